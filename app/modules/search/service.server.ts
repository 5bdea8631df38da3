// The buyer's machine search: asks the index, and when the search service is down, slow or failing, runs
// the same filters against PostgreSQL and says the results may be incomplete. Adds the facet counts a
// filter panel needs and, for an empty result, which filter to widen. The page and the API share it.
import type { Database } from "~/db/client.server";
import type { DisplayUnits } from "~/modules/units/format";
import { formatLength, formatMoney } from "~/modules/units/format";
import type { ListingSearchQuery } from "../../../search/query.ts";
import { describeSearch } from "./describe";
import { hitDisplay, type HitDisplay } from "./hit-display";
import { accuracyFilters, labelInText, formatDeviation, widerLimits, type AccuracyFilterKey } from "./figures";
import { encodeListingCursor, MAX_CURSOR_PAGE } from "./cursor.server";
import { searchListingsInDatabase, searchListingsInDatabaseTogether } from "./listing-source.server";
import {
  LISTING_FACETS,
  listingSearch,
  SearchUnavailableError,
  type ListingCursorKey,
  type ListingFacet,
  type ListingSearch,
  type ListingSearchHit,
  type ListingSearchRequest,
  type ListingSearchResult,
} from "./search.server";
import { paramsFromQuery } from "./search-params.server";
import { formatDate } from "~/modules/units/dates";

export type ResultSource = "index" | "database";

/** One result as the page and the API show it. Accuracy in µm, sizes in mm, prices in minor units. */
export type ListingHit = {
  id: string;
  slug: string;
  url: string;
  title: string;
  category: string;
  categoryLabel: string;
  condition: string;
  year: number | null;
  status: string;
  price: { minor: number; currency: string } | null;
  swingMm: number | null;
  betweenCentresMm: number | null;
  location: { city: string | null; region: string | null; country: string };
  photoUrl: string | null;
  publishedAt: string | null;
  verified: boolean;
  grade: string | null;
  report: {
    id: string;
    measuredOn: string;
    /** The date as pages show it ("4 Dec 2026"), so that the result card needs no date formatting of its own. */
    measuredOnText: string;
    keyFigures: {
      spindleRunoutUm: number | null;
      axialSlipUm: number | null;
      spindleParallelismVerticalUm: number | null;
      spindleParallelismHorizontalUm: number | null;
      centreHeightUm: number | null;
      bedStraightnessUm: number | null;
      tableFlatnessUm: number | null;
      travelSquarenessUm: number | null;
      xPositioningAccuracyUm: number | null;
      xRepeatabilityUm: number | null;
      yPositioningAccuracyUm: number | null;
      yRepeatabilityUm: number | null;
      zPositioningAccuracyUm: number | null;
      zRepeatabilityUm: number | null;
    };
  } | null;
  /** The card's words in the reader's units (`units`): sizes, chosen figures, place, price, condition, badge. */
  display: HitDisplay;
};

/** A way out of an empty result: the search with one filter widened or dropped, and how many it finds. */
export type WidenSuggestion = { filter: string; text: string; count: number; queryString: string };

export type MachineSearch = {
  source: ResultSource;
  /** Set when the answer came from PostgreSQL: text matching is plainer and the index may hold more. */
  notice: string | null;
  hits: ListingHit[];
  totalHits: number;
  page: number;
  totalPages: number;
  hitsPerPage: number;
  facets: { category: Record<string, number>; grade: Record<string, number>; verified: number; country: Record<string, number> };
  /** For an empty result: what widening one filter would find. */
  emptyBecause: string | null;
  suggestions: WidenSuggestion[];
  /**
   * The next page's cursor (`after=…`), or null on the last page: from PostgreSQL it continues after this
   * page's last row, so that listings added or removed meanwhile neither repeat nor skip a result.
   */
  nextCursor: string | null;
  /** The search as canonical parameters (no page), for links and saving. */
  queryString: string;
  /** The search in words, in the reader's units (a saved search's default name). */
  summary: string;
};

export const INCOMPLETE_NOTICE = "Results may be incomplete: the search service is not answering, so these come straight from our database, with simpler word matching.";

