// Positioning accuracy (ISO 230-2's figures as publicly described, from memory): the worked example in
// docs/positioning-worked-example.md by hand, means and standard deviations against simple-statistics
// (general-purpose statistics library from npm), invariants of the definitions, and refused inputs.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { mean, sampleStandardDeviation } from "simple-statistics";
import { GeometryInputError, positioningAccuracy } from "~/geometry";

const example = {
  targets: [0, 100, 200, 300, 400],
  forward: [
    [1, 5.5, 5, -1, -0.5],
    [2, 4.5, 1, 0, 2.5],
    [3, 5, 3, -2, 2.5],
    [3, 5.5, 1, -2, 1],
    [1, 4.5, 5, 0, -0.5],
  ],
  reverse: [
    [-2, 2, 0, -6, -3],
    [-1.5, 0, 2, -2, -4],
    [-2.5, 1, 2, -4, -2],
    [-1.5, 0, 1, -2, -2],
    [-2.5, 2, 0, -6, -4],
  ],
};

describe("positioningAccuracy: worked example (docs/positioning-worked-example.md, by hand)", () => {
  const result = positioningAccuracy(example);

  it("per target: means, standard deviations, reversal and repeatability (steps 1–3)", () => {
    const rows = result.perTarget;
    expect(rows.map((r) => r.meanForward)).toEqual([2, 5, 3, -1, 1].map((v) => expect.closeTo(v, 12)));
    expect(rows.map((r) => r.meanReverse)).toEqual([-2, 1, 1, -4, -3].map((v) => expect.closeTo(v, 12)));
    expect(rows.map((r) => r.sForward)).toEqual([1, 0.5, 2, 1, 1.5].map((v) => expect.closeTo(v, 12)));
    expect(rows.map((r) => r.sReverse)).toEqual([0.5, 1, 1, 2, 1].map((v) => expect.closeTo(v, 12)));
    expect(rows.map((r) => r.reversal)).toEqual([4, 4, 2, 3, 4].map((v) => expect.closeTo(v, 12)));
    expect(rows.map((r) => r.repeatability)).toEqual([7, 7, 8, 9, 9].map((v) => expect.closeTo(v, 12)));
  });

  it("axis figures (step 4)", () => {
    const figures = {
      accuracy: 15,
      accuracyForward: 10,
      accuracyReverse: 11,
      systematicDeviation: 9,
      systematicDeviationForward: 6,
      systematicDeviationReverse: 5,
      meanDeviationRange: 5.5,
      repeatability: 9,
      repeatabilityForward: 8,
      repeatabilityReverse: 8,
      reversalValue: 4,
      meanReversalValue: 3.4,
    };
    for (const [name, value] of Object.entries(figures)) {
      expect(result[name as keyof typeof figures], name).toBeCloseTo(value, 10);
    }
    expect(result.warnings).toEqual([]);
  });

  it("warns below 5 runs or 5 targets but still computes", () => {
    const fewRuns = positioningAccuracy({ ...example, forward: example.forward.slice(0, 3) });
    expect(fewRuns.warnings).toHaveLength(1);
    expect(fewRuns.warnings[0]).toMatch(/3 runs/);
    const fewTargets = positioningAccuracy({
      targets: example.targets.slice(0, 3),
      forward: example.forward.map((run) => run.slice(0, 3)),
      reverse: example.reverse.map((run) => run.slice(0, 3)),
    });
    expect(fewTargets.warnings.some((w) => /3 targets/.test(w))).toBe(true);
  });

  it("reversal sign: swapping the directions flips mean B and keeps B", () => {
    const swapped = positioningAccuracy({ ...example, forward: example.reverse, reverse: example.forward });
    expect(swapped.meanReversalValue).toBeCloseTo(-3.4, 10);
    expect(swapped.reversalValue).toBeCloseTo(4, 10);
    expect(swapped.accuracy).toBeCloseTo(15, 10);
  });
});

const axisRuns = fc
  .record({ targets: fc.integer({ min: 2, max: 12 }), up: fc.integer({ min: 2, max: 8 }), down: fc.integer({ min: 2, max: 8 }) })
  .chain(({ targets, up, down }) => {
    const value = fc.double({ min: -500, max: 500, noNaN: true, noDefaultInfinity: true });
    const run = fc.array(value, { minLength: targets, maxLength: targets });
    return fc.record({
      targets: fc.constant(Array.from({ length: targets }, (_, i) => i * 50)),
      forward: fc.array(run, { minLength: up, maxLength: up }),
      reverse: fc.array(run, { minLength: down, maxLength: down }),
    });
  });

