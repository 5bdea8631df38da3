import { GeometryInputError } from "./errors";
import { scoreReport } from "./report";
import type { ReportMeasurements, ReportScore, TestMeasurement, ToleranceProfile } from "./types";
import { inchesToMicrometres, inchesToMillimetres } from "./units";

export type Units = "mm" | "inch";

export interface EvaluationRequest {
  profile: { key: string; version: number };
  units: Units;
  measurements: ReportMeasurements;
}

export type EvaluationResponse = ReportScore & { inputUnits: Units };

function convertMeasurement(m: TestMeasurement): TestMeasurement {
  const um = inchesToMicrometres;
  const mm = inchesToMillimetres;
  const resolution = m.resolution === undefined ? {} : { resolution: um(m.resolution) };
  switch (m.kind) {
    case "sweep":
      return { ...m, ...resolution, readings: m.readings.map(um) };
    case "extremes":
      return { ...m, ...resolution, max: um(m.max), min: um(m.min) };
    case "profile":
      return { ...m, ...resolution, points: m.points.map((p) => ({ station: mm(p.station), reading: um(p.reading) })) };
    case "level":
      // A tilt is a ratio: µm/m and µin/in are the same number, so only the stations change.
      return { ...m, points: m.points.map((p) => ({ station: mm(p.station), reading: p.reading })) };
    case "mandrel":
      return {
        ...m,
        ...resolution,
        near: { at0: um(m.near.at0), at180: um(m.near.at180) },
        far: { at0: um(m.far.at0), at180: um(m.far.at180) },
        ...(m.length === undefined ? {} : { length: mm(m.length) }),
      };
    case "near-far":
      return {
        ...m,
        ...resolution,
        near: um(m.near),
        far: um(m.far),
        ...(m.length === undefined ? {} : { length: mm(m.length) }),
      };
    case "centre-height":
      return { ...m, ...resolution, headstockEnd: um(m.headstockEnd), tailstockEnd: um(m.tailstockEnd) };
    case "surface":
      return { ...m, ...resolution, points: m.points.map((p) => ({ x: mm(p.x), y: mm(p.y), z: um(p.z) })) };
    case "positioning":
      return { ...m, ...resolution, targets: m.targets.map(mm), forward: m.forward.map((run) => run.map(um)), reverse: m.reverse.map((run) => run.map(um)) };
    case "circular": {
      // Angles are degrees in both unit modes.
      const radial = (readings: { angle: number; deviation: number }[]) => readings.map((r) => ({ angle: r.angle, deviation: um(r.deviation) }));
      return { ...m, ...resolution, clockwise: radial(m.clockwise), counterClockwise: radial(m.counterClockwise) };
    }
  }
}

/** Measurements in the engine's units: stations and lengths in mm, readings and resolution in µm. */
export function toMetric(measurements: ReportMeasurements, units: Units): ReportMeasurements {
  if (units === "mm") return measurements;
  if (units !== "inch") {
    throw new GeometryInputError(`Units must be "mm" or "inch", not "${String(units)}".`, ["units"]);
  }
  const tests: Record<string, TestMeasurement> = {};
  for (const [code, measurement] of Object.entries(measurements.tests)) {
    tests[code] = convertMeasurement(measurement);
  }
  return { ...measurements, tests };
}

/** Unit conversion and scoring of one request against its profile; errors point at the request's fields. */
export function scoreEvaluation(profile: ToleranceProfile, request: EvaluationRequest): EvaluationResponse {
  if (profile.key !== request.profile.key || profile.version !== request.profile.version) {
    throw new GeometryInputError(
      `No tolerance profile ${request.profile.key} v${request.profile.version}.`,
      ["profile", "key"],
    );
  }
  try {
    const score = scoreReport(profile, toMetric(request.measurements, request.units));
    return { ...score, inputUnits: request.units };
  } catch (error) {
    throw error instanceof GeometryInputError ? error.within("measurements") : error;
  }
}
