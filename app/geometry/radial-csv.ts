// Generic column mapping for an instrument's exported table of radial deviations around a circle (a circular
// test): the inspector says which column holds the direction, the angle and the deviation, the deviation's
// unit and whether decimals use a comma. The result is the input of circularTest. Refusals name the line.
import { CIRCULAR_LIMITS } from "./circular";
import { GeometryInputError } from "./errors";
import { numberIn, tableRows } from "./instrument-table";
import { MICROMETRES_PER_INCH } from "./units";
import type { RadialReading } from "./circular";

export interface RadialColumns {
  /** Zero-based column indexes. */
  direction: number;
  angle: number;
  deviation: number;
  deviationUnit: "um" | "mm" | "in";
  /** Decimal comma: fields are then separated by ";" or tabs instead of ",". */
  decimalComma: boolean;
  /** The first non-empty line is a header and is skipped. */
  header: boolean;
}

export const RADIAL_CSV_LIMITS = { characters: 2_000_000, lines: 2 * CIRCULAR_LIMITS.readingsPerDirection + 10 } as const;

const CLOCKWISE = new Set(["cw", "clockwise", "+", "1"]);
const COUNTER_CLOCKWISE = new Set(["ccw", "counter-clockwise", "counterclockwise", "anticlockwise", "anti-clockwise", "-", "\u2212", "-1"]);
const TO_UM = { um: 1, mm: 1000, in: MICROMETRES_PER_INCH } as const;

/** Parses the table into clockwise and counter-clockwise readings (degrees, µm) for circularTest. */
export function parseRadialCsv(text: string, columns: RadialColumns): { clockwise: RadialReading[]; counterClockwise: RadialReading[] } {
  const readings = { clockwise: [] as RadialReading[], counterClockwise: [] as RadialReading[] };
  for (const { line, fields } of tableRows(text, { ...RADIAL_CSV_LIMITS, decimalComma: columns.decimalComma, header: columns.header, widest: Math.max(columns.direction, columns.angle, columns.deviation) })) {
    const directionText = fields[columns.direction]!.trim().toLowerCase();
    const direction = CLOCKWISE.has(directionText) ? "clockwise" : COUNTER_CLOCKWISE.has(directionText) ? "counterClockwise" : null;
    if (!direction) throw new GeometryInputError(`Line ${line}: direction "${directionText.slice(0, 20)}" is neither clockwise (cw) nor counter-clockwise (ccw).`, [line]);
    const angle = numberIn(fields[columns.angle], columns.decimalComma, "angle", line);
    // Some software writes a full turn as 0–360 inclusive: 360° is the same place as 0°.
    const turned = angle === 360 ? 0 : angle;
    if (!(turned >= 0 && turned < 360)) throw new GeometryInputError(`Line ${line}: the angle ${angle} is outside 0–360 degrees.`, [line]);
    const deviation = numberIn(fields[columns.deviation], columns.decimalComma, "deviation", line) * TO_UM[columns.deviationUnit];
    if (readings[direction].some((reading) => reading.angle === turned)) {
      if (angle === 360) continue; // the closing reading of a full turn, already read at 0°
      throw new GeometryInputError(`Line ${line}: the angle ${angle}° is read twice ${direction === "clockwise" ? "clockwise" : "counter-clockwise"}.`, [line]);
    }
    readings[direction].push({ angle: turned, deviation });
    if (readings[direction].length > CIRCULAR_LIMITS.readingsPerDirection) throw new GeometryInputError(`Line ${line}: more than ${CIRCULAR_LIMITS.readingsPerDirection} readings in one direction.`, [line]);
  }
  return readings;
}
