// Positioning accuracy and repeatability of one numerically controlled axis from repeated runs of a laser
// interferometer (ISO 230-2's method). The formulas are ISO 230-2's as publicly described (from memory: the
// standard's own text was not at hand to check them word for word); docs/positioning-worked-example.md works
// one example by hand.
//
// Notation (µm): x̄↑i, x̄↓i the mean deviation at target i approaching in the positive / negative direction,
// s↑i, s↓i their sample standard deviations (n − 1), Bi = x̄↑i − x̄↓i the reversal value at target i.
import { GeometryInputError } from "./errors";
import { requireMeasured } from "./limits";

export const POSITIONING_LIMITS = {
  /** Targets along the axis: one every millimetre over a metre of travel. */
  targets: 1_000,
  /** Runs per direction: the standard asks for 5; a long acceptance test rarely takes more than 10. */
  runsPerDirection: 20,
  /** Below these counts the figures are computed but flagged (the standard's usual minimum, from memory). */
  usualRuns: 5,
  usualTargets: 5,
} as const;

export interface PositioningInput {
  /** Target positions along the axis, mm, strictly increasing. */
  targets: number[];
  /** forward[j][i]: deviation (actual − target, µm) at target i in run j approaching in the positive direction. */
  forward: number[][];
  /** reverse[j][i]: the same approaching in the negative direction. */
  reverse: number[][];
}

export interface PositioningAtTarget {
  target: number;
  meanForward: number;
  meanReverse: number;
  /** (x̄↑i + x̄↓i) / 2 */
  mean: number;
  sForward: number;
  sReverse: number;
  /** R↑i = 4 s↑i */
  repeatabilityForward: number;
  repeatabilityReverse: number;
  /** Ri = max(2s↑i + 2s↓i + |Bi|, R↑i, R↓i) */
  repeatability: number;
  /** Bi = x̄↑i − x̄↓i (signed) */
  reversal: number;
}

export interface PositioningEvaluation {
  /** A: max over both directions of (x̄ + 2s) − min over both of (x̄ − 2s). */
  accuracy: number;
  accuracyForward: number;
  accuracyReverse: number;
  /** E: max over both directions of x̄ − min over both of x̄. */
  systematicDeviation: number;
  systematicDeviationForward: number;
  systematicDeviationReverse: number;
  /** M: max x̄i − min x̄i. */
  meanDeviationRange: number;
  /** R = max Ri */
  repeatability: number;
  repeatabilityForward: number;
  repeatabilityReverse: number;
  /** B = max |Bi| (not signed). */
  reversalValue: number;
  /** Mean of Bi (signed: positive when the forward approach lands further along the axis). */
  meanReversalValue: number;
  /** Per-target figures, in target order, for plots. */
  perTarget: PositioningAtTarget[];
  /** Readable notes on inputs below the standard's usual counts; empty when none. */
  warnings: string[];
}

function requireRuns(runs: unknown, direction: "forward" | "reverse", targetCount: number): number[][] {
  const name = direction === "forward" ? "Runs approaching in the positive direction" : "Runs approaching in the negative direction";
  if (!Array.isArray(runs)) throw new GeometryInputError(`${name} must be a list of runs.`, [direction]);
  if (runs.length < 2) {
    throw new GeometryInputError(`${name}: at least 2 runs are needed for a standard deviation; got ${runs.length}.`, [direction]);
  }
  if (runs.length > POSITIONING_LIMITS.runsPerDirection) {
    throw new GeometryInputError(`${name}: at most ${POSITIONING_LIMITS.runsPerDirection} runs; got ${runs.length}.`, [direction]);
  }
  runs.forEach((run, j) => {
    if (!Array.isArray(run)) throw new GeometryInputError(`${name}: run ${j + 1} must be a list of deviations.`, [direction, j]);
    if (run.length !== targetCount) {
      throw new GeometryInputError(`${name}: run ${j + 1} has ${run.length} deviations for ${targetCount} targets.`, [direction, j]);
    }
    run.forEach((value, i) => requireMeasured(value, "reading", `${name}: run ${j + 1}, target ${i + 1}`, [direction, j, i]));
  });
  return runs as number[][];
}

/** Mean and sample standard deviation (n − 1) of column i; two passes so large offsets do not cancel. */
function columnStats(runs: number[][], i: number): { mean: number; s: number } {
  let sum = 0;
  for (const run of runs) sum += run[i]!;
  const mean = sum / runs.length;
  let squares = 0;
  for (const run of runs) squares += (run[i]! - mean) ** 2;
  return { mean, s: Math.sqrt(squares / (runs.length - 1)) };
}

