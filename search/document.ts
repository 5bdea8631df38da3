// The listing index's document: one listing with the figures of its current report, flattened so that
// every filter a buyer uses is one attribute. Pure, so that the indexer, the full re-index and the
// tests share it. Lengths in mm, accuracy in µm, dates in epoch seconds (filters compare numbers).
import type { Grade, KeyFigures } from "../app/geometry/types.ts";

/** What the listings domain hands over for one listing. */
export type SearchableListing = {
  id: string;
  /** The listing page's address part: /machines/<slug>. */
  slug: string;
  /** draft | published | sold | withdrawn; the buyer's search shows published listings. */
  status: string;
  /** The category's stored value, e.g. `centre_lathe`, and the words shown for it. */
  category: string;
  categoryLabel: string;
  /** reconditioned | used | as_is */
  condition: string;
  make: string;
  model: string;
  year: number | null;
  description: string;
  swingMm: number | null;
  betweenCentresMm: number | null;
  spindleBoreMm: number | null;
  /** The electrical supply it runs on: volts and 1 or 3 phases (null when the seller did not say). */
  supplyVoltage?: number | null;
  supplyPhases?: number | null;
  /** Price in the currency's minor unit (cents); null when the seller asks for offers. */
  priceMinor: number | null;
  /** ISO 4217 code, e.g. `EUR`. */
  currency: string | null;
  city: string | null;
  region: string | null;
  /** ISO 3166-1 alpha-2 code. */
  country: string;
  sellerName: string;
  publishedAt: Date | null;
  /** Thumbnail for result cards. */
  photoUrl: string | null;
};

/** What the reports domain hands over for the listing's current (signed, not superseded) report. */
export type SearchableReport = {
  id: string;
  grade: Grade;
  /** The day the readings were taken: the report's age counts from it. */
  measuredOn: Date;
  /** The scored key figures in µm (as `scoreReport` returns them); null where a test was not measured. */
  keyFigures: KeyFigures;
};

/** The listing's own fields as the index holds them (dates as epoch seconds), plus its report's figures. */
export type ListingSearchDocument = Omit<SearchableListing, "publishedAt"> & {
  title: string;
  publishedAt: number | null;
  verified: boolean;
  reportId: string | null;
  grade: Grade | null;
  /** 1 for grade A … 4 for D, 5 for an incomplete report, null without a report: sort ascending for best first. */
  gradeRank: number | null;
  reportDate: number | null;
  spindleRunoutUm: number | null;
  axialSlipUm: number | null;
  spindleParallelismVerticalUm: number | null;
  spindleParallelismHorizontalUm: number | null;
  centreHeightUm: number | null;
  bedStraightnessUm: number | null;
  /** Mills and grinders: the table's flatness, and how far two travels are out of square (size, unsigned). */
  tableFlatnessUm: number | null;
  travelSquarenessUm: number | null;
  /** CNC lathes and machining centres: positioning accuracy A and repeatability R of each axis (ISO 230-2). */
  xPositioningAccuracyUm: number | null;
  xRepeatabilityUm: number | null;
  yPositioningAccuracyUm: number | null;
  yRepeatabilityUm: number | null;
  zPositioningAccuracyUm: number | null;
  zRepeatabilityUm: number | null;
};

export const gradeRanks: Readonly<Record<Grade, number>> = { A: 1, B: 2, C: 3, D: 4, incomplete: 5 };

/** Whole seconds since 1970, the unit the index's date filters compare. */
export function epochSeconds(date: Date): number {
  return Math.floor(date.getTime() / 1000);
}

// Buyers filter on “at most N µm”, so the index holds the size of a deviation, whatever its sign.
function magnitude(value: number | null | undefined): number | null {
  return value === null || value === undefined || !Number.isFinite(value) ? null : Math.abs(value);
}

export function listingToSearchDocument(listing: SearchableListing, report: SearchableReport | null): ListingSearchDocument {
  const figures = report?.keyFigures;
  return {
    id: listing.id,
    slug: listing.slug,
    status: listing.status,
    category: listing.category,
    categoryLabel: listing.categoryLabel,
    condition: listing.condition,
    make: listing.make,
    model: listing.model,
    title: `${listing.make} ${listing.model}`.trim(),
    year: listing.year,
    description: listing.description,
    swingMm: listing.swingMm,
    betweenCentresMm: listing.betweenCentresMm,
    spindleBoreMm: listing.spindleBoreMm,
    supplyVoltage: listing.supplyVoltage ?? null,
    supplyPhases: listing.supplyPhases ?? null,
    priceMinor: listing.priceMinor,
    currency: listing.currency,
    city: listing.city,
    region: listing.region,
    country: listing.country,
    sellerName: listing.sellerName,
    publishedAt: listing.publishedAt ? epochSeconds(listing.publishedAt) : null,
    photoUrl: listing.photoUrl,
    // Verified means a current signed report that graded the machine; an incomplete one proves nothing yet.
    verified: report !== null && report.grade !== "incomplete",
    reportId: report?.id ?? null,
    grade: report?.grade ?? null,
    gradeRank: report ? gradeRanks[report.grade] : null,
    reportDate: report ? epochSeconds(report.measuredOn) : null,
    spindleRunoutUm: magnitude(figures?.spindleRunOut),
    axialSlipUm: magnitude(figures?.axialSlip),
    spindleParallelismVerticalUm: magnitude(figures?.spindleParallelismVertical),
    spindleParallelismHorizontalUm: magnitude(figures?.spindleParallelismHorizontal),
    centreHeightUm: magnitude(figures?.centreHeight),
    bedStraightnessUm: magnitude(figures?.bedStraightness),
    tableFlatnessUm: magnitude(figures?.tableFlatness),
    travelSquarenessUm: magnitude(figures?.travelSquareness),
    xPositioningAccuracyUm: magnitude(figures?.xPositioningAccuracy),
    xRepeatabilityUm: magnitude(figures?.xRepeatability),
    yPositioningAccuracyUm: magnitude(figures?.yPositioningAccuracy),
    yRepeatabilityUm: magnitude(figures?.yRepeatability),
    zPositioningAccuracyUm: magnitude(figures?.zPositioningAccuracy),
    zRepeatabilityUm: magnitude(figures?.zRepeatability),
  };
}
