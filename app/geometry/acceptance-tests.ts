import { GeometryInputError, requireAtLeast, requirePositive } from "./errors";
import { mandrelInclination, totalIndicatorReading } from "./indicator";
import { requireMeasured, type Quantity } from "./limits";
import {
  localStraightness,
  profileShape,
  sortedProfile,
  straightnessEvaluation,
  runRanges,
  windowRuns,
  type ProfilePoint,
  type StraightnessReference,
} from "./straightness";
import { sourceLabel } from "./sources";
import { evaluateSurface } from "./surface-tests";
import { evaluateCircular, evaluatePositioning } from "./positioning-tests";
import { toleranceOver } from "./tolerance";
import type {
  Conditions,
  DirectionVerdict,
  EvaluationMethod,
  LocalResult,
  MeasurementKind,
  ProfileRules,
  ProfileTest,
  TestMeasurement,
  TestResult,
  ToleranceSpec,
  Warning,
} from "./types";

/** Which measurement kinds each evaluation method accepts. */
export const KINDS_FOR_METHOD: Readonly<Record<EvaluationMethod, readonly MeasurementKind[]>> = {
  "run-out": ["sweep", "extremes"],
  straightness: ["profile"],
  "range-along": ["profile"],
  squareness: ["profile"],
  "level-range": ["level"],
  "mandrel-inclination": ["mandrel"],
  "near-far": ["near-far"],
  "centre-height": ["centre-height"],
  flatness: ["surface"],
  "positioning-accuracy": ["positioning"],
  "positioning-repeatability": ["positioning"],
  "positioning-reversal": ["positioning"],
  "circular-deviation": ["circular"],
};

// Comparisons allow for binary floating-point noise (e.g. 0.0008 in × 25 400), never for rounding.
const RELATIVE_NOISE = 1e-9;
const ABSOLUTE_NOISE = 1e-9; // µm

export function withinLimit(ratio: number, limit: number): boolean {
  return ratio <= limit * (1 + RELATIVE_NOISE);
}

/** The profile-wide rules a single test is scored under (rounding, least count); none by default. */
export type TestRules = Pick<ProfileRules, "rounding" | "leastCount">;

/** The tolerance a spec gives at the measured length (mm), or at the test's nominal length when null. */
export function toleranceAt(spec: ToleranceSpec, length: number | null, nominal: number | null = null, rules: TestRules = {}): number {
  switch (spec.type) {
    case "fixed":
      return spec.tolerance;
    case "proportional": {
      const at = length ?? nominal ?? spec.over;
      return toleranceOver(
        {
          tolerance: spec.tolerance,
          over: spec.over,
          minimum: spec.minimum,
          ...(spec.maximum !== undefined ? { maximum: spec.maximum } : {}),
          ...(rules.rounding ? { roundTo: rules.rounding.step } : {}),
        },
        at,
      );
    }
    case "stepped": {
      const at = length ?? nominal;
      if (at === null) {
        throw new GeometryInputError("This tolerance depends on the measuring length; give the stations read.");
      }
      requirePositive(at, "The measuring length");
      const step = spec.steps.find((s) => at <= s.upTo * (1 + RELATIVE_NOISE));
      if (!step) {
        const last = spec.steps[spec.steps.length - 1]!.upTo;
        throw new GeometryInputError(
          `The measured length (${at} mm) is beyond the ${last} mm this profile covers; ` +
            `check the stations, or score the machine with a profile for longer beds.`,
          ["points"],
        );
      }
      return step.tolerance;
    }
  }
}

function toPoints(points: readonly { station: number; reading: number }[], readingIs: Quantity): ProfilePoint[] {
  requireAtLeast(points, 2, "Readings along the travel", ["points"]);
  return points.map((point, i) => {
    requireMeasured(point?.station, "station", `Station of point ${i + 1}`, ["points", i, "station"]);
    requireMeasured(point?.reading, readingIs, `Reading of point ${i + 1}`, ["points", i, "reading"]);
    return { x: point.station, y: point.reading };
  });
}

/** Re-points errors raised on {x, y} points at the measurement's {station, reading} fields. */
function sortedStations(points: readonly { station: number; reading: number }[], readingIs: Quantity = "reading"): ProfilePoint[] {
  const converted = toPoints(points, readingIs);
  try {
    return sortedProfile(converted);
  } catch (error) {
    if (error instanceof GeometryInputError) {
      const [index, field] = error.path;
      const path = typeof index === "number" ? ["points", index, field === "y" ? "reading" : "station"] : ["points"];
      throw new GeometryInputError(error.message, path);
    }
    throw error;
  }
}

