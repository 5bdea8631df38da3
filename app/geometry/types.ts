import type { FlatnessReference } from "./flatness";
import type { ProfileShape, ReferenceLine, StraightnessReference } from "./straightness";

// ---------------------------------------------------------------------------------------------
// Tolerance profiles (data; see profiles.ts)
// ---------------------------------------------------------------------------------------------

/**
 * How far a value can be trusted, in GEOMETRY.md's words: read in a published standard, taken from the
 * machine maker's own acceptance chart, a fact of the trade with no single source, or recalled.
 */
export type SourceConfidence = "published" | "manufacturer" | "common-practice" | "from-memory";

/**
 * Where a value comes from. `document` is the standard ("IS 6040"), the maker's chart's title, or what a
 * recalled value was recalled from; `edition` the standard's year; `clause` "clause 3.5" or "test G4".
 */
export interface ValueSource {
  confidence: SourceConfidence;
  document?: string;
  edition?: string;
  clause?: string;
  note?: string;
}

/** A source as one line a reader can follow, e.g. "IS 6040:1993, clause 3.5" (see sources.ts). */
export type SourceLabel = string;

export type ToleranceSpec =
  /** One tolerance whatever the measuring length (run-out, axial slip, centre height). */
  | { type: "fixed"; tolerance: number; source: ValueSource }
  /** T over L0, applied over the measured length by proportion and clamped (ISO 230-1, from memory). */
  | { type: "proportional"; tolerance: number; over: number; minimum: number; maximum?: number; source: ValueSource }
  /** A tolerance per band of measuring length, e.g. by distance between centres. */
  | { type: "stepped"; steps: readonly { upTo: number; tolerance: number }[]; source: ValueSource };

/** A tolerance that holds over any window of `window` mm inside the travel. */
export interface LocalToleranceSpec {
  tolerance: number;
  window: number;
  source: ValueSource;
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
  | "centre-height" // tailstock end − headstock end
  | "flatness" // width of the zone holding a surface's heights (least squares or minimum zone)
  | "positioning-accuracy" // A of one NC axis from interferometer runs (ISO 230-2)
  | "positioning-repeatability" // R of the same runs
  | "positioning-reversal" // B of the same runs
  | "circular-deviation"; // circular deviation of two interpolating axes, both directions (ISO 230-4)

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
  direction: { allowed: AllowedDirection; positive: string; source: ValueSource };
  unit: "µm" | "µm/m";
  required: boolean;
}

export type KeyFigureName =
  | "spindleRunOut"
  | "axialSlip"
  | "spindleParallelismVertical"
  | "spindleParallelismHorizontal"
  | "centreHeight"
  | "bedStraightness"
  | "tableFlatness"
  | "travelSquareness"
  | "xPositioningAccuracy"
  | "xRepeatability"
  | "yPositioningAccuracy"
  | "yRepeatability"
  | "zPositioningAccuracy"
  | "zRepeatability";

/** Machine kinds the engine has evaluation methods for; a new kind is a new entry here plus its profiles. */
export type MachineCategory = "centre-lathe" | "toolroom-lathe" | "milling-machine" | "surface-grinder" | "cnc-lathe" | "machining-centre";

/** Sizes a profile's scope can be bounded by, in mm, named as the listing names them. */
export type MachineDimension = "swingOverBedMm" | "distanceBetweenCentresMm" | "tableLengthMm";

/** The machine a report is for, as far as choosing a profile needs it. */
export interface MachineForProfile {
  category: MachineCategory;
  /** A size left out (unknown) is not checked against the scope. */
  dimensions: Partial<Record<MachineDimension, number | null>>;
  make?: string | null;
  model?: string | null;
  serialNumber?: string | null;
}

/** A maker's own acceptance chart covers one make and model, optionally only a range of serial numbers. */
export interface MakerScope {
  make: string;
  model: string;
  serialFrom?: string;
  serialTo?: string;
  /** The chart's title as printed, e.g. "Acceptance test chart shipped with the machine, form 12". */
  chart: string;
}

