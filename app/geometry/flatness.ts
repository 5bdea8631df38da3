// Flatness of a surface from heights over a grid (ISO 230-1's definition, from memory): the width along z of
// the narrowest pair of parallel planes holding every point, the planes set either by least squares or as
// the minimum zone. x, y in mm; z and the deviation in µm.
//
// Minimum zone is a linear program in the plane's two slopes: minimise u − l with
// l ≤ z_i − a·x_i − b·y_i ≤ u. We solve its dual exactly with a small simplex of our own (four equality rows:
// two weightings of the points, each summing to one, with the same centroid in x and y; maximise the
// difference of their mean heights). No general LP package is small enough for the browser bundle, and four
// rows make the simplex a few hundred lines of arithmetic per pivot: a 15 × 15 grid takes well under 1 ms.
// The slopes are read back from the final basis (the dual of the dual), and the width is measured from them,
// so the answer is always a real pair of planes holding every point.
import { GeometryInputError, requireAtLeast } from "./errors";
import { requireMeasured } from "./limits";

export const FLATNESS_REFERENCES = ["least-squares", "minimum-zone"] as const;
export type FlatnessReference = (typeof FLATNESS_REFERENCES)[number];

export interface SurfacePoint {
  /** mm */
  x: number;
  /** mm */
  y: number;
  /** µm */
  z: number;
}

export const FLATNESS_LIMITS = {
  /** Points per surface: a 50 × 50 grid. Scoring it by minimum zone stays far below 100 ms (bench/flatness.ts). */
  pointsPerSurface: 2_500,
  /** Rows or columns of a grid. */
  gridLines: 50,
} as const;

export interface FlatnessEvaluation {
  reference: FlatnessReference;
  /** Width of the zone along z, µm. */
  deviation: number;
  /** The reference plane (the middle of the zone for minimum zone): z = slopeX·x + slopeY·y + offset. */
  plane: { slopeX: number; slopeY: number; offset: number };
  /** Each point's height above the reference plane, µm, in the order given. */
  residuals: number[];
}

interface Normalised {
  X: Float64Array;
  Y: Float64Array;
  Z: Float64Array;
  cx: number;
  cy: number;
  cz: number;
  scale: number;
  /** Three points that span the plane (indices). */
  spanning: [number, number, number];
}

/** Checks the points and centres/scales them so the arithmetic stays well conditioned. */
function normalise(points: readonly SurfacePoint[]): Normalised {
  requireAtLeast(points, 3, "Surface points");
  if (points.length > FLATNESS_LIMITS.pointsPerSurface) {
    throw new GeometryInputError(
      `A surface may hold at most ${FLATNESS_LIMITS.pointsPerSurface} points (a 50 × 50 grid); got ${points.length}.`,
    );
  }
  const seen = new Set<string>();
  let sx = 0;
  let sy = 0;
  let sz = 0;
  points.forEach((point, i) => {
    if (point === null || typeof point !== "object") throw new GeometryInputError(`Point ${i + 1} must have x, y and z.`, [i]);
    requireMeasured(point.x, "station", `Point ${i + 1}'s x`, [i, "x"]);
    requireMeasured(point.y, "station", `Point ${i + 1}'s y`, [i, "y"]);
    requireMeasured(point.z, "reading", `Point ${i + 1}'s height`, [i, "z"]);
    const key = `${point.x}|${point.y}`;
    if (seen.has(key)) {
      throw new GeometryInputError(`Point ${i + 1} repeats x ${point.x} mm, y ${point.y} mm; each place is read once.`, [i]);
    }
    seen.add(key);
    sx += point.x;
    sy += point.y;
    sz += point.z;
  });
  const n = points.length;
  const cx = sx / n;
  const cy = sy / n;
  const cz = sz / n;
  let scale = 0;
  for (const point of points) scale = Math.max(scale, Math.abs(point.x - cx), Math.abs(point.y - cy));
  const X = new Float64Array(n);
  const Y = new Float64Array(n);
  const Z = new Float64Array(n);
  points.forEach((point, i) => {
    X[i] = (point.x - cx) / scale;
    Y[i] = (point.y - cy) / scale;
    Z[i] = point.z - cz;
  });
  // Three points spanning the plane: the first, the farthest from it, and the farthest from their line.
  let far = 0;
  let farDistance = 0;
  for (let i = 1; i < n; i++) {
    const d = Math.hypot(X[i]! - X[0]!, Y[i]! - Y[0]!);
    if (d > farDistance) {
      farDistance = d;
      far = i;
    }
  }
  const ux = X[far]! - X[0]!;
  const uy = Y[far]! - Y[0]!;
  let off = 0;
  let offDistance = 0;
  for (let i = 1; i < n; i++) {
    const d = Math.abs(ux * (Y[i]! - Y[0]!) - uy * (X[i]! - X[0]!)) / farDistance;
    if (d > offDistance) {
      offDistance = d;
      off = i;
    }
  }
  // Relative to the surface's size: 1e-9 of it is far below any real grid's spacing.
  if (!(offDistance > 1e-9 * farDistance)) {
    throw new GeometryInputError("The points all lie on one line; a surface needs points off that line.");
  }
  return { X, Y, Z, cx, cy, cz, scale, spanning: [0, far, off] };
}

