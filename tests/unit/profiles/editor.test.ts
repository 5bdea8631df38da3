// The staff editor's pure part: typed strings through the one profile schema with messages at their fields,
// and the side-by-side difference of two versions.
import { describe, expect, it } from "vitest";
import { CENTRE_LATHE_NORMAL, CENTRE_LATHE_PRECISION, CENTRE_LATHE_PRECISION_V1, type ProfileTest } from "~/geometry";
import { diffProfiles, settingsFormSchema, settingsToForm, testFormSchema, testToForm } from "~/modules/profiles/editor";

const nose = CENTRE_LATHE_NORMAL.tests.find((test) => test.code === "L-SP-NOSE")!;
const bed = CENTRE_LATHE_NORMAL.tests.find((test) => test.code === "L-BED-V")!;

function issuesOf(result: { success: boolean; error?: { issues: Array<{ path: PropertyKey[]; message: string }> } }) {
  expect(result.success).toBe(false);
  return Object.fromEntries(result.error!.issues.map((issue) => [issue.path.map(String).join("."), issue.message]));
}

describe("the test form", () => {
  it("reads back every built-in test unchanged from its own form values", () => {
    for (const test of [...CENTRE_LATHE_NORMAL.tests, ...CENTRE_LATHE_PRECISION.tests]) {
      const parsed = testFormSchema.safeParse(testToForm(test));
      expect(parsed.success, `${test.code}: ${parsed.error?.message}`).toBe(true);
      expect(parsed.data).toEqual(test);
    }
  });

  it("gives every bad value a message at its field", () => {
    const form = testToForm(nose);
    form.tolerance.tolerance = "-6";
    form.code = "l sp";
    form.title = "\u200B";
    form.tolerance.source = { ...form.tolerance.source, confidence: "published", document: "", edition: "", clause: "" };
    const issues = issuesOf(testFormSchema.safeParse(form));
    expect(Object.keys(issues)).toEqual(expect.arrayContaining(["code", "title", "tolerance.tolerance", "tolerance.source.document", "tolerance.source.edition", "tolerance.source.clause"]));
    expect(issues["tolerance.tolerance"]).toMatch(/greater than 0/);
  });

  it("refuses text no field should hold (NUL, Infinity typed as a word) at the field", () => {
    const form = testToForm(nose);
    form.instrument = "dial\u0000indicator";
    form.tolerance.tolerance = "Infinity";
    const issues = issuesOf(testFormSchema.safeParse(form));
    expect(Object.keys(issues)).toEqual(expect.arrayContaining(["instrument", "tolerance.tolerance"]));
  });

  it("keeps stepped rows at their places: an empty row between two filled ones is an error there", () => {
    const form = testToForm(bed);
    form.tolerance.steps[1] = { upTo: "", tolerance: "" };
    const issues = issuesOf(testFormSchema.safeParse(form));
    expect(Object.keys(issues)).toEqual(expect.arrayContaining(["tolerance.steps.1.upTo", "tolerance.steps.1.tolerance"]));
  });
});

describe("the settings form", () => {
  it("reads back the precision class v2 with its IS 6040:1993 rules", () => {
    const parsed = settingsFormSchema.safeParse(settingsToForm(CENTRE_LATHE_PRECISION));
    expect(parsed.success, parsed.error?.message).toBe(true);
    expect(parsed.data).toMatchObject({ scope: CENTRE_LATHE_PRECISION.scope, rules: CENTRE_LATHE_PRECISION.rules });
  });

  it("asks for a maker's chart title when the profile is a maker's chart", () => {
    const form = settingsToForm(CENTRE_LATHE_NORMAL);
    form.hasMaker = "on";
    form.scope.maker = { make: "Orvald", model: "TL-360", serialFrom: "", serialTo: "", chart: "" };
    expect(Object.keys(issuesOf(settingsFormSchema.safeParse(form)))).toEqual(["scope.maker.chart"]);
  });
});

describe("the difference of two versions", () => {
  it("marks exactly the values that changed, side by side", () => {
    const tightened: ProfileTest = { ...nose, tolerance: { ...nose.tolerance, tolerance: 6 } as ProfileTest["tolerance"] };
    const after = { ...CENTRE_LATHE_NORMAL, version: 2, tests: CENTRE_LATHE_NORMAL.tests.map((test) => (test.code === "L-SP-NOSE" ? tightened : test)) };
    const diff = diffProfiles(CENTRE_LATHE_NORMAL, after);
    expect(diff.settingsChanged).toBe(false);
    expect(diff.tests).toHaveLength(1);
    expect(diff.tests[0]!.rows.filter((row) => row.changed)).toEqual([{ label: "Tolerance", before: "10 µm", after: "6 µm", changed: true }]);
    expect(diff.unchanged).toBe(CENTRE_LATHE_NORMAL.tests.length - 1);
  });

  it("shows the precision class's move to IS 6040:1993 as changed scope and rules", () => {
    const diff = diffProfiles(CENTRE_LATHE_PRECISION_V1, CENTRE_LATHE_PRECISION);
    const changed = diff.settings.filter((row) => row.changed).map((row) => row.label);
    expect(changed).toEqual(expect.arrayContaining(["Size covered", "Rounding", "Instrument least count"]));
    expect(diff.settings.find((row) => row.label === "Rounding")!.after).toMatch(/2 µm.*IS 6040:1993, clause 3.5/);
  });
});
