// A machine's specification lines as the trade writes them, in the reader's units where there is a choice.
// Volts, hertz and rpm are the same for every reader; thread pitches stay in millimetres and inch threads
// in threads per inch whatever the reader's units, since a gearbox plate gives both and nobody converts
// one into the other (`common practice`). Sizes are rounded as machine sizes are quoted (`machineSize`).
// Pure: shared by the server and the browser; apart from ./format so that pages without a specification
// do not download it.
import { formatDecimal, lengthUnitLabel, machineSize, type DisplayUnits } from "./format";

type Supply = { supplyVoltage: number | null; supplyPhases: number | null; supplyFrequencyHz: number | null };

/** "400 V three-phase, 50 Hz"; null when no supply was given. */
export function formatSupply({ supplyVoltage, supplyPhases, supplyFrequencyHz }: Supply): string | null {
  if (supplyVoltage === null) return null;
  const phases = supplyPhases === 3 ? " three-phase" : supplyPhases === 1 ? " single-phase" : "";
  return `${formatDecimal(supplyVoltage, 0)} V${phases}${supplyFrequencyHz ? `, ${supplyFrequencyHz} Hz` : ""}`;
}

/** "25–2,000 rpm", or "2,850 rpm" for a single speed. */
export function formatSpeedRange(minRpm: number | null, maxRpm: number | null): string | null {
  if (minRpm === null || maxRpm === null) return null;
  const rpm = (value: number) => formatDecimal(value, value < 10 ? 1 : 0);
  return minRpm === maxRpm ? `${rpm(maxRpm)} rpm` : `${rpm(minRpm)}–${rpm(maxRpm)} rpm`;
}

type Threads = { threadPitchMinMm: number | null; threadPitchMaxMm: number | null; threadTpiMin: number | null; threadTpiMax: number | null };

/** "Metric 0.2–14 mm pitch; 2–112 TPI": the reader's own system first. */
export function formatThreadRange(threads: Threads, units: DisplayUnits): string | null {
  const metric =
    threads.threadPitchMinMm !== null && threads.threadPitchMaxMm !== null
      ? `metric ${formatDecimal(threads.threadPitchMinMm, 3)}–${formatDecimal(threads.threadPitchMaxMm, 3)} mm pitch`
      : null;
  const inch =
    threads.threadTpiMin !== null && threads.threadTpiMax !== null
      ? `${formatDecimal(threads.threadTpiMin, 2)}–${formatDecimal(threads.threadTpiMax, 2)} threads per inch`
      : null;
  const parts = (units === "inch" ? [inch, metric] : [metric, inch]).filter((part): part is string => part !== null);
  if (!parts.length) return null;
  const text = parts.join("; ");
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** "2,400 × 1,100 mm" or "94.5 × 43.5 in" (length × width). */
export function formatFootprint(lengthMm: number | null, widthMm: number | null, units: DisplayUnits): string | null {
  if (lengthMm === null || widthMm === null) return null;
  return `${formatDecimal(machineSize(lengthMm, units), 1)} × ${formatDecimal(machineSize(widthMm, units), 1)} ${lengthUnitLabel(units)}`;
}
