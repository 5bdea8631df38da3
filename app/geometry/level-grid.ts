// Heights over a surface from a precision level read step by step along lines (common practice). Each reading is
// a tilt in µm/m, positive when the level's leading end (the end in the direction of travel) stands higher; the
// rise over one step is tilt × step / 1000 µm. Lines that meet must agree: where they do not, the difference
// is the closure error, reported so the inspector can judge the readings (and re-read a line) on site.
// The heights come out relative to an arbitrary plane: flatness removes the plane anyway.
import { GeometryInputError } from "./errors";
import { FLATNESS_LIMITS, type SurfacePoint } from "./flatness";
import { requireMeasured } from "./limits";

/** Readings along every row (+x) and every column (+y) of a rectangular grid of rows × columns points. */
export interface RowsColumnsLevelGrid {
  layout: "rows-columns";
  /** mm between points along a row (x) and along a column (y). */
  stepXmm: number;
  stepYmm: number;
  /** rows × (columns − 1) tilts, µm/m, row 0 at y = 0, each read towards +x. */
  rowTilts: number[][];
  /** columns × (rows − 1) tilts, µm/m, column 0 at x = 0, each read towards +y. */
  columnTilts: number[][];
}

export const UNION_JACK_LINES = [
  "diagonal-ac",
  "diagonal-bd",
  "edge-ab",
  "edge-dc",
  "edge-ad",
  "edge-bc",
  "centre-x",
  "centre-y",
] as const;
export type UnionJackLine = (typeof UNION_JACK_LINES)[number];

/**
 * The diagonal layout: corners A (0, 0), B (length, 0), C (length, width), D (0, width). Diagonals A→C and
 * B→D, edges A→B, D→C (along x), A→D, B→C (along y), centre lines from the middle of A–D to the middle of B–C
 * (centre-x) and from the middle of A–B to the middle of D–C (centre-y). Each line: an even number of equal
 * steps (so each has a middle point where the others meet it), one tilt per step in the direction given.
 */
export interface UnionJackLevelGrid {
  layout: "union-jack";
  lengthMm: number;
  widthMm: number;
  lines: Record<UnionJackLine, number[]>;
}

export type LevelGrid = RowsColumnsLevelGrid | UnionJackLevelGrid;

export interface LevelGridHeights {
  points: SurfacePoint[];
  /** Per line or loop: how far its far end missed the height the other lines gave, µm. */
  closures: { line: string; closureUm: number }[];
  /** The largest closure, µm (absolute). */
  closureErrorUm: number;
}

function tiltsOf(list: unknown, count: number, what: string, path: (string | number)[]): number[] {
  if (!Array.isArray(list) || list.length !== count) {
    throw new GeometryInputError(`${what} needs ${count} tilts; got ${Array.isArray(list) ? list.length : "none"}.`, path);
  }
  list.forEach((tilt, i) => requireMeasured(tilt as number, "tilt", `${what}, step ${i + 1}`, [...path, i]));
  return list as number[];
}

function positiveLength(value: number, what: string, path: (string | number)[]): number {
  requireMeasured(value, "station", what, path);
  if (!(value > 0)) throw new GeometryInputError(`${what} must be greater than 0 mm.`, path);
  return value;
}

const rise = (tiltUmPerM: number, stepMm: number) => (tiltUmPerM * stepMm) / 1000;

