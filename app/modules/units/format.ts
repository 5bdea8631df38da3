/**
 * Display units for machine sizes, numbers and prices. Pure: shared by the server and the browser.
 * Sizes are stored in millimetres and shown in mm or inches; weights and powers are in ./weight-power, and
 * the conversions a form makes in ./lengths (re-exported here).
 */
import { formatDecimal, lengthUnitLabel, MILLIMETRES_PER_INCH, numberFormats, round, type DisplayUnits } from "./lengths";

export { formatDecimal, lengthFromMillimetres, lengthToMillimetres, lengthUnitLabel, MILLIMETRES_PER_INCH, round, type DisplayUnits } from "./lengths";

/**
 * A machine's size as the trade quotes it (`common practice`): whole millimetres from 100 mm (one decimal
 * below), and inches to a tenth below 10 in, to the half inch up to 100 in, whole above — "250 mm swing"
 * reads "9.8 in", "1,000 mm between centres" "39.5 in", never "9.843 in" or "39.37 in". Forms keep the
 * exact value (`lengthFromMillimetres`), so nothing a seller typed is lost by this rounding.
 */
export function machineSize(mm: number, units: DisplayUnits): number {
  if (units === "mm") return mm >= 100 ? Math.round(mm) : round(mm, 1);
  const inches = mm / MILLIMETRES_PER_INCH;
  if (inches < 10) return round(inches, 1);
  if (inches < 100) return Math.round(inches * 2) / 2;
  return Math.round(inches);
}

/** "330 mm" or "13 in": a machine size, rounded as the trade quotes it (`machineSize`). */
export function formatLength(mm: number, units: DisplayUnits): string {
  return `${formatDecimal(machineSize(mm, units), 1)} ${lengthUnitLabel(units)}`;
}

/** Lengths written into a text ("Spindle taper, at 300 mm") in the reader's units: "…, at 12 in". */
export function lengthsInText(text: string, units: DisplayUnits): string {
  if (units === "mm") return text;
  return text.replace(/(\d+(?:\.\d+)?)\s?mm\b/g, (_, value: string) => `${formatDecimal(machineSize(Number(value), "inch"), 1)} in`);
}

/** Currencies a listing can be priced in; all of them have two minor digits (ISO 4217). */
export const currencies = ["EUR", "GBP", "USD", "CHF", "SEK", "NOK", "DKK", "PLN", "CZK", "CAD", "AUD"] as const;
export type Currency = (typeof currencies)[number];

/** Major units as typed ("18 500.50") to minor units (1850050). */
export function toMinorUnits(major: number): number {
  return Math.round(major * 100);
}

export function fromMinorUnits(minor: number): number {
  return minor / 100;
}

/** "€18,500" — whole amounts lose their cents, others keep two digits. */
export function formatMoney(minor: number, currency: string): string {
  const digits = minor % 100 === 0 ? 0 : 2;
  const key = `¤${currency}${digits}`;
  let format = numberFormats.get(key);
  if (!format) numberFormats.set(key, (format = new Intl.NumberFormat("en", { style: "currency", currency, minimumFractionDigits: digits, maximumFractionDigits: digits })));
  return format.format(minor / 100);
}
