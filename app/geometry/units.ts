import { requireFinite } from "./errors";

/** 1 in = 25.4 mm exactly (international yard and pound agreement, 1959; NIST SP 811). */
export const MILLIMETRES_PER_INCH = 25.4;
export const MICROMETRES_PER_INCH = 25_400;

export function inchesToMicrometres(inches: number): number {
  return requireFinite(inches, "A length in inches") * MICROMETRES_PER_INCH;
}

export function micrometresToInches(micrometres: number): number {
  return requireFinite(micrometres, "A deviation in micrometres") / MICROMETRES_PER_INCH;
}

export function inchesToMillimetres(inches: number): number {
  return requireFinite(inches, "A length in inches") * MILLIMETRES_PER_INCH;
}

export function millimetresToInches(millimetres: number): number {
  return requireFinite(millimetres, "A length in millimetres") / MILLIMETRES_PER_INCH;
}
