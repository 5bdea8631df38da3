// Lengths and numbers as forms read and write them: the unit, the conversions between the reader's units and
// mm, a number's text. Apart from ./format (sizes as the trade quotes them, money) because the search page's
// form needs only these, and every page's script carries them (`vite.config.ts`). Pure.

export type DisplayUnits = "mm" | "inch";

/** 1 in = 25.4 mm exactly (international yard and pound agreement, 1959; NIST SP 811). */
export const MILLIMETRES_PER_INCH = 25.4;

export const lengthUnitLabel = (units: DisplayUnits) => (units === "inch" ? "in" : "mm");

export function round(value: number, digits: number) {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}

// One formatter per style: building an Intl.NumberFormat costs far more than using one.
export const numberFormats = new Map<string, Intl.NumberFormat>();

/** A number to at most `digits` decimals: "1,450", or "0.00016" and "1450" without `grouping`. */
export function formatDecimal(value: number, digits: number, grouping = true): string {
  const key = `${digits}${grouping ? "," : ""}`;
  let format = numberFormats.get(key);
  if (!format) numberFormats.set(key, (format = new Intl.NumberFormat("en", { maximumFractionDigits: digits, minimumFractionDigits: 0, useGrouping: grouping })));
  return format.format(value);
}

/** A length held in mm, converted for display (no unit). Inches keep three decimals, as dial gauges read. */
export function lengthFromMillimetres(mm: number, units: DisplayUnits): number {
  return units === "inch" ? round(mm / MILLIMETRES_PER_INCH, 3) : round(mm, 1);
}

/** A length entered in the user's units, converted to mm for storage (to 0.01 mm). */
export function lengthToMillimetres(value: number, units: DisplayUnits): number {
  return round(units === "inch" ? value * MILLIMETRES_PER_INCH : value, 2);
}
