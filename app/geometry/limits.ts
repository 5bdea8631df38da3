// How much one measurement set may hold, and how large a number may be, before it is refused. Shared by the
// evaluations API, the report form (drafts and submission) and the engine's own checks.
//
// The counts keep a request's cost small and fixed (the engine's slowest step is O(n log n) per test, the
// window checks O(n · k) for k stations per window). The magnitudes are physical: no machine's travel is
// longer than 100 m and no indicator, probe or wire microscope used for these tests reads beyond 100 mm,
// so a larger number is a slip of units or of the decimal point. They also keep every intermediate step
// finite: the largest product the engine forms is about (2 · 10⁵)² · n, far below 1.8 · 10³⁰⁸.
import { GeometryInputError, requireFinite } from "./errors";
import type { Units } from "./evaluate";
import { MICROMETRES_PER_INCH, MILLIMETRES_PER_INCH } from "./units";

export const MEASUREMENT_LIMITS = {
  /** Stations per travel: every 1 mm over a 1 m bed; drafts typed by hand stop at 200. */
  stationsPerTest: 1_000,
  /** Indicator readings per sweep: one every ½° over a revolution and more. */
  readingsPerSweep: 1_000,
  /** Tests per request: a profile has about 25; room for the largest to come. */
  testsPerRequest: 64,
  /** |station| and lengths, mm (100 m). */
  stationMm: 100_000,
  /** |reading| and resolutions, µm (100 mm). */
  readingUm: 100_000,
  /** |level tilt|, µm/m (100 mm/m, about 5.7°: no machine is levelled from there). */
  tiltUmPerM: 100_000,
  /** Closest two stations may be, mm: no travel is read in finer steps than 1 µm, and a closer pair makes slopes explode. */
  stationStepMm: 0.001,
} as const;

export type Quantity = "station" | "reading" | "tilt";

const grouped = (value: number) => value.toLocaleString("en-GB").replace(/,/g, " ");

/** The value in the engine's units (mm, µm, µm/m); non-finite stays non-finite. */
function inEngineUnits(value: number, quantity: Quantity, units: Units): number {
  if (units === "mm" || quantity === "tilt") return value;
  return quantity === "station" ? value * MILLIMETRES_PER_INCH : value * MICROMETRES_PER_INCH;
}

function limitText(quantity: Quantity, units: Units): string {
  switch (quantity) {
    case "station":
      return units === "inch"
        ? `±${grouped(Math.floor((MEASUREMENT_LIMITS.stationMm / MILLIMETRES_PER_INCH) * 100) / 100)} in (100 m)`
        : `±${grouped(MEASUREMENT_LIMITS.stationMm)} mm (100 m)`;
    case "reading":
      return units === "inch"
        ? `±${Math.floor((MEASUREMENT_LIMITS.readingUm / MICROMETRES_PER_INCH) * 1000) / 1000} in (100 mm)`
        : `±${grouped(MEASUREMENT_LIMITS.readingUm)} µm (100 mm)`;
    case "tilt":
      return `±${grouped(MEASUREMENT_LIMITS.tiltUmPerM)} µm/m (100 mm/m)`;
  }
}

const LIMIT_OF: Record<Quantity, number> = {
  station: MEASUREMENT_LIMITS.stationMm,
  reading: MEASUREMENT_LIMITS.readingUm,
  tilt: MEASUREMENT_LIMITS.tiltUmPerM,
};

const WHY: Record<Quantity, string> = {
  station: "longer than any machine's travel",
  reading: "beyond any indicator's range on these tests",
  tilt: "far beyond any level's range",
};

/**
 * Null when `value` (in the request's units) is a finite number within the physical limit of its quantity;
 * otherwise the message for its field, which names the limit.
 */
export function beyondLimit(value: number, quantity: Quantity, units: Units = "mm"): string | null {
  const metric = inEngineUnits(value, quantity, units);
  if (Number.isFinite(metric) && Math.abs(metric) <= LIMIT_OF[quantity] * (1 + 1e-12)) return null;
  return `Must lie within ${limitText(quantity, units)}, ${WHY[quantity]}; check the units and the decimal point.`;
}

