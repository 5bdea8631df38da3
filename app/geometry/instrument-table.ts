// What every instrument table import shares: the file's bounds, its lines split into fields by the separator
// that the decimal convention leaves free, an optional header line, and numbers read with their line named.
import { GeometryInputError } from "./errors";

export interface TableShape {
  /** Bounds of the file, checked before any line is split. */
  characters: number;
  lines: number;
  /** Decimal comma: fields are then separated by ";" or tabs instead of ",". */
  decimalComma: boolean;
  /** The first non-empty line is a header and is skipped. */
  header: boolean;
  /** The highest zero-based column the mapping reads. */
  widest: number;
}

/**
 * The table's data lines in order, each with its 1-based line number and its fields; blank lines are passed
 * over. Lazily, so that a refusal names the first bad line whatever is wrong with it.
 */
export function* tableRows(text: string, shape: TableShape): Generator<{ line: number; fields: string[] }> {
  if (typeof text !== "string") throw new GeometryInputError("The file must be text.");
  if (text.length > shape.characters) throw new GeometryInputError(`The file is longer than ${shape.characters} characters.`);
  if (text.includes("\u0000")) throw new GeometryInputError("The file contains NUL bytes; it is not a text table.");
  const lines = text.replace(/^\uFEFF/, "").split(/\r\n|\r|\n/);
  if (lines.length > shape.lines) throw new GeometryInputError(`The file has more than ${shape.lines} lines.`);
  const separator = shape.decimalComma ? /[;\t]/ : /[,;\t]/;
  let headerSkipped = !shape.header;
  for (const [index, raw] of lines.entries()) {
    const line = index + 1;
    if (raw.trim() === "") continue;
    if (!headerSkipped) {
      headerSkipped = true;
      continue;
    }
    const fields = raw.split(separator);
    if (fields.length <= shape.widest) throw new GeometryInputError(`Line ${line}: ${fields.length} columns; the mapping reads column ${shape.widest + 1}.`, [line]);
    yield { line, fields };
  }
}

/** A number from one field, in the table's decimal convention; the refusal names the line and the field. */
export function numberIn(field: string | undefined, decimalComma: boolean, what: string, line: number): number {
  const text = (field ?? "").trim();
  const normal = decimalComma ? text.replace(",", ".") : text;
  if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(normal)) {
    throw new GeometryInputError(`Line ${line}: the ${what} "${text.slice(0, 40)}" is not a number${decimalComma ? " (decimal comma expected)" : ""}.`, [line]);
  }
  const value = Number(normal);
  if (!Number.isFinite(value)) throw new GeometryInputError(`Line ${line}: the ${what} ${text.slice(0, 40)} is too large to be a number.`, [line]);
  return value;
}