const spread = (values: number[]) => Math.max(...values) - Math.min(...values);

/** ISO 230-2 figures of one axis (µm) from its interferometer runs. */
export function positioningAccuracy(input: { targets: number[]; forward: number[][]; reverse: number[][] }): PositioningEvaluation {
  if (input === null || typeof input !== "object") throw new GeometryInputError("Positioning readings must be an object.");
  const { targets } = input;
  if (!Array.isArray(targets)) throw new GeometryInputError("Targets must be a list of positions in mm.", ["targets"]);
  if (targets.length < 2) throw new GeometryInputError(`At least 2 targets are needed; got ${targets.length}.`, ["targets"]);
  if (targets.length > POSITIONING_LIMITS.targets) {
    throw new GeometryInputError(`At most ${POSITIONING_LIMITS.targets} targets; got ${targets.length}.`, ["targets"]);
  }
  targets.forEach((target, i) => {
    requireMeasured(target, "station", `Target ${i + 1}`, ["targets", i]);
    if (i > 0 && !(target > targets[i - 1]!)) {
      throw new GeometryInputError(`Targets must be strictly increasing: target ${i + 1} (${target} mm) follows ${targets[i - 1]} mm.`, ["targets", i]);
    }
  });
  const forward = requireRuns(input.forward, "forward", targets.length);
  const reverse = requireRuns(input.reverse, "reverse", targets.length);

  const perTarget: PositioningAtTarget[] = targets.map((target, i) => {
    const up = columnStats(forward, i);
    const down = columnStats(reverse, i);
    const reversal = up.mean - down.mean;
    const repeatabilityForward = 4 * up.s;
    const repeatabilityReverse = 4 * down.s;
    return {
      target,
      meanForward: up.mean,
      meanReverse: down.mean,
      mean: (up.mean + down.mean) / 2,
      sForward: up.s,
      sReverse: down.s,
      repeatabilityForward,
      repeatabilityReverse,
      repeatability: Math.max(2 * up.s + 2 * down.s + Math.abs(reversal), repeatabilityForward, repeatabilityReverse),
      reversal,
    };
  });

  const upperForward = perTarget.map((t) => t.meanForward + 2 * t.sForward);
  const lowerForward = perTarget.map((t) => t.meanForward - 2 * t.sForward);
  const upperReverse = perTarget.map((t) => t.meanReverse + 2 * t.sReverse);
  const lowerReverse = perTarget.map((t) => t.meanReverse - 2 * t.sReverse);
  const meansForward = perTarget.map((t) => t.meanForward);
  const meansReverse = perTarget.map((t) => t.meanReverse);

  const warnings: string[] = [];
  const fewestRuns = Math.min(forward.length, reverse.length);
  if (fewestRuns < POSITIONING_LIMITS.usualRuns) {
    warnings.push(`Only ${fewestRuns} runs in a direction; ISO 230-2 usually asks for ${POSITIONING_LIMITS.usualRuns}, so the repeatability is less certain.`);
  }
  if (targets.length < POSITIONING_LIMITS.usualTargets) {
    warnings.push(`Only ${targets.length} targets; ISO 230-2 usually asks for at least ${POSITIONING_LIMITS.usualTargets} along the travel.`);
  }

  return {
    accuracy: Math.max(...upperForward, ...upperReverse) - Math.min(...lowerForward, ...lowerReverse),
    accuracyForward: Math.max(...upperForward) - Math.min(...lowerForward),
    accuracyReverse: Math.max(...upperReverse) - Math.min(...lowerReverse),
    systematicDeviation: spread([...meansForward, ...meansReverse]),
    systematicDeviationForward: spread(meansForward),
    systematicDeviationReverse: spread(meansReverse),
    meanDeviationRange: spread(perTarget.map((t) => t.mean)),
    repeatability: Math.max(...perTarget.map((t) => t.repeatability)),
    repeatabilityForward: Math.max(...perTarget.map((t) => t.repeatabilityForward)),
    repeatabilityReverse: Math.max(...perTarget.map((t) => t.repeatabilityReverse)),
    reversalValue: Math.max(...perTarget.map((t) => Math.abs(t.reversal))),
    meanReversalValue: perTarget.reduce((sum, t) => sum + t.reversal, 0) / perTarget.length,
    perTarget,
    warnings,
  };
}
