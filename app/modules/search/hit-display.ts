// A search result's card as words in the reader's units, made on the server: the page and the API send
// them, so that the search page's script carries no formatting, labels or figure choice of its own (its
// script is held to a budget, docs/benchmarks.md). Pure.
import { countryName, labelOf, machineConditions } from "~/modules/listings/catalogue";
import { formatLength, formatMoney, type DisplayUnits } from "~/modules/units/format";
import { formatDeviation } from "./figures";

// A report older than this is shown as aged (PRODUCT.md: grades expire visibly after 12 months).
const FRESH_DAYS = 365;

/** The key figures of a result's current report, in µm (null: not measured). */
export type HitFigures = {
  spindleRunoutUm: number | null;
  axialSlipUm: number | null;
  spindleParallelismVerticalUm: number | null;
  spindleParallelismHorizontalUm: number | null;
  centreHeightUm: number | null;
  tableFlatnessUm: number | null;
  travelSquarenessUm: number | null;
  xPositioningAccuracyUm: number | null;
  xRepeatabilityUm: number | null;
  yPositioningAccuracyUm: number | null;
  zPositioningAccuracyUm: number | null;
};

export type HitDisplay = {
  /** "330 mm swing · 1000 mm between centres", or null when neither is given. */
  sizes: string | null;
  /** The figures the card shows for this kind of machine, each as read ("4 µm", "not measured"). */
  figures: Array<{ label: string; value: string }>;
  place: string;
  price: string;
  condition: string;
  /** The verification badge: its words and whether it is a caution. */
  badge: { text: string; caution: boolean };
};

function worst(...values: (number | null)[]) {
  const known = values.filter((value): value is number => value !== null);
  return known.length ? Math.max(...known) : null;
}

/** The figures a buyer compares first for this kind of machine. */
function shownFigures(category: string, figures: HitFigures) {
  // A CNC machine graded on its axes: how accurately and repeatably each axis positions (the axes it has).
  if (figures.xPositioningAccuracyUm !== null || figures.zPositioningAccuracyUm !== null) {
    return [
      { label: "X axis, positioning accuracy", value: figures.xPositioningAccuracyUm },
      { label: "X axis, repeatability", value: figures.xRepeatabilityUm },
      { label: "Y axis, positioning accuracy", value: figures.yPositioningAccuracyUm },
      { label: "Z axis, positioning accuracy", value: figures.zPositioningAccuracyUm },
    ].filter((figure) => figure.value !== null);
  }
  // A mill's or grinder's worth is its table and travels; a lathe's its spindle and centres.
  if (category === "milling_machine" || category === "surface_grinder") {
    return [
      { label: "Table flatness", value: figures.tableFlatnessUm },
      { label: "Squareness of travels", value: figures.travelSquarenessUm },
      { label: "Spindle run-out", value: figures.spindleRunoutUm },
    ];
  }
  return [
    { label: "Spindle run-out", value: figures.spindleRunoutUm },
    { label: "Axial slip", value: figures.axialSlipUm },
    { label: "Spindle-axis parallelism", value: worst(figures.spindleParallelismVerticalUm, figures.spindleParallelismHorizontalUm) },
    { label: "Centre height", value: figures.centreHeightUm },
  ];
}

export function hitDisplay(
  hit: {
    category: string;
    condition: string;
    verified: boolean;
    grade: string | null;
    price: { minor: number; currency: string } | null;
    swingMm: number | null;
    betweenCentresMm: number | null;
    location: { city: string | null; country: string };
    report: { measuredOn: string; keyFigures: HitFigures } | null;
  },
  units: DisplayUnits,
  now: Date,
): HitDisplay {
  const sizes = [
    hit.swingMm ? `${formatLength(hit.swingMm, units)} swing` : null,
    hit.betweenCentresMm ? `${formatLength(hit.betweenCentresMm, units)} between centres` : null,
  ].filter(Boolean);
  const ageDays = hit.report ? Math.floor((now.getTime() - Date.parse(`${hit.report.measuredOn}T00:00:00Z`)) / 86_400_000) : null;
  const aged = ageDays !== null && ageDays > FRESH_DAYS;
  return {
    sizes: sizes.length ? sizes.join(" · ") : null,
    figures: hit.report
      ? shownFigures(hit.category, hit.report.keyFigures).map((figure) => ({
          label: figure.label,
          value: figure.value === null ? "not measured" : formatDeviation(figure.value, units),
        }))
      : [],
    place: [hit.location.city, countryName(hit.location.country)].filter(Boolean).join(", "),
    price: hit.price ? formatMoney(hit.price.minor, hit.price.currency) : "Price on request",
    condition: labelOf(machineConditions, hit.condition),
    badge: hit.verified
      ? { text: aged ? "Report over 12 months old" : "Verified", caution: aged }
      : { text: hit.grade === "incomplete" ? "Report incomplete" : "Not yet verified", caution: true },
  };
}
