// Counts and magnitudes the shared measurement schema, the engine and the report form refuse, each with a
// message at the field that names the limit. The limits themselves are ours (app/geometry/limits.ts says why).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  BUILT_IN_PROFILES,
  CENTRE_LATHE_NORMAL,
  evaluationRequestSchemaFor,
  fieldErrors,
  GeometryInputError,
  MEASUREMENT_LIMITS,
  scoreReport,
  testMeasurementSchema,
  type TestMeasurement,
} from "~/geometry";
import { checkTestEntry, emptyTestEntry, formLimitErrors, newReportForm, previewReport } from "~/modules/reports/form";

const evaluationRequestSchema = evaluationRequestSchemaFor(BUILT_IN_PROFILES);

const stations = (count: number, reading = (i: number) => i % 7) =>
  Array.from({ length: count }, (_, i) => ({ station: i, reading: reading(i) }));

function request(tests: Record<string, unknown>, units: "mm" | "inch" = "mm") {
  return { profile: { key: CENTRE_LATHE_NORMAL.key, version: CENTRE_LATHE_NORMAL.version }, units, measurements: { tests } };
}

function errorsOf(value: unknown) {
  const parsed = evaluationRequestSchema.safeParse(value);
  expect(parsed.success).toBe(false);
  return fieldErrors(parsed.error!);
}

describe("counts in one request", () => {
  it("take 1 000 stations per test and refuse the 1 001st, naming the limit", () => {
    expect(MEASUREMENT_LIMITS.stationsPerTest).toBe(1000);
    expect(evaluationRequestSchema.safeParse(request({ "L-BED-V": { kind: "profile", points: stations(1000) } })).success).toBe(true);
    const errors = errorsOf(request({ "L-BED-V": { kind: "profile", points: stations(1001) } }));
    expect(errors["measurements.tests.L-BED-V.points"]).toEqual([expect.stringContaining("At most 1 000 stations per test")]);
  });

  it("refuse more than 1 000 readings in a sweep and more tests than a request may hold", () => {
    const sweep = errorsOf(request({ "L-SP-NOSE": { kind: "sweep", readings: Array.from({ length: 1001 }, (_, i) => i % 5) } }));
    expect(sweep["measurements.tests.L-SP-NOSE.readings"]![0]).toMatch(/At most 1 000 readings per sweep/);
    const many = Object.fromEntries(Array.from({ length: MEASUREMENT_LIMITS.testsPerRequest + 1 }, (_, i) => [`T-${i}`, { kind: "extremes", max: 1, min: 0 }]));
    expect(errorsOf(request(many))["measurements.tests"]![0]).toMatch(/At most 64 tests per request/);
  });
});