function toHit(document: ListingSearchHit, units: DisplayUnits, now: Date): ListingHit {
  const reportDate = document.reportDate === null ? null : new Date(document.reportDate * 1000).toISOString().slice(0, 10);
  const hit: Omit<ListingHit, "display"> = {
    id: document.id,
    slug: document.slug,
    url: `/machines/${document.slug}`,
    title: document.title,
    category: document.category,
    categoryLabel: document.categoryLabel,
    condition: document.condition,
    year: document.year,
    status: document.status,
    price: document.priceMinor !== null && document.currency ? { minor: document.priceMinor, currency: document.currency } : null,
    swingMm: document.swingMm,
    betweenCentresMm: document.betweenCentresMm,
    location: { city: document.city, region: document.region, country: document.country },
    photoUrl: document.photoUrl,
    publishedAt: document.publishedAt === null ? null : new Date(document.publishedAt * 1000).toISOString(),
    verified: document.verified,
    grade: document.grade,
    report:
      document.reportId && reportDate
        ? {
            id: document.reportId,
            measuredOn: reportDate,
            measuredOnText: formatDate(reportDate),
            keyFigures: {
              spindleRunoutUm: document.spindleRunoutUm,
              axialSlipUm: document.axialSlipUm,
              spindleParallelismVerticalUm: document.spindleParallelismVerticalUm,
              spindleParallelismHorizontalUm: document.spindleParallelismHorizontalUm,
              centreHeightUm: document.centreHeightUm,
              bedStraightnessUm: document.bedStraightnessUm,
              tableFlatnessUm: document.tableFlatnessUm,
              travelSquarenessUm: document.travelSquarenessUm,
              xPositioningAccuracyUm: document.xPositioningAccuracyUm,
              xRepeatabilityUm: document.xRepeatabilityUm,
              yPositioningAccuracyUm: document.yPositioningAccuracyUm,
              yRepeatabilityUm: document.yRepeatabilityUm,
              zPositioningAccuracyUm: document.zPositioningAccuracyUm,
              zRepeatabilityUm: document.zRepeatabilityUm,
            },
          }
        : null,
  };
  return { ...hit, display: hitDisplay(hit, units, now) };
}

// While the service is down every search falls back: say so once a minute with a count, not once per request
// (a line per request is a flood of the log, and its write cost the fallback path a share of its CPU).
const FALLBACK_LOG_EVERY_MS = 60_000;
let fallbackLog = { at: 0, unlogged: 0 };

function warnFallingBack(error: SearchUnavailableError) {
  const now = Date.now();
  if (now - fallbackLog.at < FALLBACK_LOG_EVERY_MS) {
    fallbackLog.unlogged++;
    return;
  }
  const since = fallbackLog.unlogged ? ` (and ${fallbackLog.unlogged} more searches since the last message)` : "";
  fallbackLog = { at: now, unlogged: 0 };
  console.warn(`[search] answering from PostgreSQL: ${error.message}${since}`);
}

/**
 * Runs searches against the index until it fails once, then against PostgreSQL for the rest of this
 * request, so that a down service costs one timeout, not one per query.
 */
export function createListingFinder(db: Database, options: { search?: ListingSearch; now?: Date } = {}) {
  const search = options.search ?? listingSearch();
  const now = options.now ?? new Date();
  let source: ResultSource = "index";
  return {
    get source() {
      return source;
    },
    async find(query: ListingSearchRequest): Promise<ListingSearchResult> {
      if (source === "index") {
        try {
          return await search.searchListings(query, now);
        } catch (error) {
          if (!(error instanceof SearchUnavailableError)) throw error;
          warnFallingBack(error);
          source = "database";
        }
      }
      return searchListingsInDatabase(db, query, now);
    },
    /** Several searches at once: one request to the index, or each in PostgreSQL. */
    async findAll(queries: ListingSearchRequest[]): Promise<ListingSearchResult[]> {
      if (source === "index") {
        try {
          return await search.searchListingsTogether(queries, now);
        } catch (error) {
          if (!(error instanceof SearchUnavailableError)) throw error;
          warnFallingBack(error);
          source = "database";
        }
      }
      return searchListingsInDatabaseTogether(db, queries, now);
    },
  };
}

