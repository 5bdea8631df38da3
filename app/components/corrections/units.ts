// The planner's inputs and results in the reader's units: lengths along the machine in mm or in, small
// deviations (shims, readings, clearances) in µm or in. The engine works in mm and µm.
import type { DisplayUnits } from "~/modules/units/format";
import { formatDecimal } from "~/modules/units/format";

export const MM_PER_INCH = 25.4;
export const UM_PER_INCH = 25_400;

export const lengthLabel = (units: DisplayUnits) => (units === "inch" ? "in" : "mm");
export const smallLabel = (units: DisplayUnits) => (units === "inch" ? "in" : "µm");

/** A typed number: blank → null; a decimal comma is read as a point; anything else that is not a number → NaN. */
export function parseTyped(text: string): number | null {
  const trimmed = text.trim();
  if (trimmed === "") return null;
  const normal = trimmed.replace(/\s/g, "").replace(",", ".").replace(/^\u2212/, "-");
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(normal)) return Number.NaN;
  return Number(normal);
}

export const lengthToMm = (value: number, units: DisplayUnits) => (units === "inch" ? value * MM_PER_INCH : value);
export const smallToUm = (value: number, units: DisplayUnits) => (units === "inch" ? value * UM_PER_INCH : value);

/** "30 µm (0.030 mm)" or "0.00120 in". */
export function formatSmall(um: number, units: DisplayUnits): string {
  if (units === "inch") return `${formatDecimal(um / UM_PER_INCH, 5)} in`;
  return `${formatDecimal(um, 1)} µm (${formatDecimal(um / 1000, 3)} mm)`;
}

/** A small value as a bare number in the reader's units, for formulas. */
export function smallNumber(um: number, units: DisplayUnits): string {
  return units === "inch" ? formatDecimal(um / UM_PER_INCH, 5) : formatDecimal(um, 2);
}

export function lengthNumber(mm: number, units: DisplayUnits): string {
  return units === "inch" ? formatDecimal(mm / MM_PER_INCH, 3) : formatDecimal(mm, 1);
}
