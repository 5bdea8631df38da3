import { GeometryInputError, requireAtLeast, requireFinite } from "./errors";
import { tooCloseStations } from "./limits";

/** A reading y (µm) at station x (mm) along a travel. */
export interface ProfilePoint {
  x: number;
  y: number;
}

export type StraightnessReference = "end-points" | "least-squares" | "minimum-zone";
export const STRAIGHTNESS_REFERENCES: readonly StraightnessReference[] = [
  "end-points",
  "least-squares",
  "minimum-zone",
];

/** y = slope · x + intercept, slope in µm/mm, intercept in µm. */
export interface ReferenceLine {
  slope: number;
  intercept: number;
}

export interface StraightnessEvaluation {
  reference: StraightnessReference;
  /** Width along y of the band parallel to the reference line that holds every point, µm. */
  deviation: number;
  /** The reference line, shifted to the middle of the band. */
  line: ReferenceLine;
}

export type ProfileShape = "convex" | "concave" | "mixed" | "straight";

/** Checks the points and returns a copy sorted by station. */
export function sortedProfile(points: readonly ProfilePoint[]): ProfilePoint[] {
  requireAtLeast(points, 2, "A straightness profile");
  points.forEach((point, i) => {
    requireFinite(point?.x, `Station of point ${i + 1}`, [i, "x"]);
    requireFinite(point?.y, `Reading of point ${i + 1}`, [i, "y"]);
  });
  const order = points.map((_, i) => i).sort((a, b) => points[a]!.x - points[b]!.x);
  for (let k = 1; k < order.length; k++) {
    const previous = order[k - 1]!;
    const current = order[k]!;
    const closeness = tooCloseStations(points[previous]!.x, points[current]!.x);
    if (closeness && points[previous]!.x !== points[current]!.x) {
      throw new GeometryInputError(closeness, [Math.max(previous, current), "x"]);
    }
    if (points[previous]!.x === points[current]!.x) {
      const [first, second] = previous < current ? [previous, current] : [current, previous];
      throw new GeometryInputError(
        `Station ${points[current]!.x} mm is given twice (points ${first + 1} and ${second + 1}); ` +
          `read each station once, or average the repeated readings before scoring.`,
        [second, "x"],
      );
    }
  }
  return order.map((i) => ({ x: points[i]!.x, y: points[i]!.y }));
}

function bandAround(points: readonly ProfilePoint[], slope: number): { top: number; bottom: number } {
  let top = -Infinity;
  let bottom = Infinity;
  for (const { x, y } of points) {
    const r = y - slope * x;
    if (r > top) top = r;
    if (r < bottom) bottom = r;
  }
  return { top, bottom };
}

function endPointSlope(sorted: readonly ProfilePoint[]): number {
  const first = sorted[0]!;
  const last = sorted[sorted.length - 1]!;
  return (last.y - first.y) / (last.x - first.x);
}

/** Ordinary least-squares regression of y on x, centred for numerical stability. */
function leastSquaresSlope(sorted: readonly ProfilePoint[]): number {
  const n = sorted.length;
  let meanX = 0;
  let meanY = 0;
  for (const p of sorted) {
    meanX += p.x;
    meanY += p.y;
  }
  meanX /= n;
  meanY /= n;
  let sxy = 0;
  let sxx = 0;
  for (const p of sorted) {
    sxy += (p.x - meanX) * (p.y - meanY);
    sxx += (p.x - meanX) * (p.x - meanX);
  }
  return sxy / sxx;
}

