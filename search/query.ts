// A buyer's listing search as data, and its translation into the index's filter and sort. Pure: the search
// module sends it to the index, and the PostgreSQL fallback reads the same fields.

export type NumberRange = { min?: number | null; max?: number | null };

export const listingSorts = ["relevance", "newest", "price-ascending", "price-descending", "best-accuracy"] as const;
export type ListingSort = (typeof listingSorts)[number];

/**
 * Mains supplies as buyers ask for them: phases and a nominal voltage band, since a machine plated 380 V or
 * 415 V runs on a 400 V supply (`common practice`; the bands follow the nominal voltages of IEC 60038).
 */
export const supplyClasses = [
  { value: "3x400", label: "Three-phase 400 V (380–415 V)", phases: 3, minVoltage: 380, maxVoltage: 415 },
  { value: "3x230", label: "Three-phase 230 V (200–240 V)", phases: 3, minVoltage: 200, maxVoltage: 240 },
  { value: "3x480", label: "Three-phase 480 V (440–480 V)", phases: 3, minVoltage: 440, maxVoltage: 480 },
  { value: "3x600", label: "Three-phase 600 V (575–600 V)", phases: 3, minVoltage: 575, maxVoltage: 600 },
  { value: "1x230", label: "Single-phase 230 V (220–240 V)", phases: 1, minVoltage: 220, maxVoltage: 240 },
  { value: "1x120", label: "Single-phase 120 V (100–127 V)", phases: 1, minVoltage: 100, maxVoltage: 127 },
] as const;
export type SupplyClass = (typeof supplyClasses)[number]["value"];
export const supplyClassOf = (value: string | undefined) => supplyClasses.find((supply) => supply.value === value);

export type ListingSearchQuery = {
  text?: string;
  /** Only these listings (a saved search asks whether one listing matches). */
  ids?: string[];
  categories?: string[];
  grades?: string[];
  verifiedOnly?: boolean;
  /** Minor units of `currency`; a price range only makes sense with one currency. */
  priceMinor?: NumberRange;
  currency?: string;
  swingMm?: NumberRange;
  betweenCentresMm?: NumberRange;
  /** Accuracy limits in µm: “at most”. A listing without that figure does not match. */
  maxSpindleRunoutUm?: number;
  maxAxialSlipUm?: number;
  /** Applies to both planes of spindle-axis parallelism. */
  maxSpindleParallelismUm?: number;
  maxCentreHeightUm?: number;
  maxBedStraightnessUm?: number;
  maxTableFlatnessUm?: number;
  maxTravelSquarenessUm?: number;
  maxXPositioningAccuracyUm?: number;
  maxXRepeatabilityUm?: number;
  maxYPositioningAccuracyUm?: number;
  maxYRepeatabilityUm?: number;
  maxZPositioningAccuracyUm?: number;
  maxZRepeatabilityUm?: number;
  /** Reports measured at most this many days ago. */
  maxReportAgeDays?: number;
  /** Runs on this supply (one of `supplyClasses`). */
  supply?: SupplyClass;
  countries?: string[];
  region?: string;
  /** Defaults to published listings only. */
  statuses?: string[];
  sort?: ListingSort;
  page?: number;
  hitsPerPage?: number;
};

/** A value quoted for the filter language, whatever it holds. */
export function quoteFilterValue(value: string | number): string {
  if (typeof value === "number") return String(value);
  return `"${value.replace(/\\/g, "\\\\").replace(/"/g, '\\"')}"`;
}

function anyOf(attribute: string, values: string[] | undefined): string | null {
  if (!values || values.length === 0) return null;
  return `${attribute} IN [${values.map(quoteFilterValue).join(", ")}]`;
}

function range(attribute: string, bounds: NumberRange | undefined): string[] {
  const conditions: string[] = [];
  if (bounds?.min !== undefined && bounds.min !== null) conditions.push(`${attribute} >= ${bounds.min}`);
  if (bounds?.max !== undefined && bounds.max !== null) conditions.push(`${attribute} <= ${bounds.max}`);
  return conditions;
}

function atMost(attribute: string, limit: number | undefined): string[] {
  return limit === undefined || limit === null ? [] : [`${attribute} <= ${limit}`];
}

function supplyFilter(value: SupplyClass | undefined): string[] {
  const supply = supplyClassOf(value);
  return supply ? [`supplyPhases = ${supply.phases}`, `supplyVoltage >= ${supply.minVoltage}`, `supplyVoltage <= ${supply.maxVoltage}`] : [];
}

/** The filter as the index takes it: every item must hold (an array of conditions ANDed). */
export function listingFilter(query: ListingSearchQuery, now: Date = new Date()): string[] {
  const conditions = [
    anyOf("id", query.ids),
    anyOf("status", query.statuses ?? ["published"]),
    anyOf("category", query.categories),
    anyOf("grade", query.grades),
    query.verifiedOnly ? "verified = true" : null,
    query.currency ? `currency = ${quoteFilterValue(query.currency)}` : null,
    ...range("priceMinor", query.priceMinor),
    ...range("swingMm", query.swingMm),
    ...range("betweenCentresMm", query.betweenCentresMm),
    ...atMost("spindleRunoutUm", query.maxSpindleRunoutUm),
    ...atMost("axialSlipUm", query.maxAxialSlipUm),
    ...atMost("spindleParallelismVerticalUm", query.maxSpindleParallelismUm),
    ...atMost("spindleParallelismHorizontalUm", query.maxSpindleParallelismUm),
    ...atMost("centreHeightUm", query.maxCentreHeightUm),
    ...atMost("bedStraightnessUm", query.maxBedStraightnessUm),
    ...atMost("tableFlatnessUm", query.maxTableFlatnessUm),
    ...atMost("travelSquarenessUm", query.maxTravelSquarenessUm),
    ...atMost("xPositioningAccuracyUm", query.maxXPositioningAccuracyUm),
    ...atMost("xRepeatabilityUm", query.maxXRepeatabilityUm),
    ...atMost("yPositioningAccuracyUm", query.maxYPositioningAccuracyUm),
    ...atMost("yRepeatabilityUm", query.maxYRepeatabilityUm),
    ...atMost("zPositioningAccuracyUm", query.maxZPositioningAccuracyUm),
    ...atMost("zRepeatabilityUm", query.maxZRepeatabilityUm),
    query.maxReportAgeDays === undefined ? null : `reportDate >= ${Math.floor(now.getTime() / 1000) - Math.round(query.maxReportAgeDays * 86_400)}`,
    ...supplyFilter(query.supply),
    anyOf("country", query.countries),
    query.region ? `region = ${quoteFilterValue(query.region)}` : null,
  ];
  return conditions.filter((condition): condition is string => condition !== null);
}

/** Ties of every sort, as the PostgreSQL fallback breaks them too: newest first, then by id. */
const tieBreak = ["publishedAt:desc", "id:desc"];

/**
 * The index's sort for a buyer's choice. A chosen sort is strict (the settings put `sort` first among
 * the ranking rules), so that “cheapest first” is that with words too; only `relevance` with words leaves
 * the order to the text ranking. Relevance without words means newest first.
 */
export function listingSortRules(sort: ListingSort | undefined, hasWords = false): string[] | undefined {
  switch (sort ?? "relevance") {
    case "relevance":
      return hasWords ? undefined : tieBreak;
    case "newest":
      return tieBreak;
    case "price-ascending":
      return ["priceMinor:asc", ...tieBreak];
    case "price-descending":
      return ["priceMinor:desc", ...tieBreak];
    case "best-accuracy":
      return ["gradeRank:asc", "spindleRunoutUm:asc", ...tieBreak];
  }
}
