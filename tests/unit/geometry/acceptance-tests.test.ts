import { describe, expect, it } from "vitest";
import {
  CENTRE_LATHE_NORMAL,
  CENTRE_LATHE_PRECISION,
  evaluateTest,
  GeometryInputError,
  type ProfileTest,
  type TestMeasurement,
} from "~/geometry";

function test(code: string, profile = CENTRE_LATHE_NORMAL): ProfileTest {
  const found = profile.tests.find((t) => t.code === code);
  if (!found) throw new Error(`no test ${code}`);
  return found;
}

const WELL_KEPT = { ambientTemperatureC: 20, warmUpMinutes: 30, levelled: true };

function score(code: string, measurement: TestMeasurement, profile = CENTRE_LATHE_NORMAL) {
  return evaluateTest(test(code, profile), measurement, WELL_KEPT);
}

const points = (stations: number[], readings: number[]) => stations.map((station, i) => ({ station, reading: readings[i]! }));

describe("run-out, axial slip and camming", () => {
  it("scores run-out from readings over a revolution", () => {
    const result = score("L-SP-NOSE", { kind: "sweep", readings: [0, 2, 5, 3, 1], resolution: 1 });
    expect(result.value).toBe(5); // ISO 230-1, from memory: TIR = max − min
    expect(result.tolerance).toBe(10); // ISO 1708:1989, from memory: spindle nose run-out 10 µm
    expect(result.ratio).toBe(0.5);
    expect(result.pass).toBe(true);
    expect(result.direction).toEqual({ allowed: "any", observed: "not-applicable", against: 0, pass: true });
  });

  it("scores axial slip and camming from the highest and lowest readings", () => {
    expect(score("L-SP-SLIP", { kind: "extremes", max: 6, min: -5, resolution: 1 }).pass).toBe(false); // ISO 1708:1989, from memory: 10 µm
    const camming = score("L-FP-CAM", { kind: "extremes", max: 12, min: -6, resolution: 1 });
    expect(camming.value).toBe(18); // ISO 230-1, from memory
    expect(camming.tolerance).toBe(20); // ISO 1708:1989, from memory: faceplate seating face 20 µm
    expect(camming.pass).toBe(true);
  });

  it("refuses extremes the wrong way round", () => {
    expect(() => score("L-SP-SLIP", { kind: "extremes", max: 1, min: 4 })).toThrow(/swap them/);
  });

  it("refuses readings of the wrong kind for the test", () => {
    expect(() => score("L-SP-NOSE", { kind: "near-far", near: 0, far: 1 })).toThrow(GeometryInputError);
    expect(() => score("L-SP-NOSE", { kind: "near-far", near: 0, far: 1 })).toThrow(/takes "sweep" or "extremes"/);
  });
});