describe("positioningAccuracy: properties", () => {
  it("means and standard deviations match simple-statistics (mean, sampleStandardDeviation)", () => {
    fc.assert(
      fc.property(axisRuns, (input) => {
        const result = positioningAccuracy(input);
        result.perTarget.forEach((row, i) => {
          const up = input.forward.map((run) => run[i]!);
          const down = input.reverse.map((run) => run[i]!);
          expect(row.meanForward).toBeCloseTo(mean(up), 8);
          expect(row.meanReverse).toBeCloseTo(mean(down), 8);
          expect(row.sForward).toBeCloseTo(sampleStandardDeviation(up), 8);
          expect(row.sReverse).toBeCloseTo(sampleStandardDeviation(down), 8);
          expect(row.reversal).toBeCloseTo(mean(up) - mean(down), 8);
        });
      }),
    );
  });

  it("invariants: E ≤ A, E↑ ≤ A↑, E↓ ≤ A↓, R↑ ≤ R, R↓ ≤ R, |mean B| ≤ B, M ≤ E, all figures ≥ 0", () => {
    fc.assert(
      fc.property(axisRuns, (input) => {
        const r = positioningAccuracy(input);
        const slack = 1e-9;
        expect(r.systematicDeviation).toBeLessThanOrEqual(r.accuracy + slack);
        expect(r.systematicDeviationForward).toBeLessThanOrEqual(r.accuracyForward + slack);
        expect(r.systematicDeviationReverse).toBeLessThanOrEqual(r.accuracyReverse + slack);
        expect(r.repeatabilityForward).toBeLessThanOrEqual(r.repeatability + slack);
        expect(r.repeatabilityReverse).toBeLessThanOrEqual(r.repeatability + slack);
        expect(Math.abs(r.meanReversalValue)).toBeLessThanOrEqual(r.reversalValue + slack);
        expect(r.meanDeviationRange).toBeLessThanOrEqual(r.systematicDeviation + slack);
        expect(Math.max(r.accuracyForward, r.accuracyReverse)).toBeLessThanOrEqual(r.accuracy + slack);
        for (const figure of [r.accuracy, r.systematicDeviation, r.repeatability, r.reversalValue, r.meanDeviationRange]) {
          expect(figure).toBeGreaterThanOrEqual(0);
        }
      }),
    );
  });

  it("a shift of every reading by a constant leaves A, E, M, R and B unchanged", () => {
    fc.assert(
      fc.property(axisRuns, fc.integer({ min: -100, max: 100 }), (input, shift) => {
        const a = positioningAccuracy(input);
        const b = positioningAccuracy({
          targets: input.targets,
          forward: input.forward.map((run) => run.map((v) => v + shift)),
          reverse: input.reverse.map((run) => run.map((v) => v + shift)),
        });
        for (const name of ["accuracy", "systematicDeviation", "meanDeviationRange", "repeatability", "reversalValue"] as const) {
          expect(b[name]).toBeCloseTo(a[name], 6);
        }
      }),
    );
  });
});

describe("positioningAccuracy: refused input", () => {
  const refuses = (input: unknown, message: RegExp) => {
    const run = () => positioningAccuracy(input as Parameters<typeof positioningAccuracy>[0]);
    expect(run).toThrow(GeometryInputError);
    expect(run).toThrow(message);
  };

  it("fewer than 2 runs in a direction", () => {
    refuses({ ...example, forward: [example.forward[0]] }, /at least 2 runs/);
    refuses({ ...example, reverse: [] }, /at least 2 runs/);
  });

  it("ragged runs", () => {
    refuses({ ...example, reverse: [...example.reverse.slice(0, 4), [1, 2, 3]] }, /run 5 has 3 deviations for 5 targets/);
  });

  it("targets not strictly increasing", () => {
    refuses({ ...example, targets: [0, 100, 100, 300, 400] }, /strictly increasing/);
    refuses({ ...example, targets: [400, 300, 200, 100, 0] }, /strictly increasing/);
  });

  it("non-finite values, with the path of the bad reading", () => {
    for (const bad of [NaN, Infinity, -Infinity]) {
      const forward = example.forward.map((run) => [...run]);
      forward[2]![3] = bad;
      try {
        positioningAccuracy({ ...example, forward });
        expect.unreachable();
      } catch (error) {
        expect(error).toBeInstanceOf(GeometryInputError);
        expect((error as GeometryInputError).path).toEqual(["forward", 2, 3]);
      }
    }
    refuses({ ...example, targets: [0, 100, NaN, 300, 400] }, /finite/);
    refuses({ ...example, forward: example.forward.map((run) => run.map(String)) }, /finite/);
  });

  it("sizes beyond the limits", () => {
    const targets = Array.from({ length: 1_001 }, (_, i) => i);
    const run = targets.map(() => 0);
    refuses({ targets, forward: [run, run], reverse: [run, run] }, /At most 1000 targets/);
    const many = Array.from({ length: 21 }, () => example.forward[0]!);
    refuses({ ...example, forward: many }, /at most 20 runs/);
  });

  it("not lists", () => {
    refuses(null, /object/);
    refuses({ ...example, targets: "0,100" }, /list/);
    refuses({ ...example, forward: { 0: [1] } }, /list of runs/);
  });
});
