// The minimum zone by rotating calipers over the convex hull, and the any-window checks over index runs,
// checked against references that share none of their code: a linear program (javascript-lp-solver), every
// line through two stations (the narrowest band touches the hull along an edge, so it is parallel to a line
// through two stations: common practice for Chebyshev line fits), and windows cut and scored one by one.
import fc from "fast-check";
import solver from "javascript-lp-solver";
import { describe, expect, it } from "vitest";
import { CENTRE_LATHE_NORMAL, evaluateTest, localStraightness, straightnessDeviation, straightnessEvaluation, type ProfilePoint } from "~/geometry";

/** Minimum zone by linear programming: minimise t s.t. |y_i − a·x_i − b| ≤ t; the width is 2t. */
function minimumZoneByLp(points: readonly ProfilePoint[]): number {
  const constraints: Record<string, { min?: number; max?: number }> = {};
  const variables: Record<string, Record<string, number>> = { aPlus: {}, aMinus: {}, bPlus: {}, bMinus: {}, t: { width: 1 } };
  points.forEach(({ x, y }, i) => {
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
  const result = solver.Solve({ optimize: "width", opType: "min", constraints, variables }) as { feasible: boolean; result: number };
  expect(result.feasible).toBe(true);
  return 2 * result.result;
}

/** The narrowest band parallel to any line through two stations: O(n³), no hull. */
function minimumZoneByPairs(points: readonly ProfilePoint[]): number {
  let best = Infinity;
  for (let i = 0; i < points.length; i++) {
    for (let j = i + 1; j < points.length; j++) {
      const slope = (points[j]!.y - points[i]!.y) / (points[j]!.x - points[i]!.x);
      const residuals = points.map((p) => p.y - slope * p.x);
      best = Math.min(best, Math.max(...residuals) - Math.min(...residuals));
    }
  }
  return best;
}

// Bed-like profiles: a crown or sag (convex or concave, so most stations sit on the hull) with noise.
const bedProfiles = fc
  .record({
    count: fc.integer({ min: 3, max: 120 }),
    length: fc.integer({ min: 200, max: 1500 }),
    crown: fc.integer({ min: -300, max: 300 }),
    tilt: fc.integer({ min: -50, max: 50 }),
    noise: fc.array(fc.integer({ min: -20, max: 20 }), { minLength: 120, maxLength: 120 }),
  })
  .map(({ count, length, crown, tilt, noise }) =>
    Array.from({ length: count }, (_, i) => {
      const x = (length * i) / (count - 1);
      return { x, y: (crown / 10) * Math.sin((Math.PI * x) / length) + (tilt / 1000) * x + noise[i]! / 10 };
    }),
  );

const randomProfiles = fc
  .uniqueArray(fc.integer({ min: 0, max: 1500 }), { minLength: 3, maxLength: 30 })
  .chain((stations) =>
    fc.array(fc.integer({ min: -500, max: 500 }), { minLength: stations.length, maxLength: stations.length }).map((tenths) => stations.map((x, i) => ({ x, y: tenths[i]! / 10 }))),
  );

describe("minimum zone by rotating calipers", () => {
  it("agrees with a linear program (javascript-lp-solver) on bed-like profiles of up to 120 stations", () => {
    fc.assert(
      fc.property(bedProfiles, (points) => {
        expect(straightnessDeviation(points, "minimum-zone")).toBeCloseTo(minimumZoneByLp(points), 6);
      }),
      { numRuns: 40 },
    );
  });

  it("agrees with the narrowest band through every pair of stations on random profiles", () => {
    fc.assert(
      fc.property(randomProfiles, (points) => {
        expect(straightnessDeviation(points, "minimum-zone")).toBeCloseTo(minimumZoneByPairs(points), 9);
      }),
      { numRuns: 200 },
    );
  });

  it("holds every station inside the band it reports", () => {
    fc.assert(
      fc.property(bedProfiles, (points) => {
        const { deviation, line } = straightnessEvaluation(points, "minimum-zone");
        for (const p of points) expect(Math.abs(p.y - (line.slope * p.x + line.intercept))).toBeLessThanOrEqual(deviation / 2 + 1e-9);
      }),
      { numRuns: 100 },
    );
  });
});

/** Each window cut out and scored on its own, as the definition reads. */
function worstWindowByCutting(points: readonly ProfilePoint[], window: number, score: (run: ProfilePoint[]) => number) {
  const sorted = [...points].sort((a, b) => a.x - b.x);
  let worst: number | null = null;
  for (let start = 0; start < sorted.length; start++) {
    const run = sorted.filter((p) => p.x >= sorted[start]!.x && p.x <= sorted[start]!.x + window);
    if (run.length >= 2) worst = Math.max(worst ?? -Infinity, score(run));
  }
  return worst;
}

describe("checks over any window", () => {
  it("give the worst minimum-zone straightness of the windows cut one by one", () => {
    fc.assert(
      fc.property(randomProfiles, fc.integer({ min: 50, max: 800 }), (points, window) => {
        const expected = worstWindowByCutting(points, window, (run) => straightnessDeviation(run, "minimum-zone"));
        const local = localStraightness(points, "minimum-zone", window);
        if (expected === null) expect(local).toBeNull();
        else expect(local!.deviation).toBeCloseTo(expected, 9);
      }),
      { numRuns: 200 },
    );
  });

  it("give what copying each window out gave, for every reference line", () => {
    // The implementation before index runs, kept here as the reference: windows from each station, the last
    // one reaching the end of the travel ends the walk (a minimum zone only shrinks on a subset).
    const bySlices = (points: readonly ProfilePoint[], reference: "end-points" | "least-squares" | "minimum-zone", window: number) => {
      const sorted = [...points].sort((a, b) => a.x - b.x);
      let worst: number | null = null;
      let end = 0;
      for (let start = 0; start < sorted.length; start++) {
        if (end < start) end = start;
        while (end + 1 < sorted.length && sorted[end + 1]!.x <= sorted[start]!.x + window * (1 + 1e-12)) end++;
        if (end > start) worst = Math.max(worst ?? -Infinity, straightnessDeviation(sorted.slice(start, end + 1), reference));
        if (end === sorted.length - 1) break;
      }
      return worst;
    };
    fc.assert(
      fc.property(randomProfiles, fc.integer({ min: 50, max: 800 }), fc.constantFrom("end-points" as const, "least-squares" as const, "minimum-zone" as const), (points, window, reference) => {
        const expected = bySlices(points, reference, window);
        const local = localStraightness(points, reference, window);
        if (expected === null) expect(local).toBeNull();
        else expect(local!.deviation).toBeCloseTo(expected, 9);
      }),
      { numRuns: 200 },
    );
  });

  it("give the worst range of the windows cut one by one (leadscrew pitch, any 300 mm and any 60 mm)", () => {
    const pitch = CENTRE_LATHE_NORMAL.tests.find((test) => test.code === "L-LS-PITCH")!;
    const range = (run: ProfilePoint[]) => Math.max(...run.map((p) => p.y)) - Math.min(...run.map((p) => p.y));
    fc.assert(
      fc.property(randomProfiles, (points) => {
        const result = evaluateTest(pitch, { kind: "profile", points: points.map((p) => ({ station: p.x, reading: p.y })) });
        expect(result.value).toBeCloseTo(worstWindowByCutting(points, 300, range) ?? range(points), 9);
        if (result.local) expect(result.local.value).toBeCloseTo(worstWindowByCutting(points, 60, range)!, 9);
      }),
      { numRuns: 200 },
    );
  });
});