describe("mandrel parallelism and the direction rules", () => {
  it("passes the worked example at the limit", () => {
    const result = score("L-SP-PAR-V", {
      kind: "mandrel",
      near: { at0: 0, at180: 0 },
      far: { at0: 30, at180: 10 },
      resolution: 1,
    });
    expect(result.value).toBe(20); // worked example, GEOMETRY.md: +20 µm over 300 mm
    expect(result.tolerance).toBe(20); // ISO 1708:1989, from memory: 20 µm over 300 mm
    expect(result.ratio).toBe(1);
    expect(result.pass).toBe(true); // worked example, GEOMETRY.md: passes at the limit
    expect(result.direction.observed).toBe("positive");
  });

  it("fails a free end that droops, however small against the tolerance", () => {
    // common practice: the free end may rise, never drop; GEOMETRY.md direction rule beyond the resolution
    const result = score("L-SP-PAR-V", {
      kind: "mandrel",
      near: { at0: 0, at180: 0 },
      far: { at0: -2, at180: -2 },
      resolution: 1,
    });
    expect(result.ratio).toBe(0.1);
    expect(result.direction).toMatchObject({ allowed: "positive", observed: "negative", against: 2, pass: false });
    expect(result.pass).toBe(false);
  });

  it("lets a droop within the instrument's resolution pass", () => {
    const result = score("L-SP-PAR-V", {
      kind: "mandrel",
      near: { at0: 0, at180: 0 },
      far: { at0: -1, at180: 0 },
      resolution: 1,
    });
    expect(result.value).toBe(-0.5);
    expect(result.pass).toBe(true); // GEOMETRY.md: fails only beyond the instrument's resolution
  });

  it("fails a free end leaning away from the tool in the horizontal plane", () => {
    const result = score("L-SP-PAR-H", {
      kind: "mandrel",
      near: { at0: 0, at180: 0 },
      far: { at0: -3, at180: -3 },
      resolution: 0.5,
    });
    expect(result.pass).toBe(false); // common practice: the free end leans toward the tool, never away
  });

  it("scales the tolerance to the length actually measured", () => {
    const result = score("L-SP-PAR-V", {
      kind: "mandrel",
      near: { at0: 0, at180: 0 },
      far: { at0: 12, at180: 12 },
      length: 150,
      resolution: 1,
    });
    expect(result.measuringLength).toBe(150);
    expect(result.tolerance).toBe(10); // ISO 230-1, from memory: 20 × 150/300, at the 10 µm minimum (from memory)
    expect(result.pass).toBe(false);
  });

  it("fails a tailstock sleeve whose free end droops", () => {
    const result = score("L-TS-SLV-V", { kind: "near-far", near: 0, far: -4, resolution: 1 });
    expect(result.pass).toBe(false); // common practice: + only
    expect(score("L-TS-SLV-V", { kind: "near-far", near: 0, far: 12, resolution: 1 }).pass).toBe(true); // ISO 1708:1989, from memory: 15 µm over 100 mm
  });
});

describe("centre height", () => {
  it("fails a tailstock centre lower than the headstock centre", () => {
    // common practice: the tailstock centre may sit slightly high, never low
    const result = score("L-CTR-HT", { kind: "centre-height", headstockEnd: 0, tailstockEnd: -3, resolution: 1 });
    expect(result.value).toBe(-3);
    expect(result.pass).toBe(false);
    expect(result.direction.against).toBe(3);
  });

  it("passes a tailstock centre up to 40 µm high", () => {
    const result = score("L-CTR-HT", { kind: "centre-height", headstockEnd: 5, tailstockEnd: 45, resolution: 1 });
    expect(result.value).toBe(40);
    expect(result.tolerance).toBe(40); // ISO 1708:1989, from memory
    expect(result.pass).toBe(true);
  });
});