export type ListingFinder = ReturnType<typeof createListingFinder>;

/** The same search for its total alone, and the counts of `facets` if any (no hits). */
function countOnly(query: ListingSearchQuery, facets: readonly ListingFacet[] = []): ListingSearchRequest {
  return { ...query, page: 1, hitsPerPage: 0, facets };
}

type Relaxation = { filter: string; relaxed: ListingSearchQuery; text: string };

/** Each active filter dropped (or, for accuracy limits, widened to the next round values) on its own. */
function relaxations(query: ListingSearchQuery, units: DisplayUnits): { dropped: Relaxation[]; widened: Map<AccuracyFilterKey, Relaxation[]> } {
  const dropped: Relaxation[] = [];
  const drop = (filter: string, active: unknown, change: Partial<ListingSearchQuery>, text: string) => {
    if (active === undefined || active === null || active === false || (Array.isArray(active) && !active.length)) return;
    dropped.push({ filter, relaxed: { ...query, ...change }, text });
  };
  const length = (mm: number | null | undefined) => (mm == null ? "" : formatLength(mm, units));
  drop("text", query.text, { text: undefined }, `without the words “${query.text}”`);
  drop("categories", query.categories, { categories: undefined }, "in any category");
  drop("grades", query.grades, { grades: undefined }, "with any grade");
  drop("verifiedOnly", query.verifiedOnly, { verifiedOnly: undefined }, "including machines not yet verified");
  drop("price", query.priceMinor && (query.priceMinor.min ?? query.priceMinor.max), { priceMinor: undefined }, "at any price");
  drop("swing", query.swingMm && (query.swingMm.min ?? query.swingMm.max), { swingMm: undefined }, `with any swing${query.swingMm?.max ? ` (not only up to ${length(query.swingMm.max)})` : ""}`);
  drop("betweenCentres", query.betweenCentresMm && (query.betweenCentresMm.min ?? query.betweenCentresMm.max), { betweenCentresMm: undefined }, "with any distance between centres");
  drop("reportAge", query.maxReportAgeDays, { maxReportAgeDays: undefined }, "with reports of any age");
  drop("countries", query.countries, { countries: undefined }, "in any country");
  const widened = new Map<AccuracyFilterKey, Relaxation[]>();
  for (const filter of accuracyFilters) {
    const limit = query[filter.key];
    if (limit === undefined) continue;
    const label = labelInText(filter.label);
    widened.set(
      filter.key,
      widerLimits(limit, units).map((wider) => ({ filter: filter.key, relaxed: { ...query, [filter.key]: wider }, text: `with ${label} ≤ ${formatDeviation(wider, units)}` })),
    );
    dropped.push({ filter: filter.key, relaxed: { ...query, [filter.key]: undefined }, text: `with any ${label}` });
  }
  return { dropped, widened };
}

function describeEmpty(query: ListingSearchQuery, units: DisplayUnits): string {
  const parts: string[] = [];
  for (const filter of accuracyFilters) {
    const limit = query[filter.key];
    if (limit !== undefined) parts.push(`${labelInText(filter.label)} ≤ ${formatDeviation(limit, units)}`);
  }
  if (query.verifiedOnly) parts.push("a verified report");
  if (query.priceMinor?.max != null && query.currency) parts.push(`a price up to ${formatMoney(query.priceMinor.max, query.currency)}`);
  if (query.text) parts.push(`the words “${query.text}”`);
  return parts.length ? `No machines with ${parts.slice(0, 3).join(", ")}` : "No machines match this search";
}