export interface ProfileScope {
  /** Largest machine covered, per dimension (mm). */
  limits: readonly { dimension: MachineDimension; maxMm: number }[];
  maker?: MakerScope;
  source: ValueSource;
}

/**
 * Rules of the profile as a whole. `rounding`: proportional tolerances are rounded to the nearest `step`
 * µm (before the minimum is applied). `leastCount`: an instrument reading this finely needs no finer one,
 * so it draws no resolution warning even where the ten-to-one rule would ask for more.
 */
export interface ProfileRules {
  minimumTolerance: { value: number; source: ValueSource };
  rounding?: { step: number; source: ValueSource };
  leastCount?: { value: number; source: ValueSource };
}

export interface ToleranceProfile {
  key: string;
  version: number;
  title: string;
  category: MachineCategory;
  accuracyClass: "normal" | "precision";
  scope: ProfileScope;
  rules: ProfileRules;
  /** Which test supplies each key figure; a category without some figure leaves it out. */
  keyFigures: Readonly<Partial<Record<KeyFigureName, string>>>;
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

/** Heights (µm) at places (x, y mm) over a surface, e.g. a grid read with a level and summed (levelGridHeights). */
export interface SurfaceMeasurement extends MeasurementBase {
  kind: "surface";
  points: { x: number; y: number; z: number }[];
  reference?: FlatnessReference;
}

/**
 * Interferometer runs along one numerically controlled axis: targets (mm, strictly increasing) and the
 * deviation (actual − target, µm) at each target in each run, approaching in the positive (forward) and the
 * negative (reverse) direction. The same runs score an axis's accuracy, repeatability and reversal tests.
 */
export interface PositioningMeasurement extends MeasurementBase {
  kind: "positioning";
  targets: number[];
  forward: number[][];
  reverse: number[][];
}

/** Radial deviations (µm) at angles (degrees) around a circle, clockwise and counter-clockwise. */
export interface CircularMeasurement extends MeasurementBase {
  kind: "circular";
  clockwise: { angle: number; deviation: number }[];
  counterClockwise: { angle: number; deviation: number }[];
}

export type TestMeasurement =
  | SweepMeasurement
  | ExtremesMeasurement
  | ProfileMeasurement
  | LevelMeasurement
  | MandrelMeasurement
  | NearFarMeasurement
  | CentreHeightMeasurement
  | SurfaceMeasurement
  | PositioningMeasurement
  | CircularMeasurement;

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
  flatness?: {
    reference: FlatnessReference;
    /** The reference plane: z = slopeX·x + slopeY·y + offset (µm, mm). */
    plane: { slopeX: number; slopeY: number; offset: number };
    /** Highest and lowest height above the plane, µm. */
    above: number;
    below: number;
  };
  /** Positioning tests: the ISO 230-2 figures of the axis (µm) and, per target, what the plot draws. */
  positioning?: {
    accuracy: number;
    systematicDeviation: number;
    repeatability: number;
    reversalValue: number;
    meanReversalValue: number;
    runsForward: number;
    runsReverse: number;
    perTarget: { target: number; meanForward: number; meanReverse: number; sForward: number; sReverse: number }[];
  };
  /** Circular tests: the deviation of each direction and the hysteresis (µm). */
  circular?: {
    circularDeviationClockwise: number;
    circularDeviationCounterClockwise: number;
    circularHysteresis: number;
  };
  /** For a range over any window: the stations (mm) of the worst window. */
  window?: { from: number; to: number };
  resolution: number | null;
  warnings: Warning[];
  /** Where the tolerance, the local tolerance and the direction rule come from, as readable lines. */
  sources: { tolerance: SourceLabel; local?: SourceLabel; direction: SourceLabel };
  /** How far each of those can be trusted. */
  confidence: { tolerance: SourceConfidence; local?: SourceConfidence; direction: SourceConfidence };
}

export type Grade = "A" | "B" | "C" | "D" | "incomplete";

export type KeyFigures = Record<KeyFigureName, number | null>;

export interface ReportScore {
  profile: { key: string; version: number; title: string; makersChart?: string };
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
