import { describe, expect, it } from "vitest";
import fc from "fast-check";
import solver from "javascript-lp-solver";
import { Matrix, solve } from "ml-matrix";
import {
  flatnessDeviation,
  flatnessEvaluation,
  GeometryInputError,
  levelGridHeights,
  parallelismToTravel,
  squarenessOfTravels,
  type SurfacePoint,
} from "~/geometry";

/** Minimum zone by javascript-lp-solver: minimise t with |z − (a·x + b·y + c)| ≤ t/2 (reference LP solver). */
function lpMinimumZone(points: SurfacePoint[]): number {
  const constraints: Record<string, { min?: number; max?: number }> = {};
  const variables: Record<string, Record<string, number>> = {
    aPlus: {}, aMinus: {}, bPlus: {}, bMinus: {}, cPlus: {}, cMinus: {}, t: { width: 1 },
  };
  points.forEach(({ x, y, z }, i) => {
    // a·x + b·y + c + t/2 ≥ z  and  a·x + b·y + c − t/2 ≤ z.
    constraints[`above${i}`] = { min: z };
    constraints[`below${i}`] = { max: z };
    for (const [row, tSign] of [[`above${i}`, 0.5], [`below${i}`, -0.5]] as const) {
      variables.aPlus![row] = x;
      variables.aMinus![row] = -x;
      variables.bPlus![row] = y;
      variables.bMinus![row] = -y;
      variables.cPlus![row] = 1;
      variables.cMinus![row] = -1;
      variables.t![row] = tSign;
    }
  });
  const result = solver.Solve({ optimize: "width", opType: "min", constraints, variables }) as { feasible: boolean; result: number };
  expect(result.feasible).toBe(true);
  return result.result;
}

/** Least-squares plane by ml-matrix (QR solve of the over-determined system [x y 1]·p = z), then the residuals' range. */
function mlMatrixLeastSquares(points: SurfacePoint[]): number {
  const design = new Matrix(points.map(({ x, y }) => [x, y, 1]));
  const heights = Matrix.columnVector(points.map(({ z }) => z));
  const [a, b, c] = solve(design, heights).to1DArray() as [number, number, number];
  const residuals = points.map(({ x, y, z }) => z - (a * x + b * y + c));
  return Math.max(...residuals) - Math.min(...residuals);
}

// Worked example, docs/geometry.md ("Flatness: a worked example"): 4 × 2 grid, heights 0, 0, 0, 12 µm along x on both rows.
const WORKED: SurfacePoint[] = [0, 100].flatMap((y) =>
  [
    [0, 0],
    [100, 0],
    [200, 0],
    [300, 12],
  ].map(([x, z]) => ({ x: x!, y, z: z! })),
);

// Random grids: 2–9 rows and columns, steps 10–200 mm, heights ±50 µm in 0.1 µm steps, with a tilt.
const grids = fc
  .record({
    rows: fc.integer({ min: 2, max: 9 }),
    columns: fc.integer({ min: 2, max: 9 }),
    stepX: fc.integer({ min: 10, max: 200 }),
    stepY: fc.integer({ min: 10, max: 200 }),
    tiltX: fc.integer({ min: -100, max: 100 }),
    tiltY: fc.integer({ min: -100, max: 100 }),
  })
  .chain(({ rows, columns, stepX, stepY, tiltX, tiltY }) =>
    fc.array(fc.integer({ min: -500, max: 500 }), { minLength: rows * columns, maxLength: rows * columns }).map((tenths) =>
      tenths.map((tenth, i) => {
        const x = (i % columns) * stepX;
        const y = Math.floor(i / columns) * stepY;
        return { x, y, z: tenth / 10 + (tiltX * x + tiltY * y) / 1000 };
      }),
    ),
  );

