// The listing index's settings: what buyers' words are matched against (in order of weight), what they
// can filter and facet on, and what results can be sorted by. Applied on start by applyIndexSettings().
import type { Settings } from "meilisearch";
import type { ListingSearchDocument } from "./document.ts";

export const LISTINGS_INDEX_UID = "listings";
export const LISTINGS_PRIMARY_KEY = "id" satisfies keyof ListingSearchDocument;

type Attribute = keyof ListingSearchDocument;

const searchableAttributes: Attribute[] = ["make", "model", "categoryLabel", "description", "city", "region", "country", "sellerName"];

// `id` is filterable too, so that a saved search can be asked whether it matches one given listing.
const filterableAttributes: Attribute[] = [
  "id",
  "status",
  "category",
  "grade",
  "verified",
  "reportDate",
  "spindleRunoutUm",
  "axialSlipUm",
  "spindleParallelismVerticalUm",
  "spindleParallelismHorizontalUm",
  "centreHeightUm",
  "bedStraightnessUm",
  "tableFlatnessUm",
  "travelSquarenessUm",
  "xPositioningAccuracyUm",
  "xRepeatabilityUm",
  "yPositioningAccuracyUm",
  "yRepeatabilityUm",
  "zPositioningAccuracyUm",
  "zRepeatabilityUm",
  "priceMinor",
  "currency",
  "swingMm",
  "supplyVoltage",
  "supplyPhases",
  "betweenCentresMm",
  "country",
  "region",
];

// `id` breaks the ties of every sort, as it does in the PostgreSQL fallback.
const sortableAttributes: Attribute[] = ["publishedAt", "priceMinor", "gradeRank", "spindleRunoutUm", "id"];

export const listingIndexSettings = {
  searchableAttributes,
  filterableAttributes,
  sortableAttributes,
  // `sort` first: a sort the buyer chose is strict, relevance only orders within equal sort values (and
  // alone when no sort is chosen). The engine's default puts `sort` after words, typo, proximity and
  // attribute, which would order “cheapest first” by price only within equal relevance. Relevance ties
  // go newest first and then by id, the order the PostgreSQL fallback uses when it cannot rank words.
  rankingRules: ["sort", "words", "typo", "proximity", "attribute", "exactness", "publishedAt:desc", "id:desc"],
} satisfies Settings;
