import { GeometryInputError, requireAtLeast, requireFinite } from "./errors";
import { tooCloseStations } from "./limits";
import { bandAround, whole, type Run } from "./straightness-line";

export { straightnessReferenceLine } from "./straightness-line";

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

function endPointSlope(sorted: readonly ProfilePoint[], run: Run = whole(sorted)): number {
  const first = sorted[run.from]!;
  const last = sorted[run.to]!;
  return (last.y - first.y) / (last.x - first.x);
}

/** Ordinary least-squares regression of y on x, centred for numerical stability. */
function leastSquaresSlope(sorted: readonly ProfilePoint[], run: Run): number {
  const n = run.to - run.from + 1;
  let meanX = 0;
  let meanY = 0;
  for (let i = run.from; i <= run.to; i++) {
    meanX += sorted[i]!.x;
    meanY += sorted[i]!.y;
  }
  meanX /= n;
  meanY /= n;
  let sxy = 0;
  let sxx = 0;
  for (let i = run.from; i <= run.to; i++) {
    const dx = sorted[i]!.x - meanX;
    sxy += dx * (sorted[i]!.y - meanY);
    sxx += dx * dx;
  }
  return sxy / sxx;
}

function cross(o: ProfilePoint, a: ProfilePoint, b: ProfilePoint): number {
  return (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
}

/** Lower and upper convex hull of a run, left to right (Andrew's monotone chain, O(n) on sorted input). */
function convexHull(sorted: readonly ProfilePoint[], run: Run): { lower: ProfilePoint[]; upper: ProfilePoint[] } {
  const lower: ProfilePoint[] = [];
  const upper: ProfilePoint[] = [];
  for (let i = run.from; i <= run.to; i++) {
    const p = sorted[i]!;
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
 * piecewise-linear function of the slope that breaks only at edge slopes. Rotating calipers: the lower
 * hull's edge slopes increase left to right and the upper hull's decrease, so one merge walks every edge
 * slope in increasing order while the supporting vertex on each chain only ever moves one way. O(n) on
 * sorted stations, O(n log n) with the sort.
 */
function minimumZoneSlope(sorted: readonly ProfilePoint[], run: Run): number {
  const { lower, upper } = convexHull(sorted, run);
  const lowerSlopes = edgeSlopes(lower); // increasing
  const upperSlopes = edgeSlopes(upper); // decreasing

  let nextLower = 0;
  let nextUpper = upperSlopes.length - 1;
  let iu = upper.length - 1; // the highest point for very steep negative slopes is the rightmost
  let il = 0;
  let bestSlope = NaN;
  let bestWidth = Infinity;
  while (nextLower < lowerSlopes.length || nextUpper >= 0) {
    const fromLower = nextUpper < 0 || (nextLower < lowerSlopes.length && lowerSlopes[nextLower]! <= upperSlopes[nextUpper]!);
    const slope = fromLower ? lowerSlopes[nextLower++]! : upperSlopes[nextUpper--]!;
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

function evaluateRun(sorted: readonly ProfilePoint[], run: Run, reference: StraightnessReference): StraightnessEvaluation {
  let slope: number;
  switch (reference) {
    case "end-points":
      slope = endPointSlope(sorted, run);
      break;
    case "least-squares":
      slope = leastSquaresSlope(sorted, run);
      break;
    case "minimum-zone":
      slope = minimumZoneSlope(sorted, run);
      break;
    default:
      throw new GeometryInputError(
        `Unknown straightness reference "${String(reference)}"; use one of ${STRAIGHTNESS_REFERENCES.join(", ")}.`,
      );
  }
  const { top, bottom } = bandAround(sorted, run, slope);
  return { reference, deviation: top - bottom, line: { slope, intercept: (top + bottom) / 2 } };
}

export function straightnessEvaluation(
  points: readonly ProfilePoint[],
  reference: StraightnessReference,
): StraightnessEvaluation {
  const sorted = sortedProfile(points);
  return evaluateRun(sorted, whole(sorted), reference);
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

/**
 * Each maximal run of consecutive stations that lie within `window` mm of the run's first station (as index
 * ranges, so no run is copied). Later runs that only hold a subset of one already given are left out.
 */
export function windowRuns(sorted: readonly ProfilePoint[], window: number): Run[] {
  const runs: Run[] = [];
  let end = 0;
  for (let start = 0; start < sorted.length; start++) {
    const limit = sorted[start]!.x + window * (1 + 1e-12);
    if (end < start) end = start;
    while (end + 1 < sorted.length && sorted[end + 1]!.x <= limit) end++;
    if (end > start) runs.push({ from: start, to: end });
    if (end === sorted.length - 1) break; // later windows only hold subsets of this one
  }
  return runs;
}

/**
 * Max − min of the readings of each run, in order. The runs slide forwards (both ends only move right), so
 * two monotonic queues give each run's highest and lowest reading in O(1): O(n) in all.
 */
export function runRanges(sorted: readonly ProfilePoint[], runs: readonly Run[]): number[] {
  const ranges: number[] = [];
  const highest: number[] = []; // indices, readings decreasing
  const lowest: number[] = []; // indices, readings increasing
  let highHead = 0;
  let lowHead = 0;
  let added = -1;
  for (const run of runs) {
    while (added < run.to) {
      added++;
      const y = sorted[added]!.y;
      while (highest.length > highHead && sorted[highest[highest.length - 1]!]!.y <= y) highest.pop();
      highest.push(added);
      while (lowest.length > lowHead && sorted[lowest[lowest.length - 1]!]!.y >= y) lowest.pop();
      lowest.push(added);
    }
    while (highest[highHead]! < run.from) highHead++;
    while (lowest[lowHead]! < run.from) lowHead++;
    ranges.push(sorted[highest[highHead]!]!.y - sorted[lowest[lowHead]!]!.y);
  }
  return ranges;
}

/**
 * Worst straightness over any window of `window` mm, each window judged against its own reference line.
 * O(n · k) for k stations per window at worst; the counts in limits.ts keep that small. A minimum zone is
 * never wider than the window's own range (the band at slope 0), so windows whose range cannot beat the
 * worst so far are skipped.
 */
export function localStraightness(
  points: readonly ProfilePoint[],
  reference: StraightnessReference,
  window: number,
): { deviation: number; from: number; to: number } | null {
  const sorted = sortedProfile(points);
  let worst: { deviation: number; from: number; to: number } | null = null;
  const runs = windowRuns(sorted, window);
  const ranges = reference === "minimum-zone" ? runRanges(sorted, runs) : null;
  for (const [i, run] of runs.entries()) {
    if (ranges && worst !== null && ranges[i]! <= worst.deviation) continue;
    const { deviation } = evaluateRun(sorted, run, reference);
    if (worst === null || deviation > worst.deviation) {
      worst = { deviation, from: sorted[run.from]!.x, to: sorted[run.to]!.x };
    }
  }
  return worst;
}