describe("flatness deviation", () => {
  it("gives the worked example's values", () => {
    expect(flatnessDeviation(WORKED, "least-squares")).toBeCloseTo(8.4, 9); // worked example, docs/geometry.md
    expect(flatnessDeviation(WORKED, "minimum-zone")).toBeCloseTo(8, 9); // worked example, docs/geometry.md
    const zone = flatnessEvaluation(WORKED, "minimum-zone");
    expect(zone.plane.slopeX).toBeCloseTo(0.04, 9); // worked example, docs/geometry.md
    expect(zone.plane.slopeY).toBeCloseTo(0, 9);
    expect(Math.max(...zone.residuals) - Math.min(...zone.residuals)).toBeCloseTo(8, 9);
  });

  it("matches javascript-lp-solver on random grids (minimum zone)", () => {
    fc.assert(
      fc.property(grids, (points) => {
        expect(flatnessDeviation(points, "minimum-zone")).toBeCloseTo(lpMinimumZone(points), 6);
      }),
      { numRuns: 150 },
    );
  });

  it("matches ml-matrix's least-squares solve on random grids", () => {
    fc.assert(
      fc.property(grids, (points) => {
        expect(flatnessDeviation(points, "least-squares")).toBeCloseTo(mlMatrixLeastSquares(points), 6);
      }),
      { numRuns: 150 },
    );
  });

  it("never reports the minimum zone wider than the least-squares planes", () => {
    fc.assert(
      fc.property(grids, (points) => {
        expect(flatnessDeviation(points, "minimum-zone")).toBeLessThanOrEqual(flatnessDeviation(points, "least-squares") + 1e-9);
      }),
      { numRuns: 200 },
    );
  });

  it("matches the LP on scattered points, not only grids", () => {
    const scattered = fc
      .uniqueArray(fc.tuple(fc.integer({ min: 0, max: 2000 }), fc.integer({ min: 0, max: 1000 })), {
        minLength: 4,
        maxLength: 40,
        selector: ([x, y]) => `${x},${y}`,
      })
      .chain((places) =>
        fc
          .array(fc.integer({ min: -1000, max: 1000 }), { minLength: places.length, maxLength: places.length })
          .map((tenths) => places.map(([x, y], i) => ({ x, y, z: tenths[i]! / 10 }))),
      )
      .filter((points) => {
        const [p, q] = points;
        return points.some((r) => (q!.x - p!.x) * (r.y - p!.y) - (q!.y - p!.y) * (r.x - p!.x) !== 0);
      });
    fc.assert(
      fc.property(scattered, (points) => {
        expect(flatnessDeviation(points, "minimum-zone")).toBeCloseTo(lpMinimumZone(points), 6);
      }),
      { numRuns: 100 },
    );
  });

  it("is zero for a tilted plane and ignores the plane's tilt", () => {
    const plane = Array.from({ length: 25 }, (_, i) => ({ x: (i % 5) * 100, y: Math.floor(i / 5) * 80, z: 0.03 * (i % 5) * 100 - 0.02 * Math.floor(i / 5) * 80 + 7 }));
    expect(flatnessDeviation(plane, "minimum-zone")).toBeCloseTo(0, 9);
    expect(flatnessDeviation(plane, "least-squares")).toBeCloseTo(0, 9);
  });

  it("solves a 50 × 50 grid (the most a surface may hold)", () => {
    const points = Array.from({ length: 2500 }, (_, i) => ({ x: (i % 50) * 20, y: Math.floor(i / 50) * 20, z: Math.sin(i * 0.37) * 4 + Math.cos(i * 0.011) * 9 }));
    expect(flatnessDeviation(points, "minimum-zone")).toBeLessThanOrEqual(flatnessDeviation(points, "least-squares"));
    expect(() => flatnessDeviation([...points, { x: -1, y: -1, z: 0 }], "minimum-zone")).toThrow(GeometryInputError);
  });

  it.each([
    ["fewer than 3 points", [{ x: 0, y: 0, z: 0 }, { x: 1, y: 0, z: 0 }]],
    ["all on one line", [{ x: 0, y: 0, z: 0 }, { x: 1, y: 1, z: 3 }, { x: 2, y: 2, z: 0 }, { x: 5, y: 5, z: 1 }]],
    ["a repeated place", [{ x: 0, y: 0, z: 0 }, { x: 1, y: 0, z: 0 }, { x: 0, y: 1, z: 0 }, { x: 1, y: 0, z: 4 }]],
    ["a non-finite height", [{ x: 0, y: 0, z: 0 }, { x: 1, y: 0, z: Number.NaN }, { x: 0, y: 1, z: 0 }]],
    ["an infinite x", [{ x: Number.POSITIVE_INFINITY, y: 0, z: 0 }, { x: 1, y: 0, z: 0 }, { x: 0, y: 1, z: 0 }]],
    ["a missing y", [{ x: 0, z: 0 }, { x: 1, y: 0, z: 0 }, { x: 0, y: 1, z: 0 }]],
  ])("refuses %s", (_, points) => {
    for (const reference of ["least-squares", "minimum-zone"] as const) {
      expect(() => flatnessDeviation(points as SurfacePoint[], reference)).toThrow(GeometryInputError);
    }
  });

  it("refuses an unknown reference", () => {
    expect(() => flatnessDeviation(WORKED, "end-points" as "minimum-zone")).toThrow(GeometryInputError);
  });
});

