// Which stored reports cannot be scored or drawn, and their readings as plain lines whatever their shape.
import { describe, expect, it } from "vitest";
import { CENTRE_LATHE_NORMAL, scoreReport, type ReportMeasurements } from "~/geometry";
import type { ReportContent } from "~/modules/reports/content";
import { storedReadings } from "~/modules/reports/stored-readings";
import { unrenderableNotice, unrenderableReason } from "~/modules/reports/unrenderable";

function contentOf(measurements: ReportMeasurements, score = scoreReport(CENTRE_LATHE_NORMAL, measurements)): ReportContent {
  return { entryUnits: "mm", measurements, measurementsAsEntered: measurements, score } as unknown as ReportContent;
}

const sound: ReportMeasurements = {
  tests: {
    "L-SP-NOSE": { kind: "sweep", readings: [0, 2, 4, 2] },
    "L-BED-V": { kind: "profile", points: [{ station: 0, reading: 0 }, { station: 500, reading: 5 }, { station: 1000, reading: 0 }] },
  },
};

describe("a stored report", () => {
  it("that the engine scored within the limits renders", () => {
    expect(unrenderableReason(contentOf(sound))).toBeNull();
    expect(unrenderableNotice(contentOf(sound))).toBeNull();
  });

  it("with a reading of 1e308, or a result stored as null (Infinity in JSON), does not, and says where", () => {
    const huge = structuredClone(sound);
    huge.tests["L-SP-NOSE"] = { kind: "sweep", readings: [1e308, -1e308] };
    expect(unrenderableReason(contentOf(huge, scoreReport(CENTRE_LATHE_NORMAL, sound)))).toMatch(/^L-SP-NOSE, reading 1: Must lie within ±100 000 µm/);

    const score = JSON.parse(JSON.stringify({ ...scoreReport(CENTRE_LATHE_NORMAL, sound), worstRatio: Infinity }));
    score.results[0].value = null;
    expect(unrenderableReason(contentOf(sound, score))).toMatch(/its value is not a number/);
    expect(unrenderableNotice(contentOf(sound, score))).toMatch(/cannot be scored or drawn.*readings and its seal/);
  });

  it("lists every test's readings as lines, null shown as not a number", () => {
    const odd = structuredClone(sound) as unknown as { tests: Record<string, unknown> };
    odd.tests["L-SP-PAR-V"] = { kind: "mandrel", near: { at0: 0, at180: null }, far: { at0: 30, at180: 10 } };
    const lines = storedReadings(contentOf(sound, scoreReport(CENTRE_LATHE_NORMAL, sound)) as ReportContent);
    expect(lines.find((test) => test.code === "L-BED-V")!.lines).toEqual(["Station 0 mm: 0 µm", "Station 500 mm: 5 µm", "Station 1000 mm: 0 µm"]);
    const withNull = storedReadings({ ...contentOf(sound), measurementsAsEntered: odd } as unknown as ReportContent);
    expect(withNull.find((test) => test.code === "L-SP-PAR-V")!.lines).toEqual(["Near: at 0° 0, at 180° not a number", "Far: at 0° 30, at 180° 10"]);
  });
});
