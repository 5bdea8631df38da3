// The scoring API against the profile versions in the database (the built-in ones, seeded with the migrations).
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { action, loader } from "~/routes/api.v1.evaluations";
import { WELL_KEPT_LATHE } from "../../unit/geometry/fixtures";

type ActionArgs = Parameters<typeof action>[0];

function post(body: unknown, method = "POST") {
  const request = new Request("http://localhost/api/v1/evaluations", {
    method,
    headers: { "Content-Type": "application/json" },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });
  return action({ request, params: {}, context: { get: () => getDatabase() } } as unknown as ActionArgs);
}

// Worked example, GEOMETRY.md: straightness 0, −4, +2, +6, +3, +8 µm at 0…500 mm; mandrel +30/+10 far, 0/0 near.
const WORKED_EXAMPLE = {
  profile: { key: "centre-lathe-normal", version: 1 },
  units: "mm",
  measurements: {
    measuredOn: "2025-03-14",
    conditions: { ambientTemperatureC: 20.5, warmUpMinutes: 30, levelled: true },
    tests: {
      "L-CAR-H": {
        kind: "profile",
        reference: "minimum-zone",
        resolution: 1,
        points: [0, 100, 200, 300, 400, 500].map((station, i) => ({ station, reading: [0, -4, 2, 6, 3, 8][i] })),
      },
      "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 30, at180: 10 }, resolution: 1 },
    },
  },
};

describe("POST /api/v1/evaluations", () => {
  it("scores the worked example with numbers one can check by hand", async () => {
    const response = await post(WORKED_EXAMPLE);
    expect(response.status).toBe(200);
    const body = await response.json();
    const [straightness, mandrel] = body.results;
    expect(straightness.code).toBe("L-CAR-H");
    expect(straightness.value).toBeCloseTo(6.0, 9); // worked example, GEOMETRY.md: minimum zone 6.0 µm
    expect(straightness.straightness.line.slope).toBeCloseTo(0.02, 12); // worked example, GEOMETRY.md
    expect(straightness.tolerance).toBe(15); // ISO 1708:1989, from memory: DC ≤ 500 → 15 µm
    expect(mandrel.value).toBe(20); // worked example, GEOMETRY.md: +20 µm over 300 mm
    expect(mandrel.pass).toBe(true); // worked example, GEOMETRY.md: passes at the limit
    expect(body.grade).toBe("incomplete"); // only two of the required tests were read
    expect(body.keyFigures.spindleParallelismVertical).toBe(20);
    expect(body.measuredOn).toBe("2025-03-14");
    // Every tolerance names its source and how far it can be trusted (GEOMETRY.md labels).
    expect(straightness.sources.tolerance).toBe("ISO 1708:1989, from memory");
    expect(straightness.confidence).toMatchObject({ tolerance: "from-memory", direction: "from-memory" });
    expect(mandrel.confidence.direction).toBe("common-practice");
  });

  it("scores with version 2 of the precision class on the 2 µm grid (IS 6040:1993, clause 3.5)", async () => {
    const response = await post({
      profile: { key: "centre-lathe-precision", version: 2 },
      units: "mm",
      measurements: { tests: { "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 8, at180: 8 }, length: 250, resolution: 2 } } },
    });
    expect(response.status).toBe(200);
    const [axis] = (await response.json()).results;
    expect(axis.tolerance).toBe(8); // 10 µm / 300 mm at 250 mm = 8.33 → 8 µm (IS 6040:1993, clause 3.5)
    expect(axis.warnings.map((w: { code: string }) => w.code)).not.toContain("resolution-coarse"); // least count 2 µm, clause 3.5
  });

  it("grades a full report", async () => {
    const response = await post({ ...WORKED_EXAMPLE, measurements: { ...WORKED_EXAMPLE.measurements, tests: WELL_KEPT_LATHE } });
    expect(response.status).toBe(200);
    expect((await response.json()).grade).toBe("A");
  });

  it("takes inches", async () => {
    const inch = {
      ...WORKED_EXAMPLE,
      units: "inch",
      measurements: {
        tests: {
          "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 0.0012, at180: 0.0004 }, length: 12 },
        },
      },
    };
    const body = await (await post(inch)).json();
    expect(body.results[0].value).toBeCloseTo(20.32, 9); // NIST SP 811: 0.0008 in × 25 400
    expect(body.results[0].tolerance).toBeCloseTo(20.32, 9); // ISO 230-1, from memory: 20 × 304.8/300
  });

  it("answers 422 with per-field errors for bad input", async () => {
    const bad = structuredClone(WORKED_EXAMPLE) as { measurements: { tests: Record<string, Record<string, unknown>> } };
    bad.measurements.tests["L-SP-PAR-V"]!["far"] = { at0: 30 };
    (bad.measurements.tests["L-CAR-H"]!["points"] as { station: number }[])[3]!.station = 200;
    const response = await post(bad);
    expect(response.status).toBe(422);
    const { errors } = await response.json();
    expect(errors["measurements.tests.L-SP-PAR-V.far.at180"]).toEqual([
      "The far-end reading with the spindle turned 180° is required (µm, or inches in inch mode).",
    ]);
    expect(errors["measurements.tests.L-CAR-H.points.3.station"][0]).toMatch(/given twice/);
  });

  it("answers 422 when the readings do not fit the profile", async () => {
    const response = await post({
      ...WORKED_EXAMPLE,
      measurements: { tests: { "L-BED-V": { kind: "profile", points: [{ station: 0, reading: 0 }, { station: 2000, reading: 5 }] } } },
    });
    expect(response.status).toBe(422);
    const { errors } = await response.json();
    expect(errors["measurements.tests.L-BED-V.points"][0]).toMatch(/beyond the 1500 mm/);
  });

  it("answers 400 for a body that is not JSON", async () => {
    const response = await post("{ not json");
    expect(response.status).toBe(400);
    expect((await response.json()).errors.request).toHaveLength(1);
  });

  it("answers 405 to other methods", async () => {
    const put = await post(WORKED_EXAMPLE, "PUT");
    expect(put.status).toBe(405);
    expect(put.headers.get("Allow")).toBe("POST");
    const get = await loader();
    expect(get.status).toBe(405);
  });
});
