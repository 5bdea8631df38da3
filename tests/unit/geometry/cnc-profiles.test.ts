import { describe, expect, it } from "vitest";
import {
  BUILT_IN_PROFILES,
  CNC_LATHE_NORMAL,
  evaluationRequestSchemaFor,
  MACHINING_CENTRE_NORMAL,
  positioningAccuracy,
  positioningGroups,
  scoreEvaluation,
  scoreReport,
  suggestProfile,
  toleranceProfileSchema,
  type TestMeasurement,
  type ToleranceProfile,
} from "~/geometry";

/**
 * Runs along an axis: `targets` evenly over `travel` mm; each run reads a slope of `pitch` µm per 100 mm, the
 * reverse runs `backlash` µm lower, and run j adds the scatter ±`scatter` µm alternately.
 */
function runs(travel: number, pitch: number, backlash: number, scatter: number): Extract<TestMeasurement, { kind: "positioning" }> {
  const targets = [0, 1, 2, 3, 4, 5].map((i) => (travel * i) / 5);
  const run = (offset: number, j: number) => targets.map((t) => (pitch * t) / 100 + offset + (j % 2 === 0 ? scatter : -scatter));
  return { kind: "positioning", targets, forward: [0, 1, 2, 3, 4].map((j) => run(0, j)), reverse: [0, 1, 2, 3, 4].map((j) => run(-backlash, j)) };
}

const conditions = { ambientTemperatureC: 20, warmUpMinutes: 30, levelled: true };

function centreReadings(travel: number, pitch: number): Record<string, TestMeasurement> {
  const tests: Record<string, TestMeasurement> = {};
  for (const [axis, codes] of positioningGroups(MACHINING_CENTRE_NORMAL.tests)) {
    const measurement = runs(axis === "V-Z" ? 400 : travel, pitch, 3, 1);
    for (const code of codes) tests[code] = measurement;
  }
  return tests;
}

