import { describe, expect, it } from "vitest";
import {
  BUILT_IN_PROFILES,
  CENTRE_LATHE_NORMAL,
  CENTRE_LATHE_PRECISION,
  CENTRE_LATHE_PRECISION_V1,
  findProfile,
  GeometryInputError,
  newestVersions,
  sourceLabel,
  suggestProfile,
  toleranceAt,
  toleranceProfileSchema,
} from "~/geometry";

const tolerance = (code: string, length: number | null = null, profile = CENTRE_LATHE_NORMAL) => {
  const test = profile.tests.find((t) => t.code === code)!;
  return toleranceAt(test.tolerance, length, test.measuringLength.nominal, profile.rules);
};

const lathe = (category: "centre-lathe" | "toolroom-lathe", swing: number | null, centres: number | null) => ({
  category,
  dimensions: { swingOverBedMm: swing, distanceBetweenCentresMm: centres },
});

describe("centre lathe, normal class", () => {
  it("holds every test of the GEOMETRY.md table, each code once", () => {
    const codes = CENTRE_LATHE_NORMAL.tests.map((t) => t.code);
    expect(new Set(codes).size).toBe(codes.length);
    expect(codes).toHaveLength(25);
  });

  it.each([
    // code, measuring length (mm), tolerance (µm) — ISO 1708:1989, from memory (GEOMETRY.md table)
    ["L-BED-V", 500, 10],
    ["L-BED-V", 1000, 20],
    ["L-BED-V", 1500, 25],
    ["L-BED-X", null, 40],
    ["L-CAR-H", 500, 15],
    ["L-CAR-H", 1000, 20],
    ["L-CAR-H", 1500, 25],
    ["L-TS-TRAV-V", 1500, 30],
    ["L-TS-TRAV-H", 1500, 30],
    ["L-SP-SLIP", null, 10],
    ["L-FP-CAM", null, 20],
    ["L-SP-NOSE", null, 10],
    ["L-SP-TAP-N", null, 10],
    ["L-SP-TAP-F", null, 20],
    ["L-SP-PAR-V", 300, 20],
    ["L-SP-PAR-H", 300, 15],
    ["L-SP-CTR", null, 15],
    ["L-TS-SLV-V", 100, 15],
    ["L-TS-SLV-H", 100, 10],
    ["L-TS-TAP-V", 300, 30],
    ["L-TS-TAP-H", 300, 30],
    ["L-CTR-HT", null, 40],
    ["L-TOP-PAR", 300, 40],
    ["L-XS-SQ", 300, 20],
    ["L-LS-SLIP", null, 15],
    ["L-LS-PITCH", 300, 40], // low confidence
    ["L-P-ROUND", null, 10],
    ["L-P-DIA", 300, 40],
    ["L-P-FLAT", 300, 25],
  ] as const)("%s over %s mm: %d µm", (code, length, expected) => {
    expect(tolerance(code, length)).toBe(expected); // ISO 1708:1989, from memory
  });

  it("has the local tolerances of the table", () => {
    const local = (code: string) => CENTRE_LATHE_NORMAL.tests.find((t) => t.code === code)!.local;
    expect(local("L-BED-V")).toMatchObject({ tolerance: 7.5, window: 250 }); // ISO 1708:1989, from memory
    expect(local("L-TS-TRAV-V")).toMatchObject({ tolerance: 20, window: 500 }); // ISO 1708:1989, from memory
    expect(local("L-LS-PITCH")).toMatchObject({ tolerance: 15, window: 60 }); // ISO 1708:1989, from memory (low confidence)
  });

  it("gives the direction of each one-way test", () => {
    const allowed = (code: string) => CENTRE_LATHE_NORMAL.tests.find((t) => t.code === code)!.direction.allowed;
    expect(allowed("L-BED-V")).toBe("convex"); // from memory (GEOMETRY.md)
    for (const code of ["L-SP-PAR-V", "L-SP-PAR-H", "L-TS-SLV-V", "L-TS-SLV-H", "L-TS-TAP-V", "L-TS-TAP-H", "L-CTR-HT", "L-XS-SQ"]) {
      expect(allowed(code)).toBe("positive"); // common practice (GEOMETRY.md)
    }
    expect(allowed("L-P-FLAT")).toBe("concave"); // common practice (GEOMETRY.md)
  });

  it("labels every value with its source", () => {
    for (const profile of BUILT_IN_PROFILES) {
      for (const test of profile.tests) {
        expect(sourceLabel(test.tolerance.source), test.code).toMatch(/from memory|common practice|IS 6040|Schlesinger|ISO/);
        expect(sourceLabel(test.direction.source), test.code).not.toBe("");
        if (test.local) expect(sourceLabel(test.local.source), test.code).not.toBe("");
        expect(test.title && test.measures && test.instrument && test.measuringLength.description, test.code).toBeTruthy();
      }
    }
  });

  it("scales proportional tolerances but never below the 10 µm minimum", () => {
    expect(tolerance("L-SP-PAR-V", 600)).toBe(40); // ISO 230-1, from memory: 20 × 600/300
    expect(tolerance("L-SP-PAR-V", 100)).toBe(10); // 6.7 µm raised to the normal-class minimum, from memory
    expect(tolerance("L-TOP-PAR", 150)).toBe(20); // ISO 230-1, from memory: 40 × 150/300
  });

  it("is frozen data", () => {
    expect(Object.isFrozen(CENTRE_LATHE_NORMAL)).toBe(true);
    expect(Object.isFrozen(CENTRE_LATHE_NORMAL.tests[0])).toBe(true);
  });
});