function rowsColumnsHeights(grid: RowsColumnsLevelGrid): LevelGridHeights {
  const stepX = positiveLength(grid.stepXmm, "The step along a row", ["stepXmm"]);
  const stepY = positiveLength(grid.stepYmm, "The step along a column", ["stepYmm"]);
  const rows = Array.isArray(grid.rowTilts) ? grid.rowTilts.length : 0;
  const columns = Array.isArray(grid.columnTilts) ? grid.columnTilts.length : 0;
  if (rows < 2 || columns < 2) throw new GeometryInputError("A level grid needs at least 2 rows and 2 columns.");
  if (rows > FLATNESS_LIMITS.gridLines || columns > FLATNESS_LIMITS.gridLines) {
    throw new GeometryInputError(`A level grid may have at most ${FLATNESS_LIMITS.gridLines} rows and columns.`);
  }
  const rowTilts = grid.rowTilts.map((line, r) => tiltsOf(line, columns - 1, `Row ${r + 1}`, ["rowTilts", r]));
  const columnTilts = grid.columnTilts.map((line, c) => tiltsOf(line, rows - 1, `Column ${c + 1}`, ["columnTilts", c]));

  // Two routes to every point: down column 0 then along the row, and along row 0 then up the column.
  const viaRows: number[][] = [];
  for (let r = 0; r < rows; r++) {
    const start = r === 0 ? 0 : viaRows[r - 1]![0]! + rise(columnTilts[0]![r - 1]!, stepY);
    const line = [start];
    for (let c = 1; c < columns; c++) line.push(line[c - 1]! + rise(rowTilts[r]![c - 1]!, stepX));
    viaRows.push(line);
  }
  const viaColumns: number[][] = Array.from({ length: rows }, () => new Array<number>(columns).fill(0));
  for (let c = 0; c < columns; c++) {
    viaColumns[0]![c] = c === 0 ? 0 : viaColumns[0]![c - 1]! + rise(rowTilts[0]![c - 1]!, stepX);
    for (let r = 1; r < rows; r++) viaColumns[r]![c] = viaColumns[r - 1]![c]! + rise(columnTilts[c]![r - 1]!, stepY);
  }
  // Each cell's loop (right along its lower row, up its right column, back along its upper row, down its left
  // column) should sum to nothing; the sum is that cell's closure.
  const closures: { line: string; closureUm: number }[] = [];
  for (let r = 0; r + 1 < rows; r++) {
    for (let c = 0; c + 1 < columns; c++) {
      const loop =
        rise(rowTilts[r]![c]!, stepX) +
        rise(columnTilts[c + 1]![r]!, stepY) -
        rise(rowTilts[r + 1]![c]!, stepX) -
        rise(columnTilts[c]![r]!, stepY);
      closures.push({ line: `cell row ${r + 1}, column ${c + 1}`, closureUm: loop });
    }
  }
  const points: SurfacePoint[] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < columns; c++) {
      points.push({ x: c * stepX, y: r * stepY, z: (viaRows[r]![c]! + viaColumns[r]![c]!) / 2 });
    }
  }
  return { points, closures, closureErrorUm: Math.max(...closures.map((entry) => Math.abs(entry.closureUm))) };
}

interface LineShape {
  from: [number, number];
  to: [number, number];
}

