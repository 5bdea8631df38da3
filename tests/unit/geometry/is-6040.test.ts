// The published rules of the precision-lathe test chart, IS 6040:1993 (aligned with ISO 1708:1989), as
// version 2 of the precision profile applies them. Clause 3.5: the minimum tolerance is 0.005 mm, a
// proportional value is rounded to the nearest 0.002 mm, and instruments need not read finer than 0.002 mm.
import { describe, expect, it } from "vitest";
import {
  BUILT_IN_PROFILES,
  CENTRE_LATHE_NORMAL,
  CENTRE_LATHE_PRECISION,
  CENTRE_LATHE_PRECISION_V1,
  evaluateTest,
  sourceLabel,
  suggestProfile,
  toleranceAt,
  toleranceOver,
  type ProfileTest,
  type ToleranceProfile,
} from "~/geometry";

const testOf = (profile: ToleranceProfile, code: string): ProfileTest => profile.tests.find((t) => t.code === code)!;
const toolroom = (swing: number, centres: number) => ({ category: "toolroom-lathe" as const, dimensions: { swingOverBedMm: swing, distanceBetweenCentresMm: centres } });

describe("rounding to the 2 µm grid (IS 6040:1993, clause 3.5)", () => {
  it("puts 10 µm per 300 mm at 250 mm on 8 µm, and never below 5 µm", () => {
    // 10 × 250 / 300 = 8.33 µm → nearest multiple of 2 µm = 8 µm (IS 6040:1993, clause 3.5)
    expect(toleranceOver({ tolerance: 10, over: 300, minimum: 5, roundTo: 2 }, 250)).toBe(8);
    // 10 × 100 / 300 = 3.33 µm → 4 µm on the grid → raised to the 5 µm minimum (IS 6040:1993, clause 3.5)
    expect(toleranceOver({ tolerance: 10, over: 300, minimum: 5, roundTo: 2 }, 100)).toBe(5);
    // 10 × 400 / 300 = 13.33 µm → 14 µm (IS 6040:1993, clause 3.5)
    expect(toleranceOver({ tolerance: 10, over: 300, minimum: 5, roundTo: 2 }, 400)).toBe(14);
    // Without a rounding rule nothing is rounded (ISO 230-1, from memory).
    expect(toleranceOver({ tolerance: 10, over: 300, minimum: 5 }, 250)).toBeCloseTo(8.333333, 5);
  });

  it("is a rule of the profile: version 2 of the precision class rounds, the normal class does not", () => {
    const axis = testOf(CENTRE_LATHE_PRECISION, "L-SP-PAR-V"); // half of 20 µm / 300 mm (Schlesinger, second-hand) = 10 µm / 300 mm
    expect(axis.tolerance).toMatchObject({ type: "proportional", tolerance: 10, over: 300, minimum: 5 });
    expect(toleranceAt(axis.tolerance, 250, 300, CENTRE_LATHE_PRECISION.rules)).toBe(8);
    expect(sourceLabel(CENTRE_LATHE_PRECISION.rules.rounding!.source)).toBe("IS 6040:1993, clause 3.5");
    expect(sourceLabel(CENTRE_LATHE_PRECISION.rules.minimumTolerance.source)).toBe("IS 6040:1993, clause 3.5");
    // The normal class: 20 × 250 / 300 = 16.67 µm, not rounded (ISO 1708:1989 and ISO 230-1, from memory).
    const normal = testOf(CENTRE_LATHE_NORMAL, "L-SP-PAR-V");
    expect(CENTRE_LATHE_NORMAL.rules.rounding).toBeUndefined();
    expect(toleranceAt(normal.tolerance, 250, 300, CENTRE_LATHE_NORMAL.rules)).toBeCloseTo(16.6667, 3);
    // Version 1 stays as it was, for the reports scored with it: 8.33 µm, not rounded.
    expect(toleranceAt(testOf(CENTRE_LATHE_PRECISION_V1, "L-SP-PAR-V").tolerance, 250, 300, CENTRE_LATHE_PRECISION_V1.rules)).toBeCloseTo(8.3333, 3);
  });

  it("scores a mandrel read over 250 mm against 8 µm", () => {
    const result = evaluateTest(
      testOf(CENTRE_LATHE_PRECISION, "L-SP-PAR-V"),
      { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 9, at180: 7 }, length: 250, resolution: 1 },
      undefined,
      CENTRE_LATHE_PRECISION.rules,
    );
    expect(result.tolerance).toBe(8); // IS 6040:1993, clause 3.5
    expect(result.value).toBe(8);
    expect(result.pass).toBe(true);
  });

  it("keeps every tolerance of version 2 on the 2 µm grid or at the 5 µm minimum", () => {
    const values = CENTRE_LATHE_PRECISION.tests.flatMap((test) => [
      ...(test.tolerance.type === "stepped" ? test.tolerance.steps.map((step) => step.tolerance) : [test.tolerance.tolerance]),
      ...(test.local ? [test.local.tolerance] : []),
    ]);
    for (const value of values) expect(value === 5 || Number.isInteger(value), String(value)).toBe(true);
    expect(values).not.toContain(7.5); // halved 15 µm moves to 8 µm (IS 6040:1993, clause 3.5)
  });
});