function cross(o: ProfilePoint, a: ProfilePoint, b: ProfilePoint): number {
  return (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
}

/** Lower and upper convex hull, left to right (Andrew's monotone chain); input sorted by x. */
function convexHull(sorted: readonly ProfilePoint[]): { lower: ProfilePoint[]; upper: ProfilePoint[] } {
  const lower: ProfilePoint[] = [];
  const upper: ProfilePoint[] = [];
  for (const p of sorted) {
    while (lower.length >= 2 && cross(lower[lower.length - 2]!, lower[lower.length - 1]!, p) <= 0) lower.pop();
    lower.push(p);
    while (upper.length >= 2 && cross(upper[upper.length - 2]!, upper[upper.length - 1]!, p) >= 0) upper.pop();
    upper.push(p);
  }
  return { lower, upper };
}

function edgeSlopes(chain: readonly ProfilePoint[]): number[] {
  const slopes: number[] = [];
  for (let i = 1; i < chain.length; i++) {
    slopes.push((chain[i]!.y - chain[i - 1]!.y) / (chain[i]!.x - chain[i - 1]!.x));
  }
  return slopes;
}

/**
 * The narrowest band along y is parallel to an edge of the convex hull, because its width is a convex
 * piecewise-linear function of the slope that breaks only at edge slopes. Walk the edge slopes in
 * increasing order while two pointers track the supporting vertices on the upper and lower hull.
 */
function minimumZoneSlope(sorted: readonly ProfilePoint[]): number {
  const { lower, upper } = convexHull(sorted);
  const lowerSlopes = edgeSlopes(lower); // increasing
  const upperSlopes = edgeSlopes(upper); // decreasing
  const candidates = [...lowerSlopes, ...upperSlopes].sort((a, b) => a - b);

  let iu = upper.length - 1; // the highest point for very steep negative slopes is the rightmost
  let il = 0;
  let bestSlope = candidates[0]!;
  let bestWidth = Infinity;
  for (const slope of candidates) {
    while (iu > 0 && upperSlopes[iu - 1]! < slope) iu--;
    while (il < lower.length - 1 && lowerSlopes[il]! < slope) il++;
    const top = upper[iu]!.y - slope * upper[iu]!.x;
    const bottom = lower[il]!.y - slope * lower[il]!.x;
    if (top - bottom < bestWidth) {
      bestWidth = top - bottom;
      bestSlope = slope;
    }
  }
  return bestSlope;
}

function evaluateSorted(sorted: readonly ProfilePoint[], reference: StraightnessReference): StraightnessEvaluation {
  let slope: number;
  switch (reference) {
    case "end-points":
      slope = endPointSlope(sorted);
      break;
    case "least-squares":
      slope = leastSquaresSlope(sorted);
      break;
    case "minimum-zone":
      slope = minimumZoneSlope(sorted);
      break;
    default:
      throw new GeometryInputError(
        `Unknown straightness reference "${String(reference)}"; use one of ${STRAIGHTNESS_REFERENCES.join(", ")}.`,
      );
  }
  const { top, bottom } = bandAround(sorted, slope);
  return { reference, deviation: top - bottom, line: { slope, intercept: (top + bottom) / 2 } };
}

export function straightnessEvaluation(
  points: readonly ProfilePoint[],
  reference: StraightnessReference,
): StraightnessEvaluation {
  return evaluateSorted(sortedProfile(points), reference);
}

/** Width (µm) of the band parallel to the reference line that holds every point. */
export function straightnessDeviation(points: readonly ProfilePoint[], reference: StraightnessReference): number {
  return straightnessEvaluation(points, reference).deviation;
}

export interface ShapeEvaluation {
  shape: ProfileShape;
  /** Highest point above the end-point line, µm (≥ 0). */
  above: number;
  /** Lowest point below the end-point line, µm (≥ 0). */
  below: number;
}

/**
 * Convex when the middle stands above the line through the end points, concave when below, mixed when
 * both by more than `resolution` (µm), straight when neither.
 */
export function profileShape(points: readonly ProfilePoint[], resolution = 0): ShapeEvaluation {
  const sorted = sortedProfile(points);
  const first = sorted[0]!;
  const slope = endPointSlope(sorted);
  let above = 0;
  let below = 0;
  for (const p of sorted.slice(1, -1)) {
    const r = p.y - (first.y + slope * (p.x - first.x));
    if (r > above) above = r;
    if (-r > below) below = -r;
  }
  // A floor far below any instrument keeps float noise on a straight profile from reading as a shape.
  const threshold = Math.max(resolution, 1e-9);
  const up = above > threshold;
  const down = below > threshold;
  const shape: ProfileShape = up && down ? "mixed" : up ? "convex" : down ? "concave" : "straight";
  return { shape, above, below };
}

/** Consecutive runs of points whose stations lie within `window` mm of the run's first station. */
export function windowsOf(sorted: readonly ProfilePoint[], window: number): ProfilePoint[][] {
  const runs: ProfilePoint[][] = [];
  let end = 0;
  for (let start = 0; start < sorted.length; start++) {
    const limit = sorted[start]!.x + window * (1 + 1e-12);
    if (end < start) end = start;
    while (end + 1 < sorted.length && sorted[end + 1]!.x <= limit) end++;
    if (end > start) runs.push(sorted.slice(start, end + 1));
    if (end === sorted.length - 1) break; // later windows only hold subsets of this one
  }
  return runs;
}

/** Worst straightness over any window of `window` mm, each window judged against its own reference line. */
export function localStraightness(
  points: readonly ProfilePoint[],
  reference: StraightnessReference,
  window: number,
): { deviation: number; from: number; to: number } | null {
  const sorted = sortedProfile(points);
  let worst: { deviation: number; from: number; to: number } | null = null;
  for (const run of windowsOf(sorted, window)) {
    const { deviation } = evaluateSorted(run, reference);
    if (worst === null || deviation > worst.deviation) {
      worst = { deviation, from: run[0]!.x, to: run[run.length - 1]!.x };
    }
  }
  return worst;
}
