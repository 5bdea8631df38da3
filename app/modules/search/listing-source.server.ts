// What the search reads from PostgreSQL: listings with their current report, for indexing (the worker and
// the full re-index) and for the fallback search that runs the buyer's filters here when the search service
// is down or slow. It reads the listings' and reports' tables directly because those domains export no
// query of this shape; it never writes to them.
import { and, asc, count, desc, eq, gt, gte, inArray, lte, or, sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";
import type { Database } from "~/db/client.server";
import type { KeyFigures } from "~/geometry/types";
import { user } from "~/modules/accounts/schema";
import { fileUrl } from "~/modules/files/serve.server";
import { labelOf, machineCategories } from "~/modules/listings/catalogue";
import { listingPhotos, listings } from "~/modules/listings/schema";
import { reports } from "~/modules/reports/schema";
import { readSealedReport } from "~/modules/reports/sealed-read.server";
import {
  listingToSearchDocument,
  type ListingSearchDocument,
  type SearchableListing,
  type SearchableReport,
} from "../../../search/document.ts";
import type { ListingSearchQuery, NumberRange } from "../../../search/query.ts";
import { listingSearch } from "./schema";
import { LISTING_FACETS, type ListingFacet, type ListingSearchRequest, type ListingSearchResult } from "./search.server";

/** A listing as the search sees it, with its current report and when that report was signed. */
export type SourceListing = { listing: SearchableListing; report: SearchableReport | null; reportSignedAt: Date | null };

// The listing's current report (its latest signed revision) is named by listing_search.report_id, which the
// database keeps in step with every listing and report write (app/modules/search/schema.ts).

// The report row itself must still belong to the listing and be signed: a row changed behind the app's back
// (triggers off) is then not shown, whatever listing_search still says.
const currentReportOf = (reportId: AnyPgColumn) => and(eq(reports.id, reportId), eq(reports.listingId, listings.id), eq(reports.status, "signed"));

// The listing's cover: its first photo. As a correlated subquery it is one lookup on (listing_id, position)
// per row returned, and after ORDER BY … LIMIT only for the rows of the page.
const coverKey = sql<string | null>`(select ${listingPhotos.thumbnailKey} from ${listingPhotos} where ${listingPhotos.listingId} = ${listings.id} order by ${listingPhotos.position}, ${listingPhotos.createdAt} limit 1)`;

const joinedSelection = {
  listing: listings,
  sellerName: user.name,
  coverKey,
  reportId: reports.id,
  grade: reports.grade,
  keyFigures: reports.keyFigures,
  measuredOn: reports.measuredOn,
  signedAt: reports.signedAt,
  contentHash: reports.contentHash,
  credential: reports.credential,
  profileKey: reports.profileKey,
  profileVersion: reports.profileVersion,
};

type JoinedRow = {
  listing: typeof listings.$inferSelect;
  sellerName: string;
  coverKey: string | null;
  reportId: string | null;
  grade: string | null;
  keyFigures: unknown;
  measuredOn: string | null;
  signedAt: Date | null;
  contentHash: string | null;
  credential: string | null;
  profileKey: string | null;
  profileVersion: number | null;
};

/**
 * The report figures of each row as its signed credential seals them: a report whose stored columns no longer
 * match its credential (or whose credential fails) is left out, so neither the index nor a page shows it.
 */
async function sealed(db: Database, rows: JoinedRow[]): Promise<JoinedRow[]> {
  return Promise.all(
    rows.map(async (row) => {
      if (!row.reportId || !row.grade || !row.measuredOn) return row;
      const reading = await readSealedReport(db, { id: row.reportId, listingId: row.listing.id, grade: row.grade, keyFigures: row.keyFigures, measuredOn: row.measuredOn, signedAt: row.signedAt, contentHash: row.contentHash, canonicalJson: null, credential: row.credential, profileKey: row.profileKey ?? undefined, profileVersion: row.profileVersion ?? undefined });
      if (!reading.ok) return { ...row, reportId: null, grade: null, keyFigures: null, measuredOn: null, signedAt: null };
      const { subject } = reading;
      return { ...row, grade: subject.grade, keyFigures: subject.keyFigures, measuredOn: subject.measuredOn, signedAt: new Date(subject.signedAt) };
    }),
  );
}

const emptyFigures: KeyFigures = {
  spindleRunOut: null,
  axialSlip: null,
  spindleParallelismVertical: null,
  spindleParallelismHorizontal: null,
  centreHeight: null,
  bedStraightness: null,
  tableFlatness: null,
  travelSquareness: null,
  xPositioningAccuracy: null,
  xRepeatability: null,
  yPositioningAccuracy: null,
  yRepeatability: null,
  zPositioningAccuracy: null,
  zRepeatability: null,
};

function toSource(row: JoinedRow): SourceListing {
  const { listing } = row;
  const report: SearchableReport | null =
    row.reportId && row.grade && row.measuredOn
      ? {
          id: row.reportId,
          grade: row.grade as SearchableReport["grade"],
          measuredOn: new Date(`${row.measuredOn}T00:00:00Z`),
          keyFigures: { ...emptyFigures, ...((row.keyFigures ?? {}) as Partial<KeyFigures>) },
        }
      : null;
  return {
    listing: {
      id: listing.id,
      slug: listing.slug,
      status: listing.status,
      category: listing.category,
      categoryLabel: labelOf(machineCategories, listing.category),
      condition: listing.condition,
      make: listing.make,
      model: listing.model,
      year: listing.year,
      description: listing.description,
      swingMm: listing.swingOverBedMm,
      betweenCentresMm: listing.distanceBetweenCentresMm,
      spindleBoreMm: listing.spindleBoreMm,
      priceMinor: listing.priceMinor,
      currency: listing.currency,
      city: listing.city,
      region: listing.region,
      country: listing.country,
      sellerName: row.sellerName,
      publishedAt: listing.publishedAt,
      photoUrl: row.coverKey ? fileUrl(row.coverKey) : null,
    },
    report,
    reportSignedAt: report ? row.signedAt : null,
  };
}

/** The listings with these ids (any status), each with its current report; missing ids are left out. */
export async function loadSearchableListings(db: Database, ids: string[]): Promise<Map<string, SourceListing>> {
  const valid = ids.filter((id) => /^[0-9a-f-]{36}$/i.test(id));
  if (!valid.length) return new Map();
  const rows = await db
    .select(joinedSelection)
    .from(listings)
    .innerJoin(user, eq(user.id, listings.sellerId))
    .leftJoin(listingSearch, eq(listingSearch.listingId, listings.id))
    .leftJoin(reports, currentReportOf(listingSearch.reportId))
    .where(inArray(listings.id, valid));
  return new Map((await sealed(db, rows)).map((row) => [row.listing.id, toSource(row)]));
}

/** One page of listing ids in id order, for the full re-index to walk every listing without holding them all. */
export async function listingIdsAfter(db: Database, afterId: string | null, limit: number): Promise<{ id: string; status: string }[]> {
  return db
    .select({ id: listings.id, status: listings.status })
    .from(listings)
    .where(afterId ? gt(listings.id, afterId) : undefined)
    .orderBy(asc(listings.id))
    .limit(limit);
}

// ————— The fallback search —————
// It filters, counts and sorts on listing_search alone (one narrow row per listing, indexed for each sort and
// for word matching), and joins the listing, seller and report for the rows of the page only.

const s = listingSearch;

function escapeLike(word: string) {
  return word.replace(/[\\%_]/g, (character) => `\\${character}`);
}

// Words are folded as the index folds them (compatibility-decomposed, lower case, without combining marks), as
// listing_search.search_text is by listing_search_fold() in the database, so that a composed and a decomposed
// “Î”, or “Präzision” and “prazision”, are the same.
const foldWord = (word: string) => word.normalize("NFKD").replace(/\p{M}/gu, "").toLowerCase();
const facetText = (value: string) => value.trim().normalize("NFKD").toLowerCase();

function rangeOf(column: AnyPgColumn, bounds: NumberRange | undefined): SQL[] {
  const conditions: SQL[] = [];
  if (bounds?.min !== undefined && bounds.min !== null) conditions.push(gte(column, bounds.min));
  if (bounds?.max !== undefined && bounds.max !== null) conditions.push(lte(column, bounds.max));
  return conditions;
}

function atMost(column: AnyPgColumn, limit: number | undefined): SQL[] {
  return limit === undefined || limit === null ? [] : [lte(column, limit)];
}

/** A figure without a column of its own, read from the stored key figures as a magnitude (mills' and grinders' tables and travels). */
function figureAtMost(name: keyof KeyFigures, limit: number | undefined): SQL[] {
  return limit === undefined || limit === null ? [] : [sql`abs((${s.keyFigures} ->> ${name})::double precision) <= ${limit}`];
}

function idsCondition(ids: string[]): SQL {
  const valid = ids.filter((id) => /^[0-9a-f-]{36}$/i.test(id));
  return valid.length ? inArray(s.listingId, valid) : sql`false`;
}

/** The same conditions as search/query.ts's listingFilter, written against listing_search. */
function conditionsFor(query: ListingSearchQuery, now: Date): SQL | undefined {
  const words = (query.text ?? "").trim().split(/\s+/).filter(Boolean).slice(0, 8);
  const textConditions = words.map((word) => {
    const folded = foldWord(word);
    const categories = machineCategories.filter((category) => foldWord(category.label).includes(folded)).map((category) => category.value);
    const matches = sql`${s.searchText} like ${`%${escapeLike(folded)}%`}`;
    return categories.length ? or(matches, inArray(s.category, categories as (typeof machineCategories)[number]["value"][]))! : matches;
  });
  const conditions: (SQL | undefined)[] = [
    query.ids ? idsCondition(query.ids) : undefined,
    inArray(s.status, (query.statuses ?? ["published"]) as (typeof listings.status.enumValues)[number][]),
    query.categories?.length ? inArray(s.category, query.categories as (typeof listings.category.enumValues)[number][]) : undefined,
    query.grades?.length ? inArray(s.grade, query.grades) : undefined,
    query.verifiedOnly ? eq(s.verified, true) : undefined,
    query.currency ? eq(s.currency, query.currency) : undefined,
    ...rangeOf(s.priceMinor, query.priceMinor),
    ...rangeOf(s.swingMm, query.swingMm),
    ...rangeOf(s.betweenCentresMm, query.betweenCentresMm),
    ...atMost(s.spindleRunoutUm, query.maxSpindleRunoutUm),
    ...atMost(s.axialSlipUm, query.maxAxialSlipUm),
    ...atMost(s.parallelismVerticalUm, query.maxSpindleParallelismUm),
    ...atMost(s.parallelismHorizontalUm, query.maxSpindleParallelismUm),
    ...atMost(s.centreHeightUm, query.maxCentreHeightUm),
    ...atMost(s.bedStraightnessUm, query.maxBedStraightnessUm),
    ...figureAtMost("tableFlatness", query.maxTableFlatnessUm),
    ...figureAtMost("travelSquareness", query.maxTravelSquarenessUm),
    query.maxReportAgeDays === undefined
      ? undefined
      : gte(s.measuredOn, new Date(now.getTime() - query.maxReportAgeDays * 86_400_000).toISOString().slice(0, 10)),
    query.countries?.length ? inArray(s.country, query.countries) : undefined,
    query.region ? eq(s.regionKey, facetText(query.region)) : undefined,
    ...textConditions,
  ];
  return and(...conditions);
}

// Each order matches an index of listing_search (nulls placed as the index places them), so a page is read
// from the index in order and stops at its last row.
function orderFor(query: ListingSearchQuery): SQL[] {
  const newest = [sql`${s.publishedAt} desc nulls last`, sql`${s.listingId} desc nulls last`];
  switch (query.sort ?? "relevance") {
    case "price-ascending":
      return [asc(s.priceMinor), ...newest];
    case "price-descending":
      return [desc(s.priceMinor), ...newest];
    case "best-accuracy":
      return [sql`${s.gradeRank} asc nulls last`, sql`${s.spindleRunoutUm} asc nulls last`, ...newest];
    default:
      // Without the index's text ranking, newest first is the most useful order.
      return newest;
  }
}

const facetColumns: Record<ListingFacet, SQL> = {
  category: sql`${s.category}::text`,
  grade: sql`${s.grade}`,
  verified: sql`${s.verified}::text`,
  country: sql`${s.country}`,
};

/** The bit GROUPING() sets for each facet's row (1 = aggregated away; first argument highest), and the total's. */
const facetGroupings: Record<ListingFacet, number> = { category: 0b0111, grade: 0b1011, verified: 0b1101, country: 0b1110 };
const totalGrouping = 0b1111;

/**
 * The buyer's search run against PostgreSQL: the same filters, sorts, page and facet counts as the index,
 * with plain word matching instead of the index's ranking and typo tolerance. Two queries: the page (the
 * listing, seller, report and cover joined for its rows only), and the total with the facets asked for in
 * one grouped pass over listing_search; a search for counts alone (`hitsPerPage: 0`) runs the second only.
 */
export async function searchListingsInDatabase(db: Database, query: ListingSearchRequest, now: Date = new Date()): Promise<ListingSearchResult> {
  const started = performance.now();
  const hitsPerPage = query.hitsPerPage ?? 20;
  const page = query.page ?? 1;
  const where = conditionsFor(query, now);
  const facetNames = [...(query.facets ?? LISTING_FACETS)];

  const pageRows = async (): Promise<JoinedRow[]> => {
    if (hitsPerPage === 0) return [];
    // The page's ids first, in order, from listing_search alone (an index read in order that stops at the
    // page's last row); the listing, seller, report and cover are joined for those rows only.
    const order = orderFor(query);
    const ids = db
      .select({ listingId: s.listingId, position: sql<number>`row_number() over (order by ${sql.join(order, sql`, `)})`.as("position") })
      .from(s)
      .where(where)
      .orderBy(...order)
      .limit(hitsPerPage)
      .offset((page - 1) * hitsPerPage)
      .as("page");
    return db
      .select(joinedSelection)
      .from(ids)
      .innerJoin(listings, eq(listings.id, ids.listingId))
      .innerJoin(user, eq(user.id, listings.sellerId))
      .leftJoin(s, eq(s.listingId, ids.listingId))
      .leftJoin(reports, currentReportOf(s.reportId))
      .orderBy(ids.position);
  };
  const facetRows = async (): Promise<{ grouping: number; value: string | null; count: number }[]> => {
    if (!facetNames.length) {
      const [row] = await db.select({ count: count() }).from(s).where(where);
      return [{ grouping: totalGrouping, value: null, count: row?.count ?? 0 }];
    }
        const sets = facetNames.map((facet) => sql`(${facetColumns[facet]})`);
    // GROUPING() bits in LISTING_FACETS' order (a facet not asked for counts as aggregated away), and the
    // value of the one facet a row is grouped by (the others are null in its grouping set).
    const bits = LISTING_FACETS.map((facet, position) => {
      const weight = 1 << (LISTING_FACETS.length - 1 - position);
      return facetNames.includes(facet) ? sql`grouping(${facetColumns[facet]}) * ${sql.raw(String(weight))}` : sql.raw(String(weight));
    });
    const value = sql`coalesce(${sql.join(facetNames.map((facet) => facetColumns[facet]), sql`, `)})`;
    return db
      .select({ grouping: sql<number>`${sql.join(bits, sql` + `)}`.mapWith(Number), value: sql<string | null>`${value}`, count: count() })
      .from(s)
      .where(where)
      .groupBy(sql`grouping sets (${sql.join([...sets, sql`()`], sql`, `)})`);
  };
  const [rows, grouped] = await Promise.all([pageRows().then((found) => sealed(db, found)), facetRows()]);

  const facets = Object.fromEntries(LISTING_FACETS.map((facet) => [facet, {} as Record<string, number>])) as ListingSearchResult["facets"];
  let total = 0;
  for (const row of grouped) {
    if (row.grouping === totalGrouping) {
      total = Number(row.count);
      continue;
    }
    const facet = facetNames.find((name) => facetGroupings[name] === row.grouping);
    if (facet && row.value !== null && row.value !== undefined) facets[facet][String(row.value)] = Number(row.count);
  }
  return {
    hits: rows.map((row) => {
      const source = toSource(row);
      return listingToSearchDocument(source.listing, source.report) satisfies ListingSearchDocument;
    }),
    totalHits: total,
    page,
    hitsPerPage,
    totalPages: hitsPerPage === 0 ? 0 : Math.ceil(total / hitsPerPage),
    facets,
    processingTimeMs: Math.round(performance.now() - started),
  };
}
