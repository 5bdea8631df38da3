// Correction planner: every formula against the worked examples in docs/correction-planner.md (by hand; the
// formulas are common practice), property tests that applying the correction leaves nothing to correct, and
// refused inputs.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  GeometryInputError,
  backOffAngleFor,
  endFloatCheck,
  inclinationAfterPadMoves,
  mandrelInclination,
  nutAxialMovement,
  padMovesOf,
  scrapingDepths,
  shimmedHeight,
  tailstockSetOver,
  taperFromOffset,
  tiltCorrection,
} from "~/geometry";

describe("tilt of a headstock or tailstock (docs/correction-planner.md §1, by hand)", () => {
  it("example 1a: free end 20 µm high over 300 mm, pads 450 mm apart → 30 µm shim under the rear pad", () => {
    const inclination = mandrelInclination({ near: { at0: 0, at180: 0 }, far: { at0: 30, at180: 10 } });
    expect(inclination).toBe(20);
    const input = { plane: "vertical" as const, inclination, measuringLength: 300, padDistance: 450 };
    const result = tiltCorrection(input);
    expect(result).toEqual({ signed: 30, amount: 30, pad: "rear", direction: "up" });
    expect(inclinationAfterPadMoves(input, padMovesOf(result))).toBeCloseTo(0, 12);
  });

  it("example 1b: free end 12 µm away from the tool, pads 400 mm apart → nose pad 16 µm toward the front", () => {
    const input = { plane: "horizontal" as const, inclination: -12, measuringLength: 300, padDistance: 400 };
    const result = tiltCorrection(input);
    expect(result).toEqual({ signed: -16, amount: 16, pad: "nose", direction: "front" });
    expect(inclinationAfterPadMoves(input, padMovesOf(result))).toBeCloseTo(0, 12);
  });

  it("example 1c: 0.0008 in over 12 in, pads 18 in apart → 0.0012 in (30.48 µm; 1 in = 25.4 mm exactly, NIST SP 811)", () => {
    const result = tiltCorrection({ plane: "vertical", inclination: 20.32, measuringLength: 304.8, padDistance: 457.2 });
    expect(result.amount).toBeCloseTo(30.48, 10);
    expect(result.amount / 25_400).toBeCloseTo(0.0012, 12);
  });

  it("example 1d: a free end 9 µm low is raised by a 9 µm shim under the nose pad (sign conventions, §1)", () => {
    expect(tiltCorrection({ plane: "vertical", inclination: -9, measuringLength: 300, padDistance: 300 })).toEqual({
      signed: -9, amount: 9, pad: "nose", direction: "up",
    });
  });

  it("example 1e: a test that reads true needs nothing", () => {
    expect(tiltCorrection({ plane: "horizontal", inclination: 0, measuringLength: 300, padDistance: 300 })).toEqual({
      signed: 0, amount: 0, pad: null, direction: null,
    });
  });

  it("property: applying the correction to the measured line gives zero inclination (both planes)", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("vertical" as const, "horizontal" as const),
        fc.double({ min: -500, max: 500, noNaN: true }),
        fc.double({ min: 10, max: 2000, noNaN: true }),
        fc.double({ min: 10, max: 2000, noNaN: true }),
        (plane, inclination, measuringLength, padDistance) => {
          const input = { plane, inclination, measuringLength, padDistance };
          const correction = tiltCorrection(input);
          expect(correction.amount).toBeGreaterThanOrEqual(0);
          if (plane === "vertical" && correction.pad) expect(correction.direction).toBe("up");
          expect(Math.abs(inclinationAfterPadMoves(input, padMovesOf(correction)))).toBeLessThan(1e-9 * Math.max(1, Math.abs(inclination)));
        },
      ),
    );
  });

  it("property: the correction from a rigid model of the part (rotating the mandrel's line about the rear pad) brings the free end back", () => {
    // Independent of the planner's own formula: put the mandrel's near and far points on a rigid body, rotate
    // the body by the angle the shim makes (atan of shim over pad distance) and read the far point again.
    fc.assert(
      fc.property(
        fc.double({ min: -300, max: 300, noNaN: true }),
        fc.double({ min: 50, max: 1500, noNaN: true }),
        fc.double({ min: 50, max: 1500, noNaN: true }),
        (inclination, measuringLength, padDistance) => {
          const correction = tiltCorrection({ plane: "vertical", inclination, measuringLength, padDistance });
          const moves = padMovesOf(correction);
          const um = 1e-3; // µm in mm
          const angle = Math.atan2((moves.nose - moves.rear) * um, padDistance);
          const slope = Math.tan(Math.atan2(inclination * um, measuringLength) + angle);
          expect(Math.abs(slope * measuringLength) / um).toBeLessThan(1e-6);
        },
      ),
    );
  });

  it("refuses lengths that are zero, negative, non-finite or beyond 100 m, naming the field", () => {
    const good = { plane: "vertical" as const, inclination: 10, measuringLength: 300, padDistance: 400 };
    for (const [field, value] of [
      ["measuringLength", 0],
      ["measuringLength", -1],
      ["padDistance", Number.NaN],
      ["padDistance", 1e9],
      ["inclination", Number.POSITIVE_INFINITY],
      ["inclination", 1e6],
    ] as const) {
      try {
        tiltCorrection({ ...good, [field]: value });
        expect.unreachable(`${field}=${value}`);
      } catch (error) {
        expect(error).toBeInstanceOf(GeometryInputError);
        expect((error as GeometryInputError).path).toEqual([field]);
      }
    }
  });
});