describe("CNC lathe and machining centre profiles", () => {
  it("are valid profiles in the built-in set, every tolerance labelled from memory, key figures on their tests", () => {
    for (const profile of [CNC_LATHE_NORMAL, MACHINING_CENTRE_NORMAL]) {
      expect(toleranceProfileSchema.safeParse(profile).success).toBe(true);
      expect(BUILT_IN_PROFILES).toContain(profile);
      for (const test of profile.tests) expect(test.tolerance.source.confidence).toBe("from-memory");
      for (const code of Object.values(profile.keyFigures)) expect(profile.tests.map((test) => test.code)).toContain(code);
    }
    expect([...positioningGroups(CNC_LATHE_NORMAL.tests).keys()]).toEqual(["C-X", "C-Z"]);
    expect([...positioningGroups(MACHINING_CENTRE_NORMAL.tests).keys()]).toEqual(["V-X", "V-Y", "V-Z"]);
  });

  it("grade each axis on A, R and B of one set of runs, with tolerances by the travel the targets span", () => {
    const score = scoreReport(MACHINING_CENTRE_NORMAL, { conditions, tests: centreReadings(500, 2) });
    const x = positioningAccuracy(runs(500, 2, 3, 1));
    // Expected figures from the engine's own ISO 230-2 method (checked by hand in docs/positioning-worked-example.md).
    expect(score.keyFigures.xPositioningAccuracy).toBeCloseTo(x.accuracy, 9);
    expect(score.keyFigures.xRepeatability).toBeCloseTo(x.repeatability, 9);
    const byCode = new Map(score.results.map((result) => [result.code, result]));
    // 500 mm travel: the first band (A 22, R 12, B 10 µm, from memory).
    expect(byCode.get("V-X-A")).toMatchObject({ measuringLength: 500, tolerance: 22 });
    expect(byCode.get("V-X-R")).toMatchObject({ tolerance: 12 });
    expect(byCode.get("V-X-B")).toMatchObject({ tolerance: 10, value: 3 });
    expect(byCode.get("V-X-A")?.positioning?.perTarget).toHaveLength(6);
    // A = 10 µm slope + 3 µm backlash + 4s; s of ±1 alternating over 5 runs (n − 1) = √(5/4)·… computed by the engine.
    expect(score.missing).toEqual([]);
    expect(score.grade).not.toBe("incomplete");
    // A longer travel falls in the next band.
    const long = scoreReport(MACHINING_CENTRE_NORMAL, { conditions, tests: centreReadings(800, 2) });
    expect(long.results.find((r) => r.code === "V-X-A")).toMatchObject({ measuringLength: 800, tolerance: 25 });
  });

  it("fails an axis whose pitch error exceeds its accuracy tolerance", () => {
    const score = scoreReport(MACHINING_CENTRE_NORMAL, { conditions, tests: centreReadings(500, 8) });
    expect(score.outOfTolerance).toContain("V-X-A");
    expect(score.outOfTolerance).not.toContain("V-X-R");
  });

  it("refuses a travel beyond the longest band", () => {
    expect(() => scoreReport(MACHINING_CENTRE_NORMAL, { conditions, tests: { "V-X-A": runs(2500, 1, 1, 1) } })).toThrow(/beyond the 2000 mm/);
  });

  it("scores the circular test from radial deviations in both directions", () => {
    const circle = (bump: number) => Array.from({ length: 36 }, (_, i) => ({ angle: i * 10, deviation: i === 9 ? bump : 0 }));
    const score = scoreReport(MACHINING_CENTRE_NORMAL, { conditions, tests: { "V-XY-CIRC": { kind: "circular", clockwise: circle(6), counterClockwise: circle(0) } } });
    const result = score.results[0]!;
    expect(result.tolerance).toBe(30);
    expect(result.circular?.circularHysteresis).toBeCloseTo(6, 9);
  });

  it("convert inch runs: targets in inches to mm, deviations in inches to µm", () => {
    const metric = runs(500, 2, 3, 1);
    const inch = {
      ...metric,
      targets: metric.targets.map((t) => t / 25.4),
      forward: metric.forward.map((run) => run.map((d) => d / 25_400)),
      reverse: metric.reverse.map((run) => run.map((d) => d / 25_400)),
    };
    const inMm = scoreEvaluation(MACHINING_CENTRE_NORMAL, { profile: { key: MACHINING_CENTRE_NORMAL.key, version: 1 }, units: "mm", measurements: { tests: { "V-X-A": metric } } });
    const inInch = scoreEvaluation(MACHINING_CENTRE_NORMAL, { profile: { key: MACHINING_CENTRE_NORMAL.key, version: 1 }, units: "inch", measurements: { tests: { "V-X-A": inch } } });
    expect(inInch.results[0]!.value).toBeCloseTo(inMm.results[0]!.value, 6);
    expect(inInch.results[0]!.measuringLength).toBeCloseTo(500, 6);
  });

  it("the request schema refuses ragged runs, falling targets and a single run, at their fields", () => {
    const schema = evaluationRequestSchemaFor(BUILT_IN_PROFILES);
    const request = (measurement: unknown) => ({ profile: { key: "cnc-lathe-normal", version: 1 }, units: "mm", measurements: { tests: { "C-X-A": measurement } } });
    const good = runs(200, 1, 1, 1);
    expect(schema.safeParse(request(good)).success).toBe(true);
    const ragged = schema.safeParse(request({ ...good, forward: [good.forward[0], good.forward[1]!.slice(1)] }));
    expect(ragged.error?.issues.map((issue) => issue.path.join("."))).toContain("measurements.tests.C-X-A.forward.1");
    const falling = schema.safeParse(request({ ...good, targets: [...good.targets].reverse() }));
    expect(falling.success).toBe(false);
    expect(schema.safeParse(request({ ...good, reverse: [good.reverse[0]] })).success).toBe(false);
    expect(schema.safeParse(request({ ...good, forward: good.forward.map((run) => run.map((d, i) => (i === 2 ? 1e9 : d))) })).error?.issues[0]?.message).toMatch(/Must lie within/);
  });

  it("a maker's stated positioning specification, entered as a maker's chart copied from the class, is suggested for that model", () => {
    const chart: ToleranceProfile = {
      ...MACHINING_CENTRE_NORMAL,
      key: "maker-chart-vmc-demo",
      title: "Maker's positioning specification",
      scope: { limits: [], maker: { make: "Orvale", model: "VC-640", chart: "Positioning specification, sales brochure" }, source: { confidence: "manufacturer", document: "Positioning specification, sales brochure" } },
      tests: MACHINING_CENTRE_NORMAL.tests.map((test) =>
        test.code === "V-X-A" ? { ...test, tolerance: { type: "fixed", tolerance: 8, source: { confidence: "manufacturer", document: "Positioning specification, sales brochure" } } } : test,
      ),
    };
    expect(toleranceProfileSchema.safeParse(chart).success).toBe(true);
    const profiles = [...BUILT_IN_PROFILES, chart];
    expect(suggestProfile(profiles, { category: "machining-centre", dimensions: {}, make: "orvale", model: "VC-640" })?.key).toBe(chart.key);
    expect(suggestProfile(profiles, { category: "machining-centre", dimensions: {}, make: "Orvale", model: "VC-800" })?.key).toBe(MACHINING_CENTRE_NORMAL.key);
    const score = scoreReport(chart, { conditions, tests: { "V-X-A": runs(500, 2, 3, 1) } });
    expect(score.results[0]).toMatchObject({ tolerance: 8, pass: false, confidence: { tolerance: "manufacturer" } });
  });
});
