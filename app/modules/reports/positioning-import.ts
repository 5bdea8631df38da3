// Importing an instrument's table of positioning deviations into a report's positioning test: the column
// mapping the inspector chooses (saved per inspector), a look at the first lines to choose it by, and the
// parsed runs in the form's units with the figures they give, previewed before they are accepted. Pure:
// the browser parses; the server checks the mapping it stores and scores the runs the form carries.
import { z } from "zod";
import {
  circularTest,
  GeometryInputError,
  MICROMETRES_PER_INCH,
  MILLIMETRES_PER_INCH,
  parseDeviationCsv,
  parseRadialCsv,
  positioningAccuracy,
  type CircularEvaluation,
  type DeviationColumns,
  type PositioningEvaluation,
} from "~/geometry";
import { CIRCULAR_ENTRY_LIMITS, POSITIONING_ENTRY_LIMITS, type EntryUnits, type PositioningRuns, type RadialEntry } from "./form";

/** A pasted or chosen table: far below the engine's own limit, since the browser parses it on a tablet. */
export const IMPORT_LIMITS = { characters: 500_000, previewLines: 6, columns: 50 } as const;

export const columnMappingSchema = z.object({
  run: z.number().int().min(0).max(IMPORT_LIMITS.columns - 1),
  direction: z.number().int().min(0).max(IMPORT_LIMITS.columns - 1),
  target: z.number().int().min(0).max(IMPORT_LIMITS.columns - 1),
  deviation: z.number().int().min(0).max(IMPORT_LIMITS.columns - 1),
  targetUnit: z.enum(["mm", "in"]),
  deviationUnit: z.enum(["um", "mm", "in"]),
  decimalComma: z.boolean(),
  header: z.boolean(),
}) satisfies z.ZodType<DeviationColumns>;

export type ColumnMapping = z.output<typeof columnMappingSchema>;

/** The mapping offered to an inspector who has saved none: columns in the order run, direction, target, deviation. */
export function defaultMapping(units: EntryUnits): ColumnMapping {
  return { run: 0, direction: 1, target: 2, deviation: 3, targetUnit: units === "inch" ? "in" : "mm", deviationUnit: units === "inch" ? "in" : "um", decimalComma: false, header: true };
}

/** The first non-empty lines cut into cells as the mapping would cut them, to choose the columns by. */
export function previewCells(text: string, decimalComma: boolean): string[][] {
  const rows: string[][] = [];
  const separator = decimalComma ? /[;\t]/ : /[,;\t]/;
  for (const line of text.slice(0, 20_000).split(/\r\n|\r|\n/)) {
    if (!line.trim()) continue;
    rows.push(
      line
        .split(separator)
        .slice(0, IMPORT_LIMITS.columns)
        .map((cell) => cell.trim().slice(0, 24)),
    );
    if (rows.length >= IMPORT_LIMITS.previewLines) break;
  }
  return rows;
}

export type ImportResult =
  | { ok: true; runs: PositioningRuns; evaluation: PositioningEvaluation; summary: { targets: number; forwardRuns: number; reverseRuns: number; from: number; to: number } }
  | { ok: false; message: string };

const round = (value: number, digits: number) => Number(value.toFixed(digits));

/** Parses the table with the mapping, checks what a report can carry, and gives the runs in the form's units. */
export function importRuns(text: string, mapping: ColumnMapping, units: EntryUnits): ImportResult {
  if (text.length > IMPORT_LIMITS.characters) return { ok: false, message: `The table is longer than ${IMPORT_LIMITS.characters.toLocaleString("en-GB")} characters; export one axis at a time.` };
  const columns = new Set([mapping.run, mapping.direction, mapping.target, mapping.deviation]);
  if (columns.size < 4) return { ok: false, message: "Choose a different column for each of run, direction, target and deviation." };
  try {
    const parsed = parseDeviationCsv(text, mapping);
    if (parsed.targets.length > POSITIONING_ENTRY_LIMITS.targets) return { ok: false, message: `${parsed.targets.length} targets; a report takes at most ${POSITIONING_ENTRY_LIMITS.targets} per axis.` };
    for (const direction of ["forward", "reverse"] as const) {
      if (parsed[direction].length > POSITIONING_ENTRY_LIMITS.runsPerDirection) {
        return { ok: false, message: `${parsed[direction].length} runs ${direction}; a report takes at most ${POSITIONING_ENTRY_LIMITS.runsPerDirection} per direction.` };
      }
    }
    // The engine refuses too few runs, ragged runs or unordered targets with its own message.
    const evaluation = positioningAccuracy(parsed);
    // Rounded to well below any instrument's resolution, so the stored draft stays short.
    const runs: PositioningRuns =
      units === "inch"
        ? {
            targets: parsed.targets.map((target) => round(target / MILLIMETRES_PER_INCH, 6)),
            forward: parsed.forward.map((run) => run.map((value) => round(value / MICROMETRES_PER_INCH, 8))),
            reverse: parsed.reverse.map((run) => run.map((value) => round(value / MICROMETRES_PER_INCH, 8))),
          }
        : {
            targets: parsed.targets.map((target) => round(target, 4)),
            forward: parsed.forward.map((run) => run.map((value) => round(value, 4))),
            reverse: parsed.reverse.map((run) => run.map((value) => round(value, 4))),
          };
    return {
      ok: true,
      runs,
      evaluation,
      summary: { targets: parsed.targets.length, forwardRuns: parsed.forward.length, reverseRuns: parsed.reverse.length, from: parsed.targets[0]!, to: parsed.targets.at(-1)! },
    };
  } catch (error) {
    if (error instanceof GeometryInputError) return { ok: false, message: error.message };
    throw error;
  }
}

export type RadialImportResult = { ok: true; radial: RadialEntry; evaluation: CircularEvaluation } | { ok: false; message: string };

/**
 * A circular test's table with the same mapping: its direction column says clockwise or counter-clockwise,
 * its target column holds the angle in degrees (the run column is not read).
 */
export function importRadial(text: string, mapping: ColumnMapping, units: EntryUnits): RadialImportResult {
  if (text.length > IMPORT_LIMITS.characters) return { ok: false, message: `The table is longer than ${IMPORT_LIMITS.characters.toLocaleString("en-GB")} characters.` };
  if (new Set([mapping.direction, mapping.target, mapping.deviation]).size < 3) return { ok: false, message: "Choose a different column for each of direction, angle and deviation." };
  try {
    const parsed = parseRadialCsv(text, { direction: mapping.direction, angle: mapping.target, deviation: mapping.deviation, deviationUnit: mapping.deviationUnit, decimalComma: mapping.decimalComma, header: mapping.header });
    for (const direction of ["clockwise", "counterClockwise"] as const) {
      if (parsed[direction].length > CIRCULAR_ENTRY_LIMITS.readingsPerDirection) {
        return { ok: false, message: `${parsed[direction].length} readings in one direction; a report takes at most ${CIRCULAR_ENTRY_LIMITS.readingsPerDirection} (one every half degree).` };
      }
    }
    const evaluation = circularTest(parsed);
    const inUnits = (readings: typeof parsed.clockwise) =>
      readings.map((reading) => ({ angle: round(reading.angle, 4), deviation: units === "inch" ? round(reading.deviation / MICROMETRES_PER_INCH, 8) : round(reading.deviation, 4) }));
    return { ok: true, radial: { clockwise: inUnits(parsed.clockwise), counterClockwise: inUnits(parsed.counterClockwise) }, evaluation };
  } catch (error) {
    if (error instanceof GeometryInputError) return { ok: false, message: error.message };
    throw error;
  }
}
