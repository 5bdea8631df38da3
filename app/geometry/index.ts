// The geometry engine: pure, deterministic, no I/O. Lengths along a travel in mm; deviations and
// tolerances in µm. The same code scores on the server and previews in the browser.
export { GeometryInputError } from "./errors";
export {
  inchesToMicrometres,
  micrometresToInches,
  inchesToMillimetres,
  millimetresToInches,
  MICROMETRES_PER_INCH,
  MILLIMETRES_PER_INCH,
} from "./units";
export { totalIndicatorReading, mandrelInclination, type MandrelReadings } from "./indicator";
export {
  straightnessDeviation,
  straightnessEvaluation,
  straightnessReferenceLine,
  profileShape,
  localStraightness,
  STRAIGHTNESS_REFERENCES,
  type ProfilePoint,
  type ProfileShape,
  type ReferenceLine,
  type StraightnessEvaluation,
  type StraightnessReference,
} from "./straightness";
export { toleranceOver, roundToStep, type ProportionalRule } from "./tolerance";
export { evaluateTest, toleranceAt, KINDS_FOR_METHOD, type TestRules } from "./acceptance-tests";
export { scoreReport, gradeOf, type GradedOutcome } from "./report";
export {
  BUILT_IN_PROFILES,
  CENTRE_LATHE_NORMAL,
  CENTRE_LATHE_PRECISION,
  CENTRE_LATHE_PRECISION_V1,
  KNEE_MILL_NORMAL,
  SURFACE_GRINDER_NORMAL,
  CNC_LATHE_NORMAL,
  MACHINING_CENTRE_NORMAL,
  findProfile,
  newestVersions,
  makerChartFits,
  sizeFits,
  suggestProfile,
} from "./profiles";
export {
  toleranceProfileSchema,
  profileTestSchema,
  profileSettingsSchema,
  valueSourceSchema,
  compareSerials,
  MACHINE_CATEGORIES,
  MACHINE_DIMENSIONS,
  EVALUATION_METHODS,
  ALLOWED_DIRECTIONS,
  KEY_FIGURE_NAMES,
  PROFILE_LIMITS,
} from "./profile-schema";
export { sourceLabel, confidenceOfLabel, testsScoredFromMemory, CONFIDENCE_LABELS, SOURCE_CONFIDENCES } from "./sources";
export { toMetric, scoreEvaluation, type EvaluationRequest, type EvaluationResponse, type Units } from "./evaluate";
export {
  evaluationRequestSchemaFor,
  keyedByTestCode,
  reportMeasurementsSchema,
  testMeasurementSchema,
  conditionsSchema,
  unitsSchema,
  sweepMeasurementSchema,
  extremesMeasurementSchema,
  profileMeasurementSchema,
  levelMeasurementSchema,
  mandrelMeasurementSchema,
  nearFarMeasurementSchema,
  centreHeightMeasurementSchema,
  positioningMeasurementSchema,
  circularMeasurementSchema,
  fieldErrors,
  type EvaluationRequestInput,
} from "./schema";
export type * from "./types";
export { MEASUREMENT_LIMITS, beyondLimit, measurementLimitIssues, numbersOf, type Quantity } from "./limits";
export {
  flatnessDeviation,
  flatnessEvaluation,
  FLATNESS_REFERENCES,
  FLATNESS_LIMITS,
  type FlatnessEvaluation,
  type FlatnessReference,
  type SurfacePoint,
} from "./flatness";
export {
  levelGridHeights,
  UNION_JACK_LINES,
  type LevelGrid,
  type LevelGridHeights,
  type RowsColumnsLevelGrid,
  type UnionJackLevelGrid,
  type UnionJackLine,
} from "./level-grid";
export { squarenessOfTravels, travelSlope, type SquarenessEvaluation, type TravelReading } from "./squareness";
export { parallelismToTravel, type ParallelismEvaluation } from "./parallelism";
export {
  positioningAccuracy,
  POSITIONING_LIMITS,
  type PositioningAtTarget,
  type PositioningEvaluation,
  type PositioningInput,
} from "./positioning";
export { circularTest, CIRCULAR_LIMITS, type CircularEvaluation, type RadialReading } from "./circular";
export { parseDeviationCsv, DEVIATION_CSV_LIMITS, type DeviationColumns } from "./deviation-csv";
export { parseRadialCsv, RADIAL_CSV_LIMITS, type RadialColumns } from "./radial-csv";
export * from "./corrections";
export { positioningGroups } from "./profiles-cnc";