describe("straightness of a travel", () => {
  const WORKED = points([0, 100, 200, 300, 400, 500], [0, -4, 2, 6, 3, 8]); // worked example, GEOMETRY.md

  it("scores the carriage in the horizontal plane with the reference the tester chose", () => {
    const ends = score("L-CAR-H", { kind: "profile", points: WORKED, resolution: 0.5 });
    const zone = score("L-CAR-H", { kind: "profile", points: WORKED, reference: "minimum-zone", resolution: 0.5 });
    expect(ends.value).toBeCloseTo(6.8, 9); // worked example, GEOMETRY.md
    expect(ends.straightness?.reference).toBe("end-points");
    expect(zone.value).toBeCloseTo(6.0, 9); // worked example, GEOMETRY.md
    expect(zone.tolerance).toBe(15); // ISO 1708:1989, from memory: 15 µm for DC ≤ 500
    expect(zone.measuringLength).toBe(500);
    expect(zone.pass).toBe(true);
  });

  it("takes the tolerance band of the length measured", () => {
    const long = points([0, 400, 800], [0, 5, 0]);
    expect(score("L-BED-V", { kind: "profile", points: long, resolution: 1 }).tolerance).toBe(20); // ISO 1708:1989, from memory: DC ≤ 1000 → 20 µm
    const longer = points([0, 600, 1200], [0, 5, 0]);
    expect(score("L-BED-V", { kind: "profile", points: longer, resolution: 1 }).tolerance).toBe(25); // ISO 1708:1989, from memory: DC ≤ 1500 → 25 µm
    expect(() => score("L-BED-V", { kind: "profile", points: points([0, 1600], [0, 1]) })).toThrow(/beyond the 1500 mm/);
  });

  it("fails a bed that sags (concave), however little", () => {
    // from memory (GEOMETRY.md): bed in the vertical plane, convex only
    const sag = points([0, 250, 500, 750, 1000], [0, -2, -3, -2, 0]);
    const result = score("L-BED-V", { kind: "profile", points: sag, resolution: 1 });
    expect(result.value).toBeCloseTo(3, 9);
    expect(result.ratio).toBeCloseTo(0.15, 9);
    expect(result.direction).toMatchObject({ allowed: "convex", observed: "concave", pass: false });
    expect(result.pass).toBe(false);
  });

  it("passes a bed with a crown within tolerance and checks the local tolerance", () => {
    const crown = points([0, 125, 250, 375, 500, 625, 750, 875, 1000], [0, 4, 7, 9, 10, 9, 7, 4, 0]);
    const result = score("L-BED-V", { kind: "profile", points: crown, resolution: 0.5 });
    expect(result.value).toBeCloseTo(10, 9);
    expect(result.tolerance).toBe(20); // ISO 1708:1989, from memory
    expect(result.local?.tolerance).toBe(7.5); // ISO 1708:1989, from memory: 7.5 µm per 250 mm
    // by hand: the worst 250 mm window is the top, 375–625 mm: 9, 10, 9 → 1 µm above its end-point line
    expect(result.local?.value).toBeCloseTo(1, 9);
    expect(result.local).toMatchObject({ from: 375, to: 625 });
    expect(result.pass).toBe(true);
  });

  it("fails a bed whose local straightness is out though the whole is in", () => {
    const kinked = points([0, 125, 250, 375, 500], [0, 9, 0, 0, 0]);
    const result = score("L-BED-V", { kind: "profile", points: kinked, resolution: 0.5 });
    expect(result.value).toBe(9);
    expect(result.tolerance).toBe(10); // ISO 1708:1989, from memory: DC ≤ 500 → 10 µm
    expect(result.local?.pass).toBe(false); // 9 µm over 250 mm > 7.5 µm, ISO 1708:1989, from memory
    expect(result.pass).toBe(false);
    expect(result.ratio).toBeCloseTo(9 / 7.5, 12);
  });

  it("warns when two stations are all there is", () => {
    const result = score("L-CAR-H", { kind: "profile", points: points([0, 500], [0, 4]), resolution: 0.5 });
    expect(result.warnings.map((w) => w.code)).toContain("few-stations");
  });

  it("refuses a station read twice, pointing at the second", () => {
    try {
      score("L-CAR-H", { kind: "profile", points: points([0, 100, 100], [0, 1, 2]) });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(GeometryInputError);
      expect((error as GeometryInputError).path).toEqual(["points", 2, "station"]);
    }
  });
});

describe("practical tests", () => {
  it("fails a convex facing, however slight", () => {
    // common practice: a faced surface may be slightly concave, never convex
    const convex = points([0, 75, 150, 225, 300], [0, 2, 3, 2, 0]);
    const result = score("L-P-FLAT", { kind: "profile", points: convex, resolution: 1 });
    expect(result.ratio).toBeLessThan(0.5);
    expect(result.direction).toMatchObject({ allowed: "concave", observed: "convex", pass: false });
    expect(result.pass).toBe(false);
  });

  it("passes a slightly concave facing", () => {
    const concave = points([0, 75, 150, 225, 300], [0, -4, -6, -4, 0]);
    const result = score("L-P-FLAT", { kind: "profile", points: concave, resolution: 1 });
    expect(result.tolerance).toBe(25); // ISO 1708:1989, from memory: 25 µm over 300 mm
    expect(result.pass).toBe(true);
  });

  it("scores roundness and diameter variation", () => {
    expect(score("L-P-ROUND", { kind: "sweep", readings: [0, 3, 6, 2], resolution: 0.5 }).pass).toBe(true); // ISO 1708:1989, from memory: 10 µm
    const diameters = score("L-P-DIA", { kind: "profile", points: points([0, 100, 200], [0, 10, 18]), resolution: 1 });
    expect(diameters.value).toBe(18);
    expect(diameters.tolerance).toBeCloseTo((40 * 200) / 300, 12); // ISO 1708:1989, from memory, scaled by ISO 230-1 (from memory)
    expect(diameters.pass).toBe(true);
  });
});