describe("the instrument's least count (IS 6040:1993, clause 3.5)", () => {
  const nose = testOf(CENTRE_LATHE_PRECISION, "L-SP-NOSE"); // 5 µm: half of 10 µm, at the minimum

  it("draws no resolution warning for a 2 µm instrument on the precision profile", () => {
    const result = evaluateTest(nose, { kind: "extremes", max: 4, min: 0, resolution: 2 }, undefined, CENTRE_LATHE_PRECISION.rules);
    expect(result.tolerance).toBe(5);
    expect(result.warnings.map((w) => w.code)).not.toContain("resolution-coarse");
  });

  it("still warns for an instrument coarser than 2 µm", () => {
    const result = evaluateTest(nose, { kind: "extremes", max: 4, min: 0, resolution: 5 }, undefined, CENTRE_LATHE_PRECISION.rules);
    expect(result.warnings.map((w) => w.code)).toContain("resolution-coarse"); // ten-to-one rule, common practice
  });

  it("leaves the ten-to-one rule alone on profiles without a least count", () => {
    const result = evaluateTest(testOf(CENTRE_LATHE_PRECISION_V1, "L-SP-NOSE"), { kind: "extremes", max: 4, min: 0, resolution: 2 }, undefined, CENTRE_LATHE_PRECISION_V1.rules);
    expect(result.warnings.map((w) => w.code)).toContain("resolution-coarse"); // 2 µm > 5 µm / 10 (common practice)
  });
});

describe("the scope of IS 6040:1993: swing ≤ 500 mm, between centres ≤ 1 500 mm", () => {
  it("covers a toolroom lathe up to both limits and none beyond", () => {
    expect(suggestProfile(BUILT_IN_PROFILES, toolroom(500, 1500))).toBe(CENTRE_LATHE_PRECISION);
    expect(suggestProfile(BUILT_IN_PROFILES, toolroom(500.1, 1000))).toBeNull();
    expect(suggestProfile(BUILT_IN_PROFILES, toolroom(300, 1500.1))).toBeNull();
    expect(sourceLabel(CENTRE_LATHE_PRECISION.scope.source)).toBe("IS 6040:1993, scope");
  });

  it("does not fall back to version 1's wider scope for a new report", () => {
    // Version 1 claimed 800 mm; only the newest version of a profile is suggested.
    expect(suggestProfile(BUILT_IN_PROFILES, toolroom(600, 1000))).toBeNull();
  });

  it("leaves lathes over 800 mm swing without a profile (none is sourced yet)", () => {
    expect(suggestProfile(BUILT_IN_PROFILES, { category: "centre-lathe", dimensions: { swingOverBedMm: 801, distanceBetweenCentresMm: 1000 } })).toBeNull();
  });
});
