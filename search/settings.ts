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
  "priceMinor",
  "currency",
  "swingMm",
  "betweenCentresMm",
  "country",
  "region",
];

const sortableAttributes: Attribute[] = ["publishedAt", "priceMinor", "gradeRank", "spindleRunoutUm"];

export const listingIndexSettings = {
  searchableAttributes,
  filterableAttributes,
  sortableAttributes,
  // The engine's default order of ranking rules.
  rankingRules: ["words", "typo", "proximity", "attribute", "sort", "exactness"],
} satisfies Settings;