function unionJackHeights(grid: UnionJackLevelGrid): LevelGridHeights {
  const L = positiveLength(grid.lengthMm, "The surface's length", ["lengthMm"]);
  const W = positiveLength(grid.widthMm, "The surface's width", ["widthMm"]);
  const shapes: Record<UnionJackLine, LineShape> = {
    "diagonal-ac": { from: [0, 0], to: [L, W] },
    "diagonal-bd": { from: [L, 0], to: [0, W] },
    "edge-ab": { from: [0, 0], to: [L, 0] },
    "edge-dc": { from: [0, W], to: [L, W] },
    "edge-ad": { from: [0, 0], to: [0, W] },
    "edge-bc": { from: [L, 0], to: [L, W] },
    "centre-x": { from: [0, W / 2], to: [L, W / 2] },
    "centre-y": { from: [L / 2, 0], to: [L / 2, W] },
  };
  if (grid.lines === null || typeof grid.lines !== "object") throw new GeometryInputError("The diagonal layout needs its eight lines.", ["lines"]);
  const tilts = {} as Record<UnionJackLine, number[]>;
  for (const line of UNION_JACK_LINES) {
    const list = grid.lines[line];
    const steps = Array.isArray(list) ? list.length : 0;
    if (steps < 2 || steps % 2 !== 0 || steps > 2 * FLATNESS_LIMITS.gridLines) {
      throw new GeometryInputError(`Line ${line} needs an even number of steps from 2 to ${2 * FLATNESS_LIMITS.gridLines}; got ${steps}.`, ["lines", line]);
    }
    tilts[line] = tiltsOf(list, steps, `Line ${line}`, ["lines", line]);
  }
  const stepOf = (line: UnionJackLine) => {
    const { from, to } = shapes[line];
    return Math.hypot(to[0] - from[0], to[1] - from[1]) / tilts[line].length;
  };
  const integrate = (line: UnionJackLine, start: number) => {
    const heights = [start];
    const step = stepOf(line);
    for (const tilt of tilts[line]) heights.push(heights[heights.length - 1]! + rise(tilt, step));
    return heights;
  };
  const closures: { line: string; closureUm: number }[] = [];
  /** Integrated from a known start to a known end: the miss at the end is the closure, spread evenly back along the line. */
  const closed = (line: UnionJackLine, start: number, end: number) => {
    const heights = integrate(line, start);
    const steps = heights.length - 1;
    const miss = heights[steps]! - end;
    closures.push({ line, closureUm: miss });
    return heights.map((h, k) => h - (miss * k) / steps);
  };
  const middle = (heights: number[]) => heights[(heights.length - 1) / 2]!;

  // The diagonals set the reference: A→C from 0, then B→D lifted so the two agree at the centre.
  const ac = integrate("diagonal-ac", 0);
  const bdRaw = integrate("diagonal-bd", 0);
  const lift = middle(ac) - middle(bdRaw);
  const bd = bdRaw.map((h) => h + lift);
  const A = ac[0]!;
  const C = ac[ac.length - 1]!;
  const B = bd[0]!;
  const D = bd[bd.length - 1]!;
  const ab = closed("edge-ab", A, B);
  const dc = closed("edge-dc", D, C);
  const ad = closed("edge-ad", A, D);
  const bc = closed("edge-bc", B, C);
  const cx = closed("centre-x", middle(ad), middle(bc));
  const cy = closed("centre-y", middle(ab), middle(dc));
  // The centre lines cross the diagonals' centre: how far each misses it is a further check.
  closures.push({ line: "centre-x at the centre", closureUm: middle(cx) - middle(ac) });
  closures.push({ line: "centre-y at the centre", closureUm: middle(cy) - middle(ac) });

  const sums = new Map<string, { x: number; y: number; z: number; count: number }>();
  const place = (line: UnionJackLine, heights: number[]) => {
    const { from, to } = shapes[line];
    const steps = heights.length - 1;
    heights.forEach((z, k) => {
      const x = from[0] + ((to[0] - from[0]) * k) / steps;
      const y = from[1] + ((to[1] - from[1]) * k) / steps;
      const key = `${Math.round(x * 1e6)}|${Math.round(y * 1e6)}`;
      const entry = sums.get(key);
      if (entry) {
        entry.z += z;
        entry.count += 1;
      } else sums.set(key, { x, y, z, count: 1 });
    });
  };
  place("diagonal-ac", ac);
  place("diagonal-bd", bd);
  place("edge-ab", ab);
  place("edge-dc", dc);
  place("edge-ad", ad);
  place("edge-bc", bc);
  place("centre-x", cx);
  place("centre-y", cy);
  const points = [...sums.values()].map((entry) => ({ x: entry.x, y: entry.y, z: entry.z / entry.count }));
  return { points, closures, closureErrorUm: Math.max(...closures.map((entry) => Math.abs(entry.closureUm))) };
}

/** Heights (x, y mm; z µm) from level readings, with the closure error of the lines that meet. */
export function levelGridHeights(grid: LevelGrid): LevelGridHeights {
  if (grid?.layout === "rows-columns") return rowsColumnsHeights(grid);
  if (grid?.layout === "union-jack") return unionJackHeights(grid);
  throw new GeometryInputError('A level grid\'s layout is "rows-columns" or "union-jack".', ["layout"]);
}
