// Tilt of a headstock or tailstock from a test mandrel (common practice): the part sits on two pads a distance
// D apart along its axis; its mandrel leans by δ over the measuring length L. Raising one pad by c turns the part
// by c / D, which moves the mandrel's reading at L by c · L / D, so the correction is c = δ · D / L.
//
// Signs follow the mandrel tests: vertical plane + = free end higher; horizontal plane + = free end toward the
// tool (front). "Nose pad" is the pad nearer the mandrel's free end (the spindle nose of a headstock, the sleeve
// end of a tailstock); "rear pad" is the other one.
// Worked examples: docs/correction-planner.md, section 1.
import { requireLengthMm, requireReadingUm } from "./correction-limits";

export type CorrectionPlane = "vertical" | "horizontal";

export interface TiltCorrectionInput {
  plane: CorrectionPlane;
  /** Inclination of the mandrel over the measuring length, µm, signed as the test defines it. */
  inclination: number;
  /** Measuring length over which the inclination was read, mm. */
  measuringLength: number;
  /** Distance between the seating pads along the axis, mm. */
  padDistance: number;
}

export interface TiltCorrection {
  /** c = δ · D / L, µm, signed like the inclination. */
  signed: number;
  /** |c|, µm: the shim thickness (vertical) or the lateral movement (horizontal). */
  amount: number;
  /**
   * Which pad to raise (vertical) or move (horizontal). Vertical: free end high → raise the rear pad; low → raise
   * the nose pad (shims only add). Horizontal: free end toward the tool → move the nose pad toward the back; away
   * from the tool → toward the front. Null when the test already reads true.
   */
  pad: "nose" | "rear" | null;
  /** Direction of the movement: up (a shim), toward the back or toward the front; null when nothing to do. */
  direction: "up" | "back" | "front" | null;
}

export function tiltCorrection(input: TiltCorrectionInput): TiltCorrection {
  const inclination = requireReadingUm(input?.inclination, "The inclination", "inclination");
  const length = requireLengthMm(input?.measuringLength, "The measuring length", "measuringLength");
  const padDistance = requireLengthMm(input?.padDistance, "The distance between the pads", "padDistance");
  const signed = (inclination * padDistance) / length;
  const amount = Math.abs(signed);
  if (signed === 0) return { signed: 0, amount: 0, pad: null, direction: null };
  if (input.plane === "vertical") {
    return { signed, amount, pad: signed > 0 ? "rear" : "nose", direction: "up" };
  }
  return { signed, amount, pad: "nose", direction: signed > 0 ? "back" : "front" };
}

/**
 * The mandrel's inclination after the pads move: the part turns by (nose − rear) / D, which moves the reading at
 * L by that times L. Heights for the vertical plane (+ up), lateral positions for the horizontal (+ toward the
 * tool), µm.
 */
export function inclinationAfterPadMoves(input: TiltCorrectionInput, moves: { nose: number; rear: number }): number {
  return input.inclination + ((moves.nose - moves.rear) * input.measuringLength) / input.padDistance;
}

/** The pad moves a correction stands for, signed as in `inclinationAfterPadMoves`. */
export function padMovesOf(correction: TiltCorrection): { nose: number; rear: number } {
  if (correction.pad === null) return { nose: 0, rear: 0 };
  if (correction.direction === "up") return correction.pad === "rear" ? { nose: 0, rear: correction.amount } : { nose: correction.amount, rear: 0 };
  return { nose: correction.direction === "back" ? -correction.amount : correction.amount, rear: 0 };
}
