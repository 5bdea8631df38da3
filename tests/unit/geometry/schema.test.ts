import { describe, expect, it } from "vitest";
import {
  BUILT_IN_PROFILES,
  CENTRE_LATHE_NORMAL,
  evaluationRequestSchemaFor,
  fieldErrors,
  mandrelMeasurementSchema,
  profileMeasurementSchema,
  scoreEvaluation,
  testMeasurementSchema,
  toMetric,
} from "~/geometry";
import { WELL_KEPT_LATHE } from "./fixtures";

function errorsOf(schema: { safeParse(value: unknown): { success: boolean; error?: unknown } }, value: unknown) {
  const result = schema.safeParse(value);
  expect(result.success).toBe(false);
  return fieldErrors(result.error as never);
}

describe("measurement schemas", () => {
  it("accept every measurement of the well-kept lathe", () => {
    for (const [code, measurement] of Object.entries(WELL_KEPT_LATHE)) {
      expect(testMeasurementSchema.safeParse(measurement).success, code).toBe(true);
    }
  });

  it("say which field is wrong, in words", () => {
    const errors = errorsOf(mandrelMeasurementSchema, { kind: "mandrel", near: { at0: 0 }, far: { at0: "x", at180: 1 } });
    expect(errors["near.at180"]).toEqual(["The near-end reading with the spindle turned 180° is required (µm, or inches in inch mode)."]);
    expect(errors["far.at0"]).toEqual(["The far-end reading with the spindle at 0° must be a number (µm, or inches in inch mode)."]);
  });

  it("point at a station read twice", () => {
    const errors = errorsOf(profileMeasurementSchema, {
      kind: "profile",
      points: [
        { station: 0, reading: 0 },
        { station: 100, reading: 1 },
        { station: 100, reading: 2 },
      ],
    });
    expect(errors["points.2.station"]![0]).toMatch(/Station 100 is given twice \(points 2 and 3\)/);
  });

  it("refuse fewer than two stations, a zero resolution and an unknown reference", () => {
    const errors = errorsOf(profileMeasurementSchema, {
      kind: "profile",
      points: [{ station: 0, reading: 0 }],
      resolution: 0,
      reference: "eyeball",
    });
    expect(Object.keys(errors).sort()).toEqual(["points", "reference", "resolution"]);
  });

  it("ask for the kind of readings when it is missing", () => {
    const errors = errorsOf(testMeasurementSchema, { readings: [1, 2] });
    expect(errors["kind"]![0]).toMatch(/Say which kind of readings/);
  });
});

describe("the evaluation request", () => {
  const evaluationRequestSchema = evaluationRequestSchemaFor(BUILT_IN_PROFILES);
  const request = (overrides: Record<string, unknown> = {}) => ({
    profile: { key: "centre-lathe-normal", version: 1 },
    units: "mm",
    measurements: { tests: { "L-SP-NOSE": { kind: "sweep", readings: [0, 4] } } },
    ...overrides,
  });

  it("names an unknown profile, version, test and kind", () => {
    expect(Object.keys(errorsOf(evaluationRequestSchema, request({ profile: { key: "mill", version: 1 } })))).toEqual(["profile.key"]);
    expect(Object.keys(errorsOf(evaluationRequestSchema, request({ profile: { key: "centre-lathe-normal", version: 9 } })))).toEqual([
      "profile.version",
    ]);
    const wrong = errorsOf(
      evaluationRequestSchema,
      request({ measurements: { tests: { "L-NOPE": { kind: "sweep", readings: [0, 1] }, "L-CTR-HT": { kind: "sweep", readings: [0, 1] } } } }),
    );
    expect(Object.keys(wrong).sort()).toEqual(["measurements.tests.L-CTR-HT.kind", "measurements.tests.L-NOPE"]);
  });

  it("insists on the units", () => {
    const errors = errorsOf(evaluationRequestSchema, request({ units: undefined }));
    expect(errors["units"]![0]).toMatch(/"mm".*"inch"/);
  });
});

describe("inch mode", () => {
  it("converts readings to µm and stations to mm before scoring", () => {
    const metric = toMetric(
      {
        tests: {
          "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 0.0012, at180: 0.0004 }, length: 12, resolution: 0.0001 },
          "L-CAR-H": { kind: "profile", points: [{ station: 0, reading: 0 }, { station: 10, reading: 0.0002 }, { station: 20, reading: 0 }] },
          "L-BED-X": { kind: "level", points: [{ station: 0, reading: 40 }, { station: 20, reading: 10 }] },
        },
      },
      "inch",
    );
    const mandrel = metric.tests["L-SP-PAR-V"]!;
    expect(mandrel.kind === "mandrel" && mandrel.far.at0).toBeCloseTo(30.48, 9); // NIST SP 811: 0.0012 × 25 400
    expect(mandrel.kind === "mandrel" && mandrel.length).toBeCloseTo(304.8, 9); // NIST SP 811: 12 × 25.4
    expect(mandrel.resolution).toBeCloseTo(2.54, 12); // NIST SP 811
    const profile = metric.tests["L-CAR-H"]!;
    expect(profile.kind === "profile" && profile.points[1]).toEqual({ station: 254, reading: 5.08 }); // NIST SP 811
    const level = metric.tests["L-BED-X"]!;
    expect(level.kind === "level" && level.points[1]).toEqual({ station: 508, reading: 10 }); // a tilt is a ratio: µin/in = µm/m
  });

  it("scores the same machine the same in either unit", () => {
    // the worked example of GEOMETRY.md, mandrel readings given in inches (NIST SP 811: 1 in = 25.4 mm)
    const inch = scoreEvaluation(CENTRE_LATHE_NORMAL, {
      profile: { key: "centre-lathe-normal", version: 1 },
      units: "inch",
      measurements: {
        tests: { "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 30 / 25_400, at180: 10 / 25_400 } } },
      },
    });
    const result = inch.results[0]!;
    expect(result.value).toBeCloseTo(20, 9); // worked example, GEOMETRY.md
    expect(result.pass).toBe(true); // passes at the limit despite the floating-point round trip
    expect(inch.inputUnits).toBe("inch");
  });
});