describe("magnitudes", () => {
  it("refuse ±1e308 and anything beyond 100 mm at the reading's own field, in the request's units", () => {
    const errors = errorsOf(
      request({
        "L-BED-V": { kind: "profile", points: [{ station: 0, reading: 0 }, { station: 500, reading: 1e308 }, { station: 1000, reading: -1e308 }] },
        "L-SP-NOSE": { kind: "sweep", readings: [0, 100_001] },
        "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 1e200, at180: 0 } },
        "L-BED-X": { kind: "level", points: [{ station: -1e6, reading: 0 }, { station: 0, reading: 0 }] },
      }),
    );
    expect(errors["measurements.tests.L-BED-V.points.1.reading"]![0]).toMatch(/within ±100 000 µm \(100 mm\)/);
    expect(errors["measurements.tests.L-BED-V.points.2.reading"]).toBeDefined();
    expect(errors["measurements.tests.L-SP-NOSE.readings.1"]).toBeDefined();
    expect(errors["measurements.tests.L-SP-PAR-V.far.at0"]).toBeDefined();
    expect(errors["measurements.tests.L-BED-X.points.0.station"]![0]).toMatch(/within ±100 000 mm \(100 m\)/);
    // 100 mm itself is a reading; 4 in is 101.6 mm and is not.
    expect(evaluationRequestSchema.safeParse(request({ "L-SP-NOSE": { kind: "sweep", readings: [0, 100_000] } })).success).toBe(true);
    expect(errorsOf(request({ "L-SP-NOSE": { kind: "sweep", readings: [0, 4] } }, "inch"))["measurements.tests.L-SP-NOSE.readings.1"]![0]).toMatch(/±3.937 in/);
  });

  it("refuse two stations closer than 1 µm, whose slope would explode, in the schema and in the engine", () => {
    const points = [{ station: 0, reading: 0 }, { station: 5e-324, reading: 1 }, { station: 500, reading: 0 }];
    expect(errorsOf(request({ "L-CAR-H": { kind: "profile", points } }))["measurements.tests.L-CAR-H.points.1.station"]![0]).toMatch(/closer than 0.001 mm/);
    expect(() => scoreReport(CENTRE_LATHE_NORMAL, { tests: { "L-CAR-H": { kind: "profile", points } } })).toThrow(/closer than 0.001 mm/);
  });

  it("never let the engine return a non-finite number for what the schema accepts (property)", () => {
    // Any readings within the limits, however extreme: every value, tolerance and ratio stays finite.
    const reading = fc.double({ min: -MEASUREMENT_LIMITS.readingUm, max: MEASUREMENT_LIMITS.readingUm, noNaN: true });
    const station = fc.double({ min: -MEASUREMENT_LIMITS.stationMm, max: MEASUREMENT_LIMITS.stationMm, noNaN: true });
    fc.assert(
      fc.property(fc.uniqueArray(station, { minLength: 2, maxLength: 40, selector: (x) => x }), fc.array(reading, { minLength: 40, maxLength: 40 }), fc.constantFrom("end-points", "least-squares", "minimum-zone"), (xs, ys, reference) => {
        const measurement = { kind: "profile", reference, points: xs.map((x, i) => ({ station: x, reading: ys[i]! })) };
        if (!testMeasurementSchema.safeParse(measurement).success) return;
        let score;
        try {
          score = scoreReport(CENTRE_LATHE_NORMAL, { tests: { "L-CAR-H": measurement as TestMeasurement, "L-SP-NOSE": { kind: "sweep", readings: [ys[0]!, ys[1]!] } } });
        } catch (error) {
          // A travel longer than the profile covers is refused with a message, which is fine.
          expect(error).toBeInstanceOf(GeometryInputError);
          return;
        }
        for (const result of score.results) {
          for (const value of [result.value, result.tolerance, result.ratio, result.straightness?.line.slope ?? 0, result.straightness?.line.intercept ?? 0]) {
            expect(Number.isFinite(value)).toBe(true);
          }
        }
      }),
      { numRuns: 300 },
    );
  });

  it("are the engine's own last word: a direct call with 1e308 is refused at the field", () => {
    expect(() => scoreReport(CENTRE_LATHE_NORMAL, { tests: { "L-SP-NOSE": { kind: "sweep", readings: [1e308, -1e308] } } })).toThrow(
      expect.objectContaining({ path: ["tests", "L-SP-NOSE", "readings", 0], message: expect.stringMatching(/100 000 µm/) }),
    );
    expect(() =>
      scoreReport(CENTRE_LATHE_NORMAL, { tests: { "L-BED-V": { kind: "profile", points: [{ station: 0, reading: 1e200 }, { station: 500, reading: 0 }, { station: 1000, reading: -1e200 }] } } }),
    ).toThrow(expect.objectContaining({ path: ["tests", "L-BED-V", "points", 0, "reading"] }));
  });
});

describe("the report form", () => {
  it("says at the field that a typed reading is beyond what the tests read, even half typed", () => {
    const entry = { ...emptyTestEntry("profile"), points: [{ station: "0", reading: "1e308" }] };
    expect(checkTestEntry(entry, [], "mm").errors["points.0.reading"]![0]).toMatch(/within ±100 000 µm/);
    const overflow = { ...emptyTestEntry("sweep"), readings: ["0", "1e999"] };
    expect(checkTestEntry(overflow, [], "mm").errors["readings.1"]![0]).toMatch(/within ±100 000 µm/);
    const inches = { ...emptyTestEntry("near-far"), near: "0", far: "5" };
    expect(checkTestEntry(inches, [], "inch").errors["far"]![0]).toMatch(/±3.937 in/);
    expect(checkTestEntry(inches, [], "mm").state).toBe("complete");
  });

  it("lists every such number of a form, instruments included, keyed as the entry page shows them", () => {
    const form = newReportForm({ profileKey: CENTRE_LATHE_NORMAL.key, profileVersion: 1, units: "mm", measuredOn: "2025-03-14" });
    form.tests["L-SP-PAR-V"] = { ...emptyTestEntry("mandrel"), near0: "0", near180: "0", far0: "-1e308", far180: "0" };
    form.instruments[0]!.resolution = "1e300";
    expect(Object.keys(formLimitErrors(form)).sort()).toEqual(["instruments.0.resolution", "tests.L-SP-PAR-V.far0"]);
    const preview = previewReport(form, CENTRE_LATHE_NORMAL)!;
    expect(preview.tests.find((test) => test.test.code === "L-SP-PAR-V")!.check.state).toBe("invalid");
  });
});