function evaluationFrom(
  points: readonly SurfacePoint[],
  data: Normalised,
  reference: FlatnessReference,
  a: number,
  b: number,
): FlatnessEvaluation {
  const n = points.length;
  const raw = new Float64Array(n);
  let max = -Infinity;
  let min = Infinity;
  for (let i = 0; i < n; i++) {
    const r = data.Z[i]! - a * data.X[i]! - b * data.Y[i]!;
    raw[i] = r;
    if (r > max) max = r;
    if (r < min) min = r;
  }
  // Least squares: the plane through the centroid. Minimum zone: the middle of the zone.
  const middle = reference === "least-squares" ? 0 : (max + min) / 2;
  const slopeX = a / data.scale;
  const slopeY = b / data.scale;
  const offset = data.cz + middle - slopeX * data.cx - slopeY * data.cy;
  return {
    reference,
    deviation: max - min,
    plane: { slopeX, slopeY, offset },
    residuals: Array.from(raw, (r) => r - middle),
  };
}

function leastSquaresSlopes(data: Normalised): [number, number] {
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  let sxz = 0;
  let syz = 0;
  for (let i = 0; i < data.X.length; i++) {
    const x = data.X[i]!;
    const y = data.Y[i]!;
    const z = data.Z[i]!;
    sxx += x * x;
    sxy += x * y;
    syy += y * y;
    sxz += x * z;
    syz += y * z;
  }
  const det = sxx * syy - sxy * sxy;
  return [(sxz * syy - syz * sxy) / det, (syz * sxx - sxz * sxy) / det];
}

/**
 * Slopes (a, b) of the minimum zone, by the simplex method on the dual linear program.
 * Columns 0…n−1 weight points on the upper plane (1, 0, X, Y), n…2n−1 on the lower (0, 1, −X, −Y); the last
 * four are an identity that carries the inverse of the basis, from which the slopes are read.
 */
