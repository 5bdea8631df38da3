// Generic column mapping of a deviation table: malformed lines, decimal commas, inch files.
import { describe, expect, it } from "vitest";
import { GeometryInputError, parseDeviationCsv, positioningAccuracy, type DeviationColumns } from "~/geometry";

const mapping: DeviationColumns = { run: 0, direction: 1, target: 2, deviation: 3, targetUnit: "mm", deviationUnit: "um", decimalComma: false, header: true };
const csv = ["run,dir,target,dev", "1,+,0,1.5", "1,+,100,2", "2,+,0,0.5", "2,+,100,3", "1,-,0,-1", "1,-,100,0", "2,-,0,-2", "2,-,100,1"].join("\n");

describe("parseDeviationCsv", () => {
  it("maps columns into the positioning input", () => {
    const input = parseDeviationCsv(csv, mapping);
    expect(input).toEqual({ targets: [0, 100], forward: [[1.5, 2], [0.5, 3]], reverse: [[-1, 0], [-2, 1]] });
    expect(positioningAccuracy(input).reversalValue).toBeCloseTo(2.5, 12);
  });

  it("reads decimal commas with semicolons", () => {
    const text = csv.replace(/\./g, "#").replace(/,/g, ";").replace(/#/g, ",");
    expect(parseDeviationCsv(text, { ...mapping, decimalComma: true }).forward).toEqual([[1.5, 2], [0.5, 3]]);
  });

  it("converts an inch file (targets in inches, deviations in inches) to mm and µm", () => {
    const text = ["run,dir,target,dev", "1,+,0,0.0001", "1,+,4,0.0002", "2,+,0,0", "2,+,4,0", "1,-,0,0", "1,-,4,0", "2,-,0,0", "2,-,4,0"].join("\n");
    const input = parseDeviationCsv(text, { ...mapping, targetUnit: "in", deviationUnit: "in" });
    expect(input.targets[1]).toBeCloseTo(101.6, 12);
    expect(input.forward[0]![0]).toBeCloseTo(2.54, 12);
  });

  it("takes the minus sign (U+2212) for the negative direction, as some exports write it", () => {
    expect(parseDeviationCsv(csv.replace(/,-,/g, ",\u2212,"), mapping)).toEqual(parseDeviationCsv(csv, mapping));
  });

  it("refuses malformed lines, naming the line", () => {
    const bad = (text: string, message: RegExp, columns = mapping) => {
      expect(() => parseDeviationCsv(text, columns)).toThrow(GeometryInputError);
      expect(() => parseDeviationCsv(text, columns)).toThrow(message);
    };
    bad(csv.replace("2,+,0,0.5", "2,+,0,abc"), /Line 4: the deviation "abc" is not a number/);
    bad(csv.replace("2,+,0,0.5", "2,+,0"), /Line 4: 3 columns/);
    bad(csv.replace("2,+,0,0.5", "2,sideways,0,0.5"), /Line 4: direction/);
    bad(csv.replace("2,+,0,0.5", "2,+,0,1e999"), /Line 4/);
    bad(csv + "\n2,+,100,4", /Line 10: run 2 reads target 100 mm twice/);
    bad(csv.replace("2,-,100,1", "2,-,50,1"), /no reading at target/);
    bad("a\u0000b", /NUL/);
  });
});
