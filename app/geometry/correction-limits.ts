// Bounds shared by the correction planner's methods: the same physical limits as measurements (a length
// beyond 100 m or a reading beyond 100 mm is a slip of units or of the decimal point), so every input is
// checked before any arithmetic and every result stays finite.
import { GeometryInputError, requireFinite } from "./errors";
import { MEASUREMENT_LIMITS } from "./limits";

/** A length along the machine (pad distance, measuring length, turned length), mm, greater than 0. */
export function requireLengthMm(value: number, what: string, field: string): number {
  requireFinite(value, what, [field]);
  if (value <= 0) throw new GeometryInputError(`${what} must be greater than 0 mm, got ${value}.`, [field]);
  if (value > MEASUREMENT_LIMITS.stationMm) {
    throw new GeometryInputError(`${what} must be at most ${MEASUREMENT_LIMITS.stationMm} mm (100 m); check the units.`, [field]);
  }
  if (value < MEASUREMENT_LIMITS.stationStepMm) {
    throw new GeometryInputError(`${what} must be at least ${MEASUREMENT_LIMITS.stationStepMm} mm.`, [field]);
  }
  return value;
}

/** A position along the machine, mm, 0 or more (measured from a stated edge). */
export function requirePositionMm(value: number, what: string, path: readonly (string | number)[]): number {
  requireFinite(value, what, path);
  if (value < 0) throw new GeometryInputError(`${what} must be 0 mm or more (measured from the edge that stays), got ${value}.`, path);
  if (value > MEASUREMENT_LIMITS.stationMm) {
    throw new GeometryInputError(`${what} must be at most ${MEASUREMENT_LIMITS.stationMm} mm (100 m); check the units.`, path);
  }
  return value;
}

/** A signed indicator reading or difference, µm, within ±100 mm. */
export function requireReadingUm(value: number, what: string, field: string): number {
  requireFinite(value, what, [field]);
  if (Math.abs(value) > MEASUREMENT_LIMITS.readingUm) {
    throw new GeometryInputError(`${what} must lie within ±${MEASUREMENT_LIMITS.readingUm} µm (100 mm); check the units.`, [field]);
  }
  return value;
}
