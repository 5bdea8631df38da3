/**
 * Display units for machine sizes, weights and powers. Pure: shared by the server and the browser.
 * Sizes are stored in millimetres, weights in kilograms, power in kilowatts; a user who reads inches
 * also reads pounds and horsepower, as the trade does where inches are the norm.
 */
export type DisplayUnits = "mm" | "inch";

/** 1 in = 25.4 mm exactly (international yard and pound agreement, 1959; NIST SP 811). */
export const MILLIMETRES_PER_INCH = 25.4;
/** 1 lb = 0.453 592 37 kg exactly (same agreement; NIST SP 811). */
export const KILOGRAMS_PER_POUND = 0.45359237;
/** 1 mechanical horsepower = 745.699 872 W (NIST SP 811, appendix B). */
export const KILOWATTS_PER_HORSEPOWER = 0.745699872;

export const lengthUnitLabel = (units: DisplayUnits) => (units === "inch" ? "in" : "mm");
export const weightUnitLabel = (units: DisplayUnits) => (units === "inch" ? "lb" : "kg");
export const powerUnitLabel = (units: DisplayUnits) => (units === "inch" ? "hp" : "kW");

function round(value: number, digits: number) {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}

function formatNumber(value: number, maximumFractionDigits: number) {
  return new Intl.NumberFormat("en", { maximumFractionDigits, minimumFractionDigits: 0 }).format(value);
}

/** A length held in mm, converted for display (no unit). Inches keep three decimals, as dial gauges read. */
export function lengthFromMillimetres(mm: number, units: DisplayUnits): number {
  return units === "inch" ? round(mm / MILLIMETRES_PER_INCH, 3) : round(mm, 1);
}

/** A length entered in the user's units, converted to mm for storage (to 0.01 mm). */
export function lengthToMillimetres(value: number, units: DisplayUnits): number {
  return round(units === "inch" ? value * MILLIMETRES_PER_INCH : value, 2);
}

/** "330 mm" or "13 in". */
export function formatLength(mm: number, units: DisplayUnits): string {
  const digits = units === "inch" ? 3 : 1;
  return `${formatNumber(lengthFromMillimetres(mm, units), digits)} ${lengthUnitLabel(units)}`;
}

export function weightFromKilograms(kg: number, units: DisplayUnits): number {
  return units === "inch" ? Math.round(kg / KILOGRAMS_PER_POUND) : Math.round(kg);
}

export function weightToKilograms(value: number, units: DisplayUnits): number {
  return Math.round(units === "inch" ? value * KILOGRAMS_PER_POUND : value);
}

/** "1,450 kg" or "3,197 lb". */
export function formatWeight(kg: number, units: DisplayUnits): string {
  return `${formatNumber(weightFromKilograms(kg, units), 0)} ${weightUnitLabel(units)}`;
}

export function powerFromKilowatts(kw: number, units: DisplayUnits): number {
  return units === "inch" ? round(kw / KILOWATTS_PER_HORSEPOWER, 1) : round(kw, 2);
}

export function powerToKilowatts(value: number, units: DisplayUnits): number {
  return round(units === "inch" ? value * KILOWATTS_PER_HORSEPOWER : value, 3);
}

/** "5.5 kW" or "7.4 hp". */
export function formatPower(kw: number, units: DisplayUnits): string {
  return `${formatNumber(powerFromKilowatts(kw, units), units === "inch" ? 1 : 2)} ${powerUnitLabel(units)}`;
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
  const whole = minor % 100 === 0;
  return new Intl.NumberFormat("en", {
    style: "currency",
    currency,
    minimumFractionDigits: whole ? 0 : 2,
    maximumFractionDigits: whole ? 0 : 2,
  }).format(minor / 100);
}