/** A known surface: a gentle saddle with a twist, µm over mm. */
const known = (x: number, y: number) => 4e-5 * (x - 200) ** 2 - 3e-5 * (y - 150) ** 2 + 0.01 * x + 1e-5 * x * y;

describe("level grid heights", () => {
  const rows = 4;
  const columns = 5;
  const step = 100;
  const tilt = (from: [number, number], to: [number, number], length: number) => ((known(...to) - known(...from)) / length) * 1000;
  const rowTilts = Array.from({ length: rows }, (_, r) =>
    Array.from({ length: columns - 1 }, (_, c) => tilt([c * step, r * step], [(c + 1) * step, r * step], step)),
  );
  const columnTilts = Array.from({ length: columns }, (_, c) =>
    Array.from({ length: rows - 1 }, (_, r) => tilt([c * step, r * step], [c * step, (r + 1) * step], step)),
  );

  it("recovers a grid whose heights are known, with no closure error (rows and columns)", () => {
    const result = levelGridHeights({ layout: "rows-columns", stepXmm: step, stepYmm: step, rowTilts, columnTilts });
    expect(result.points).toHaveLength(rows * columns);
    for (const point of result.points) expect(point.z).toBeCloseTo(known(point.x, point.y) - known(0, 0), 9);
    expect(result.closureErrorUm).toBeCloseTo(0, 9);
  });

  it("reports a misread step as the closure of the cells it borders", () => {
    const misread = rowTilts.map((line) => [...line]);
    misread[1]![2]! += 20; // 20 µm/m over 100 mm: 2 µm
    const result = levelGridHeights({ layout: "rows-columns", stepXmm: step, stepYmm: step, rowTilts: misread, columnTilts });
    expect(result.closureErrorUm).toBeCloseTo(2, 9);
    expect(result.closures.filter((entry) => Math.abs(entry.closureUm) > 1e-9)).toHaveLength(2);
  });

  it("recovers a known surface read in the diagonal layout", () => {
    const L = 600;
    const W = 400;
    const line = (from: [number, number], to: [number, number], steps: number) => {
      const length = Math.hypot(to[0] - from[0], to[1] - from[1]) / steps;
      return Array.from({ length: steps }, (_, k) => {
        const a: [number, number] = [from[0] + ((to[0] - from[0]) * k) / steps, from[1] + ((to[1] - from[1]) * k) / steps];
        const b: [number, number] = [from[0] + ((to[0] - from[0]) * (k + 1)) / steps, from[1] + ((to[1] - from[1]) * (k + 1)) / steps];
        return tilt(a, b, length);
      });
    };
    const lines = {
      "diagonal-ac": line([0, 0], [L, W], 8),
      "diagonal-bd": line([L, 0], [0, W], 8),
      "edge-ab": line([0, 0], [L, 0], 6),
      "edge-dc": line([0, W], [L, W], 6),
      "edge-ad": line([0, 0], [0, W], 4),
      "edge-bc": line([L, 0], [L, W], 4),
      "centre-x": line([0, W / 2], [L, W / 2], 6),
      "centre-y": line([L / 2, 0], [L / 2, W], 4),
    };
    const result = levelGridHeights({ layout: "union-jack", lengthMm: L, widthMm: W, lines });
    for (const point of result.points) expect(point.z).toBeCloseTo(known(point.x, point.y) - known(0, 0), 9);
    expect(result.closureErrorUm).toBeCloseTo(0, 9);
    // 9 + 9 stations on the diagonals less the shared centre; the edges' inner stations; the centre lines' inner
    // stations less the centre.
    expect(result.points).toHaveLength(17 + (5 + 5 + 3 + 3) + (4 + 2));

    const misread = { ...lines, "edge-ab": lines["edge-ab"].map((value, k) => (k === 0 ? value + 30 : value)) };
    const off = levelGridHeights({ layout: "union-jack", lengthMm: L, widthMm: W, lines: misread });
    expect(off.closures.find((entry) => entry.line === "edge-ab")!.closureUm).toBeCloseTo(3, 9); // 30 µm/m × 100 mm
  });

  it("refuses ragged lines, odd diagonal steps and non-finite tilts", () => {
    expect(() => levelGridHeights({ layout: "rows-columns", stepXmm: 100, stepYmm: 100, rowTilts: [[1], [1, 2]], columnTilts: [[1], [1]] })).toThrow(GeometryInputError);
    expect(() =>
      levelGridHeights({ layout: "rows-columns", stepXmm: 100, stepYmm: 100, rowTilts: [[Number.NaN], [1]], columnTilts: [[1], [1]] }),
    ).toThrow(GeometryInputError);
    const lines = Object.fromEntries(
      ["diagonal-ac", "diagonal-bd", "edge-ab", "edge-dc", "edge-ad", "edge-bc", "centre-x", "centre-y"].map((name) => [name, [0, 0, 0]]),
    );
    expect(() => levelGridHeights({ layout: "union-jack", lengthMm: 600, widthMm: 400, lines } as never)).toThrow(GeometryInputError);
    expect(() => levelGridHeights({ layout: "spiral" } as never)).toThrow(GeometryInputError);
  });
});

