// Identifying a machine by make, model and serial: what the comparison forgives (common practice of reading
// stamped plates: O for 0, I or L for 1, punctuation) and what it does not.
import { describe, expect, it } from "vitest";
import { editDistance, matchOf, nameKey, serialKey } from "~/modules/machines/identity";

describe("machine identity", () => {
  it("normalises makes, models and serials", () => {
    expect(nameKey("Tessmar-Werke ")).toBe("tessmarwerke");
    expect(nameKey("DL 330")).toBe(nameKey("dl-330"));
    expect(serialKey(" dl330-1187 ")).toBe("D13301187");
    expect(serialKey("DL33O/1I87")).toBe(serialKey("DL330-1187"));
    expect(serialKey(null)).toBe("");
  });

  it("counts edits up to a limit", () => {
    expect(editDistance("ABC123", "ABC123")).toBe(0);
    expect(editDistance("ABC123", "ABC124")).toBe(1);
    expect(editDistance("ABC123", "ABC12")).toBe(1);
    expect(editDistance("ABC123", "XYZ999", 2)).toBe(3);
  });

  it("matches the same plate, flags one wrong character, and never matches without a serial or across models", () => {
    const machine = { make: "Tessmar", model: "DL 330", serialNumber: "DL330-1187" };
    expect(matchOf(machine, { make: "TESSMAR", model: "DL-330", serialNumber: "dl 330 1187" })).toBe("same");
    expect(matchOf(machine, { ...machine, serialNumber: "DL330-1188" })).toBe("close");
    expect(matchOf(machine, { ...machine, serialNumber: "DL330-1277" })).toBeNull();
    expect(matchOf(machine, { ...machine, model: "DL 360" })).toBeNull();
    expect(matchOf(machine, { ...machine, serialNumber: null })).toBeNull();
    expect(matchOf({ ...machine, serialNumber: "1" }, { ...machine, serialNumber: "1" })).toBeNull();
  });
});