describe("squareness of the cross-slide", () => {
  it("passes a travel that leans toward concave facing", () => {
    const result = score("L-XS-SQ", { kind: "profile", points: points([0, 150, 300], [0, 6, 12]), resolution: 1 });
    expect(result.value).toBeCloseTo(12, 9); // least-squares slope 0.04 µm/mm × 300 mm, by hand
    expect(result.tolerance).toBe(20); // ISO 1708:1989, from memory: 20 µm over 300 mm
    expect(result.pass).toBe(true);
  });

  it("fails a travel that would face convex", () => {
    // common practice: faced work must not rock
    const result = score("L-XS-SQ", { kind: "profile", points: points([0, 150, 300], [0, -1.5, -3]), resolution: 1 });
    expect(result.value).toBeCloseTo(-3, 9);
    expect(result.pass).toBe(false);
  });
});

describe("leadscrew cumulative pitch error", () => {
  it("takes the worst range over any 300 mm and any 60 mm", () => {
    const stations = [0, 60, 120, 180, 240, 300, 360, 420, 480, 540, 600];
    const errors = [0, 4, 8, 10, 14, 18, 20, 16, 30, 32, 34];
    const result = score("L-LS-PITCH", { kind: "profile", points: points(stations, errors), resolution: 1 });
    // by hand: any 300 mm window, worst is 180–480: 10 … 30 → 20 µm; any 60 mm: 420–480 → 14 µm
    expect(result.value).toBe(20);
    expect(result.window).toEqual({ from: 180, to: 480 });
    expect(result.tolerance).toBe(40); // ISO 1708:1989, from memory (low confidence): 40 µm over any 300 mm
    expect(result.local).toMatchObject({ value: 14, window: 60, tolerance: 15, pass: true }); // ISO 1708:1989, from memory (low confidence)
    expect(result.pass).toBe(true);
  });
});

describe("tailstock travel and bed twist", () => {
  it("checks the tailstock travel against the 20 µm local tolerance per 500 mm", () => {
    const result = score("L-TS-TRAV-V", {
      kind: "profile",
      points: points([0, 250, 500, 750, 1000], [0, 10, 22, 25, 26]),
      resolution: 1,
    });
    expect(result.value).toBe(26);
    expect(result.tolerance).toBe(30); // ISO 1708:1989, from memory
    expect(result.local).toMatchObject({ value: 22, tolerance: 20, pass: false }); // ISO 1708:1989, from memory
    expect(result.pass).toBe(false);
  });

  it("scores twist as the range of level tilts in µm/m", () => {
    const result = score("L-BED-X", { kind: "level", points: points([0, 500, 1000], [10, -12, 20]), resolution: 2 });
    expect(result.value).toBe(32);
    expect(result.unit).toBe("µm/m");
    expect(result.tolerance).toBe(40); // ISO 1708:1989, from memory: 0.04 mm per metre
    expect(result.pass).toBe(true);
  });
});