/** Every number of a measurement with its path and quantity, as `[path, value, quantity]`. */
export function* numbersOf(measurement: {
  kind: string;
  [field: string]: unknown;
}): Generator<[(string | number)[], unknown, Quantity]> {
  const tilt = measurement.kind === "level";
  if (measurement.resolution !== undefined) yield [["resolution"], measurement.resolution, tilt ? "tilt" : "reading"];
  if (measurement.length !== undefined) yield [["length"], measurement.length, "station"];
  switch (measurement.kind) {
    case "sweep":
      if (Array.isArray(measurement.readings)) for (const [i, reading] of measurement.readings.entries()) yield [["readings", i], reading, "reading"];
      return;
    case "profile":
    case "level":
      if (Array.isArray(measurement.points)) {
        for (const [i, point] of (measurement.points as Array<Record<string, unknown>>).entries()) {
          yield [["points", i, "station"], point?.station, "station"];
          yield [["points", i, "reading"], point?.reading, tilt ? "tilt" : "reading"];
        }
      }
      return;
    case "surface":
      if (Array.isArray(measurement.points)) {
        for (const [i, point] of (measurement.points as Array<Record<string, unknown>>).entries()) {
          yield [["points", i, "x"], point?.x, "station"];
          yield [["points", i, "y"], point?.y, "station"];
          yield [["points", i, "z"], point?.z, "reading"];
        }
      }
      return;
    case "positioning":
      if (Array.isArray(measurement.targets)) for (const [i, target] of measurement.targets.entries()) yield [["targets", i], target, "station"];
      for (const direction of ["forward", "reverse"] as const) {
        const runs = measurement[direction];
        if (!Array.isArray(runs)) continue;
        for (const [j, run] of runs.entries()) {
          if (Array.isArray(run)) for (const [i, value] of run.entries()) yield [[direction, j, i], value, "reading"];
        }
      }
      return;
    case "circular":
      for (const direction of ["clockwise", "counterClockwise"] as const) {
        const readings = measurement[direction];
        if (!Array.isArray(readings)) continue;
        for (const [i, reading] of (readings as Array<Record<string, unknown>>).entries()) yield [[direction, i, "deviation"], reading?.deviation, "reading"];
      }
      return;
    case "mandrel":
      for (const end of ["near", "far"] as const) {
        const pair = measurement[end] as Record<string, unknown> | undefined;
        yield [[end, "at0"], pair?.at0, "reading"];
        yield [[end, "at180"], pair?.at180, "reading"];
      }
      return;
    default:
      for (const field of ["max", "min", "near", "far", "headstockEnd", "tailstockEnd"]) {
        if (field in measurement) yield [[field], measurement[field], "reading"];
      }
  }
}

/** Message for two stations closer than the finest step, or null. */
export function tooCloseStations(a: number, b: number, units: Units = "mm"): string | null {
  const gap = Math.abs(inEngineUnits(a, "station", units) - inEngineUnits(b, "station", units));
  if (!(gap < MEASUREMENT_LIMITS.stationStepMm * (1 - 1e-9))) return null;
  const step = units === "inch" ? "0.001 mm (0.00004 in)" : "0.001 mm";
  return `Stations ${a} and ${b} are closer than ${step}, too close to tell apart; read each station once, or average the readings.`;
}

/** Field messages for numbers of a measurement beyond their limits (paths relative to the measurement). */
export function measurementLimitIssues(
  measurement: { kind: string; [field: string]: unknown },
  units: Units,
): Array<{ path: (string | number)[]; message: string }> {
  const issues: Array<{ path: (string | number)[]; message: string }> = [];
  for (const [path, value, quantity] of numbersOf(measurement)) {
    if (typeof value !== "number") continue; // the shape checks say what is missing
    const message = beyondLimit(value, quantity, units);
    if (message) issues.push({ path, message });
  }
  if (Array.isArray(measurement.points)) {
    const points = measurement.points as Array<{ station?: unknown }>;
    const order = points
      .map((point, i) => ({ station: point?.station, i }))
      .filter((point): point is { station: number; i: number } => typeof point.station === "number")
      .sort((a, b) => a.station - b.station);
    for (let k = 1; k < order.length; k++) {
      const message = order[k]!.station === order[k - 1]!.station ? null : tooCloseStations(order[k - 1]!.station, order[k]!.station, units);
      if (message) issues.push({ path: ["points", Math.max(order[k]!.i, order[k - 1]!.i), "station"], message });
    }
  }
  return issues;
}

/** The engine's own check (metric units): a finite number within the physical limit, or a GeometryInputError. */
export function requireMeasured(value: number, quantity: Quantity, what: string, path: readonly (string | number)[] = []): number {
  requireFinite(value, what, path);
  const message = beyondLimit(value, quantity);
  if (message) throw new GeometryInputError(`${what} is ${value}. ${message}`, path);
  return value;
}