function minimumZoneSlopes(data: Normalised): [number, number] {
  const n = data.X.length;
  const columns = 2 * n + 4;
  const width = columns + 1; // the right-hand side last
  const tableau = new Float64Array(4 * width);
  const cost = new Float64Array(columns);
  for (let i = 0; i < n; i++) {
    tableau[0 * width + i] = 1;
    tableau[2 * width + i] = data.X[i]!;
    tableau[3 * width + i] = data.Y[i]!;
    cost[i] = -data.Z[i]!;
    tableau[1 * width + n + i] = 1;
    tableau[2 * width + n + i] = -data.X[i]!;
    tableau[3 * width + n + i] = -data.Y[i]!;
    cost[n + i] = data.Z[i]!;
  }
  for (let r = 0; r < 4; r++) tableau[r * width + 2 * n + r] = 1;
  tableau[0 * width + columns] = 1;
  tableau[1 * width + columns] = 1;

  const basis = [-1, -1, -1, -1];
  const pivot = (row: number, column: number) => {
    const base = row * width;
    const factor = tableau[base + column]!;
    for (let k = 0; k < width; k++) tableau[base + k]! /= factor;
    for (let r = 0; r < 4; r++) {
      if (r === row) continue;
      const other = r * width;
      const m = tableau[other + column]!;
      if (m === 0) continue;
      for (let k = 0; k < width; k++) tableau[other + k]! -= m * tableau[base + k]!;
    }
    basis[row] = column;
  };

  // A feasible start: one point weighted fully on both planes, completed by two more points that span the
  // plane with it (the basis matrix is then invertible; the start is degenerate, which the rules below handle).
  const [i, j, k] = data.spanning;
  for (const column of [n + i, i, j, k]) {
    let best = -1;
    let bestSize = 0;
    for (let r = 0; r < 4; r++) {
      if (basis[r] !== -1) continue;
      const size = Math.abs(tableau[r * width + column]!);
      if (size > bestSize) {
        bestSize = size;
        best = r;
      }
    }
    pivot(best, column);
  }
  for (let r = 0; r < 4; r++) {
    if (tableau[r * width + columns]! < 0) tableau[r * width + columns] = 0;
  }

  let zScale = 1;
  for (let q = 0; q < n; q++) zScale = Math.max(zScale, Math.abs(data.Z[q]!));
  const costTolerance = 1e-10 * zScale;
  const pivotTolerance = 1e-10;
  const isBasic = new Uint8Array(columns);
  let degenerateRun = 0;
  const maxIterations = 200 + 40 * n;
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    isBasic.fill(0);
    for (const b of basis) isBasic[b] = 1;
    const cb0 = cost[basis[0]!]!;
    const cb1 = cost[basis[1]!]!;
    const cb2 = cost[basis[2]!]!;
    const cb3 = cost[basis[3]!]!;
    // Dantzig's rule (most negative reduced cost); after a run of degenerate pivots, Bland's (first negative),
    // which cannot cycle.
    const bland = degenerateRun > 8;
    let entering = -1;
    let mostNegative = -costTolerance;
    for (let c = 0; c < 2 * n; c++) {
      if (isBasic[c]) continue;
      const reduced =
        cost[c]! -
        cb0 * tableau[c]! -
        cb1 * tableau[width + c]! -
        cb2 * tableau[2 * width + c]! -
        cb3 * tableau[3 * width + c]!;
      if (reduced < mostNegative) {
        entering = c;
        mostNegative = reduced;
        if (bland) break;
      }
    }
    if (entering === -1) {
      // Optimal. The simplex multipliers y = c_B·B⁻¹ sit under the identity columns; a = −y₃, b = −y₄.
      const multiplier = (r: number) =>
        cb0 * tableau[2 * n + r]! +
        cb1 * tableau[width + 2 * n + r]! +
        cb2 * tableau[2 * width + 2 * n + r]! +
        cb3 * tableau[3 * width + 2 * n + r]!;
      return [-multiplier(2), -multiplier(3)];
    }
    let leaving = -1;
    let bestRatio = Infinity;
    for (let r = 0; r < 4; r++) {
      const entry = tableau[r * width + entering]!;
      if (entry <= pivotTolerance) continue;
      const ratio = tableau[r * width + columns]! / entry;
      if (ratio < bestRatio - 1e-15 || (ratio <= bestRatio + 1e-15 && leaving !== -1 && basis[r]! < basis[leaving]!)) {
        bestRatio = ratio;
        leaving = r;
      }
    }
    // The primal is always feasible, so the dual is bounded and some row limits the step.
    if (leaving === -1) throw new Error("Minimum-zone flatness: unbounded step (numerical breakdown).");
    degenerateRun = bestRatio <= 1e-15 ? degenerateRun + 1 : 0;
    pivot(leaving, entering);
    for (let r = 0; r < 4; r++) {
      if (tableau[r * width + columns]! < 0) tableau[r * width + columns] = 0;
    }
  }
  throw new Error("Minimum-zone flatness: the simplex did not finish (numerical breakdown).");
}

/** The flatness evaluation with its reference plane and each point's height above it. */
export function flatnessEvaluation(points: readonly SurfacePoint[], reference: FlatnessReference): FlatnessEvaluation {
  if (!FLATNESS_REFERENCES.includes(reference)) {
    throw new GeometryInputError(`Unknown flatness reference "${String(reference)}"; use least-squares or minimum-zone.`);
  }
  const data = normalise(points);
  const [a, b] = leastSquaresSlopes(data);
  const leastSquares = evaluationFrom(points, data, reference, a, b);
  if (reference === "least-squares") return leastSquares;
  const [mzA, mzB] = minimumZoneSlopes(data);
  const minimumZone = evaluationFrom(points, data, reference, mzA, mzB);
  // Rounding in the last pivot could leave the zone a hair wider than the least-squares planes; never report that.
  return minimumZone.deviation <= leastSquares.deviation ? minimumZone : evaluationFrom(points, data, reference, a, b);
}

/** Width along z (µm) of the zone holding every point, by least-squares plane or minimum zone. */
export function flatnessDeviation(points: { x: number; y: number; z: number }[], reference: "least-squares" | "minimum-zone"): number {
  return flatnessEvaluation(points, reference).deviation;
}
