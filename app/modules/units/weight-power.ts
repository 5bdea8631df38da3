// Weights and powers as machine listings show and take them: kilograms and kilowatts stored, pounds and
// horsepower for readers who use inches, as the trade does where inches are the norm. Pure: server and browser.
// Apart from ~/modules/units/format so that pages without a machine's specification do not download it.
import { formatDecimal, round, type DisplayUnits } from "./format";

/** 1 lb = 0.453 592 37 kg exactly (international yard and pound agreement, 1959; NIST SP 811). */
export const KILOGRAMS_PER_POUND = 0.45359237;
/** 1 mechanical horsepower = 745.699 872 W (NIST SP 811, appendix B). */
export const KILOWATTS_PER_HORSEPOWER = 0.745699872;
export const weightUnitLabel = (units: DisplayUnits) => (units === "inch" ? "lb" : "kg");
export const powerUnitLabel = (units: DisplayUnits) => (units === "inch" ? "hp" : "kW");

export function weightFromKilograms(kg: number, units: DisplayUnits): number {
  return units === "inch" ? Math.round(kg / KILOGRAMS_PER_POUND) : Math.round(kg);
}

export function weightToKilograms(value: number, units: DisplayUnits): number {
  return Math.round(units === "inch" ? value * KILOGRAMS_PER_POUND : value);
}

/** "1,450 kg" or "3,197 lb". */
export function formatWeight(kg: number, units: DisplayUnits): string {
  return `${formatDecimal(weightFromKilograms(kg, units), 0)} ${weightUnitLabel(units)}`;
}

export function powerFromKilowatts(kw: number, units: DisplayUnits): number {
  return units === "inch" ? round(kw / KILOWATTS_PER_HORSEPOWER, 1) : round(kw, 2);
}

export function powerToKilowatts(value: number, units: DisplayUnits): number {
  return round(units === "inch" ? value * KILOWATTS_PER_HORSEPOWER : value, 3);
}

/** "5.5 kW" or "7.4 hp". */
export function formatPower(kw: number, units: DisplayUnits): string {
  return `${formatDecimal(powerFromKilowatts(kw, units), units === "inch" ? 1 : 2)} ${powerUnitLabel(units)}`;
}

