import { GeometryInputError, requireFinite, requirePositive } from "./errors";

export interface ProportionalRule {
  tolerance: number;
  over: number;
  minimum?: number;
  maximum?: number;
}

/**
 * A tolerance T given over L0 applies over L as T · L / L0 (rule of proportionality), clamped to the
 * minimum and maximum (ISO 230-1, from memory). Not rounded.
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
  if (minimum !== undefined && tolerance < minimum) tolerance = minimum;
  if (maximum !== undefined && tolerance > maximum) tolerance = maximum;
  return tolerance;
}
