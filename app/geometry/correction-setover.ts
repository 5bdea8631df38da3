// Tailstock set-over from the taper of a bar turned between centres (common practice). The tool runs parallel to
// the ways; if the tailstock centre sits e off the headstock's line, the work's axis drifts by e over the distance
// between centres C, so the radius changes by e · l / C over a turned length l and the diameter by twice that.
// Hence e = (Δd / 2) · C / l.
//
// Sign: Δd = diameter at the tailstock end − diameter at the headstock end. Larger at the tailstock end means the
// tailstock centre sits toward the back (away from the tool): move it toward the front (the tool) by e; larger at
// the headstock end: toward the back.
// Worked examples: docs/correction-planner.md, section 3.
import { GeometryInputError } from "./errors";
import { requireLengthMm, requireReadingUm } from "./correction-limits";

export interface SetOverInput {
  /** Diameter at the tailstock end − diameter at the headstock end, µm. */
  diameterDifference: number;
  /** Distance between the two measured diameters along the bar, mm. */
  turnedLength: number;
  /** Distance between centres, mm. */
  betweenCentres: number;
}

export interface SetOverCorrection {
  /** e = (Δd / 2) · C / l, µm, signed: + toward the front (the tool). */
  signed: number;
  amount: number;
  direction: "front" | "back" | null;
}

export function tailstockSetOver(input: SetOverInput): SetOverCorrection {
  const difference = requireReadingUm(input?.diameterDifference, "The diameter difference", "diameterDifference");
  const turned = requireLengthMm(input?.turnedLength, "The turned length", "turnedLength");
  const centres = requireLengthMm(input?.betweenCentres, "The distance between centres", "betweenCentres");
  if (turned > centres * (1 + 1e-12)) {
    throw new GeometryInputError(`The turned length (${turned} mm) cannot exceed the distance between centres (${centres} mm).`, ["turnedLength"]);
  }
  const signed = ((difference / 2) * centres) / turned;
  return { signed, amount: Math.abs(signed), direction: signed === 0 ? null : signed > 0 ? "front" : "back" };
}

/**
 * Diameter difference a bar turned with the tailstock centre offset by `offset` µm (+ toward the tool) would show
 * over `turnedLength` (tailstock end − headstock end): the tool sits at a fixed distance from the ways, the axis
 * comes toward it by offset · z / C, so the radius falls by that.
 */
export function taperFromOffset(offset: number, turnedLength: number, betweenCentres: number): number {
  return -2 * ((offset * turnedLength) / betweenCentres);
}