function range(points: readonly ProfilePoint[]): number {
  let max = -Infinity;
  let min = Infinity;
  for (const p of points) {
    if (p.y > max) max = p.y;
    if (p.y < min) min = p.y;
  }
  return max - min;
}

/** Worst max − min of the readings over any window of `window` mm, O(n). */
function worstRangeOver(sorted: readonly ProfilePoint[], window: number): { value: number; from: number; to: number } | null {
  const runs = windowRuns(sorted, window);
  const ranges = runRanges(sorted, runs);
  let worst: { value: number; from: number; to: number } | null = null;
  runs.forEach((run, i) => {
    if (worst === null || ranges[i]! > worst.value) worst = { value: ranges[i]!, from: sorted[run.from]!.x, to: sorted[run.to]!.x };
  });
  return worst;
}

function signed(value: number, resolution: number): "positive" | "negative" | "none" {
  if (value > resolution + ABSOLUTE_NOISE) return "positive";
  if (value < -(resolution + ABSOLUTE_NOISE)) return "negative";
  return "none";
}

export function conditionWarnings(conditions: Conditions | undefined): Warning[] {
  const warnings: Warning[] = [];
  if (conditions?.ambientTemperatureC === undefined) {
    warnings.push({
      code: "temperature-missing",
      message: "Ambient temperature not recorded; record it (the reference temperature is 20 °C, ISO 1:2016).",
    });
  }
  if (conditions?.warmUpMinutes === undefined || conditions.warmUpMinutes <= 0) {
    warnings.push({
      code: "warm-up-missing",
      message: "No warm-up run recorded; run the spindle before the tests and record for how long.",
    });
  }
  if (conditions?.levelled !== true) {
    warnings.push({
      code: "levelling-missing",
      message: "Levelling not recorded; level the machine before the tests and say so.",
    });
  }
  return warnings;
}

interface Evaluated {
  value: number;
  measuringLength: number | null;
  local: { value: number; from: number; to: number } | null | undefined;
  straightness?: TestResult["straightness"];
  flatness?: TestResult["flatness"];
  positioning?: TestResult["positioning"];
  circular?: TestResult["circular"];
  window?: { from: number; to: number };
  direction: Omit<DirectionVerdict, "allowed">;
  warnings: Warning[];
}

const UNSIGNED_DIRECTION = { observed: "not-applicable", against: 0, pass: true } as const;

/** One-direction tests fail on any deviation the other way beyond the instrument's resolution. */
function signedDirection(value: number, allowed: ProfileTest["direction"]["allowed"], resolution: number) {
  const against = allowed === "positive" ? Math.max(0, -value) : 0;
  return { observed: signed(value, resolution), against, pass: against <= resolution + ABSOLUTE_NOISE };
}

