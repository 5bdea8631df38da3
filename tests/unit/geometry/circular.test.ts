// Circular test (ISO 230-4's figures, from memory): closed-form cases worked by hand below, invariance to the
// set-up's centre offset, and refused inputs.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { circularTest, GeometryInputError, type RadialReading } from "~/geometry";

const rad = (degrees: number) => (degrees * Math.PI) / 180;
const around = (step: number, deviation: (angle: number) => number, start = 0): RadialReading[] =>
  Array.from({ length: Math.round(360 / step) }, (_, k) => start + k * step).map((angle) => ({ angle, deviation: deviation(angle) }));

describe("circularTest", () => {
  it("a pure centre offset is the set-up, not the machine: deviation 0, offset recovered", () => {
    const offset = (a: number) => 1 + 3 * Math.cos(rad(a)) + 2 * Math.sin(rad(a));
    const result = circularTest({ clockwise: around(10, offset), counterClockwise: around(10, offset) });
    expect(result.circularDeviation).toBeCloseTo(0, 9);
    expect(result.circularDeviationClockwise).toBeCloseTo(0, 9);
    expect(result.circularHysteresis).toBeCloseTo(0, 9);
    expect(result.centreOffset.x).toBeCloseTo(3, 9);
    expect(result.centreOffset.y).toBeCloseTo(2, 9);
  });

  it("an oval path 5·cos 2θ spans 10 µm; paths 3 µm apart give hysteresis 3 and a combined span 13 (by hand)", () => {
    const oval = (a: number) => 5 * Math.cos(rad(2 * a));
    const result = circularTest({
      clockwise: around(5, (a) => oval(a) + 2),
      counterClockwise: around(5, (a) => oval(a) - 1),
    });
    expect(result.circularDeviationClockwise).toBeCloseTo(10, 9);
    expect(result.circularDeviationCounterClockwise).toBeCloseTo(10, 9);
    expect(result.circularHysteresis).toBeCloseTo(3, 9);
    // One centre for both: residuals 5·cos 2θ ± 1.5, so 6.5 − (−6.5).
    expect(result.circularDeviation).toBeCloseTo(13, 9);
  });

  it("interpolates the other direction around the circle when the angles differ (including across 360°)", () => {
    const result = circularTest({
      clockwise: around(10, () => 4, 5),
      counterClockwise: around(10, () => 0),
    });
    expect(result.circularHysteresis).toBeCloseTo(4, 12);
    // Across 0°: the counter-clockwise path reads 10 at 350° and 20 at 0°, so 15 at 355° and 5 at 345°.
    const wrap = circularTest({
      clockwise: around(10, () => 0, 5),
      counterClockwise: around(10, (a) => (a === 350 ? 10 : a === 0 ? 20 : 0)),
    });
    expect(wrap.circularHysteresis).toBeCloseTo(15, 12);
  });

  it("property: adding a centre offset to both directions changes no figure but the offset", () => {
    const path = fc.array(fc.double({ min: -50, max: 50, noNaN: true, noDefaultInfinity: true }), { minLength: 36, maxLength: 36 });
    fc.assert(
      fc.property(path, path, fc.double({ min: -100, max: 100, noNaN: true }), fc.double({ min: -100, max: 100, noNaN: true }), (cw, ccw, x, y) => {
        const read = (values: number[], shift: boolean) =>
          values.map((deviation, k) => ({ angle: k * 10, deviation: deviation + (shift ? x * Math.cos(rad(k * 10)) + y * Math.sin(rad(k * 10)) : 0) }));
        const plain = circularTest({ clockwise: read(cw, false), counterClockwise: read(ccw, false) });
        const shifted = circularTest({ clockwise: read(cw, true), counterClockwise: read(ccw, true) });
        expect(shifted.circularDeviation).toBeCloseTo(plain.circularDeviation, 6);
        expect(shifted.circularDeviationClockwise).toBeCloseTo(plain.circularDeviationClockwise, 6);
        expect(shifted.circularHysteresis).toBeCloseTo(plain.circularHysteresis, 6);
        expect(shifted.centreOffset.x - plain.centreOffset.x).toBeCloseTo(x, 6);
      }),
    );
  });

  describe("refused input", () => {
    const full = around(10, () => 0);
    const refuses = (input: unknown, message: RegExp) => {
      const run = () => circularTest(input as Parameters<typeof circularTest>[0]);
      expect(run).toThrow(GeometryInputError);
      expect(run).toThrow(message);
    };
    it("too few or too many readings", () => {
      refuses({ clockwise: full.slice(0, 7), counterClockwise: full }, /at least 8/);
      refuses({ clockwise: full, counterClockwise: around(0.09, () => 0) }, /at most 3600/);
    });
    it("angles outside 0–360, read twice, or bunched in a small arc", () => {
      refuses({ clockwise: [...full.slice(1), { angle: 360, deviation: 0 }], counterClockwise: full }, /0 up to/);
      refuses({ clockwise: [...full, { angle: 10, deviation: 1 }], counterClockwise: full }, /read twice/);
      const bunched = Array.from({ length: 10 }, (_, k) => ({ angle: k * 1e-7, deviation: k }));
      refuses({ clockwise: bunched, counterClockwise: bunched }, /too little of the circle/);
    });
    it("non-finite numbers, with the path", () => {
      const bad = full.map((r) => ({ ...r }));
      bad[3]!.deviation = NaN;
      try {
        circularTest({ clockwise: full, counterClockwise: bad });
        expect.unreachable();
      } catch (error) {
        expect(error).toBeInstanceOf(GeometryInputError);
        expect((error as GeometryInputError).path).toEqual(["counterClockwise", 3, "deviation"]);
      }
      refuses({ clockwise: full.map((r, k) => (k === 2 ? { ...r, angle: Infinity } : r)), counterClockwise: full }, /finite/);
      refuses(null, /object/);
    });
  });
});
