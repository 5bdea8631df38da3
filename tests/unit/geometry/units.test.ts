import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  GeometryInputError,
  inchesToMicrometres,
  inchesToMillimetres,
  micrometresToInches,
  millimetresToInches,
} from "~/geometry";

describe("inch and metric conversions", () => {
  it("takes 1 in as exactly 25.4 mm", () => {
    expect(inchesToMillimetres(1)).toBe(25.4); // NIST SP 811
    expect(inchesToMicrometres(1)).toBe(25_400); // NIST SP 811
    expect(millimetresToInches(25.4)).toBe(1); // NIST SP 811
  });

  it("gives the tenth and the thou of GEOMETRY.md", () => {
    expect(inchesToMicrometres(0.0001)).toBeCloseTo(2.54, 12); // 0.0001 in = 2.54 µm, NIST SP 811 via GEOMETRY.md
    expect(inchesToMicrometres(0.001)).toBeCloseTo(25.4, 12); // 0.001 in = 25.4 µm, NIST SP 811 via GEOMETRY.md
    expect(micrometresToInches(25.4)).toBeCloseTo(0.001, 15); // NIST SP 811
  });

  it.each([
    // µm, inches as the trade quotes them, decimals shown — common practice (GEOMETRY.md rules of thumb)
    [5, "0.0002", 4],
    [10, "0.0004", 4],
    [20, "0.0008", 4],
    [25, "0.001", 3],
  ])("quotes %d µm as %s in to a display rounding", (micrometres, quoted, decimals) => {
    expect(micrometresToInches(micrometres).toFixed(decimals)).toBe(quoted); // common practice
  });

  it("does not round: 0.0002 in is 5.08 µm, not 5", () => {
    expect(inchesToMicrometres(0.0002)).toBeCloseTo(5.08, 12); // NIST SP 811: 0.0002 × 25 400
  });

  it("round-trips any finite value", () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), (micrometres) => {
        const back = inchesToMicrometres(micrometresToInches(micrometres));
        expect(Math.abs(back - micrometres)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(micrometres)));
      }),
    );
  });

  it.each([NaN, Infinity, -Infinity])("refuses %s", (bad) => {
    expect(() => inchesToMicrometres(bad)).toThrow(GeometryInputError);
    expect(() => micrometresToInches(bad)).toThrow(GeometryInputError);
    expect(() => inchesToMillimetres(bad)).toThrow(GeometryInputError);
  });
});