describe("squareness and parallelism to a travel", () => {
  it("states the squareness as the least-squares slope over the length read", () => {
    // 0.05 µm per mm over 300 mm: 15 µm (worked by hand).
    const readings = [0, 100, 200, 300].map((station) => ({ station, reading: 0.05 * station + (station === 100 ? 1 : 0) - (station === 200 ? 1 : 0) }));
    const result = squarenessOfTravels(readings);
    expect(result.overMm).toBe(300);
    // slope = Σ(s − 150)(r − r̄)/Σ(s − 150)²: the ±1 µm pair tilts it by (−50·1 + 50·(−1))/50 000 = −0.002.
    expect(result.slopeUmPerM).toBeCloseTo(48, 9);
    expect(result.deviation).toBeCloseTo(14.4, 9);
  });

  it("cancels the square's own error with the square turned over", () => {
    const machine = 0.02; // µm/mm
    const square = 0.01;
    const normal = [0, 250, 500].map((station) => ({ station, reading: (machine + square) * station }));
    const reversed = [0, 250, 500].map((station) => ({ station, reading: (machine - square) * station }));
    expect(squarenessOfTravels(normal, { reversed, overMm: 300 }).deviation).toBeCloseTo(6, 9);
  });

  it("gives the range of readings as the parallelism", () => {
    const result = parallelismToTravel([
      { station: 0, reading: 2 },
      { station: 200, reading: -3 },
      { station: 400, reading: 5 },
    ]);
    expect(result.deviation).toBe(8);
    expect(result.lengthMm).toBe(400);
  });

  it("refuses a station read twice and non-finite readings", () => {
    expect(() => squarenessOfTravels([{ station: 0, reading: 0 }, { station: 0, reading: 1 }])).toThrow(GeometryInputError);
    expect(() => parallelismToTravel([{ station: 0, reading: 0 }, { station: 1, reading: Number.POSITIVE_INFINITY }])).toThrow(GeometryInputError);
    expect(() => squarenessOfTravels([{ station: 0, reading: 0 }, { station: 10, reading: 1 }], { overMm: -1 })).toThrow(GeometryInputError);
  });
});
