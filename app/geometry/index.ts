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
  profileShape,
  localStraightness,
  STRAIGHTNESS_REFERENCES,
  type ProfilePoint,
  type ProfileShape,
  type ReferenceLine,
  type StraightnessEvaluation,
  type StraightnessReference,
} from "./straightness";
export { toleranceOver, type ProportionalRule } from "./tolerance";
export { evaluateTest, toleranceAt, KINDS_FOR_METHOD } from "./acceptance-tests";
export { scoreReport, gradeOf, type GradedOutcome } from "./report";
export {
  PROFILES,
  CENTRE_LATHE_NORMAL,
  CENTRE_LATHE_PRECISION,
  getProfile,
  latestProfile,
  suggestProfile,
} from "./profiles";
export { toMetric, scoreEvaluation, type EvaluationRequest, type EvaluationResponse, type Units } from "./evaluate";
export {
  evaluationRequestSchema,
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
  fieldErrors,
  type EvaluationRequestInput,
} from "./schema";
export type * from "./types";
export { MEASUREMENT_LIMITS, beyondLimit, measurementLimitIssues, type Quantity } from "./limits";