function evaluateReadings(test: ProfileTest, measurement: TestMeasurement, resolution: number): Evaluated {
  const allowed = test.direction.allowed;

  switch (measurement.kind) {
    case "sweep": {
      let value: number;
      try {
        value = totalIndicatorReading(measurement.readings);
      } catch (error) {
        throw error instanceof GeometryInputError ? error.within("readings") : error;
      }
      return { value, measuringLength: null, local: undefined, direction: UNSIGNED_DIRECTION, warnings: [] };
    }
    case "extremes": {
      requireMeasured(measurement.max, "reading", "The highest reading", ["max"]);
      requireMeasured(measurement.min, "reading", "The lowest reading", ["min"]);
      if (measurement.max < measurement.min) {
        throw new GeometryInputError(
          `The highest reading (${measurement.max}) is below the lowest (${measurement.min}); swap them.`,
          ["max"],
        );
      }
      return {
        value: measurement.max - measurement.min,
        measuringLength: null,
        local: undefined,
        direction: UNSIGNED_DIRECTION,
        warnings: [],
      };
    }
    case "level": {
      const sorted = sortedStations(measurement.points, "tilt");
      return { value: range(sorted), measuringLength: null, local: undefined, direction: UNSIGNED_DIRECTION, warnings: [] };
    }
    case "mandrel": {
      const value = mandrelInclination(measurement);
      const length = measurement.length ?? test.measuringLength.nominal;
      if (length !== null) {
        requirePositive(length, "The distance between the near and far readings (mm)", ["length"]);
        requireMeasured(length, "station", "The distance between the near and far readings (mm)", ["length"]);
      }
      return { value, measuringLength: length, local: undefined, direction: signedDirection(value, allowed, resolution), warnings: [] };
    }
    case "near-far": {
      requireMeasured(measurement.near, "reading", "The near reading", ["near"]);
      requireMeasured(measurement.far, "reading", "The far reading", ["far"]);
      const value = measurement.far - measurement.near;
      const length = measurement.length ?? test.measuringLength.nominal;
      if (length !== null) {
        requirePositive(length, "The distance between the near and far readings (mm)", ["length"]);
        requireMeasured(length, "station", "The distance between the near and far readings (mm)", ["length"]);
      }
      return { value, measuringLength: length, local: undefined, direction: signedDirection(value, allowed, resolution), warnings: [] };
    }
    case "centre-height": {
      requireMeasured(measurement.headstockEnd, "reading", "The reading at the headstock end", ["headstockEnd"]);
      requireMeasured(measurement.tailstockEnd, "reading", "The reading at the tailstock end", ["tailstockEnd"]);
      const value = measurement.tailstockEnd - measurement.headstockEnd;
      return { value, measuringLength: null, local: undefined, direction: signedDirection(value, allowed, resolution), warnings: [] };
    }
    case "profile":
      return evaluateProfile(test, measurement.points, measurement.reference, resolution);
    case "surface":
      return { ...evaluateSurface(test, measurement), local: undefined, direction: UNSIGNED_DIRECTION };
    case "positioning":
      return { ...evaluatePositioning(test, measurement), local: undefined, direction: UNSIGNED_DIRECTION };
    case "circular":
      return { ...evaluateCircular(measurement), local: undefined, direction: UNSIGNED_DIRECTION };
  }
}

function evaluateProfile(
  test: ProfileTest,
  points: readonly { station: number; reading: number }[],
  chosenReference: StraightnessReference | undefined,
  resolution: number,
): Evaluated {
  const sorted = sortedStations(points);
  const span = sorted[sorted.length - 1]!.x - sorted[0]!.x;
  const warnings: Warning[] = [];
  const allowed = test.direction.allowed;

  switch (test.method) {
    case "straightness": {
      const reference = chosenReference ?? test.reference ?? "end-points";
      const evaluation = straightnessEvaluation(sorted, reference);
      if (sorted.length < 3) {
        warnings.push({
          code: "few-stations",
          message: "Only two stations: a straightness of 0 is certain; read at least three, better every 1/10 of the travel.",
        });
      }
      const worstLocal = test.local ? localStraightness(sorted, reference, test.local.window) : undefined;
      const local = worstLocal && { value: worstLocal.deviation, from: worstLocal.from, to: worstLocal.to };
      const shape = profileShape(sorted, resolution);
      const against = allowed === "convex" ? shape.below : allowed === "concave" ? shape.above : 0;
      return {
        value: evaluation.deviation,
        measuringLength: span,
        local,
        straightness: { reference, line: evaluation.line, ...shape },
        direction: { observed: shape.shape, against, pass: against <= resolution + ABSOLUTE_NOISE },
        warnings,
      };
    }
    case "range-along": {
      const window = test.overAnyWindow;
      const whole = { value: range(sorted), from: sorted[0]!.x, to: sorted[sorted.length - 1]!.x };
      const worst = window !== undefined ? (worstRangeOver(sorted, window) ?? whole) : whole;
      const local = test.local ? worstRangeOver(sorted, test.local.window) : undefined;
      return {
        value: worst.value,
        measuringLength: window !== undefined ? Math.min(span, window) : span,
        local,
        window: { from: worst.from, to: worst.to },
        direction: UNSIGNED_DIRECTION,
        warnings,
      };
    }
    case "squareness": {
      // Departure from square over the travel: least-squares slope times the length (ISO 230-1, from memory).
      const { line } = straightnessEvaluation(sorted, "least-squares");
      const value = line.slope * span;
      return {
        value,
        measuringLength: span,
        local: undefined,
        direction: signedDirection(value, allowed, resolution),
        warnings,
      };
    }
    default:
      throw new GeometryInputError(`Test ${test.code} does not take readings along a travel.`, ["kind"]);
  }
}

