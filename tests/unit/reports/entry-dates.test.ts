import { describe, expect, it } from "vitest";
import { dayAtMachine } from "~/modules/inspections/local-time";
import { emptyTestEntry, measuredOnCheck, previewReport, reportFormSchema, resolutionNote } from "~/modules/reports/form";
import { CENTRE_LATHE_NORMAL } from "~/geometry";

const days = { today: "2026-12-04", visitDay: "2026-12-07" };

describe("the date of the tests", () => {
  it("refuses a date after today where the machine stands", () => {
    expect(measuredOnCheck("2026-12-05", days).error).toMatch(/in the future/);
    expect(measuredOnCheck("2026-12-04", days).error).toBeNull();
    expect(measuredOnCheck("", days).error).toMatch(/Give the date/);
  });

  it("warns, without refusing, on a date before the booked visit", () => {
    const early = measuredOnCheck("2026-12-03", { today: "2026-12-10", visitDay: "2026-12-07" });
    expect(early.error).toBeNull();
    expect(early.warning).toMatch(/2026-12-03 is before the booked visit \(2026-12-07\)/);
    expect(measuredOnCheck("2026-12-07", { today: "2026-12-10", visitDay: "2026-12-07" }).warning).toBeNull();
  });

  it("takes the calendar day at the machine's place (IANA zones)", () => {
    // 23:30 UTC on 4 December is already 5 December in Auckland (UTC+13 in December) and still the 4th in London.
    expect(dayAtMachine("2026-12-04T23:30:00Z", { country: "NZ" })).toBe("2026-12-05");
    expect(dayAtMachine("2026-12-04T23:30:00Z", { country: "GB" })).toBe("2026-12-04");
    expect(dayAtMachine("2026-12-04T23:30:00Z", { country: "US" })).toBe("2026-12-04"); // several zones: UTC
  });
});

describe("a level chosen for a height profile", () => {
  const instruments = [
    { id: "i1", kind: "dial-indicator" as const, description: "", resolution: "1", calibrationDue: "" },
    { id: "i2", kind: "precision-level" as const, description: "", resolution: "20", calibrationDue: "" },
  ];
  const profile = { ...emptyTestEntry("profile"), points: [0, 250, 500, 750, 1000].map((station, i) => ({ station: String(station), reading: String([0, 3, 5, 4, 0][i]) })), instrumentId: "i2" };

  it("says why the level's resolution does not apply, instead of saying none was given", () => {
    const form = reportFormSchema.parse({
      units: "mm",
      profile: { key: CENTRE_LATHE_NORMAL.key, version: CENTRE_LATHE_NORMAL.version, reason: "" },
      measuredOn: "2026-12-04",
      conditions: { ambientTemperatureC: "20", warmUpMinutes: "30", levelled: "yes", notes: "" },
      instruments,
      tests: { "L-BED-V": profile },
      notes: "",
      safetyAcknowledged: true,
    });
    const preview = previewReport(form, CENTRE_LATHE_NORMAL)!;
    const messages = preview.tests.find((test) => test.test.code === "L-BED-V")!.result!.warnings.map((warning) => warning.message);
    expect(messages.some((message) => message.startsWith("No instrument resolution given"))).toBe(false);
    expect(messages.join(" ")).toMatch(/The level reads tilt \(µm\/m\), not steps of the heights entered here \(µm\)/);
  });

  it("is silent when the test has its own resolution, or the readings are tilts", () => {
    expect(resolutionNote({ ...profile, resolution: "2" } , instruments, "mm")).toBeNull();
    expect(resolutionNote({ ...profile, kind: "level" } , instruments, "mm")).toBeNull();
    expect(resolutionNote({ ...profile, instrumentId: "i1" } , instruments, "mm")).toBeNull();
  });
});
