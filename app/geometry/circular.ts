// Circular test of two interpolating axes (ISO 230-4's method, from memory: the standard's text was not at
// hand). A ball bar or similar reads the radial deviation (measured − nominal radius, µm) around the circle in
// each direction of travel.
//
// Centre: the least-squares circle. Its centre is where a misplaced pivot or set-up offset puts it, so
// measuring about it keeps the set-up out of the machine's figure (the pivot's own offset is not the
// machine's error). Radial deviations are tiny beside the radius, so the least-squares circle is the linear
// fit r(θ) ≈ c + a·cos θ + b·sin θ (the usual limaçon approximation, common practice); the deviation from it
// is the residual.
import { GeometryInputError, requireFinite } from "./errors";
import { requireMeasured } from "./limits";

export const CIRCULAR_LIMITS = {
  /** Readings per direction: one every 0.1° over a full circle. */
  readingsPerDirection: 3_600,
  /** Fewest readings per direction: a circle needs three; eight gives the fit some redundancy. */
  fewestReadings: 8,
} as const;

export interface RadialReading {
  /** Angle around the circle, degrees, 0 ≤ angle < 360. */
  angle: number;
  /** Radial deviation, measured − nominal radius, µm. */
  deviation: number;
}

export interface CircularEvaluation {
  /** Range of the clockwise readings about their least-squares circle, µm. */
  circularDeviationClockwise: number;
  /** Range of the counter-clockwise readings about their least-squares circle, µm. */
  circularDeviationCounterClockwise: number;
  /** Range of both directions about one least-squares circle fitted to all readings, µm. */
  circularDeviation: number;
  /**
   * Largest radial difference between the two directions at the same angle, µm. The counter-clockwise path is
   * interpolated linearly (around the circle) at each clockwise angle. Both paths are taken about the same
   * centre, so the difference is that of the readings themselves.
   */
  circularHysteresis: number;
  /** Offset of the least-squares centre from the pivot, µm, along the 0° and 90° directions (both directions fitted together). */
  centreOffset: { x: number; y: number };
}

function requireReadings(readings: unknown, name: string, key: string): RadialReading[] {
  if (!Array.isArray(readings)) throw new GeometryInputError(`${name} must be a list of readings.`, [key]);
  if (readings.length < CIRCULAR_LIMITS.fewestReadings) {
    throw new GeometryInputError(`${name}: at least ${CIRCULAR_LIMITS.fewestReadings} readings are needed; got ${readings.length}.`, [key]);
  }
  if (readings.length > CIRCULAR_LIMITS.readingsPerDirection) {
    throw new GeometryInputError(`${name}: at most ${CIRCULAR_LIMITS.readingsPerDirection} readings; got ${readings.length}.`, [key]);
  }
  const seen = new Set<number>();
  readings.forEach((reading: RadialReading, i) => {
    requireFinite(reading?.angle, `${name}: angle ${i + 1}`, [key, i, "angle"]);
    if (reading.angle < 0 || reading.angle >= 360) {
      throw new GeometryInputError(`${name}: angle ${i + 1} is ${reading.angle}°; angles run from 0 up to (not including) 360.`, [key, i, "angle"]);
    }
    if (seen.has(reading.angle)) throw new GeometryInputError(`${name}: angle ${reading.angle}° is read twice.`, [key, i, "angle"]);
    seen.add(reading.angle);
    requireMeasured(reading.deviation, "reading", `${name}: deviation ${i + 1}`, [key, i, "deviation"]);
  });
  return [...(readings as RadialReading[])].sort((a, b) => a.angle - b.angle);
}

/** Least-squares r ≈ c + a cos θ + b sin θ by the 3 × 3 normal equations (Cramer's rule); residual range and centre. */
function fitCircle(readings: readonly RadialReading[], name: string): { range: number; a: number; b: number } {
  const rows = readings.map(({ angle, deviation }) => {
    const t = (angle * Math.PI) / 180;
    return [1, Math.cos(t), Math.sin(t), deviation] as const;
  });
  const n = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const rhs = [0, 0, 0];
  for (const row of rows) {
    for (let p = 0; p < 3; p++) {
      rhs[p]! += row[p]! * row[3];
      for (let q = 0; q < 3; q++) n[p]![q]! += row[p]! * row[q]!;
    }
  }
  const det = (m: number[][]) =>
    m[0]![0]! * (m[1]![1]! * m[2]![2]! - m[1]![2]! * m[2]![1]!) -
    m[0]![1]! * (m[1]![0]! * m[2]![2]! - m[1]![2]! * m[2]![0]!) +
    m[0]![2]! * (m[1]![0]! * m[2]![1]! - m[1]![1]! * m[2]![0]!);
  const d = det(n);
  // Angles bunched in one small arc leave the centre undetermined.
  if (!(Math.abs(d) > 1e-9 * rows.length ** 3)) {
    throw new GeometryInputError(`${name}: the angles cover too little of the circle to place its centre; read around the whole circle.`);
  }
  const solveFor = (column: number) => det(n.map((row, p) => row.map((value, q) => (q === column ? rhs[p]! : value)))) / d;
  const [c, a, b] = [solveFor(0), solveFor(1), solveFor(2)];
  let min = Infinity;
  let max = -Infinity;
  for (const row of rows) {
    const residual = row[3] - (c + a * row[1] + b * row[2]);
    min = Math.min(min, residual);
    max = Math.max(max, residual);
  }
  return { range: max - min, a, b };
}

/** The deviation at `angle` from readings sorted by angle, interpolated linearly around the circle. */
function deviationAt(sorted: readonly RadialReading[], angle: number): number {
  let hi = sorted.findIndex((reading) => reading.angle >= angle);
  if (hi === -1) hi = 0;
  if (sorted[hi]!.angle === angle) return sorted[hi]!.deviation;
  const lo = (hi - 1 + sorted.length) % sorted.length;
  const from = sorted[lo]!;
  const to = sorted[hi]!;
  const span = (to.angle - from.angle + 360) % 360 || 360;
  const along = (angle - from.angle + 360) % 360;
  return from.deviation + ((to.deviation - from.deviation) * along) / span;
}

/** Circular deviation of each direction and of both, and the circular hysteresis, µm. */
export function circularTest(input: { clockwise: RadialReading[]; counterClockwise: RadialReading[] }): CircularEvaluation {
  if (input === null || typeof input !== "object") throw new GeometryInputError("Circular test readings must be an object.");
  const clockwise = requireReadings(input.clockwise, "Clockwise readings", "clockwise");
  const counterClockwise = requireReadings(input.counterClockwise, "Counter-clockwise readings", "counterClockwise");
  const both = fitCircle([...clockwise, ...counterClockwise], "Readings of both directions");
  let hysteresis = 0;
  for (const reading of clockwise) {
    hysteresis = Math.max(hysteresis, Math.abs(reading.deviation - deviationAt(counterClockwise, reading.angle)));
  }
  return {
    circularDeviationClockwise: fitCircle(clockwise, "Clockwise readings").range,
    circularDeviationCounterClockwise: fitCircle(counterClockwise, "Counter-clockwise readings").range,
    circularDeviation: both.range,
    circularHysteresis: hysteresis,
    centreOffset: { x: both.a, y: both.b },
  };
}
