// Deviations and tolerances for display, in the reader's units. Scoring and storage never round; pages do.
// From the engine's own files, not its index: the index would bring the whole engine into the pages.
import { micrometresToInches } from "~/geometry/units";
import type { DisplayUnits } from "~/modules/units/format";
import { formatDate } from "~/modules/units/dates";

const minus = "\u2212";

function formatNumber(value: number, fractionDigits: number, signed: boolean): string {
  const rounded = Number(value.toFixed(fractionDigits));
  const text = Math.abs(rounded).toFixed(fractionDigits);
  if (rounded < 0) return `${minus}${text}`;
  return signed && rounded > 0 ? `+${text}` : text;
}

/** "4.0 µm" or "0.00016 in"; µm/m (a tilt, the same number as µin/in) stays as it is. */
export function formatDeviation(micrometres: number, units: DisplayUnits, options: { signed?: boolean; unit?: "µm" | "µm/m" } = {}): string {
  const signed = options.signed ?? false;
  if (options.unit === "µm/m") return `${formatNumber(micrometres, 1, signed)} µm/m`;
  if (units === "inch") return `${formatNumber(micrometresToInches(micrometres), 5, signed)} in`;
  return `${formatNumber(micrometres, 1, signed)} µm`;
}

/** Both units, for certificates read on either side of the Atlantic: "4.0 µm (0.00016 in)". */
export function formatDeviationBoth(micrometres: number, options: { signed?: boolean; unit?: "µm" | "µm/m" } = {}): string {
  if (options.unit === "µm/m") return formatDeviation(micrometres, "mm", options);
  return `${formatDeviation(micrometres, "mm", options)} (${formatDeviation(micrometres, "inch", options)})`;
}

export function formatRatio(ratio: number): string {
  return ratio.toFixed(2);
}

const dateTimeFormat = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  year: "numeric",
  hour: "2-digit",
  minute: "2-digit",
  second: "2-digit",
  timeZone: "UTC",
});

/** The date of the tests, in the one date style of every page (`~/modules/units/dates`). */
export function formatReportDate(isoDate: string): string {
  return formatDate(isoDate);
}

export function formatSignedAt(iso: string): string {
  return `${dateTimeFormat.format(new Date(iso))} UTC`;
}

export const GRADE_MEANING: Record<string, string> = {
  A: "every graded test within half its tolerance",
  B: "every graded test within tolerance",
  C: "at most two tests out, none beyond 1.5 × tolerance",
  D: "more tests out, or one far out",
  incomplete: "a required test has no reading",
};

export const DIRECTION_LABELS: Record<string, string> = {
  any: "no sign",
  either: "either way",
  positive: "+ only",
  convex: "convex only",
  concave: "concave only",
};

/** Methods whose value carries a sign (a lean or a height difference); the others are widths or ranges. */
export function isSignedValue(method: string): boolean {
  return ["mandrel-inclination", "near-far", "centre-height", "squareness"].includes(method);
}

/** What the readings showed, in words, for the results table. */
export function observedLabel(observed: string): string | null {
  if (observed === "not-applicable") return null;
  if (observed === "none") return "level";
  return observed;
}
