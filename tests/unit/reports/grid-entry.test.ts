import { describe, expect, it } from "vitest";
import { flatnessDeviation, KNEE_MILL_NORMAL } from "~/geometry";
import { formFromContent } from "~/modules/reports/form-from-content";
import { checkTestEntry, emptyTestEntry, newReportForm, previewReport, reportFormSchema, type TestEntry } from "~/modules/reports/form";
import { gridFromPoints, parseHeightTable, parseTiltLines, tiltTexts } from "~/modules/reports/grid-entry";

function surfaceEntry(grid: Partial<TestEntry["grid"]>): TestEntry {
  const entry = emptyTestEntry("surface");
  return { ...entry, grid: { ...entry.grid, ...grid } };
}

describe("a flatness grid pasted from a spreadsheet", () => {
  it("reads tabs with a decimal comma, CSV, a header line and a column of row labels", () => {
    expect(parseHeightTable("x\t0\t100\t200\nrow 1\t0\t1,5\t-2\nrow 2\t3\t0\t1")).toEqual({
      heights: [
        ["0", "1,5", "-2"],
        ["3", "0", "1"],
      ],
      skipped: 1,
      tooLarge: false,
    });
    expect(parseHeightTable("0,1,2\r\n3,4,5\n\n6,7,8").heights).toHaveLength(3);
    expect(parseHeightTable("0;1,5\n2;3").heights[0]).toEqual(["0", "1,5"]);
  });

  it("cuts a paste beyond 50 × 50 and says so", () => {
    const line = Array.from({ length: 60 }, () => "1").join("\t");
    const pasted = parseHeightTable(Array.from({ length: 55 }, () => line).join("\n"));
    expect(pasted.tooLarge).toBe(true);
    expect(pasted.heights).toHaveLength(50);
    expect(pasted.heights[0]).toHaveLength(50);
  });

  it("reads tilt lines separated by spaces (decimal comma) or by commas", () => {
    expect(tiltTexts("12 -4 3,5")).toEqual(["12", "-4", "3,5"]);
    expect(tiltTexts("12,-4,3.5")).toEqual(["12", "-4", "3.5"]);
    expect(parseTiltLines("1\t2\t3\n\n4;5;6")).toEqual(["1 2 3", "4 5 6"]);
  });
});

describe("a surface entry", () => {
  const heights = [
    ["0", "2", "1"],
    ["1", "-3", "0"],
    ["2", "1", "4"],
  ];

  it("is empty, then incomplete while cells are missing, then complete with points on the grid", () => {
    expect(checkTestEntry(surfaceEntry({ rows: 3, columns: 3 })).state).toBe("empty");
    const partial = checkTestEntry(surfaceEntry({ rows: 3, columns: 3, stepX: "100", stepY: "50", heights: [["1"]] }));
    expect(partial.state).toBe("incomplete");
    expect(partial.errors.entry?.[0]).toMatch(/8 of the 9 heights/);
    const complete = checkTestEntry(surfaceEntry({ rows: 3, columns: 3, stepX: "100", stepY: "50", heights }));
    expect(complete.state).toBe("complete");
    expect(complete.measurement).toMatchObject({ kind: "surface" });
    if (complete.measurement?.kind !== "surface") throw new Error("not a surface");
    expect(complete.measurement.points).toContainEqual({ x: 200, y: 100, z: 4 });
    expect(complete.measurement.points).toContainEqual({ x: 100, y: 50, z: -3 });
  });

  it("marks a cell that is not a number, or beyond any indicator, at its place", () => {
    const bad = checkTestEntry(surfaceEntry({ rows: 2, columns: 2, stepX: "10", stepY: "10", heights: [["0", "x"], ["1e9", "1"]] }));
    expect(bad.state).toBe("invalid");
    expect(bad.errors["grid.heights.0.1"]).toEqual(["Not a number."]);
    expect(bad.errors["grid.heights.1.0"]?.[0]).toMatch(/Must lie within/);
    const spacing = checkTestEntry(surfaceEntry({ rows: 2, columns: 2, stepX: "0", stepY: "10", heights: [["0", "1"], ["1", "1"]] }));
    expect(spacing.errors["grid.stepX"]?.[0]).toMatch(/greater than 0/);
  });

  it("turns level tilts along rows and columns into heights, with the closure of each cell", () => {
    // A plane rising 10 µm/m along x and 20 µm/m along y, read exactly: every cell closes.
    const rows = 3;
    const columns = 4;
    const entry = surfaceEntry({
      layout: "rows-columns",
      rows,
      columns,
      stepX: "100",
      stepY: "100",
      rowTilts: Array.from({ length: rows }, () => "10 10 10"),
      columnTilts: Array.from({ length: columns }, () => "20 20"),
    });
    const check = checkTestEntry(entry);
    expect(check.state).toBe("complete");
    expect(check.closure?.errorUm).toBeCloseTo(0, 9);
    if (check.measurement?.kind !== "surface") throw new Error("not a surface");
    expect(flatnessDeviation(check.measurement.points, "minimum-zone")).toBeCloseTo(0, 9);
    // One row misread by 50 µm/m over a 100 mm step: 5 µm of closure shows up.
    const misread = checkTestEntry({ ...entry, grid: { ...entry.grid, rowTilts: ["10 10 10", "10 60 10", "10 10 10"] } });
    expect(misread.closure?.errorUm).toBeCloseTo(5, 9);
  });

  it("asks for the right count of tilts on each line", () => {
    const check = checkTestEntry(surfaceEntry({ layout: "rows-columns", rows: 2, columns: 3, stepX: "1", stepY: "1", rowTilts: ["1 2", "1"], columnTilts: ["1", "1", "1"] }));
    expect(check.state).toBe("invalid");
    expect(check.errors["grid.rowTilts.1"]?.[0]).toMatch(/Give 2 tilts/);
  });

  it("takes the diagonal layout's eight lines, each in an even number of steps", () => {
    const flat = "0 0 0 0";
    const lines = Object.fromEntries(["diagonal-ac", "diagonal-bd", "edge-ab", "edge-dc", "edge-ad", "edge-bc", "centre-x", "centre-y"].map((line) => [line, flat])) as TestEntry["grid"]["lines"];
    const check = checkTestEntry(surfaceEntry({ layout: "union-jack", length: "800", width: "400", lines }));
    expect(check.state).toBe("complete");
    expect(check.closure?.errorUm).toBeCloseTo(0, 9);
    const odd = checkTestEntry(surfaceEntry({ layout: "union-jack", length: "800", width: "400", lines: { ...lines, "edge-ab": "0 0 0" } }));
    expect(odd.errors["grid.lines.edge-ab"]?.[0]).toMatch(/even number/);
  });

  it("in inch mode, takes spacing in inches and heights in inches", () => {
    const check = checkTestEntry(surfaceEntry({ rows: 2, columns: 2, stepX: "4", stepY: "4", heights: [["0", "0.0001"], ["0", "0"]] }), [], "inch");
    expect(check.state).toBe("complete");
    if (check.measurement?.kind !== "surface") throw new Error("not a surface");
    expect(check.measurement.points).toContainEqual({ x: 4, y: 0, z: 0.0001 });
  });
});

