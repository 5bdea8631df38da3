// Squareness of two travels, read with an indicator against a square (ISO 230-1's method, from memory): the
// square's one arm is set parallel to the first travel, the indicator rides the second travel against the
// other arm. The slope of the readings along the second travel (least-squares line, so one rough reading
// does not swing it) is the squareness deviation, stated over the length read.
import { GeometryInputError, requireAtLeast } from "./errors";
import { requireMeasured } from "./limits";

export interface TravelReading {
  /** Position along the travel, mm. */
  station: number;
  /** Indicator reading, µm. */
  reading: number;
}

export interface SquarenessEvaluation {
  /** Signed slope of the readings, µm per metre of travel. */
  slopeUmPerM: number;
  /** |slope| over the length stated (or read), µm. */
  deviation: number;
  /** The length the deviation is stated over, mm. */
  overMm: number;
}

/** Least-squares slope of readings along a travel, µm per mm; the stations must differ. */
export function travelSlope(readings: readonly TravelReading[], what = "Readings along the travel"): { slope: number; lengthMm: number } {
  requireAtLeast(readings, 2, what);
  let sumStation = 0;
  let sumReading = 0;
  const seen = new Set<number>();
  readings.forEach((point, i) => {
    requireMeasured(point?.station, "station", `${what}: station ${i + 1}`, [i, "station"]);
    requireMeasured(point.reading, "reading", `${what}: reading ${i + 1}`, [i, "reading"]);
    if (seen.has(point.station)) throw new GeometryInputError(`${what}: station ${point.station} mm is read twice.`, [i, "station"]);
    seen.add(point.station);
    sumStation += point.station;
    sumReading += point.reading;
  });
  const meanStation = sumStation / readings.length;
  const meanReading = sumReading / readings.length;
  let sxx = 0;
  let sxy = 0;
  let min = Infinity;
  let max = -Infinity;
  for (const point of readings) {
    sxx += (point.station - meanStation) ** 2;
    sxy += (point.station - meanStation) * (point.reading - meanReading);
    min = Math.min(min, point.station);
    max = Math.max(max, point.station);
  }
  return { slope: sxy / sxx, lengthMm: max - min };
}

/**
 * Squareness of the second travel to the first. `reversed`: readings with the square turned over, entered so
 * the machine's error keeps its sign; the mean of the two slopes cancels the square's own error (common practice).
 */
export function squarenessOfTravels(
  readings: readonly TravelReading[],
  options: { reversed?: readonly TravelReading[]; overMm?: number } = {},
): SquarenessEvaluation {
  const first = travelSlope(readings, "Readings against the square");
  let slope = first.slope;
  if (options.reversed !== undefined) {
    const second = travelSlope(options.reversed, "Readings against the square turned over");
    slope = (first.slope + second.slope) / 2;
  }
  let overMm = first.lengthMm;
  if (options.overMm !== undefined) {
    requireMeasured(options.overMm, "station", "The length the squareness is stated over", ["overMm"]);
    if (!(options.overMm > 0)) throw new GeometryInputError("The length the squareness is stated over must be greater than 0 mm.", ["overMm"]);
    overMm = options.overMm;
  }
  return { slopeUmPerM: slope * 1000, deviation: Math.abs(slope) * overMm, overMm };
}