describe("precision class, version 1", () => {
  it("halves every normal-class tolerance, never below 5 µm", () => {
    // Schlesinger, Testing Machine Tools, as quoted second-hand: half; IS 6040:1993: minimum 5 µm
    for (const test of CENTRE_LATHE_NORMAL.tests) {
      const lengths = test.tolerance.type === "stepped" ? test.tolerance.steps.map((s) => s.upTo) : [test.measuringLength.nominal];
      for (const length of lengths) {
        const normal = tolerance(test.code, length);
        expect(tolerance(test.code, length, CENTRE_LATHE_PRECISION_V1), test.code).toBe(Math.max(normal / 2, 5));
      }
    }
  });

  it("gives 5 µm for the spindle nose and 10 µm for the spindle axis over 300 mm", () => {
    expect(tolerance("L-SP-NOSE", null, CENTRE_LATHE_PRECISION_V1)).toBe(5); // half of 10 µm (Schlesinger, second-hand)
    expect(tolerance("L-SP-PAR-V", 300, CENTRE_LATHE_PRECISION_V1)).toBe(10); // half of 20 µm (Schlesinger, second-hand)
  });
});

describe("choosing a profile", () => {
  it("finds profiles by key and version among those given", () => {
    expect(findProfile(BUILT_IN_PROFILES, "centre-lathe-normal", 1)).toBe(CENTRE_LATHE_NORMAL);
    expect(findProfile(BUILT_IN_PROFILES, "centre-lathe-normal", 2)).toBeUndefined();
    expect(newestVersions(BUILT_IN_PROFILES).find((p) => p.key === "centre-lathe-precision")).toBe(CENTRE_LATHE_PRECISION);
  });

  it("suggests the newest version by category, swing and distance between centres", () => {
    // GEOMETRY.md scope of the normal class: swing up to 800 mm, between centres up to 1500 mm (ISO 1708:1989, from memory)
    expect(suggestProfile(BUILT_IN_PROFILES, lathe("centre-lathe", 400, 1000))).toBe(CENTRE_LATHE_NORMAL);
    expect(suggestProfile(BUILT_IN_PROFILES, lathe("toolroom-lathe", 330, 650))).toBe(CENTRE_LATHE_PRECISION);
    expect(suggestProfile(BUILT_IN_PROFILES, lathe("centre-lathe", 800, 1500))).toBe(CENTRE_LATHE_NORMAL);
    expect(suggestProfile(BUILT_IN_PROFILES, lathe("centre-lathe", 1000, 1500))).toBeNull();
    expect(suggestProfile(BUILT_IN_PROFILES, lathe("centre-lathe", 500, 3000))).toBeNull();
    // An unknown size is not held against the machine.
    expect(suggestProfile(BUILT_IN_PROFILES, lathe("centre-lathe", null, 1000))).toBe(CENTRE_LATHE_NORMAL);
  });

  it("refuses sizes that are not positive and unknown categories", () => {
    expect(() => suggestProfile(BUILT_IN_PROFILES, lathe("centre-lathe", 0, 1000))).toThrow(GeometryInputError);
    expect(() => suggestProfile(BUILT_IN_PROFILES, lathe("centre-lathe", 400, NaN))).toThrow(GeometryInputError);
    expect(() => suggestProfile(BUILT_IN_PROFILES, lathe("planer" as never, 400, 1000))).toThrow(/category/);
  });
});

describe("the built-in data", () => {
  it("passes the one profile schema the editor uses, unchanged", () => {
    for (const profile of BUILT_IN_PROFILES) {
      const parsed = toleranceProfileSchema.safeParse(profile);
      expect(parsed.success, `${profile.key} v${profile.version}: ${parsed.error?.message}`).toBe(true);
      expect(parsed.data).toEqual(profile);
    }
  });
});
