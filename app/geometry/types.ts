import type { ProfileShape, ReferenceLine, StraightnessReference } from "./straightness";

// ---------------------------------------------------------------------------------------------
// Tolerance profiles (data; see profiles.ts)
// ---------------------------------------------------------------------------------------------

/** Where a value comes from, in GEOMETRY.md's words: a published source, "common practice" or "from memory". */
export type SourceLabel = string;

export type ToleranceSpec =
  /** One tolerance whatever the measuring length (run-out, axial slip, centre height). */
  | { type: "fixed"; tolerance: number; source: SourceLabel }
  /** T over L0, applied over the measured length by proportion and clamped (ISO 230-1, from memory). */
  | { type: "proportional"; tolerance: number; over: number; minimum: number; maximum?: number; source: SourceLabel }
  /** A tolerance per band of measuring length, e.g. by distance between centres. */
  | { type: "stepped"; steps: readonly { upTo: number; tolerance: number }[]; source: SourceLabel };

/** A tolerance that holds over any window of `window` mm inside the travel. */
export interface LocalToleranceSpec {
  tolerance: number;
  window: number;
  source: SourceLabel;
}

/** How the readings of a test become its value. */
export type EvaluationMethod =
  | "run-out" // max − min over a revolution
  | "straightness" // band width about a reference line, with shape
  | "range-along" // max − min of readings along a travel (optionally over any window)
  | "squareness" // signed departure from square over the travel (least-squares slope × length)
  | "level-range" // max − min of level tilts along the travel, µm/m
  | "mandrel-inclination" // mean(far) − mean(near), 0° and 180°
  | "near-far" // far − near, element that does not turn
  | "centre-height"; // tailstock end − headstock end

/** "any": the value has no sign (run-out); "either": signed, both ways allowed. */
export type AllowedDirection = "any" | "either" | "positive" | "convex" | "concave";

export interface ProfileTest {
  /** Our own code, e.g. "L-BED-V". */
  code: string;
  title: string;
  /** What is measured, in the trade's words. */
  measures: string;
  instrument: string;
  measuringLength: { nominal: number | null; description: string };
  tolerance: ToleranceSpec;
  local?: LocalToleranceSpec;
  method: EvaluationMethod;
  /** Default reference line for straightness tests; a measurement may choose another. */
  reference?: StraightnessReference;
  /** For range-along: the value is the worst range over any window of this many mm. */
  overAnyWindow?: number;
  direction: { allowed: AllowedDirection; positive: string; source: SourceLabel };
  unit: "µm" | "µm/m";
  required: boolean;
}

export type KeyFigureName =
  | "spindleRunOut"
  | "axialSlip"
  | "spindleParallelismVertical"
  | "spindleParallelismHorizontal"
  | "centreHeight"
  | "bedStraightness";

export type MachineCategory = "centre-lathe" | "toolroom-lathe";

export interface ToleranceProfile {
  key: string;
  version: number;
  title: string;
  category: MachineCategory;
  accuracyClass: "normal" | "precision";
  scope: { swingMaxMm: number; betweenCentresMaxMm: number; source: SourceLabel };
  minimumTolerance: { value: number; source: SourceLabel };
  /** Which test supplies each key figure. */
  keyFigures: Readonly<Record<KeyFigureName, string>>;
  tests: readonly ProfileTest[];
}

// ---------------------------------------------------------------------------------------------
// Measurements (metric: stations and lengths in mm, readings and resolution in µm)
// ---------------------------------------------------------------------------------------------

export interface Conditions {
  /** Ambient temperature during the tests; the reference temperature is 20 °C (ISO 1:2016). */
  ambientTemperatureC?: number;
  /** Minutes the spindle ran before the tests. */
  warmUpMinutes?: number;
  /** Whether the machine was levelled before the tests. */
  levelled?: boolean;
}

interface MeasurementBase {
  /** Smallest step the instrument reads, µm (µm/m for a level). */
  resolution?: number;
}

/** Indicator readings over at least one revolution. */
export interface SweepMeasurement extends MeasurementBase {
  kind: "sweep";
  readings: number[];
}

/** Only the highest and lowest indicator reading over a revolution. */
export interface ExtremesMeasurement extends MeasurementBase {
  kind: "extremes";
  max: number;
  min: number;
}

