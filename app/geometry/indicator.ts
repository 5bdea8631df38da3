import { requireAtLeast } from "./errors";
import { requireMeasured } from "./limits";

/** Max − min of indicator readings over at least one revolution (ISO 230-1, from memory). */
export function totalIndicatorReading(readings: readonly number[]): number {
  requireAtLeast(readings, 2, "Indicator readings over a revolution");
  let max = -Infinity;
  let min = Infinity;
  readings.forEach((reading, i) => {
    requireMeasured(reading, "reading", `Indicator reading ${i + 1}`, [i]);
    if (reading > max) max = reading;
    if (reading < min) min = reading;
  });
  return max - min;
}

export interface MandrelReadings {
  near: { at0: number; at180: number };
  far: { at0: number; at180: number };
}

/**
 * Inclination of a test mandrel's axis to the carriage travel: mean(far) − mean(near).
 * Averaging 0° and 180° cancels the mandrel's own run-out (common practice).
 */
export function mandrelInclination(readings: MandrelReadings): number {
  const near = readings?.near;
  const far = readings?.far;
  requireMeasured(near?.at0, "reading", "The near-end reading at 0°", ["near", "at0"]);
  requireMeasured(near?.at180, "reading", "The near-end reading at 180°", ["near", "at180"]);
  requireMeasured(far?.at0, "reading", "The far-end reading at 0°", ["far", "at0"]);
  requireMeasured(far?.at180, "reading", "The far-end reading at 180°", ["far", "at180"]);
  return (far.at0 + far.at180) / 2 - (near.at0 + near.at180) / 2;
}
