// Spindle bearing running clearance (common practice): after preloading the thrust bearings, the adjusting nut
// is backed off by an angle θ; a thread of pitch p moves it axially by p · θ / 360°. 15° on a 1 mm pitch is
// 1000 µm · 15 / 360 ≈ 41.7 µm, in line with an end float of a few hundredths of a millimetre. The end float
// is then read with an indicator on the spindle end while pushing and pulling, and checked against a target range
// (the machine's manual gives it; a few hundredths of a millimetre at most is common practice).
// Worked examples: docs/correction-planner.md, section 4.
import { GeometryInputError, requireFinite } from "./errors";
import { MEASUREMENT_LIMITS } from "./limits";

export const BEARING_LIMITS = {
  /** Finest and coarsest adjusting-nut pitch, mm (M4 fine to a coarse 12 mm lead). */
  pitchMm: { min: 0.1, max: 12 },
  /** The nut is never backed off more than a full turn for running clearance. */
  angleDegrees: 360,
} as const;

function requirePitch(pitch: number): number {
  requireFinite(pitch, "The thread pitch", ["pitch"]);
  const { min, max } = BEARING_LIMITS.pitchMm;
  if (pitch < min || pitch > max) {
    throw new GeometryInputError(`The thread pitch must lie between ${min} and ${max} mm, got ${pitch}.`, ["pitch"]);
  }
  return pitch;
}

/** Axial movement of the nut, µm, for a pitch in mm and an angle in degrees (0–360). */
export function nutAxialMovement(input: { pitch: number; angle: number }): number {
  const pitch = requirePitch(input?.pitch);
  const angle = requireFinite(input?.angle, "The back-off angle", ["angle"]);
  if (angle < 0 || angle > BEARING_LIMITS.angleDegrees) {
    throw new GeometryInputError(`The back-off angle must lie between 0° and ${BEARING_LIMITS.angleDegrees}°, got ${angle}.`, ["angle"]);
  }
  return (pitch * 1000 * angle) / 360;
}

/** Angle, degrees, that moves a nut of this pitch axially by `clearance` µm: θ = 360° · c / p. */
export function backOffAngleFor(input: { pitch: number; clearance: number }): number {
  const pitch = requirePitch(input?.pitch);
  const clearance = requireFinite(input?.clearance, "The clearance", ["clearance"]);
  if (clearance < 0) throw new GeometryInputError(`The clearance must be 0 µm or more, got ${clearance}.`, ["clearance"]);
  const angle = (360 * clearance) / (pitch * 1000);
  if (angle > BEARING_LIMITS.angleDegrees) {
    throw new GeometryInputError(`That clearance needs more than a full turn on a ${pitch} mm pitch; check the units.`, ["clearance"]);
  }
  return angle;
}

export interface EndFloatCheck {
  verdict: "within" | "tight" | "loose";
  /** Change of back-off angle that brings the float to the middle of the target, degrees (+ = back off more). */
  angleChange: number;
}

/** The end float read back (µm) against a target range (µm): within, too tight or too loose, and by what angle. */
export function endFloatCheck(input: { reading: number; min: number; max: number; pitch: number }): EndFloatCheck {
  const pitch = requirePitch(input?.pitch);
  const limit = MEASUREMENT_LIMITS.readingUm;
  const reading = requireFinite(input?.reading, "The end float reading", ["reading"]);
  const min = requireFinite(input?.min, "The target's lower end", ["min"]);
  const max = requireFinite(input?.max, "The target's upper end", ["max"]);
  for (const [field, value] of [["reading", reading], ["min", min], ["max", max]] as const) {
    if (value < 0 || value > limit) throw new GeometryInputError(`Must lie between 0 and ${limit} µm, got ${value}.`, [field]);
  }
  if (min > max) throw new GeometryInputError("The target's lower end must not exceed its upper end.", ["min"]);
  const middle = (min + max) / 2;
  const angleChange = (360 * (middle - reading)) / (pitch * 1000);
  const verdict = reading < min ? "tight" : reading > max ? "loose" : "within";
  return { verdict, angleChange: verdict === "within" ? 0 : angleChange };
}
