// Heights over a surface as the inspector enters them: a grid of indicator heights, or precision-level tilts read
// along the rows and columns of a grid or along the diagonal layout's eight lines. Pure and shared by the browser
// (live preview) and the server (draft checks, scoring). Text as typed in, the engine's surface points out.
import { z } from "zod";
import {
  FLATNESS_LIMITS,
  GeometryInputError,
  inchesToMillimetres,
  levelGridHeights,
  micrometresToInches,
  UNION_JACK_LINES,
  type LevelGrid,
  type UnionJackLine,
} from "~/geometry";
import { safeText } from "~/modules/validation/text";

export const GRID_LAYOUTS = ["heights", "rows-columns", "union-jack"] as const;
export type GridLayout = (typeof GRID_LAYOUTS)[number];

/** Rows or columns of a grid: the engine's cap (50 × 50 scores in well under 100 ms, bench/flatness.ts). */
export const GRID_MAX_LINES = FLATNESS_LIMITS.gridLines;
/** Steps along one line of the diagonal layout. */
export const GRID_MAX_STEPS = 2 * FLATNESS_LIMITS.gridLines;
const MAX_NUMBER_TEXT = 32;
/** One line's tilts as typed, separated by spaces: 100 numbers of up to 32 characters. */
const MAX_TILT_LINE = GRID_MAX_STEPS * (MAX_NUMBER_TEXT + 1);

const cell = safeText({ label: "number", max: MAX_NUMBER_TEXT, messages: { tooLong: "Too long for a number." } }).default("");
const tiltLine = safeText({ label: "tilts", max: MAX_TILT_LINE, messages: { tooLong: `At most ${GRID_MAX_STEPS} tilts on a line.` } }).default("");
const lineCount = z
  .number({ error: `Give a whole number of rows or columns from 2 to ${GRID_MAX_LINES}.` })
  .int(`Give a whole number of rows or columns from 2 to ${GRID_MAX_LINES}.`)
  .min(2, "A grid has at least 2 rows and 2 columns.")
  .max(GRID_MAX_LINES, `At most ${GRID_MAX_LINES} rows or columns; read a coarser grid.`);

export const gridEntrySchema = z.object({
  layout: z.enum(GRID_LAYOUTS, { error: "Choose how the surface was read." }).default("heights"),
  rows: lineCount.default(5),
  columns: lineCount.default(5),
  /** Spacing between columns (along x) and between rows (along y), in the entry's station units. */
  stepX: cell,
  stepY: cell,
  /** The diagonal layout's surface: length along x, width along y, in station units. */
  length: cell,
  width: cell,
  /** rows × columns heights in reading units, row 0 at y = 0. */
  heights: z.array(z.array(cell).max(GRID_MAX_LINES, `At most ${GRID_MAX_LINES} columns.`)).max(GRID_MAX_LINES, `At most ${GRID_MAX_LINES} rows.`).default([]),
  /** One line of tilts (µm/m) per row, read towards +x, and per column, read towards +y. */
  rowTilts: z.array(tiltLine).max(GRID_MAX_LINES, `At most ${GRID_MAX_LINES} rows.`).default([]),
  columnTilts: z.array(tiltLine).max(GRID_MAX_LINES, `At most ${GRID_MAX_LINES} columns.`).default([]),
  lines: z.object(Object.fromEntries(UNION_JACK_LINES.map((line) => [line, tiltLine])) as Record<UnionJackLine, typeof tiltLine>).default(
    Object.fromEntries(UNION_JACK_LINES.map((line) => [line, ""])) as Record<UnionJackLine, string>,
  ),
  reference: z.union([z.literal(""), z.enum(["least-squares", "minimum-zone"])]).default(""),
});

export type GridEntry = z.output<typeof gridEntrySchema>;

export const emptyGridEntry = (): GridEntry => gridEntrySchema.parse({});

/** The diagonal layout's lines in the inspector's words, corners A (0, 0), B (length, 0), C, D (0, width). */
export const UNION_JACK_LINE_LABELS: Record<UnionJackLine, string> = {
  "diagonal-ac": "Diagonal A → C",
  "diagonal-bd": "Diagonal B → D",
  "edge-ab": "Edge A → B (front)",
  "edge-dc": "Edge D → C (back)",
  "edge-ad": "Edge A → D (left)",
  "edge-bc": "Edge B → C (right)",
  "centre-x": "Centre line, left → right",
  "centre-y": "Centre line, front → back",
};