async function widenSuggestions(finder: ListingFinder, query: ListingSearchQuery, units: DisplayUnits): Promise<WidenSuggestion[]> {
  const { dropped, widened } = relaxations(query, units);
  const ladders = [...widened.values()];
  const candidates = [...dropped, ...ladders.flat()];
  const results = await finder.findAll(candidates.map((candidate) => countOnly(candidate.relaxed)));
  const counted = candidates.map((candidate, position) => ({ candidate, count: results[position]!.totalHits }));
  const droppedCounts = counted.slice(0, dropped.length);
  let next = dropped.length;
  const widenedCounts = ladders.map((ladder) => counted.slice(next, (next += ladder.length)));
  const suggestions: WidenSuggestion[] = [];
  // For an accuracy limit, the tightest wider limit that finds something says most.
  for (const ladder of widenedCounts) {
    const first = ladder.find((entry) => entry.count > 0);
    if (first) suggestions.push(suggestion(first.candidate, first.count));
  }
  for (const entry of droppedCounts) {
    if (entry.count === 0) continue;
    if (widened.has(entry.candidate.filter as AccuracyFilterKey) && suggestions.some((known) => known.filter === entry.candidate.filter)) continue;
    suggestions.push(suggestion(entry.candidate, entry.count));
  }
  return suggestions.slice(0, 4);
}

function suggestion(candidate: Relaxation, count: number): WidenSuggestion {
  return {
    filter: candidate.filter,
    count,
    text: `${count} ${count === 1 ? "machine" : "machines"} ${candidate.text}`,
    queryString: paramsFromQuery(candidate.relaxed).toString(),
  };
}

/**
 * The search page's and the API's answer: one page of results, facet counts per value (each facet
 * counted without its own filter, so other choices stay visible), and for an empty page what to widen.
 */
export async function searchMachines(
  db: Database,
  query: ListingSearchQuery,
  options: { units?: DisplayUnits; now?: Date; search?: ListingSearch; after?: ListingCursorKey | null } = {},
): Promise<MachineSearch> {
  const units = options.units ?? "mm";
  const finder = createListingFinder(db, options);
  // The page, and for each facet that is filtered on the same search without that filter: one request.
  // Each search counts only the facets taken from it.
  const facetSearches: Array<{ facet: "category" | "grade" | "verified"; query: ListingSearchRequest }> = [];
  if (query.categories?.length) facetSearches.push({ facet: "category", query: countOnly({ ...query, categories: undefined }, ["category"]) });
  if (query.grades?.length) facetSearches.push({ facet: "grade", query: countOnly({ ...query, grades: undefined }, ["grade"]) });
  if (query.verifiedOnly) facetSearches.push({ facet: "verified", query: countOnly({ ...query, verifiedOnly: undefined }, ["verified"]) });
  const pageFacets = LISTING_FACETS.filter((facet) => !facetSearches.some((search) => search.facet === facet));
  const [result, ...others] = await finder.findAll([{ ...query, facets: pageFacets, after: options.after ?? undefined }, ...facetSearches.map((search) => search.query)]);
  const facetsWithout = (facet: "category" | "grade" | "verified") => {
    const position = facetSearches.findIndex((search) => search.facet === facet);
    return (position < 0 ? result! : others[position]!).facets[facet];
  };
  const [categoryFacets, gradeFacets, verifiedFacets] = [facetsWithout("category"), facetsWithout("grade"), facetsWithout("verified")];
  const empty = result!.totalHits === 0;
  const suggestions = empty ? await widenSuggestions(finder, query, units) : [];
  const queryString = paramsFromQuery(query).toString();
  const nextKey = "nextKey" in result! ? (result.nextKey as ListingCursorKey | null) : null;
  const nextCursor =
    result!.page < result!.totalPages && result!.page < MAX_CURSOR_PAGE && result!.hits.length > 0
      ? encodeListingCursor(query, queryString, { page: result!.page + 1, key: finder.source === "database" ? nextKey : null })
      : null;
  return {
    source: finder.source,
    notice: finder.source === "database" ? INCOMPLETE_NOTICE : null,
    hits: result!.hits.map((hit) => toHit(hit, units, options.now ?? new Date())),
    totalHits: result!.totalHits,
    page: result!.page,
    totalPages: result!.totalPages,
    hitsPerPage: result!.hitsPerPage,
    facets: {
      category: categoryFacets,
      grade: gradeFacets,
      verified: verifiedFacets.true ?? 0,
      country: result!.facets.country,
    },
    emptyBecause: empty ? describeEmpty(query, units) : null,
    suggestions,
    nextCursor,
    queryString,
    summary: describeSearch(query, units),
  };
}
