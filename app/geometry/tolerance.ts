import { GeometryInputError, requireFinite, requirePositive } from "./errors";

export interface ProportionalRule {
  tolerance: number;
  over: number;
  minimum?: number;
  maximum?: number;
  /** Round the proportional value to the nearest multiple of this many µm before the minimum applies. */
  roundTo?: number;
}

/**
 * A tolerance T given over L0 applies over L as T · L / L0 (rule of proportionality), clamped to the
 * minimum and maximum (ISO 230-1, from memory). Rounded only where the profile says so, e.g. to the
 * nearest 2 µm (IS 6040:1993, clause 3.5), and then never below the minimum.
 */
export function toleranceOver(rule: ProportionalRule, length: number): number {
  requireFinite(rule?.tolerance, "The tolerance", ["tolerance"]);
  if (rule.tolerance < 0) {
    throw new GeometryInputError(`The tolerance cannot be negative, got ${rule.tolerance} µm.`, ["tolerance"]);
  }
  requirePositive(rule.over, "The length a tolerance is given over", ["over"]);
  requirePositive(length, "The measuring length", []);
  const { minimum, maximum } = rule;
  if (minimum !== undefined) requireFinite(minimum, "The minimum tolerance", ["minimum"]);
  if (maximum !== undefined) requireFinite(maximum, "The maximum tolerance", ["maximum"]);
  if (minimum !== undefined && maximum !== undefined && minimum > maximum) {
    throw new GeometryInputError(
      `The minimum tolerance (${minimum} µm) is above the maximum (${maximum} µm); swap or correct them.`,
      ["minimum"],
    );
  }
  let tolerance = (rule.tolerance * length) / rule.over;
  if (rule.roundTo !== undefined) {
    requirePositive(rule.roundTo, "The rounding step", ["roundTo"]);
    tolerance = roundToStep(tolerance, rule.roundTo);
  }
  if (minimum !== undefined && tolerance < minimum) tolerance = minimum;
  if (maximum !== undefined && tolerance > maximum) tolerance = maximum;
  return tolerance;
}

/** The nearest multiple of `step`, free of binary noise (8.333 on a 2 µm grid → 8, not 8.000000001). */
export function roundToStep(value: number, step: number): number {
  return Number((Math.round(value / step) * step).toFixed(9));
}
