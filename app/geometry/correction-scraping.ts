// Scraping the seating so the shims can come out (common practice). A shim of thickness s slid under one edge of
// the seating made the test read true; the part rocked on the opposite edge, a distance X away. Taking the shim
// out drops the shimmed edge by s; to keep the corrected tilt the seating must instead fall by s at the rocking
// edge and by nothing at the shim, linearly between: depth(x) = s · x / X, with x measured from the shim's line
// (the line the scraping pivots about, left unscraped) toward the rocking edge.
// The part ends lower by up to s at the rocking edge: check centre height afterwards.
// Worked examples: docs/correction-planner.md, section 2.
import { GeometryInputError } from "./errors";
import { requireLengthMm, requirePositionMm, requireReadingUm } from "./correction-limits";

export const SCRAPING_LIMITS = {
  /** Pads per seating: a seating divided finer than this is scraped by feel, not by a table. */
  pads: 50,
} as const;

export interface ScrapingInput {
  /** Shim thickness that made the test read true, µm, greater than 0. */
  shim: number;
  /** Distance from the shim's line to the edge the part rocked on, mm. */
  shimDistance: number;
  /** Each pad's centre, mm from the shim's line toward the rocking edge. */
  padPositions: readonly number[];
}

export interface ScrapingPad {
  position: number;
  /** Depth to scrape at this pad, µm. */
  depth: number;
}

export function scrapingDepths(input: ScrapingInput): ScrapingPad[] {
  const shim = requireReadingUm(input?.shim, "The shim thickness", "shim");
  if (shim <= 0) throw new GeometryInputError(`The shim thickness must be greater than 0 µm, got ${shim}.`, ["shim"]);
  const distance = requireLengthMm(input?.shimDistance, "The shim's distance from the rocking edge", "shimDistance");
  const positions = input?.padPositions;
  if (!Array.isArray(positions) || positions.length === 0) {
    throw new GeometryInputError("At least one pad position is needed.", ["padPositions"]);
  }
  if (positions.length > SCRAPING_LIMITS.pads) {
    throw new GeometryInputError(`At most ${SCRAPING_LIMITS.pads} pads; got ${positions.length}.`, ["padPositions"]);
  }
  return positions.map((position, i) => {
    requirePositionMm(position, `Pad ${i + 1}'s position`, ["padPositions", i]);
    if (position > distance * (1 + 1e-12)) {
      throw new GeometryInputError(
        `Pad ${i + 1} at ${position} mm lies beyond the rocking edge (${distance} mm); pads lie between the shim and that edge.`,
        ["padPositions", i],
      );
    }
    return { position, depth: (shim * position) / distance };
  });
}

/**
 * Height of the seating's top at x with the shim in, µm, against the rocking edge: it rises linearly from 0 at the
 * rocking edge (x = X) to s at the shim's line (x = 0). After scraping and taking the shim out the top is at
 * −depth(x); the two differ by s everywhere, so the tilt is kept and the part only sits lower.
 */
export function shimmedHeight(input: ScrapingInput, position: number): number {
  return (input.shim * (input.shimDistance - position)) / input.shimDistance;
}