describe("warnings", () => {
  it("warns when the instrument is coarser than a tenth of the tolerance", () => {
    const result = score("L-SP-NOSE", { kind: "sweep", readings: [0, 4], resolution: 2 });
    expect(result.warnings.map((w) => w.code)).toEqual(["resolution-coarse"]); // common practice: ten-to-one rule
    expect(score("L-SP-NOSE", { kind: "sweep", readings: [0, 4], resolution: 1 }).warnings).toEqual([]); // common practice: 1 µm = a tenth of 10 µm
  });

  it("warns when the resolution is not given", () => {
    expect(score("L-SP-NOSE", { kind: "sweep", readings: [0, 4] }).warnings.map((w) => w.code)).toEqual(["resolution-missing"]);
  });

  it("warns for each condition not recorded", () => {
    const result = evaluateTest(test("L-SP-NOSE"), { kind: "sweep", readings: [0, 4], resolution: 1 }, { levelled: false });
    // GEOMETRY.md: record ambient temperature (20 °C reference, ISO 1:2016), warm-up and levelling
    expect(result.warnings.map((w) => w.code)).toEqual(["temperature-missing", "warm-up-missing", "levelling-missing"]);
  });
});

describe("precision class", () => {
  it("halves the tolerances, never below 5 µm", () => {
    // Schlesinger, as quoted second-hand: half the normal class; IS 6040:1993: never below 5 µm
    const slip = score("L-SP-SLIP", { kind: "extremes", max: 4, min: 0, resolution: 0.5 }, CENTRE_LATHE_PRECISION);
    expect(slip.tolerance).toBe(5);
    const parallel = score(
      "L-SP-PAR-V",
      { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 4, at180: 4 }, length: 100, resolution: 0.5 },
      CENTRE_LATHE_PRECISION,
    );
    expect(parallel.tolerance).toBe(5); // 10 × 100/300 = 3.3 µm, raised to the 5 µm minimum (IS 6040:1993)
    const bed = test("L-BED-V", CENTRE_LATHE_PRECISION);
    expect(bed.local?.tolerance).toBe(5); // 7.5 / 2 = 3.75 µm, raised to 5 µm (IS 6040:1993)
  });
});

describe("test kinds refuse input they cannot score", () => {
  it.each([
    ["a mandrel length of 0", "L-SP-PAR-V", { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 1, at180: 1 }, length: 0 }, ["length"]],
    ["a negative sleeve length", "L-TS-SLV-V", { kind: "near-far", near: 0, far: 1, length: -100 }, ["length"]],
    ["a non-finite far reading", "L-TS-SLV-V", { kind: "near-far", near: 0, far: NaN }, ["far"]],
    ["one reading over a revolution", "L-SP-NOSE", { kind: "sweep", readings: [3] }, ["readings"]],
    ["no readings over a revolution", "L-SP-NOSE", { kind: "sweep", readings: [] }, ["readings"]],
    ["an infinite reading over a revolution", "L-SP-NOSE", { kind: "sweep", readings: [0, Infinity] }, ["readings", 1]],
    ["one station along a travel", "L-CAR-H", { kind: "profile", points: [{ station: 0, reading: 0 }] }, ["points"]],
    ["a non-finite station", "L-CAR-H", { kind: "profile", points: [{ station: 0, reading: 0 }, { station: NaN, reading: 1 }] }, ["points", 1, "station"]],
    ["a repeated level station", "L-BED-X", { kind: "level", points: [{ station: 5, reading: 0 }, { station: 5, reading: 1 }] }, ["points", 1, "station"]],
    ["a non-finite centre-height reading", "L-CTR-HT", { kind: "centre-height", headstockEnd: 0, tailstockEnd: -Infinity }, ["tailstockEnd"]],
    ["a resolution of 0", "L-SP-NOSE", { kind: "sweep", readings: [0, 1], resolution: 0 }, ["resolution"]],
  ] as const)("%s", (_, code, measurement, path) => {
    try {
      score(code, measurement as unknown as TestMeasurement);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(GeometryInputError);
      expect((error as GeometryInputError).path).toEqual(path);
      expect((error as Error).message.length).toBeGreaterThan(20);
    }
  });
});
