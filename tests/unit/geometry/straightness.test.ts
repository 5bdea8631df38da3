import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { linearRegression } from "simple-statistics";
import solver from "javascript-lp-solver";
import {
  GeometryInputError,
  localStraightness,
  profileShape,
  straightnessDeviation,
  straightnessEvaluation,
  type ProfilePoint,
} from "~/geometry";

// Worked example, GEOMETRY.md: stations 0…500 mm, readings 0, −4, +2, +6, +3, +8 µm.
const WORKED: ProfilePoint[] = [0, 100, 200, 300, 400, 500].map((x, i) => ({ x, y: [0, -4, 2, 6, 3, 8][i]! }));

/** Width of the band about y = slope·x + intercept, computed independently of the engine. */
function bandWidth(points: readonly ProfilePoint[], slope: number, intercept: number): number {
  const residuals = points.map((p) => p.y - (slope * p.x + intercept));
  return Math.max(...residuals) - Math.min(...residuals);
}

/**
 * Minimum zone by linear programming: minimise t s.t. |y_i − a·x_i − b| ≤ t, a and b free. The band
 * about the line is ±t, so its width is 2t.
 */
function minimumZoneByLp(points: readonly ProfilePoint[]): number {
  const constraints: Record<string, { min?: number; max?: number }> = {};
  const variables: Record<string, Record<string, number>> = {
    aPlus: {},
    aMinus: {},
    bPlus: {},
    bMinus: {},
    t: { width: 1 },
  };
  points.forEach(({ x, y }, i) => {
    // a·x + b + t ≥ y  and  a·x + b − t ≤ y, with a = aPlus − aMinus, b = bPlus − bMinus.
    constraints[`above${i}`] = { min: y };
    constraints[`below${i}`] = { max: y };
    for (const [row, tSign] of [[`above${i}`, 1], [`below${i}`, -1]] as const) {
      variables.aPlus![row] = x;
      variables.aMinus![row] = -x;
      variables.bPlus![row] = 1;
      variables.bMinus![row] = -1;
      variables.t![row] = tSign;
    }
  });
  const result = solver.Solve({ optimize: "width", opType: "min", constraints, variables }) as {
    feasible: boolean;
    result: number;
  };
  expect(result.feasible).toBe(true);
  return 2 * result.result;
}

// Random profiles: distinct stations up to 1500 mm, readings ±50 µm in 0.1 µm steps.
const profiles = fc
  .uniqueArray(fc.integer({ min: 0, max: 1500 }), { minLength: 3, maxLength: 40 })
  .chain((stations) =>
    fc
      .array(fc.integer({ min: -500, max: 500 }), { minLength: stations.length, maxLength: stations.length })
      .map((tenths) => stations.map((x, i) => ({ x, y: tenths[i]! / 10 }))),
  );

describe("straightness deviation", () => {
  it("gives the worked example's three values", () => {
    expect(straightnessDeviation(WORKED, "end-points")).toBeCloseTo(6.8, 9); // worked example, GEOMETRY.md
    expect(straightnessDeviation(WORKED, "least-squares")).toBeCloseTo(6.286, 3); // worked example, GEOMETRY.md
    expect(straightnessDeviation(WORKED, "minimum-zone")).toBeCloseTo(6.0, 9); // worked example, GEOMETRY.md
  });

  it("gives the worked example's reference slopes", () => {
    expect(straightnessEvaluation(WORKED, "least-squares").line.slope).toBeCloseTo(0.018571, 6); // worked example, GEOMETRY.md
    expect(straightnessEvaluation(WORKED, "minimum-zone").line.slope).toBeCloseTo(0.02, 12); // worked example, GEOMETRY.md
  });

  it("does not depend on the order the stations are given in", () => {
    const shuffled = [WORKED[3]!, WORKED[0]!, WORKED[5]!, WORKED[1]!, WORKED[4]!, WORKED[2]!];
    expect(straightnessDeviation(shuffled, "end-points")).toBeCloseTo(6.8, 9); // worked example, GEOMETRY.md
    expect(straightnessDeviation(shuffled, "minimum-zone")).toBeCloseTo(6.0, 9); // worked example, GEOMETRY.md
  });

  it("least squares agrees with simple-statistics' linear regression on random profiles", () => {
    fc.assert(
      fc.property(profiles, (points) => {
        const { m, b } = linearRegression(points.map((p) => [p.x, p.y])); // simple-statistics
        const expected = bandWidth(points, m, b);
        expect(straightnessDeviation(points, "least-squares")).toBeCloseTo(expected, 6);
      }),
      { numRuns: 200 },
    );
  });

  it("minimum zone agrees with a linear program (javascript-lp-solver) on random profiles", () => {
    fc.assert(
      fc.property(profiles, (points) => {
        const expected = minimumZoneByLp(points); // javascript-lp-solver
        expect(straightnessDeviation(points, "minimum-zone")).toBeCloseTo(expected, 6);
      }),
      { numRuns: 150 },
    );
  });

  it("minimum zone is never wider than least squares or end points", () => {
    fc.assert(
      fc.property(profiles, (points) => {
        // ISO 230-1, from memory: the minimum zone is the narrowest band, by definition
        const zone = straightnessDeviation(points, "minimum-zone");
        expect(zone).toBeLessThanOrEqual(straightnessDeviation(points, "least-squares") + 1e-9);
        expect(zone).toBeLessThanOrEqual(straightnessDeviation(points, "end-points") + 1e-9);
      }),
      { numRuns: 300 },
    );
  });

  it("is unchanged by tilting the whole profile (the reference follows the tilt)", () => {
    fc.assert(
      fc.property(profiles, fc.integer({ min: -100, max: 100 }), (points, tiltTenths) => {
        // ISO 230-1, from memory: straightness is measured about a fitted line, so a tilt drops out
        const tilt = tiltTenths / 1000; // µm/mm
        const tilted = points.map((p) => ({ x: p.x, y: p.y + tilt * p.x }));
        for (const reference of ["end-points", "least-squares", "minimum-zone"] as const) {
          expect(straightnessDeviation(tilted, reference)).toBeCloseTo(straightnessDeviation(points, reference), 6);
        }
      }),
      { numRuns: 100 },
    );
  });

  it("is zero for points on a line, and for two points", () => {
    const line = [0, 50, 120, 300].map((x) => ({ x, y: 3 + 0.01 * x }));
    for (const reference of ["end-points", "least-squares", "minimum-zone"] as const) {
      expect(straightnessDeviation(line, reference)).toBeCloseTo(0, 12); // common practice: a straight line has no deviation
      expect(straightnessDeviation([{ x: 0, y: 0 }, { x: 10, y: 7 }], reference)).toBeCloseTo(0, 12); // common practice
    }
  });
});

