// Generic column mapping of a table of radial deviations round a circle: malformed lines, decimal commas,
// inch deviations, a full turn closed at 360°. Expected values worked by hand from the table itself.
import { describe, expect, it } from "vitest";
import { circularTest, GeometryInputError, parseRadialCsv, type RadialColumns } from "~/geometry";

const mapping: RadialColumns = { direction: 0, angle: 1, deviation: 2, deviationUnit: "um", decimalComma: false, header: true };
const angles = Array.from({ length: 12 }, (_, i) => i * 30);
// A path 2 µm larger one way than the other: hysteresis 2 µm (by hand), each path a circle about the pivot.
const table = ["direction,angle,deviation", ...angles.map((angle) => `cw,${angle},1`), ...angles.map((angle) => `ccw,${angle},-1`)].join("\n");

describe("parseRadialCsv", () => {
  it("maps columns into clockwise and counter-clockwise readings for circularTest", () => {
    const readings = parseRadialCsv(table, mapping);
    expect(readings.clockwise).toHaveLength(12);
    expect(readings.counterClockwise[3]).toEqual({ angle: 90, deviation: -1 });
    expect(circularTest(readings).circularHysteresis).toBeCloseTo(2, 9);
  });

  it("reads decimal commas with semicolons, and deviations in inches", () => {
    const comma = table.replace(/,/g, ";").replace(/;1$/gm, ";0,0001").replace(/;-1$/gm, ";-0,0001");
    const readings = parseRadialCsv(comma, { ...mapping, decimalComma: true, deviationUnit: "in" });
    expect(readings.clockwise[0]!.deviation).toBeCloseTo(2.54, 12);
  });

  it("takes 360° as the closing reading of a full turn", () => {
    const closed = `${table}\ncw,360,1`;
    expect(parseRadialCsv(closed, mapping).clockwise).toHaveLength(12);
  });

  it("refuses malformed lines, naming the line", () => {
    const bad = (text: string, message: RegExp) => {
      expect(() => parseRadialCsv(text, mapping)).toThrow(GeometryInputError);
      expect(() => parseRadialCsv(text, mapping)).toThrow(message);
    };
    bad(table.replace("cw,60,1", "cw,sixty,1"), /Line 4: the angle "sixty" is not a number/);
    bad(table.replace("cw,60,1", "sideways,60,1"), /Line 4: direction/);
    bad(table.replace("cw,60,1", "cw,400,1"), /Line 4: the angle 400 is outside/);
    bad(table.replace("cw,60,1", "cw,30,1"), /Line 4: the angle 30° is read twice clockwise/);
    bad(table.replace("cw,60,1", "cw,60"), /Line 4: 2 columns/);
  });
});
