import { describe, expect, it } from "vitest";
import { CENTRE_LATHE_NORMAL, GeometryInputError, gradeOf, scoreReport } from "~/geometry";
import { wellKeptReport } from "./fixtures";

const out = (ratio: number) => ({ ratio, pass: false });
const inside = (ratio: number) => ({ ratio, pass: true });

describe("grade boundaries", () => {
  // our own scheme, GEOMETRY.md: A all r ≤ 0.5; B all r ≤ 1; C ≤ 2 out, none beyond 1.5; D otherwise
  it("A when every ratio is at most 0.5", () => {
    expect(gradeOf([inside(0.5), inside(0.1)])).toBe("A");
    expect(gradeOf([inside(0.5000001), inside(0.1)])).toBe("B");
  });

  it("B when every test is in tolerance", () => {
    expect(gradeOf([inside(1), inside(0.2)])).toBe("B");
  });

  it("C with one or two tests out, none beyond 1.5", () => {
    expect(gradeOf([out(1.01), inside(0.2)])).toBe("C");
    expect(gradeOf([out(1.5), out(1.2), inside(0.2)])).toBe("C");
  });

  it("D with three tests out, or one beyond 1.5", () => {
    expect(gradeOf([out(1.1), out(1.1), out(1.1)])).toBe("D");
    expect(gradeOf([out(1.51), inside(0.2)])).toBe("D");
  });

  it("counts a direction failure as out however small its ratio", () => {
    expect(gradeOf([out(0.1), inside(0.2)])).toBe("C"); // GEOMETRY.md: direction failure counted as out of tolerance
  });

  it("incomplete when a required test has no reading", () => {
    expect(gradeOf([inside(0.1)], 1)).toBe("incomplete");
  });
});

describe("scoring a whole report", () => {
  it("grades the well-kept lathe A and carries its key figures and date", () => {
    const score = scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport());
    expect(score.results).toHaveLength(CENTRE_LATHE_NORMAL.tests.length);
    expect(score.grade).toBe("A");
    expect(score.worstRatio).toBe(0.5); // bed: 10 µm of 20 µm (ISO 1708:1989, from memory)
    expect(score.measuredOn).toBe("2025-03-14");
    expect(score.keyFigures).toEqual({
      spindleRunOut: 4,
      axialSlip: 3,
      spindleParallelismVertical: 8, // mean(12, 4) − mean(0, 0), GEOMETRY.md method
      spindleParallelismHorizontal: 5, // mean(6, 4) − mean(1, −1)
      centreHeight: 15,
      bedStraightness: 10,
      tableFlatness: null,
      travelSquareness: null,
      xPositioningAccuracy: null,
      xRepeatability: null,
      yPositioningAccuracy: null,
      yRepeatability: null,
      zPositioningAccuracy: null,
      zRepeatability: null,
    });
    expect(score.missing).toEqual([]);
    expect(score.outOfTolerance).toEqual([]);
    expect(score.warnings).toEqual([]);
    expect(score.results.flatMap((r) => r.warnings)).toEqual([]);
  });

  it("drops to B when one test passes above half its tolerance", () => {
    const score = scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport({ "L-SP-NOSE": { kind: "sweep", readings: [0, 6], resolution: 1 } }));
    expect(score.grade).toBe("B");
    expect(score.keyFigures.spindleRunOut).toBe(6);
  });

  it("drops to C when the tailstock centre sits low, however little", () => {
    const score = scoreReport(
      CENTRE_LATHE_NORMAL,
      wellKeptReport({ "L-CTR-HT": { kind: "centre-height", headstockEnd: 0, tailstockEnd: -2, resolution: 1 } }),
    );
    expect(score.grade).toBe("C"); // common practice: tailstock low fails; GEOMETRY.md: counted as out
    expect(score.outOfTolerance).toEqual(["L-CTR-HT"]);
    expect(score.keyFigures.centreHeight).toBe(-2);
  });

  it("grades D when a test is beyond 1.5 times its tolerance", () => {
    const score = scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport({ "L-SP-SLIP": { kind: "extremes", max: 16, min: 0, resolution: 1 } }));
    expect(score.grade).toBe("D"); // 16 of 10 µm: r = 1.6 (ISO 1708:1989, from memory)
  });

  it("grades on the required tests, while still listing a measured optional test that fails", () => {
    // PRODUCT.md / GEOMETRY.md: the grade is the worst ratio over the required tests.
    const score = scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport({ "L-P-ROUND": { kind: "sweep", readings: [0, 12], resolution: 1 } }));
    expect(score.grade).toBe("A");
    expect(score.outOfTolerance).toEqual(["L-P-ROUND"]);
  });

  it("is incomplete without a required test, and lists it", () => {
    const score = scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport({ "L-SP-PAR-H": undefined }));
    expect(score.grade).toBe("incomplete");
    expect(score.missing).toEqual(["L-SP-PAR-H"]);
    expect(score.keyFigures.spindleParallelismHorizontal).toBeNull();
  });

  it("is not held up by an optional test left out", () => {
    const score = scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport({ "L-P-FLAT": undefined, "L-LS-PITCH": undefined }));
    expect(score.grade).toBe("A");
  });

  it("warns once per missing condition at report level", () => {
    const report = { ...wellKeptReport(), conditions: undefined };
    const score = scoreReport(CENTRE_LATHE_NORMAL, report);
    expect(score.warnings.map((w) => w.code)).toEqual(["temperature-missing", "warm-up-missing", "levelling-missing"]);
    expect(score.grade).toBe("A"); // warnings do not change the grade
  });

  it("is deterministic", () => {
    expect(scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport())).toEqual(scoreReport(CENTRE_LATHE_NORMAL, wellKeptReport()));
  });

  it("refuses a test code the profile does not have", () => {
    const report = wellKeptReport();
    report.tests["X-NOPE"] = { kind: "sweep", readings: [0, 1] };
    expect(() => scoreReport(CENTRE_LATHE_NORMAL, report)).toThrow(/"X-NOPE" is not a test of centre-lathe-normal v1/);
  });

  it("says which test and field a bad reading is in", () => {
    const report = wellKeptReport({ "L-SP-NOSE": { kind: "sweep", readings: [1] } });
    try {
      scoreReport(CENTRE_LATHE_NORMAL, report);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(GeometryInputError);
      expect((error as GeometryInputError).path).toEqual(["tests", "L-SP-NOSE", "readings"]);
      expect((error as Error).message).toMatch(/^L-SP-NOSE \(Spindle nose\): .*at least 2/);
    }
  });
});