describe("scraping after shimming (docs/correction-planner.md §2, by hand)", () => {
  it("example 2a: 40 µm shim, rocking edge 400 mm away, five pads → 0, 10, 20, 30, 40 µm", () => {
    const depths = scrapingDepths({ shim: 40, shimDistance: 400, padPositions: [0, 100, 200, 300, 400] });
    expect(depths.map((pad) => pad.depth)).toEqual([0, 10, 20, 30, 40]);
  });

  it("example 2b: 0.0015 in shim over 10 in, pads at 2.5 and 7.5 in → 0.000375 and 0.001125 in (1 in = 25.4 mm exactly, NIST SP 811)", () => {
    const depths = scrapingDepths({ shim: 38.1, shimDistance: 254, padPositions: [63.5, 190.5] });
    expect(depths[0].depth).toBeCloseTo(9.525, 10);
    expect(depths[1].depth).toBeCloseTo(28.575, 10);
    expect(depths[1].depth / 25_400).toBeCloseTo(0.001125, 12);
  });

  it("property: with the shim out and the pads scraped, every pad sits s lower than shimmed (the tilt is kept)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 500, noNaN: true }),
        fc.double({ min: 10, max: 2000, noNaN: true }),
        fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 2, maxLength: 20 }),
        (shim, shimDistance, fractions) => {
          const input = { shim, shimDistance, padPositions: fractions.map((f) => f * shimDistance) };
          const pads = scrapingDepths(input);
          for (const pad of pads) {
            expect(pad.depth).toBeGreaterThanOrEqual(0);
            expect(pad.depth).toBeLessThanOrEqual(shim * (1 + 1e-12));
            // shimmed height − (−depth) is the shim everywhere: the surface moved down without turning.
            expect(shimmedHeight(input, pad.position) + pad.depth).toBeCloseTo(shim, 9);
          }
        },
      ),
    );
  });

  it("refuses no pads, too many pads, a pad beyond the rocking edge, a negative position and a shim of 0", () => {
    const good = { shim: 40, shimDistance: 400, padPositions: [0, 200] };
    expect(() => scrapingDepths({ ...good, padPositions: [] })).toThrow(GeometryInputError);
    expect(() => scrapingDepths({ ...good, padPositions: Array.from({ length: 51 }, () => 1) })).toThrow(/At most 50/);
    expect(() => scrapingDepths({ ...good, padPositions: [0, 401] })).toThrow(/beyond the rocking edge/);
    expect(() => scrapingDepths({ ...good, padPositions: [-1] })).toThrow(/0 mm or more/);
    expect(() => scrapingDepths({ ...good, shim: 0 })).toThrow(/greater than 0/);
    expect(() => scrapingDepths({ ...good, padPositions: [Number.NaN] })).toThrow(/finite/);
  });
});

