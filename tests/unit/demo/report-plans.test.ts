// The demo reports' invented readings score to the grades the demo says, by the same engine the server
// uses; the readings look like an inspector's (whole steps of the instrument, directions as planned).
import { describe, expect, it } from "vitest";
import { reportFormSchema, checkTestEntry, metricMeasurements, checkConditions, profileOf } from "~/modules/reports/form";
import { BUILT_IN_PROFILES, scoreReport, type TestMeasurement } from "~/geometry";
import { demoReportPlans, formFor } from "~/demo/report-plans";
import { demoReadings } from "~/demo/report-readings";

const measured = new Date(Date.UTC(2026, 2, 10));

/** Scores a demo form the way the server's submission does: typed strings, through the form's own checks. */
function scoreAsServer(form: unknown) {
  const parsed = reportFormSchema.parse(form);
  const tests: Record<string, TestMeasurement> = {};
  for (const [code, entry] of Object.entries(parsed.tests)) {
    const check = checkTestEntry(entry, parsed.instruments);
    expect(check.state, `${code}: ${JSON.stringify(check.errors)}`).toBe("complete");
    tests[code] = check.measurement!;
  }
  const conditions = checkConditions(parsed);
  return scoreReport(profileOf(parsed, BUILT_IN_PROFILES)!, metricMeasurements(parsed, tests, conditions.values));
}

describe("demo report plans", () => {
  it("has twenty-three reports, each grade at least once, mills, grinders and CNC machines among them, one corrected and one over twelve months old", () => {
    expect(demoReportPlans).toHaveLength(23);
    expect(demoReportPlans.filter((plan) => plan.profileKey === "cnc-lathe-normal")).toHaveLength(1);
    expect(demoReportPlans.filter((plan) => plan.profileKey === "vertical-machining-centre-normal")).toHaveLength(2);
    expect(demoReportPlans.filter((plan) => plan.profileKey === "knee-mill-normal")).toHaveLength(3);
    expect(demoReportPlans.filter((plan) => plan.profileKey === "surface-grinder-normal")).toHaveLength(2);
    for (const grade of ["A", "B", "C", "D", "incomplete"]) expect(demoReportPlans.some((plan) => plan.grade === grade), grade).toBe(true);
    expect(demoReportPlans.filter((plan) => plan.correction)).toHaveLength(1);
    expect(demoReportPlans.some((plan) => plan.measuredDaysAgo > 366)).toBe(true);
  });

  for (const plan of demoReportPlans) {
    it(`${plan.model} scores ${plan.grade} as the server would score it`, () => {
      const { form, score } = formFor(plan, undefined, measured, plan.notes);
      expect(score.grade).toBe(plan.grade);
      expect(scoreAsServer(form).grade).toBe(plan.grade);
      if (plan.grade !== "incomplete") expect(score.missing).toEqual([]);
      // No warning about the instruments: each resolution is fine enough for its tolerance (ten-to-one rule, common practice).
      for (const result of score.results) expect(result.warnings.map((warning) => warning.code)).not.toContain("resolution-coarse");
      if (plan.correction) {
        const first = formFor(plan, plan.correction.firstRatios, measured, plan.correction.firstNotes);
        expect(first.score.grade).toBe(plan.correction.firstGrade);
        expect(scoreAsServer(first.form).grade).toBe(plan.correction.firstGrade);
      }
    });
  }

  it("draws the same readings from the same seed", () => {
    const machine = { profileKey: "centre-lathe-normal", units: "mm" as const, travel: 1000, crossTravel: 150, indicatorResolution: 1, levelResolution: 2, band: [0.2, 0.4] as [number, number], seed: 7 };
    expect(demoReadings(machine)).toEqual(demoReadings(machine));
  });
});
