import { describe, expect, it } from "vitest";
import { hitDisplay, type HitFigures } from "~/modules/search/hit-display";

const noFigures: HitFigures = {
  spindleRunoutUm: null, axialSlipUm: null, spindleParallelismVerticalUm: null, spindleParallelismHorizontalUm: null,
  centreHeightUm: null, tableFlatnessUm: null, travelSquarenessUm: null, xPositioningAccuracyUm: null,
  xRepeatabilityUm: null, yPositioningAccuracyUm: null, zPositioningAccuracyUm: null,
};
const lathe = {
  category: "centre_lathe",
  condition: "used",
  verified: true,
  grade: "B",
  price: { minor: 1_240_000, currency: "EUR" },
  swingMm: 330,
  betweenCentresMm: 1000,
  location: { city: "Brennwald", country: "DE" },
  report: { measuredOn: "2026-12-01", keyFigures: { ...noFigures, spindleRunoutUm: 4, axialSlipUm: 3, spindleParallelismVerticalUm: 20, spindleParallelismHorizontalUm: 2 } },
};
const now = new Date("2026-12-05T10:00:00Z");

describe("a search result's words", () => {
  it("shows a lathe's spindle figures in the reader's units, the worse parallelism of the two planes", () => {
    const display = hitDisplay(lathe, "mm", now);
    expect(display.figures).toEqual([
      { label: "Spindle run-out", value: "4 µm" },
      { label: "Axial slip", value: "3 µm" },
      { label: "Spindle-axis parallelism", value: "20 µm" },
      { label: "Centre height", value: "not measured" },
    ]);
    expect(display.sizes).toBe("330 mm swing · 1,000 mm between centres");
    expect(display.place).toBe("Brennwald, Germany");
    expect(display.price).toBe("€12,400");
    expect(display.condition).toBe("Used");
    expect(display.badge).toEqual({ text: "Verified", caution: false });
  });

  it("writes an inch reader's figures and sizes in inches (4 µm = 0.00016 in; 330 mm swing quoted as 13 in)", () => {
    const display = hitDisplay(lathe, "inch", now);
    expect(display.figures[0]).toEqual({ label: "Spindle run-out", value: "0.00016 in" });
    expect(display.sizes).toMatch(/^13 in swing/);
  });

  it("shows a mill's table and travels, and a CNC machine's positioning by axis", () => {
    const mill = hitDisplay({ ...lathe, category: "milling_machine", report: { ...lathe.report, keyFigures: { ...noFigures, tableFlatnessUm: 8 } } }, "mm", now);
    expect(mill.figures.map((figure) => figure.label)).toEqual(["Table flatness", "Squareness of travels", "Spindle run-out"]);
    const cnc = hitDisplay({ ...lathe, category: "cnc_lathe", report: { ...lathe.report, keyFigures: { ...noFigures, xPositioningAccuracyUm: 6, zPositioningAccuracyUm: 9 } } }, "mm", now);
    expect(cnc.figures).toEqual([
      { label: "X axis, positioning accuracy", value: "6 µm" },
      { label: "Z axis, positioning accuracy", value: "9 µm" },
    ]);
  });

  it("marks a report over 12 months old, an incomplete one, and a machine without one (PRODUCT.md: grades expire visibly)", () => {
    expect(hitDisplay({ ...lathe, report: { ...lathe.report, measuredOn: "2025-12-01" } }, "mm", now).badge).toEqual({ text: "Report over 12 months old", caution: true });
    expect(hitDisplay({ ...lathe, verified: false, grade: "incomplete" }, "mm", now).badge).toEqual({ text: "Report incomplete", caution: true });
    const bare = hitDisplay({ ...lathe, verified: false, grade: null, report: null, price: null, swingMm: null, betweenCentresMm: null }, "mm", now);
    expect(bare).toMatchObject({ badge: { text: "Not yet verified", caution: true }, figures: [], sizes: null, price: "Price on request" });
  });
});
