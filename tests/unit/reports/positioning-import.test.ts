// Importing an instrument's deviation table into a report's positioning tests: the mapping, the preview's
// figures, the form's units, refusals naming the line, and the limits of what a report carries.
import { describe, expect, it } from "vitest";
import { MACHINING_CENTRE_NORMAL, positioningAccuracy } from "~/geometry";
import { deviationTable, demoAxisRuns } from "~/demo/positioning-runs";
import { checkTestEntry, emptyTestEntry, newReportForm, previewReport, testEntrySchema } from "~/modules/reports/form";
import { formFromContent } from "~/modules/reports/form-from-content";
import { columnMappingSchema, defaultMapping, importRadial, importRuns, IMPORT_LIMITS, previewCells } from "~/modules/reports/positioning-import";

const axis = demoAxisRuns({ travel: 600, targets: 11, runs: 5, seed: 7, ratio: 0.45, tolerances: { accuracy: 25, repeatability: 15, reversal: 10 } });
const mm = defaultMapping("mm");

describe("importing a deviation table", () => {
  it("gives the runs and the same figures as the engine computes from them (engine cross-checked against simple-statistics in positioning.test.ts)", () => {
    const imported = importRuns(deviationTable(axis), mm, "mm");
    if (!imported.ok) throw new Error(imported.message);
    expect(imported.runs.targets).toEqual(axis.targets);
    expect(imported.runs.forward).toEqual(axis.forward);
    expect(imported.runs.reverse).toEqual(axis.reverse);
    expect(imported.summary).toMatchObject({ targets: 11, forwardRuns: 5, reverseRuns: 5, from: 0, to: 600 });
    expect(imported.evaluation.accuracy).toBeCloseTo(positioningAccuracy(axis).accuracy, 9);
  });

  it("reads decimal commas with semicolons, the same as the decimal point", () => {
    const comma = importRuns(deviationTable(axis, { decimalComma: true }), { ...mm, decimalComma: true }, "mm");
    const point = importRuns(deviationTable(axis), mm, "mm");
    expect(comma.ok && point.ok && comma.runs).toEqual(point.ok && point.runs);
  });

  it("keeps an inch form's runs in inches, which the engine's conversion turns back into the same figures", () => {
    const imported = importRuns(deviationTable(axis), mm, "inch");
    if (!imported.ok) throw new Error(imported.message);
    expect(imported.runs.targets.at(-1)).toBeCloseTo(600 / 25.4, 6);
    const form = newReportForm({ profileKey: MACHINING_CENTRE_NORMAL.key, profileVersion: 1, units: "inch", measuredOn: "2026-11-30" });
    form.tests["V-X-A"] = { ...emptyTestEntry("positioning"), runs: imported.runs };
    const result = previewReport(form, MACHINING_CENTRE_NORMAL)!.tests.find((test) => test.test.code === "V-X-A")!.result!;
    // Rounded to 1e-8 in (0.25 nm) on import: the figures agree to well under a thousandth of a micrometre.
    expect(result.value).toBeCloseTo(positioningAccuracy(axis).accuracy, 3);
  });

  it("reads a table written in inches into millimetres and micrometres", () => {
    const inches = { targets: axis.targets.map((t) => t / 25.4), forward: axis.forward.map((r) => r.map((v) => v / 25_400)), reverse: axis.reverse.map((r) => r.map((v) => v / 25_400)) };
    const imported = importRuns(deviationTable(inches), { ...mm, targetUnit: "in", deviationUnit: "in" }, "mm");
    if (!imported.ok) throw new Error(imported.message);
    expect(imported.evaluation.accuracy).toBeCloseTo(positioningAccuracy(axis).accuracy, 3);
  });

  it("refuses a line that does not parse, naming it, and a mapping that reads one column twice", () => {
    const lines = deviationTable(axis).split("\n");
    lines[7] = "1,+,oops,0.3";
    const refused = importRuns(lines.join("\n"), mm, "mm");
    expect(refused).toEqual({ ok: false, message: expect.stringMatching(/^Line 8: the target "oops" is not a number/) });
    expect(importRuns(deviationTable(axis), { ...mm, deviation: 2 }, "mm")).toEqual({ ok: false, message: expect.stringMatching(/different column/) });
    expect(importRuns("run,direction,target,deviation\n1,+,0,1\n1,+,100,2", mm, "mm")).toEqual({ ok: false, message: expect.stringMatching(/at least 2 runs/) });
  });

  it("refuses more than a report carries, and text beyond its length, before parsing it", () => {
    const many = demoAxisRuns({ travel: 1000, targets: 201, runs: 2, seed: 3, ratio: 0.5, tolerances: { accuracy: 25, repeatability: 15, reversal: 10 } });
    expect(importRuns(deviationTable(many), mm, "mm")).toEqual({ ok: false, message: expect.stringMatching(/at most 200 per axis/) });
    expect(importRuns("x".repeat(IMPORT_LIMITS.characters + 1), mm, "mm")).toEqual({ ok: false, message: expect.stringMatching(/longer than/) });
  });

  it("shows the first lines cut into columns as the mapping would cut them", () => {
    expect(previewCells("a;b;1,5\n\n1;+;0,2", true)).toEqual([
      ["a", "b", "1,5"],
      ["1", "+", "0,2"],
    ]);
    expect(previewCells("a,b\n".repeat(50), false)).toHaveLength(IMPORT_LIMITS.previewLines);
  });

  it("saves only a well-formed mapping", () => {
    expect(columnMappingSchema.safeParse(mm).success).toBe(true);
    expect(columnMappingSchema.safeParse({ ...mm, run: -1 }).success).toBe(false);
    expect(columnMappingSchema.safeParse({ ...mm, run: 1.5 }).success).toBe(false);
    expect(columnMappingSchema.safeParse({ ...mm, deviationUnit: "nm" }).success).toBe(false);
  });
});