/** Scores one test of a profile from its measurement (metric units). */
export function evaluateTest(
  test: ProfileTest,
  measurement: TestMeasurement,
  conditions?: Conditions,
  rules: TestRules = {},
): TestResult {
  const kinds = KINDS_FOR_METHOD[test.method];
  if (!kinds.includes(measurement?.kind)) {
    throw new GeometryInputError(
      `${test.code} (${test.title}) takes ${kinds.map((k) => `"${k}"`).join(" or ")} readings, ` +
        `not "${String(measurement?.kind)}".`,
      ["kind"],
    );
  }
  if (measurement.resolution !== undefined) {
    requirePositive(measurement.resolution, "The instrument resolution", ["resolution"]);
    requireMeasured(measurement.resolution, measurement.kind === "level" ? "tilt" : "reading", "The instrument resolution", ["resolution"]);
  }
  const resolution = measurement.resolution ?? null;
  const evaluated = evaluateReadings(test, measurement, resolution ?? 0);
  const tolerance = toleranceAt(test.tolerance, evaluated.measuringLength, test.measuringLength.nominal, rules);
  const direction: DirectionVerdict = { allowed: test.direction.allowed, ...evaluated.direction };
  const warnings: Warning[] = [...evaluated.warnings];

  let local: LocalResult | null = null;
  if (test.local && evaluated.local !== undefined) {
    if (evaluated.local === null) {
      warnings.push({
        code: "local-not-evaluated",
        message:
          `No two stations lie within ${test.local.window} mm of each other, so the local tolerance ` +
          `could not be checked; read more closely spaced stations.`,
      });
    } else {
      const ratio = evaluated.local.value / test.local.tolerance;
      local = {
        value: evaluated.local.value,
        window: test.local.window,
        tolerance: test.local.tolerance,
        ratio,
        pass: withinLimit(ratio, 1),
        from: evaluated.local.from,
        to: evaluated.local.to,
      };
    }
  }

  const mainRatio = Math.abs(evaluated.value) / tolerance;
  const ratio = Math.max(mainRatio, local?.ratio ?? 0);
  const pass = withinLimit(mainRatio, 1) && (local?.pass ?? true) && direction.pass;

  const finest = Math.min(tolerance, local?.tolerance ?? Infinity);
  if (resolution === null) {
    warnings.push({
      code: "resolution-missing",
      message:
        "No instrument resolution given: the direction rule is applied with no allowance and the ten-to-one rule " +
        "cannot be checked; give the instrument's smallest reading step.",
    });
  } else if (resolution > finest / 10 + ABSOLUTE_NOISE && !(rules.leastCount && resolution <= rules.leastCount.value + ABSOLUTE_NOISE)) {
    // An instrument as fine as the profile's least count is enough, whatever the ten-to-one rule asks.
    warnings.push({
      code: "resolution-coarse",
      message:
        `The instrument reads in steps of ${resolution} ${test.unit}, coarser than a tenth of the ` +
        `${finest} ${test.unit} tolerance (ten-to-one rule, common practice); a finer instrument is advised.`,
    });
  }
  warnings.push(...conditionWarnings(conditions));

  return {
    code: test.code,
    title: test.title,
    required: test.required,
    method: test.method,
    unit: test.unit,
    value: evaluated.value,
    measuringLength: evaluated.measuringLength,
    tolerance,
    ratio,
    pass,
    direction,
    local,
    ...(evaluated.straightness ? { straightness: evaluated.straightness } : {}),
    ...(evaluated.window ? { window: evaluated.window } : {}),
    ...(evaluated.flatness ? { flatness: evaluated.flatness } : {}),
    ...(evaluated.positioning ? { positioning: evaluated.positioning } : {}),
    ...(evaluated.circular ? { circular: evaluated.circular } : {}),
    resolution,
    warnings,
    sources: {
      tolerance: sourceLabel(test.tolerance.source),
      ...(test.local ? { local: sourceLabel(test.local.source) } : {}),
      direction: sourceLabel(test.direction.source),
    },
    confidence: {
      tolerance: test.tolerance.source.confidence,
      ...(test.local ? { local: test.local.source.confidence } : {}),
      direction: test.direction.source.confidence,
    },
  };
}
