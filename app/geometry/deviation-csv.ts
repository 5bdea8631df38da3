// Generic column mapping for an instrument's exported table of positioning deviations: the inspector says
// which column holds the run, the direction, the target and the deviation, their units, and whether decimals
// use a comma. The result is the input of positioningAccuracy. Refusals name the line.
import { GeometryInputError } from "./errors";
import { numberIn, tableRows } from "./instrument-table";
import { POSITIONING_LIMITS } from "./positioning";
import { MICROMETRES_PER_INCH, MILLIMETRES_PER_INCH } from "./units";

export interface DeviationColumns {
  /** Zero-based column indexes. */
  run: number;
  direction: number;
  target: number;
  deviation: number;
  targetUnit: "mm" | "in";
  deviationUnit: "um" | "mm" | "in";
  /** Decimal comma: fields are then separated by ";" or tabs instead of ",". */
  decimalComma: boolean;
  /** The first non-empty line is a header and is skipped. */
  header: boolean;
}

export const DEVIATION_CSV_LIMITS = { characters: 2_000_000, lines: 50_000 } as const;

const FORWARD = new Set(["+", "forward", "positive", "up", "1"]);
const REVERSE = new Set(["-", "\u2212", "reverse", "negative", "down", "-1"]);
const TO_MM = { mm: 1, in: MILLIMETRES_PER_INCH } as const;
const TO_UM = { um: 1, mm: 1000, in: MICROMETRES_PER_INCH } as const;

/** Parses the table into targets (mm) and forward / reverse runs (µm) for positioningAccuracy. */
export function parseDeviationCsv(text: string, columns: DeviationColumns): { targets: number[]; forward: number[][]; reverse: number[][] } {
  const runs = { forward: new Map<string, Map<number, number>>(), reverse: new Map<string, Map<number, number>>() };
  const targets = new Set<number>();
  for (const { line, fields } of tableRows(text, { ...DEVIATION_CSV_LIMITS, decimalComma: columns.decimalComma, header: columns.header, widest: Math.max(columns.run, columns.direction, columns.target, columns.deviation) })) {
    const directionText = fields[columns.direction]!.trim().toLowerCase();
    const direction = FORWARD.has(directionText) ? "forward" : REVERSE.has(directionText) ? "reverse" : null;
    if (!direction) throw new GeometryInputError(`Line ${line}: direction "${directionText.slice(0, 20)}" is neither + (forward) nor − (reverse).`, [line]);
    const run = fields[columns.run]!.trim().slice(0, 40);
    if (run === "") throw new GeometryInputError(`Line ${line}: the run is empty.`, [line]);
    const target = numberIn(fields[columns.target], columns.decimalComma, "target", line) * TO_MM[columns.targetUnit];
    const deviation = numberIn(fields[columns.deviation], columns.decimalComma, "deviation", line) * TO_UM[columns.deviationUnit];
    const readings = runs[direction].get(run) ?? new Map<number, number>();
    if (readings.has(target)) throw new GeometryInputError(`Line ${line}: run ${run} reads target ${target} mm twice in the same direction.`, [line]);
    readings.set(target, deviation);
    runs[direction].set(run, readings);
    targets.add(target);
    if (targets.size > POSITIONING_LIMITS.targets) throw new GeometryInputError(`Line ${line}: more than ${POSITIONING_LIMITS.targets} targets.`, [line]);
  }
  const sorted = [...targets].sort((a, b) => a - b);
  const assemble = (direction: "forward" | "reverse") =>
    [...runs[direction].entries()].map(([run, readings]) =>
      sorted.map((target) => {
        const value = readings.get(target);
        if (value === undefined) throw new GeometryInputError(`Run ${run} (${direction}) has no reading at target ${target} mm.`);
        return value;
      }),
    );
  return { targets: sorted, forward: assemble("forward"), reverse: assemble("reverse") };
}