describe("a positioning test's entry", () => {
  it("is empty until runs are imported, then complete; the engine refuses ragged runs at the runs", () => {
    expect(checkTestEntry(emptyTestEntry("positioning")).state).toBe("empty");
    const complete = checkTestEntry({ ...emptyTestEntry("positioning"), runs: axis });
    expect(complete.state).toBe("complete");
    const ragged = checkTestEntry({ ...emptyTestEntry("positioning"), runs: { ...axis, forward: [axis.forward[0]!.slice(1), ...axis.forward.slice(1)] } });
    expect(ragged.state).toBe("invalid");
    expect(ragged.errors.runs?.[0]).toMatch(/Run 1 has 10 deviations for 11 targets/);
  });

  it("refuses non-finite numbers and more runs than a report carries in the stored draft", () => {
    expect(testEntrySchema.safeParse({ kind: "positioning", runs: { targets: [0, Infinity], forward: [], reverse: [] } }).success).toBe(false);
    expect(testEntrySchema.safeParse({ kind: "positioning", runs: { targets: [0, 1], forward: Array.from({ length: 21 }, () => [0, 1]), reverse: [] } }).success).toBe(false);
  });

  it("comes back from signed content for a correction as it was entered", () => {
    const form = formFromContent({
      entryUnits: "mm",
      profile: { key: MACHINING_CENTRE_NORMAL.key, version: 1, reason: "", suggested: null },
      measuredOn: "2026-11-30",
      conditions: { ambientTemperatureC: null, warmUpMinutes: null, levelled: null, notes: "" },
      instruments: [],
      tests: {},
      notes: "",
      measurementsAsEntered: { tests: { "V-X-A": { kind: "positioning", ...axis } } },
    } as unknown as Parameters<typeof formFromContent>[0]);
    expect(form.tests["V-X-A"]!.runs).toEqual(axis);
  });
});

describe("a circular test's table", () => {
  const angles = Array.from({ length: 24 }, (_, i) => i * 15);
  const table = ["dir;angle;dev", ...angles.map((angle) => `cw;${angle};${(1.5 * Math.cos((2 * Math.PI * angle) / 180)).toFixed(2).replace(".", ",")}`), ...angles.map((angle) => `ccw;${angle};0,5`)].join("\n");
  const circular = { ...mm, direction: 0, target: 1, deviation: 2, decimalComma: true };

  it("imports both directions with the mapping (its target column holds the angle) and previews the engine's figures", () => {
    const imported = importRadial(table, circular, "mm");
    if (!imported.ok) throw new Error(imported.message);
    expect(imported.radial.clockwise).toHaveLength(24);
    // An oval 1.5·cos 2θ spans 3 µm about its circle (by hand).
    expect(imported.evaluation.circularDeviationClockwise).toBeCloseTo(3, 6);
    const form = newReportForm({ profileKey: MACHINING_CENTRE_NORMAL.key, profileVersion: 1, units: "mm", measuredOn: "2026-11-30" });
    form.tests["V-XY-CIRC"] = { ...emptyTestEntry("circular"), radial: imported.radial };
    const result = previewReport(form, MACHINING_CENTRE_NORMAL)!.tests.find((test) => test.test.code === "V-XY-CIRC")!.result!;
    expect(result.value).toBeCloseTo(imported.evaluation.circularDeviation, 9);
  });

  it("refuses a line that does not parse, naming it, and a mapping that reads a column twice", () => {
    expect(importRadial(table.replace("cw;30;", "cw;thirty;"), circular, "mm")).toEqual({ ok: false, message: expect.stringMatching(/^Line 4: the angle "thirty"/) });
    expect(importRadial(table, { ...circular, target: 2 }, "mm")).toEqual({ ok: false, message: expect.stringMatching(/different column/) });
  });
});