describe("tailstock set-over from a turned bar's taper (docs/correction-planner.md §3, by hand)", () => {
  it("example 3a: +60 µm over 150 mm, centres 600 mm apart → 120 µm toward the front", () => {
    const result = tailstockSetOver({ diameterDifference: 60, turnedLength: 150, betweenCentres: 600 });
    expect(result).toEqual({ signed: 120, amount: 120, direction: "front" });
    expect(60 + taperFromOffset(result.signed, 150, 600)).toBeCloseTo(0, 12);
  });

  it("example 3b: −20 µm over 200 mm, centres 500 mm apart → 25 µm toward the back", () => {
    expect(tailstockSetOver({ diameterDifference: -20, turnedLength: 200, betweenCentres: 500 })).toEqual({
      signed: -25, amount: 25, direction: "back",
    });
  });

  it("property: turning again after the set-over gives a parallel bar", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -500, max: 500, noNaN: true }),
        fc.double({ min: 10, max: 3000, noNaN: true }),
        fc.double({ min: 0.01, max: 1, noNaN: true }),
        (difference, betweenCentres, fraction) => {
          const turnedLength = Math.max(1, betweenCentres * fraction);
          const { signed } = tailstockSetOver({ diameterDifference: difference, turnedLength, betweenCentres });
          expect(Math.abs(difference + taperFromOffset(signed, turnedLength, betweenCentres))).toBeLessThan(1e-9 * Math.max(1, Math.abs(difference)));
        },
      ),
    );
  });

  it("refuses a turned length longer than the distance between centres", () => {
    expect(() => tailstockSetOver({ diameterDifference: 10, turnedLength: 700, betweenCentres: 600 })).toThrow(/cannot exceed/);
  });
});

describe("bearing running clearance and end float (docs/correction-planner.md §4, by hand)", () => {
  it("example 4a: 15° on a 1 mm pitch ≈ 0.04 mm (common practice)", () => {
    expect(nutAxialMovement({ pitch: 1, angle: 15 })).toBeCloseTo(41.6667, 4);
  });

  it("example 4b: 25 µm on a 1.5 mm pitch needs 6°", () => {
    expect(backOffAngleFor({ pitch: 1.5, clearance: 25 })).toBeCloseTo(6, 12);
  });

  it("example 4c: 20° on a 16 threads-per-inch nut → 88.19 µm (0.003 47 in; 1 in = 25.4 mm exactly, NIST SP 811)", () => {
    const movement = nutAxialMovement({ pitch: 25.4 / 16, angle: 20 });
    expect(movement).toBeCloseTo(88.194, 3);
    expect(movement / 25_400).toBeCloseTo(0.00347, 5);
  });

  it("example 4d: end float 8 µm against 10–30 µm is tight by 2.88°; 45 µm is loose by 6°", () => {
    const tight = endFloatCheck({ reading: 8, min: 10, max: 30, pitch: 1.5 });
    expect(tight.verdict).toBe("tight");
    expect(tight.angleChange).toBeCloseTo(2.88, 12);
    const loose = endFloatCheck({ reading: 45, min: 10, max: 30, pitch: 1.5 });
    expect(loose.verdict).toBe("loose");
    expect(loose.angleChange).toBeCloseTo(-6, 12);
    expect(endFloatCheck({ reading: 20, min: 10, max: 30, pitch: 1.5 })).toEqual({ verdict: "within", angleChange: 0 });
  });

  it("property: the angle for a clearance moves the nut by that clearance; the suggested change lands in range", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 12, noNaN: true }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        fc.double({ min: 0, max: 200, noNaN: true }),
        (pitch, clearance, reading) => {
          expect(nutAxialMovement({ pitch, angle: backOffAngleFor({ pitch, clearance }) })).toBeCloseTo(clearance, 9);
          const check = endFloatCheck({ reading, min: 10, max: 30, pitch });
          const after = reading + (pitch * 1000 * check.angleChange) / 360;
          expect(after).toBeGreaterThanOrEqual(10 - 1e-9);
          expect(after).toBeLessThanOrEqual(30 + 1e-9);
        },
      ),
    );
  });

  it("refuses a pitch outside 0.1–12 mm, an angle beyond a turn and a target upside down", () => {
    expect(() => nutAxialMovement({ pitch: 0, angle: 15 })).toThrow(/pitch/);
    expect(() => nutAxialMovement({ pitch: 1, angle: 400 })).toThrow(/angle/);
    expect(() => nutAxialMovement({ pitch: 1, angle: Number.NaN })).toThrow(/finite/);
    expect(() => endFloatCheck({ reading: 5, min: 30, max: 10, pitch: 1 })).toThrow(/lower end/);
    expect(() => backOffAngleFor({ pitch: 0.1, clearance: 1000 })).toThrow(/full turn/);
  });
});