// ————— Numbers as typed —————

/** A number as typed: "-2", "−2", "0,4" (decimal comma), "+3". Empty → undefined; anything else "invalid"; never non-finite. */
export function typedNumber(text: string): number | undefined | "invalid" {
  const trimmed = text.trim().replace(/\u2212/g, "-").replace(/^\+/, "");
  if (trimmed === "") return undefined;
  const normalised = /^-?\d*,\d+$/.test(trimmed) ? trimmed.replace(",", ".") : trimmed;
  if (!/^-?(\d+\.?\d*|\.\d+)(e-?\d+)?$/i.test(normalised)) return "invalid";
  const value = Number(normalised);
  return Number.isFinite(value) ? value : "invalid";
}

/** The cells of one pasted line: tabs or semicolons (then a decimal comma is allowed), otherwise commas or spaces. */
function cellsOf(line: string): string[] {
  const parts = /[\t;]/.test(line) ? line.split(/[\t;]/) : line.split(/[,\s]+/);
  return parts.map((part) => part.trim()).filter(Boolean);
}

/**
 * A block pasted from a spreadsheet or CSV file as a grid of heights: one row per line. Lines that hold no
 * number (a header) are skipped and counted; a first cell that is not a number (a row label) is dropped.
 */
export function parseHeightTable(text: string): { heights: string[][]; skipped: number; tooLarge: boolean } {
  const lines = text.split(/\r?\n/).filter((line) => line.trim());
  const labelled = (line: string | undefined) => {
    if (line === undefined) return false;
    const first = (/[\t;]/.test(line) ? line.split(/[\t;]/) : line.trim().split(/[,\s]+/))[0]!.trim();
    return typeof typedNumber(first) !== "number";
  };
  // With row labels in the first column, a first line of column positions is a header, numbers or not.
  const headerFirst = lines.length > 2 && labelled(lines[0]) && labelled(lines[1]);
  const heights: string[][] = [];
  let skipped = headerFirst ? 1 : 0;
  for (const raw of headerFirst ? lines.slice(1) : lines) {
    let cells = cellsOf(raw);
    if (cells.length > 1 && labelled(raw)) cells = cells.slice(1);
    if (!cells.length || cells.some((cell) => typeof typedNumber(cell) !== "number")) {
      skipped += 1;
      continue;
    }
    heights.push(cells);
  }
  const tooLarge = heights.length > GRID_MAX_LINES || heights.some((row) => row.length > GRID_MAX_LINES);
  return { heights: heights.slice(0, GRID_MAX_LINES).map((row) => row.slice(0, GRID_MAX_LINES)), skipped, tooLarge };
}

/** A pasted block of tilt lines, one per line of text, as single-line texts separated by spaces. */
export function parseTiltLines(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((line) => cellsOf(line).join(" "))
    .filter(Boolean)
    .slice(0, GRID_MAX_LINES);
}

/** The tilts of one line as typed ("12 -4 3,5"): a comma between digits is a decimal comma when spaces separate the numbers. */
export function tiltTexts(line: string): string[] {
  const trimmed = line.trim();
  if (!trimmed) return [];
  return /\s|;/.test(trimmed) ? trimmed.split(/[\s;]+/).filter(Boolean) : trimmed.split(",").map((part) => part.trim()).filter(Boolean);
}

/** Every typed number of a grid with its path (within the grid) and quantity, for the limit checks. */
export function* gridNumbers(grid: GridEntry): Generator<[string, string, "station" | "reading" | "tilt"]> {
  for (const field of ["stepX", "stepY", "length", "width"] as const) yield [field, grid[field], "station"];
  switch (grid.layout) {
    case "heights":
      for (const [r, row] of grid.heights.entries()) for (const [c, text] of row.entries()) yield [`heights.${r}.${c}`, text, "reading"];
      return;
    case "rows-columns":
      for (const [r, line] of grid.rowTilts.entries()) for (const text of tiltTexts(line)) yield [`rowTilts.${r}`, text, "tilt"];
      for (const [c, line] of grid.columnTilts.entries()) for (const text of tiltTexts(line)) yield [`columnTilts.${c}`, text, "tilt"];
      return;
    case "union-jack":
      for (const line of UNION_JACK_LINES) for (const text of tiltTexts(grid.lines[line])) yield [`lines.${line}`, text, "tilt"];
  }
}

