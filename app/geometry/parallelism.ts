// Parallelism of a surface to a travel (ISO 230-1's method, from memory): an indicator carried by the moving
// part reads the surface (or a straightedge laid on it) along the travel; the deviation is the range of the
// readings, max − min, over the length read. Reading every point of a surface this way also catches twist that
// an end-to-end pair would miss.
import { requireAtLeast } from "./errors";
import { type TravelReading, travelSlope } from "./squareness";

export interface ParallelismEvaluation {
  /** max − min of the readings, µm. */
  deviation: number;
  /** The length read, mm. */
  lengthMm: number;
  /** Least-squares slope, µm per metre: the tilt between the surface and the travel (the part of the range a shim would correct). */
  slopeUmPerM: number;
}

export function parallelismToTravel(readings: readonly TravelReading[]): ParallelismEvaluation {
  requireAtLeast(readings, 2, "Readings along the travel");
  const { slope, lengthMm } = travelSlope(readings, "Readings along the travel");
  let max = -Infinity;
  let min = Infinity;
  for (const point of readings) {
    max = Math.max(max, point.reading);
    min = Math.min(min, point.reading);
  }
  return { deviation: max - min, lengthMm, slopeUmPerM: slope * 1000 };
}
