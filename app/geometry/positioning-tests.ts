// Scoring the positioning tests of a numerically controlled axis and the circular test of two axes. One set of
// interferometer runs gives all of an axis's ISO 230-2 figures; each test of a profile grades one of them
// (accuracy A, repeatability R or reversal B) against its own tolerance, taken over the travel the targets
// span (tolerances of these tests are stated by travel length: common practice).
import { circularTest } from "./circular";
import { GeometryInputError } from "./errors";
import { positioningAccuracy } from "./positioning";
import type { CircularMeasurement, PositioningMeasurement, ProfileTest, TestResult, Warning } from "./types";

type PositioningFigures = NonNullable<TestResult["positioning"]>;

export function evaluatePositioning(
  test: ProfileTest,
  measurement: PositioningMeasurement,
): { value: number; measuringLength: number; positioning: PositioningFigures; warnings: Warning[] } {
  const evaluation = positioningAccuracy({ targets: measurement.targets, forward: measurement.forward, reverse: measurement.reverse });
  const value =
    test.method === "positioning-accuracy"
      ? evaluation.accuracy
      : test.method === "positioning-repeatability"
        ? evaluation.repeatability
        : test.method === "positioning-reversal"
          ? evaluation.reversalValue
          : null;
  if (value === null) throw new GeometryInputError(`Test ${test.code} does not take interferometer runs.`, ["kind"]);
  const targets = measurement.targets;
  return {
    value,
    measuringLength: targets[targets.length - 1]! - targets[0]!,
    positioning: {
      accuracy: evaluation.accuracy,
      systematicDeviation: evaluation.systematicDeviation,
      repeatability: evaluation.repeatability,
      reversalValue: evaluation.reversalValue,
      meanReversalValue: evaluation.meanReversalValue,
      runsForward: measurement.forward.length,
      runsReverse: measurement.reverse.length,
      perTarget: evaluation.perTarget.map((t) => ({ target: t.target, meanForward: t.meanForward, meanReverse: t.meanReverse, sForward: t.sForward, sReverse: t.sReverse })),
    },
    warnings: evaluation.warnings.map((message) => ({ code: "few-stations", message })),
  };
}

export function evaluateCircular(measurement: CircularMeasurement): { value: number; measuringLength: null; circular: NonNullable<TestResult["circular"]>; warnings: Warning[] } {
  const evaluation = circularTest({ clockwise: measurement.clockwise, counterClockwise: measurement.counterClockwise });
  return {
    value: evaluation.circularDeviation,
    measuringLength: null,
    circular: {
      circularDeviationClockwise: evaluation.circularDeviationClockwise,
      circularDeviationCounterClockwise: evaluation.circularDeviationCounterClockwise,
      circularHysteresis: evaluation.circularHysteresis,
    },
    warnings: [],
  };
}
