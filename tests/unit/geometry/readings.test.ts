import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { GeometryInputError, mandrelInclination, toleranceOver, totalIndicatorReading } from "~/geometry";

describe("total indicator reading", () => {
  it("is max − min of the readings", () => {
    expect(totalIndicatorReading([2, -3, 5, 1])).toBe(8); // ISO 230-1, from memory: TIR = max − min
    expect(totalIndicatorReading([4, 4])).toBe(0); // ISO 230-1, from memory
  });

  it("does not depend on the indicator's zero", () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: -1000, max: 1000 }), { minLength: 2, maxLength: 50 }),
        fc.integer({ min: -1000, max: 1000 }),
        (readings, zero) => {
          // common practice: the dial may be set anywhere; only the sweep counts
          expect(totalIndicatorReading(readings.map((r) => r + zero))).toBe(totalIndicatorReading(readings));
        },
      ),
    );
  });

  it.each([
    ["no readings", []],
    ["one reading", [3]],
  ])("refuses %s", (_, readings) => {
    expect(() => totalIndicatorReading(readings)).toThrow(GeometryInputError);
    expect(() => totalIndicatorReading(readings)).toThrow(/at least 2/);
  });

  it.each([NaN, Infinity])("refuses a reading of %s and says which", (bad) => {
    expect(() => totalIndicatorReading([1, bad])).toThrow(/Indicator reading 2 must be a finite number/);
  });
});

describe("mandrel inclination", () => {
  it("gives the worked example: +20 µm over 300 mm", () => {
    // worked example, GEOMETRY.md: free end +30 at 0° and +10 at 180°, near end 0 and 0
    expect(mandrelInclination({ near: { at0: 0, at180: 0 }, far: { at0: 30, at180: 10 } })).toBe(20);
  });

  it("cancels the mandrel's own run-out", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: -50, max: 50 }),
        fc.integer({ min: -50, max: 50 }),
        fc.integer({ min: 0, max: 30 }),
        (nearAxis, farAxis, eccentricity) => {
          // common practice: a bent or eccentric mandrel reads +e at 0° and −e at 180°; the mean drops it
          const readings = {
            near: { at0: nearAxis + eccentricity, at180: nearAxis - eccentricity },
            far: { at0: farAxis + 2 * eccentricity, at180: farAxis - 2 * eccentricity },
          };
          expect(mandrelInclination(readings)).toBe(farAxis - nearAxis);
        },
      ),
    );
  });

  it("refuses a missing or non-finite reading and says which", () => {
    expect(() => mandrelInclination({ near: { at0: 0, at180: NaN }, far: { at0: 1, at180: 1 } })).toThrow(
      /near-end reading at 180°/,
    );
    expect(() =>
      mandrelInclination({ near: { at0: 0, at180: 0 }, far: { at0: Infinity, at180: 1 } }),
    ).toThrow(GeometryInputError);
    expect(() => mandrelInclination({ near: { at0: 0, at180: 0 } } as never)).toThrow(GeometryInputError);
  });
});

describe("tolerance over another length", () => {
  it("scales in proportion both ways", () => {
    // ISO 230-1, from memory: T over L0 applies over L as T · L / L0
    expect(toleranceOver({ tolerance: 20, over: 300 }, 150)).toBe(10);
    expect(toleranceOver({ tolerance: 20, over: 300 }, 600)).toBe(40);
    expect(toleranceOver({ tolerance: 20, over: 300 }, 300)).toBe(20);
  });

  it("never goes below the minimum", () => {
    // ISO 230-1, from memory; 10 µm minimum for the normal class, from memory
    expect(toleranceOver({ tolerance: 20, over: 300, minimum: 10 }, 100)).toBe(10);
    // 5 µm minimum for precision lathes (IS 6040:1993)
    expect(toleranceOver({ tolerance: 10, over: 300, minimum: 5 }, 60)).toBe(5);
  });

  it("stops at the maximum", () => {
    expect(toleranceOver({ tolerance: 40, over: 300, maximum: 40 }, 900)).toBe(40); // ISO 230-1, from memory
  });

  it("does not round", () => {
    expect(toleranceOver({ tolerance: 20, over: 300 }, 100)).toBe(20 / 3); // ISO 230-1, from memory: 6.666… µm
  });

  it.each([
    ["a length of 0", { tolerance: 20, over: 300 }, 0],
    ["a negative length", { tolerance: 20, over: 300 }, -5],
    ["a non-finite length", { tolerance: 20, over: 300 }, NaN],
    ["an over-length of 0", { tolerance: 20, over: 0 }, 100],
    ["a negative tolerance", { tolerance: -1, over: 300 }, 100],
    ["a minimum above the maximum", { tolerance: 20, over: 300, minimum: 30, maximum: 10 }, 100],
    ["an infinite tolerance", { tolerance: Infinity, over: 300 }, 100],
  ])("refuses %s", (_, rule, length) => {
    expect(() => toleranceOver(rule, length)).toThrow(GeometryInputError);
  });
});