// ————— From the grid to the engine's points —————

export interface GridCheck {
  /** Field path within the grid → messages. */
  errors: Record<string, string[]>;
  /** How many cells or lines hold something, and how many must, to tell empty from incomplete. */
  filled: number;
  /** Why the grid is not complete yet, when it is not. */
  missing: string | null;
  /** In the entry's units (x, y as stations, z as readings); present when the grid is complete. */
  points?: { x: number; y: number; z: number }[];
  /** For level readings: the largest closure (µm) and each line's or cell's. */
  closure?: { errorUm: number; lines: { line: string; closureUm: number }[] };
}

function positiveSpacing(text: string, field: string, what: string, errors: Record<string, string[]>): number | undefined {
  const value = typedNumber(text);
  if (value === "invalid") errors[field] = ["Not a number."];
  else if (value !== undefined && !(value > 0)) errors[field] = [`${what} must be greater than 0.`];
  else return value;
  return undefined;
}

function tiltsOfLine(line: string, field: string, count: number | "even", errors: Record<string, string[]>): number[] | null {
  const texts = tiltTexts(line);
  if (!texts.length) return null;
  const values: number[] = [];
  for (const text of texts) {
    const value = typedNumber(text);
    if (typeof value !== "number") {
      errors[field] = [`"${text.slice(0, 12)}" is not a number.`];
      return null;
    }
    values.push(value);
  }
  if (count === "even") {
    if (values.length % 2 !== 0 || values.length > GRID_MAX_STEPS) {
      errors[field] = [`Give an even number of steps (2 to ${GRID_MAX_STEPS}), so the line has a middle point; got ${values.length}.`];
      return null;
    }
  } else if (values.length !== count) {
    errors[field] = [`Give ${count} tilts (one per step between ${count + 1} points); got ${values.length}.`];
    return null;
  }
  return values;
}

/** Checks a grid as typed and, when complete, gives its points in the entry's units. */
export function checkGrid(grid: GridEntry, units: "mm" | "inch"): GridCheck {
  const errors: Record<string, string[]> = {};
  const toMm = (value: number) => (units === "inch" ? inchesToMillimetres(value) : value);
  const fromMm = (value: number) => (units === "inch" ? value / 25.4 : value);
  const fromUm = (value: number) => (units === "inch" ? micrometresToInches(value) : value);
  const rows = grid.rows;
  const columns = grid.columns;

  if (grid.layout === "heights") {
    const stepX = positiveSpacing(grid.stepX, "stepX", "The spacing between columns", errors);
    const stepY = positiveSpacing(grid.stepY, "stepY", "The spacing between rows", errors);
    const points: { x: number; y: number; z: number }[] = [];
    let filled = 0;
    for (let r = 0; r < rows; r++) {
      for (let c = 0; c < columns; c++) {
        const value = typedNumber(grid.heights[r]?.[c] ?? "");
        if (value === "invalid") errors[`heights.${r}.${c}`] = ["Not a number."];
        else if (value !== undefined) {
          filled += 1;
          points.push({ x: c * (stepX ?? 0), y: r * (stepY ?? 0), z: value });
        }
      }
    }
    const cells = rows * columns;
    const missing =
      filled < cells
        ? `${cells - filled} of the ${cells} heights still to read.`
        : stepX === undefined || stepY === undefined
          ? "Give the spacing between columns and between rows."
          : null;
    if (Object.keys(errors).length || missing) return { errors, filled, missing };
    return { errors, filled, missing: null, points };
  }

  if (grid.layout === "rows-columns") {
    const stepX = positiveSpacing(grid.stepX, "stepX", "The step along a row", errors);
    const stepY = positiveSpacing(grid.stepY, "stepY", "The step along a column", errors);
    const rowTilts: number[][] = [];
    const columnTilts: number[][] = [];
    let filled = 0;
    let complete = true;
    for (let r = 0; r < rows; r++) {
      const values = tiltsOfLine(grid.rowTilts[r] ?? "", `rowTilts.${r}`, columns - 1, errors);
      if (tiltTexts(grid.rowTilts[r] ?? "").length) filled += 1;
      if (values) rowTilts.push(values);
      else complete = false;
    }
    for (let c = 0; c < columns; c++) {
      const values = tiltsOfLine(grid.columnTilts[c] ?? "", `columnTilts.${c}`, rows - 1, errors);
      if (tiltTexts(grid.columnTilts[c] ?? "").length) filled += 1;
      if (values) columnTilts.push(values);
      else complete = false;
    }
    const missing = !complete
      ? `Give the tilts along every row (${columns - 1} each) and every column (${rows - 1} each).`
      : stepX === undefined || stepY === undefined
        ? "Give the step along a row and along a column."
        : null;
    if (Object.keys(errors).length || missing) return { errors, filled, missing };
    return fromLevel({ layout: "rows-columns", stepXmm: toMm(stepX!), stepYmm: toMm(stepY!), rowTilts, columnTilts }, fromMm, fromUm, filled);
  }

  const length = positiveSpacing(grid.length, "length", "The length of the surface", errors);
  const width = positiveSpacing(grid.width, "width", "The width of the surface", errors);
  const lines = {} as Record<UnionJackLine, number[]>;
  let filled = 0;
  let complete = true;
  for (const line of UNION_JACK_LINES) {
    if (tiltTexts(grid.lines[line]).length) filled += 1;
    const values = tiltsOfLine(grid.lines[line], `lines.${line}`, "even", errors);
    if (values) lines[line] = values;
    else complete = false;
  }
  const missing = !complete ? "Give the tilts along all eight lines." : length === undefined || width === undefined ? "Give the length and width of the surface." : null;
  if (Object.keys(errors).length || missing) return { errors, filled, missing };
  return fromLevel({ layout: "union-jack", lengthMm: toMm(length!), widthMm: toMm(width!), lines }, fromMm, fromUm, filled);
}