/** Readings (µm) at stations (mm) along a travel. */
export interface ProfileMeasurement extends MeasurementBase {
  kind: "profile";
  points: { station: number; reading: number }[];
  reference?: StraightnessReference;
}

/** Level tilts (µm/m, the same number as µin/in) at stations (mm) along a travel. */
export interface LevelMeasurement extends MeasurementBase {
  kind: "level";
  points: { station: number; reading: number }[];
}

/** Test mandrel in the spindle: indicator near the nose and at the far end, spindle at 0° and 180°. */
export interface MandrelMeasurement extends MeasurementBase {
  kind: "mandrel";
  near: { at0: number; at180: number };
  far: { at0: number; at180: number };
  /** Distance between the near and far readings, mm; the profile's measuring length when omitted. */
  length?: number;
}

/** An element that does not turn (tailstock sleeve): indicator near and far. */
export interface NearFarMeasurement extends MeasurementBase {
  kind: "near-far";
  near: number;
  far: number;
  length?: number;
}

/** Test mandrel between centres, indicator read at both ends in the vertical plane. */
export interface CentreHeightMeasurement extends MeasurementBase {
  kind: "centre-height";
  headstockEnd: number;
  tailstockEnd: number;
}

export type TestMeasurement =
  | SweepMeasurement
  | ExtremesMeasurement
  | ProfileMeasurement
  | LevelMeasurement
  | MandrelMeasurement
  | NearFarMeasurement
  | CentreHeightMeasurement;

export type MeasurementKind = TestMeasurement["kind"];

export interface ReportMeasurements {
  /** Date of the tests, ISO 8601 (YYYY-MM-DD); it travels with the grade. */
  measuredOn?: string;
  conditions?: Conditions;
  /** Keyed by the profile's test code. */
  tests: Record<string, TestMeasurement>;
}

// ---------------------------------------------------------------------------------------------
// Results
// ---------------------------------------------------------------------------------------------

export type WarningCode =
  | "resolution-missing"
  | "resolution-coarse"
  | "temperature-missing"
  | "warm-up-missing"
  | "levelling-missing"
  | "local-not-evaluated"
  | "few-stations";

export interface Warning {
  code: WarningCode;
  message: string;
}

export type ObservedDirection = "positive" | "negative" | "none" | ProfileShape | "not-applicable";

export interface DirectionVerdict {
  allowed: AllowedDirection;
  observed: ObservedDirection;
  /** How far the readings go the disallowed way, µm (0 when they do not). */
  against: number;
  pass: boolean;
}

export interface LocalResult {
  value: number;
  window: number;
  tolerance: number;
  ratio: number;
  pass: boolean;
  /** Stations (mm) of the worst window. */
  from: number;
  to: number;
}

export interface TestResult {
  code: string;
  title: string;
  required: boolean;
  method: EvaluationMethod;
  unit: "µm" | "µm/m";
  /** Signed for directional tests (inclination, centre height, squareness), otherwise ≥ 0. */
  value: number;
  /** The length actually measured, mm; null when the tolerance does not depend on length. */
  measuringLength: number | null;
  /** The tolerance at the actual measuring length. */
  tolerance: number;
  /** Worst of |value| / tolerance and the local ratio. */
  ratio: number;
  pass: boolean;
  direction: DirectionVerdict;
  local: LocalResult | null;
  straightness?: {
    reference: StraightnessReference;
    line: ReferenceLine;
    shape: ProfileShape;
    above: number;
    below: number;
  };
  /** For a range over any window: the stations (mm) of the worst window. */
  window?: { from: number; to: number };
  resolution: number | null;
  warnings: Warning[];
  sources: { tolerance: SourceLabel; local?: SourceLabel; direction: SourceLabel };
}

export type Grade = "A" | "B" | "C" | "D" | "incomplete";

export type KeyFigures = Record<KeyFigureName, number | null>;

export interface ReportScore {
  profile: { key: string; version: number; title: string };
  measuredOn: string | null;
  grade: Grade;
  /** Worst ratio over the graded tests (null when none was measured). */
  worstRatio: number | null;
  keyFigures: KeyFigures;
  /** Required test codes with no reading. */
  missing: string[];
  /** Codes of graded tests out of tolerance or failing their direction rule. */
  outOfTolerance: string[];
  results: TestResult[];
  warnings: Warning[];
}