describe("the form's bounds on a grid", () => {
  it("refuses more than 50 rows, hostile text in a cell, and a fractional row count, at the field", () => {
    const base = newReportForm({ profileKey: KNEE_MILL_NORMAL.key, profileVersion: KNEE_MILL_NORMAL.version, units: "mm", measuredOn: "2026-01-02" });
    const withGrid = (grid: Record<string, unknown>) => reportFormSchema.safeParse({ ...base, tests: { "M-TABLE-FLAT": { kind: "surface", grid } } });
    expect(withGrid({ heights: Array.from({ length: 51 }, () => ["1"]) }).success).toBe(false);
    expect(withGrid({ heights: [["1\u0000"]] }).success).toBe(false);
    expect(withGrid({ rows: 2.5 }).success).toBe(false);
    expect(withGrid({ rows: 51 }).success).toBe(false);
    expect(withGrid({ rows: 50, columns: 50 }).success).toBe(true);
  });
});

describe("a milling machine's report with a flatness grid", () => {
  it("scores the table's flatness live, by minimum zone, as its key figure", () => {
    const form = newReportForm({ profileKey: KNEE_MILL_NORMAL.key, profileVersion: KNEE_MILL_NORMAL.version, units: "mm", measuredOn: "2026-01-02" });
    form.tests["M-TABLE-FLAT"] = surfaceEntry({ rows: 3, columns: 3, stepX: "300", stepY: "120", heights: [["0", "2", "1"], ["1", "-3", "0"], ["2", "1", "4"]] });
    const preview = previewReport(form, KNEE_MILL_NORMAL)!;
    const flat = preview.tests.find((test) => test.test.code === "M-TABLE-FLAT")!;
    expect(flat.result?.flatness?.reference).toBe("minimum-zone");
    const points = [0, 1, 2].flatMap((r) => [0, 1, 2].map((c) => ({ x: c * 300, y: r * 120, z: [[0, 2, 1], [1, -3, 0], [2, 1, 4]][r]![c]! })));
    expect(flat.result?.value).toBeCloseTo(flatnessDeviation(points, "minimum-zone"), 9);
    expect(preview.score?.keyFigures.tableFlatness).toBeCloseTo(flat.result!.value, 9);
  });

  it("a signed grid comes back into the form for a correction", () => {
    const points = [0, 1, 2].flatMap((r) => [0, 1].map((c) => ({ x: c * 250, y: r * 0.1, z: r - c })));
    const grid = gridFromPoints(points)!;
    expect(grid).toMatchObject({ rows: 3, columns: 2, stepX: "250", stepY: "0.1" });
    expect(grid.heights[2]).toEqual(["2", "1"]);
    expect(gridFromPoints(points.slice(1))).toBeNull();
    // formFromContent maps a surface through the same path.
    expect(typeof formFromContent).toBe("function");
  });
});
