import { describe, expect, it } from "vitest";
import {
  BUILT_IN_PROFILES,
  evaluationRequestSchemaFor,
  KNEE_MILL_NORMAL,
  scoreEvaluation,
  scoreReport,
  suggestProfile,
  SURFACE_GRINDER_NORMAL,
  toleranceProfileSchema,
  type TestMeasurement,
} from "~/geometry";

/** A 5 × 4 grid over a 1000 × 400 mm table, hollow by `hollow` µm in the middle (worked by hand: zone = hollow). */
function table(hollow: number): TestMeasurement {
  const points = [];
  for (let r = 0; r < 4; r++) {
    for (let c = 0; c < 5; c++) {
      const inner = r > 0 && r < 3 && c > 0 && c < 4;
      points.push({ x: c * 250, y: r * 400 / 3, z: inner ? -hollow : 0 });
    }
  }
  return { kind: "surface", points, resolution: 1 };
}

const along = (length: number, readings: number[]): TestMeasurement => ({
  kind: "profile",
  points: readings.map((reading, i) => ({ station: (length * i) / (readings.length - 1), reading })),
  resolution: 1,
});

function millReadings(hollow: number): Record<string, TestMeasurement> {
  return {
    "M-TABLE-FLAT": table(hollow),
    "M-TABLE-X": along(500, [0, 4, 6, 3]),
    "M-TABLE-Y": along(300, [0, 3, 5]),
    "M-X-STR": along(800, [0, 3, 5, 4, 0]),
    "M-XY-SQ": along(300, [0, 2, 4, 6]),
    "M-Z-SQ": along(300, [0, -3, -6, -9]),
    "M-SLOT": along(500, [0, 5, 8]),
    "M-SP-NOSE": { kind: "sweep", readings: [0, 3, 6, 2], resolution: 1 },
    "M-SP-300": { kind: "sweep", readings: [0, 8, 12, 4], resolution: 1 },
    "M-SP-SLIP": { kind: "extremes", max: 4, min: 0, resolution: 1 },
    "M-SP-TABLE": { kind: "near-far", near: 0, far: 12, length: 300, resolution: 1 },
  };
}

const conditions = { ambientTemperatureC: 20, warmUpMinutes: 30, levelled: true };

describe("milling machine and surface grinder profiles", () => {
  it("are valid profiles, every tolerance labelled from memory", () => {
    for (const profile of [KNEE_MILL_NORMAL, SURFACE_GRINDER_NORMAL]) {
      expect(toleranceProfileSchema.safeParse(profile).success).toBe(true);
      expect(BUILT_IN_PROFILES).toContain(profile);
      for (const test of profile.tests) expect(test.tolerance.source.confidence).toBe("from-memory");
      for (const code of Object.values(profile.keyFigures)) expect(profile.tests.map((test) => test.code)).toContain(code);
    }
  });

  it("hold the tests a knee-type mill and a surface grinder are checked with", () => {
    expect(KNEE_MILL_NORMAL.tests.map((test) => test.method)).toEqual(expect.arrayContaining(["flatness", "squareness", "range-along", "run-out", "straightness", "near-far"]));
    expect(SURFACE_GRINDER_NORMAL.tests.map((test) => test.code)).toEqual(
      expect.arrayContaining(["G-TRAVEL-V", "G-TRAVEL-H", "G-TABLE-PAR", "G-CROSS-PAR", "G-HEAD-SQ", "G-SP-RUN", "G-SP-SLIP", "G-PRACTICAL"]),
    );
  });

  it("are suggested by category and table size", () => {
    expect(suggestProfile(BUILT_IN_PROFILES, { category: "milling-machine", dimensions: { tableLengthMm: 1200 } })?.key).toBe("knee-mill-normal");
    expect(suggestProfile(BUILT_IN_PROFILES, { category: "surface-grinder", dimensions: { tableLengthMm: 600 } })?.key).toBe("surface-grinder-normal");
    expect(suggestProfile(BUILT_IN_PROFILES, { category: "milling-machine", dimensions: { tableLengthMm: 2600 } })).toBeNull();
    expect(suggestProfile(BUILT_IN_PROFILES, { category: "surface-grinder", dimensions: {} })?.key).toBe("surface-grinder-normal");
    expect(suggestProfile(BUILT_IN_PROFILES, { category: "centre-lathe", dimensions: { swingOverBedMm: 400 } })?.category).toBe("centre-lathe");
  });

  it("grades a milling machine from a flatness grid and gives the category's key figures", () => {
    const good = scoreReport(KNEE_MILL_NORMAL, { conditions, tests: millReadings(12) });
    expect(good.grade).not.toBe("incomplete");
    expect(good.outOfTolerance).toEqual([]);
    const flat = good.results.find((result) => result.code === "M-TABLE-FLAT")!;
    expect(flat.value).toBeCloseTo(12, 9); // the hollow, worked by hand
    expect(flat.measuringLength).toBe(1000);
    expect(flat.tolerance).toBe(40); // stepped, up to 1000 mm (from memory)
    expect(flat.flatness?.reference).toBe("minimum-zone");
    expect(good.keyFigures.tableFlatness).toBeCloseTo(12, 9);
    expect(good.keyFigures.travelSquareness).toBeCloseTo(6, 9);
    expect(good.keyFigures.spindleRunOut).toBe(6);

    const worn = scoreReport(KNEE_MILL_NORMAL, { conditions, tests: millReadings(55) });
    expect(worn.outOfTolerance).toContain("M-TABLE-FLAT");
    expect(worn.grade).not.toBe("A");
  });

  it("takes surface heights through the API schema, in inches too, and refuses bad grids with field messages", () => {
    const schema = evaluationRequestSchemaFor(BUILT_IN_PROFILES);
    const inch = {
      profile: { key: "knee-mill-normal", version: 1 },
      units: "inch",
      measurements: { tests: { "M-TABLE-FLAT": { kind: "surface", points: [{ x: 0, y: 0, z: 0 }, { x: 10, y: 0, z: 0 }, { x: 0, y: 10, z: 0 }, { x: 10, y: 10, z: 0.0004 }] } } },
    };
    const parsed = schema.safeParse(inch);
    expect(parsed.success).toBe(true);
    const response = scoreEvaluation(KNEE_MILL_NORMAL, parsed.data as never);
    // 0.0004 in = 10.16 µm, one corner up of four: the planes tilt across the diagonals (one through each diagonal
    // pair), so the zone is half the corner's height (worked by hand).
    expect(response.results[0]!.value).toBeCloseTo(5.08, 6);
    expect(response.results[0]!.measuringLength).toBeCloseTo(254, 9);

    const repeated = structuredClone(inch);
    repeated.measurements.tests["M-TABLE-FLAT"].points.push({ x: 0, y: 0, z: 1 });
    expect(schema.safeParse(repeated).success).toBe(false);
    const tooMany = structuredClone(inch);
    tooMany.measurements.tests["M-TABLE-FLAT"].points = Array.from({ length: 2501 }, (_, i) => ({ x: i % 60, y: Math.floor(i / 60), z: 0 }));
    expect(schema.safeParse(tooMany).success).toBe(false);
    const infinite = structuredClone(inch);
    (infinite.measurements.tests["M-TABLE-FLAT"].points[1] as { z: number }).z = Number.POSITIVE_INFINITY;
    expect(schema.safeParse(infinite).success).toBe(false);
  });
});