function fromLevel(grid: LevelGrid, fromMm: (value: number) => number, fromUm: (value: number) => number, filled: number): GridCheck {
  try {
    const heights = levelGridHeights(grid);
    return {
      errors: {},
      filled,
      missing: null,
      points: heights.points.map((point) => ({ x: fromMm(point.x), y: fromMm(point.y), z: fromUm(point.z) })),
      closure: { errorUm: heights.closureErrorUm, lines: heights.closures },
    };
  } catch (error) {
    if (!(error instanceof GeometryInputError)) throw error;
    const [first, second] = error.path;
    const field = first === "rowTilts" || first === "columnTilts" || first === "lines" ? `${first}.${String(second)}` : "grid";
    return { errors: { [field]: [error.message] }, filled, missing: null };
  }
}

/**
 * A surface's points back as a grid of heights (a correction starts from the signed readings): the places must
 * form a full, evenly spaced grid, which every surface entered through the form does.
 */
export function gridFromPoints(points: readonly { x: number; y: number; z: number }[]): GridEntry | null {
  const xs = [...new Set(points.map((point) => point.x))].sort((a, b) => a - b);
  const ys = [...new Set(points.map((point) => point.y))].sort((a, b) => a - b);
  if (xs.length < 2 || ys.length < 2 || xs.length > GRID_MAX_LINES || ys.length > GRID_MAX_LINES || xs.length * ys.length !== points.length) return null;
  const even = (values: number[]) => values.every((value, i) => Math.abs(value - values[0]! - (i * (values.at(-1)! - values[0]!)) / (values.length - 1)) < 1e-9 * Math.max(1, Math.abs(values.at(-1)!)));
  if (!even(xs) || !even(ys) || xs[0] !== 0 || ys[0] !== 0) return null;
  const heights = ys.map(() => xs.map(() => ""));
  for (const point of points) heights[ys.indexOf(point.y)]![xs.indexOf(point.x)] = String(point.z);
  const step = (values: number[]) => String(Number(((values.at(-1)! - values[0]!) / (values.length - 1)).toPrecision(12)));
  return { ...emptyGridEntry(), layout: "heights", rows: ys.length, columns: xs.length, stepX: step(xs), stepY: step(ys), heights };
}