describe("shape of a straightness profile", () => {
  it("calls a hump convex, a sag concave and the worked example mixed", () => {
    const hump = [0, 100, 200, 300, 400].map((x, i) => ({ x, y: [0, 3, 5, 3, 0][i]! }));
    const sag = hump.map((p) => ({ x: p.x, y: -p.y }));
    expect(profileShape(hump).shape).toBe("convex"); // GEOMETRY.md: convex = middle above the end-point line
    expect(profileShape(sag).shape).toBe("concave"); // GEOMETRY.md: concave = middle below
    expect(profileShape(WORKED).shape).toBe("mixed"); // worked example, GEOMETRY.md: −5.6 µm below and +1.2 µm above
    expect(profileShape(WORKED).below).toBeCloseTo(5.6, 9); // worked example, GEOMETRY.md (end-point residual at 100 mm)
    expect(profileShape(WORKED).above).toBeCloseTo(1.2, 9); // worked example, GEOMETRY.md (end-point residual at 300 mm)
  });

  it("ignores departures within the instrument's resolution", () => {
    const nearlyHump = [0, 100, 200, 300].map((x, i) => ({ x, y: [0, 4, -0.5, 0][i]! }));
    expect(profileShape(nearlyHump, 1).shape).toBe("convex"); // GEOMETRY.md: direction rules beyond the resolution
    expect(profileShape(nearlyHump, 0).shape).toBe("mixed"); // GEOMETRY.md
  });
});

describe("local straightness", () => {
  it("takes the worst window, each against its own reference line", () => {
    // Worked example, GEOMETRY.md, over any 250 mm: window 0–200 mm is 0, −4, +2 → end-point line
    // through (0, 0) and (200, 2), point at 100 mm 5 µm below it (computed by hand).
    const local = localStraightness(WORKED, "end-points", 250);
    expect(local?.deviation).toBeCloseTo(5, 9);
    expect(local?.from).toBe(0);
    expect(local?.to).toBe(200);
  });

  it("has nothing to say when no two stations lie within the window", () => {
    expect(localStraightness([{ x: 0, y: 0 }, { x: 500, y: 1 }], "end-points", 250)).toBeNull();
  });
});

describe("straightness refuses input it cannot score", () => {
  it.each([
    ["no points", []],
    ["one point", [{ x: 0, y: 1 }]],
  ])("%s", (_, points) => {
    expect(() => straightnessDeviation(points, "minimum-zone")).toThrow(GeometryInputError);
    expect(() => straightnessDeviation(points, "minimum-zone")).toThrow(/at least 2/);
  });

  it("a station read twice, and says which", () => {
    const repeated = [{ x: 0, y: 0 }, { x: 100, y: 2 }, { x: 100, y: 3 }];
    expect(() => straightnessDeviation(repeated, "least-squares")).toThrow(GeometryInputError);
    expect(() => straightnessDeviation(repeated, "least-squares")).toThrow(/Station 100 mm is given twice \(points 2 and 3\)/);
  });

  it.each([NaN, Infinity, -Infinity])("a station or reading of %s", (bad) => {
    expect(() => straightnessDeviation([{ x: 0, y: 0 }, { x: bad, y: 1 }], "end-points")).toThrow(GeometryInputError);
    expect(() => straightnessDeviation([{ x: 0, y: 0 }, { x: 1, y: bad }], "end-points")).toThrow(GeometryInputError);
  });

  it("an unknown reference line", () => {
    expect(() => straightnessDeviation(WORKED, "best-fit" as never)).toThrow(GeometryInputError);
  });
});
