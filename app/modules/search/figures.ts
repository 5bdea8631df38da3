// Accuracy figures as buyers read and type them: µm for millimetre users, inches for inch users (a dial
// indicator in inch reads to 0.0001 in, "a tenth"). Stored and searched in µm. Pure: server and browser.
import { formatDecimal, type DisplayUnits } from "~/modules/units/lengths";

// 1 in = 25 400 µm exactly (as ~/geometry/units); plain arithmetic here, so that the search page's script
// does not load the engine's unit checks for numbers the form has already read.
const MICROMETRES_PER_INCH = 25_400;

export const deviationUnitLabel = (units: DisplayUnits) => (units === "inch" ? "in" : "µm");

/** The number a form field shows for a limit held in µm. */
export function deviationInputValue(micrometres: number, units: DisplayUnits): string {
  return units === "inch" ? formatDecimal(micrometres / MICROMETRES_PER_INCH, 6, false) : formatDecimal(micrometres, 3, false);
}

/** "4 µm" or "0.00016 in". */
export function formatDeviation(micrometres: number, units: DisplayUnits): string {
  return units === "inch" ? `${formatDecimal(micrometres / MICROMETRES_PER_INCH, 5, false)} in` : `${formatDecimal(micrometres, 1, false)} µm`;
}

/** A typed limit in the user's units to µm (to 0.001 µm); undefined when blank or not a positive number. */
export function deviationFromInput(text: string, units: DisplayUnits): number | undefined {
  const value = Number(text.trim().replace(",", "."));
  if (!text.trim() || !Number.isFinite(value) || value <= 0) return undefined;
  const micrometres = units === "inch" ? value * MICROMETRES_PER_INCH : value;
  return Math.round(micrometres * 1000) / 1000;
}

// Limits a buyer might widen to, in each unit system's round numbers.
const micrometreSteps = [1, 2, 3, 4, 5, 6, 8, 10, 12, 15, 20, 25, 30, 40, 50, 75, 100, 150, 200];
const inchSteps = [0.0001, 0.0002, 0.0003, 0.0004, 0.0005, 0.0006, 0.0008, 0.001, 0.0015, 0.002, 0.003, 0.004, 0.005, 0.008];

/** The next few round limits above `micrometres`, in µm, as the user would type them. */
export function widerLimits(micrometres: number, units: DisplayUnits, howMany = 4): number[] {
  const steps = units === "inch" ? inchSteps.map((inches) => Math.round(inches * MICROMETRES_PER_INCH * 1000) / 1000) : micrometreSteps;
  return steps.filter((step) => step > micrometres + 1e-9).slice(0, howMany);
}

/**
 * The accuracy limits' address parameters, in the filter panel's order: all the browser needs (the panel's
 * labels come from the server, `accuracyFilters`). tests/unit/search/figures.test.ts keeps the two in step.
 */
export const accuracyParams = [
  "runoutMax", "axialSlipMax", "parallelismMax", "centreHeightMax", "flatnessMax", "squarenessMax",
  "xAccuracyMax", "xRepeatabilityMax", "yAccuracyMax", "yRepeatabilityMax", "zAccuracyMax", "zRepeatabilityMax",
] as const;

export const accuracyFilters = [
  { key: "maxSpindleRunoutUm", param: "runoutMax", label: "Spindle run-out" },
  { key: "maxAxialSlipUm", param: "axialSlipMax", label: "Axial slip" },
  { key: "maxSpindleParallelismUm", param: "parallelismMax", label: "Spindle-axis parallelism" },
  { key: "maxCentreHeightUm", param: "centreHeightMax", label: "Centre height difference" },
  { key: "maxTableFlatnessUm", param: "flatnessMax", label: "Table flatness" },
  { key: "maxTravelSquarenessUm", param: "squarenessMax", label: "Squareness of travels" },
  { key: "maxXPositioningAccuracyUm", param: "xAccuracyMax", label: "X axis, positioning accuracy" },
  { key: "maxXRepeatabilityUm", param: "xRepeatabilityMax", label: "X axis, repeatability" },
  { key: "maxYPositioningAccuracyUm", param: "yAccuracyMax", label: "Y axis, positioning accuracy" },
  { key: "maxYRepeatabilityUm", param: "yRepeatabilityMax", label: "Y axis, repeatability" },
  { key: "maxZPositioningAccuracyUm", param: "zAccuracyMax", label: "Z axis, positioning accuracy" },
  { key: "maxZRepeatabilityUm", param: "zRepeatabilityMax", label: "Z axis, repeatability" },
] as const;

/** A filter's label inside a sentence: lower case, but an axis letter stays a capital ("X axis, repeatability"). */
export const labelInText = (label: string) => (/^[XYZ] axis/.test(label) ? label : label.toLowerCase());

export type AccuracyFilterKey = (typeof accuracyFilters)[number]["key"];
