// What the search reads from PostgreSQL: listings with their current report, for indexing (the worker and
// the full re-index) and for the fallback search that runs the buyer's filters here when the search service
// is down or slow. It reads the listings' and reports' tables directly because those domains export no
// query of this shape; it never writes to them.
import { and, asc, count, desc, eq, gt, gte, inArray, isNotNull, lte, or, sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";
import type { Database } from "~/db/client.server";
import type { KeyFigures } from "~/geometry/types";
import { user } from "~/modules/accounts/schema";
import { fileUrl } from "~/modules/files/serve.server";
import { labelOf, machineCategories } from "~/modules/listings/catalogue";
import { listingPhotos, listings } from "~/modules/listings/schema";
import { reports } from "~/modules/reports/schema";
import { credentialKnown, credentialSha256Sql, readSealedReport } from "~/modules/reports/sealed-read.server";
import {
  listingToSearchDocument,
  type SearchableListing,
  type SearchableReport,
} from "../../../search/document.ts";
import { supplyClassOf, type ListingSearchQuery, type NumberRange } from "../../../search/query.ts";
import { listingSearch, listingSearchCounts } from "./schema";
import { currentSearchGeneration, keptSearchAnswers } from "./kept-answers.server";
import { LISTING_FACETS, LISTING_HIT_ATTRIBUTES, type ListingCursorKey, type ListingFacet, type ListingSearchHit, type ListingSearchRequest, type ListingSearchResult } from "./search.server";

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
async function sealed<Row extends JoinedRow>(db: Database, rows: Row[]): Promise<Row[]> {
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

// A page of results reads only what a result shows (LISTING_HIT_ATTRIBUTES): no description or seller, and
// the report's credential as the database's digest of it, its text only when this process has not verified
// that credential yet (readSealedReport).
const pageSelection = {
  id: listings.id,
  slug: listings.slug,
  status: listings.status,
  category: listings.category,
  condition: listings.condition,
  make: listings.make,
  model: listings.model,
  year: listings.year,
  swingOverBedMm: listings.swingOverBedMm,
  distanceBetweenCentresMm: listings.distanceBetweenCentresMm,
  priceMinor: listings.priceMinor,
  currency: listings.currency,
  city: listings.city,
  region: listings.region,
  country: listings.country,
  publishedAt: listings.publishedAt,
  coverKey,
  reportId: reports.id,
  grade: reports.grade,
  keyFiguresText: sql<string | null>`${reports.keyFigures}::text`,
  measuredOn: reports.measuredOn,
  signedAt: reports.signedAt,
  contentHash: reports.contentHash,
  credentialSha256: credentialSha256Sql(reports.credential),
  profileKey: reports.profileKey,
  profileVersion: reports.profileVersion,
};

type PageRow = {
  id: string;
  slug: string;
  status: string;
  category: string;
  condition: string;
  make: string;
  model: string;
  year: number | null;
  swingOverBedMm: number | null;
  distanceBetweenCentresMm: number | null;
  priceMinor: number | null;
  currency: string | null;
  city: string | null;
  region: string | null;
  country: string;
  publishedAt: Date | null;
  coverKey: string | null;
  reportId: string | null;
  grade: string | null;
  keyFiguresText: string | null;
  measuredOn: string | null;
  signedAt: Date | null;
  contentHash: string | null;
  credentialSha256: string | null;
  profileKey: string | null;
  profileVersion: number | null;
  cursorKey: ListingCursorKey;
};

type SealedPageRow = PageRow & { keyFigures: unknown };

/** The page's rows with their report figures as the signed credentials seal them (as `sealed`). */
async function sealedPage(db: Database, rows: PageRow[]): Promise<SealedPageRow[]> {
  // The credentials this process has not verified with these digests are read in one statement.
  const unknown = rows.filter((row) => row.reportId && row.credentialSha256 && !credentialKnown(row.reportId, row.credentialSha256)).map((row) => row.reportId!);
  const texts = unknown.length
    ? new Map((await db.select({ id: reports.id, credential: reports.credential }).from(reports).where(inArray(reports.id, unknown))).map((row) => [row.id, row.credential]))
    : new Map<string, string | null>();
  const loadCredential = async (id: string) =>
    texts.has(id) ? (texts.get(id) ?? null) : ((await db.select({ credential: reports.credential }).from(reports).where(eq(reports.id, id)))[0]?.credential ?? null);
  return Promise.all(
    rows.map(async (row) => {
      if (!row.reportId || !row.grade || !row.measuredOn) return { ...row, keyFigures: null };
      const reading = await readSealedReport(
        db,
        {
          id: row.reportId,
          listingId: row.id,
          grade: row.grade,
          keyFigures: undefined,
          keyFiguresText: row.keyFiguresText ?? "null",
          measuredOn: row.measuredOn,
          signedAt: row.signedAt,
          contentHash: row.contentHash,
          canonicalJson: null,
          credential: null,
          credentialSha256: row.credentialSha256,
          profileKey: row.profileKey ?? undefined,
          profileVersion: row.profileVersion ?? undefined,
        },
        { loadCredential },
      );
      if (!reading.ok) return { ...row, reportId: null, grade: null, keyFigures: null, measuredOn: null, signedAt: null };
      const { subject } = reading;
      return { ...row, grade: subject.grade, keyFigures: subject.keyFigures, measuredOn: subject.measuredOn, signedAt: new Date(subject.signedAt) };
    }),
  );
}

/** One result as the index answers it: the document's hit attributes only. */
function hitOf(row: SealedPageRow): ListingSearchHit {
  const report = searchableReportOf(row);
  const document = listingToSearchDocument(
    {
      id: row.id,
      slug: row.slug,
      status: row.status,
      category: row.category,
      categoryLabel: labelOf(machineCategories, row.category),
      condition: row.condition,
      make: row.make,
      model: row.model,
      year: row.year,
      // Not hit attributes: the page does not read them.
      description: "",
      sellerName: "",
      spindleBoreMm: null,
      swingMm: row.swingOverBedMm,
      betweenCentresMm: row.distanceBetweenCentresMm,
      priceMinor: row.priceMinor,
      currency: row.currency,
      city: row.city,
      region: row.region,
      country: row.country,
      publishedAt: row.publishedAt,
      photoUrl: row.coverKey ? fileUrl(row.coverKey) : null,
    },
    report,
  );
  return Object.fromEntries(LISTING_HIT_ATTRIBUTES.map((name) => [name, document[name]])) as ListingSearchHit;
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

/** A row's current report as the search document takes it, or null when the row has none (or its seal failed). */
function searchableReportOf(row: { reportId: string | null; grade: string | null; measuredOn: string | null; keyFigures: unknown }): SearchableReport | null {
  if (!row.reportId || !row.grade || !row.measuredOn) return null;
  return {
    id: row.reportId,
    grade: row.grade as SearchableReport["grade"],
    measuredOn: new Date(`${row.measuredOn}T00:00:00Z`),
    keyFigures: { ...emptyFigures, ...((row.keyFigures ?? {}) as Partial<KeyFigures>) },
  };
}

function toSource(row: JoinedRow): SourceListing {
  const { listing } = row;
  const report = searchableReportOf(row);
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
      supplyVoltage: listing.supplyVoltage,
      supplyPhases: listing.supplyPhases,
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

// The supply is a listing's own figure, not a report's: read from listings by primary key for the rows
// listing_search has narrowed, so that listing_search and its triggers need no column for it.
function supplyCondition(value: ListingSearchQuery["supply"]): SQL | undefined {
  const supply = supplyClassOf(value);
  if (!supply) return undefined;
  return sql`exists (select 1 from ${listings} where ${listings.id} = ${s.listingId} and ${listings.supplyPhases} = ${supply.phases} and ${listings.supplyVoltage} between ${supply.minVoltage} and ${supply.maxVoltage})`;
}

function idsCondition(ids: string[]): SQL {
  const valid = ids.filter((id) => /^[0-9a-f-]{36}$/i.test(id));
  return valid.length ? inArray(s.listingId, valid) : sql`false`;
}

/** The accuracy limits: each holds only listings whose current report has the figure. */
const accuracyLimitKeys = [
  "maxSpindleRunoutUm", "maxAxialSlipUm", "maxSpindleParallelismUm", "maxCentreHeightUm", "maxBedStraightnessUm", "maxTableFlatnessUm", "maxTravelSquarenessUm",
  "maxXPositioningAccuracyUm", "maxXRepeatabilityUm", "maxYPositioningAccuracyUm", "maxYRepeatabilityUm", "maxZPositioningAccuracyUm", "maxZRepeatabilityUm",
] as const satisfies readonly (keyof ListingSearchQuery)[];

// Each condition keyed by what it tests and with which values, so that the searches of one request can share the
// conditions they have in common (searchListingsInDatabaseTogether).
type KeyedCondition = { key: string; condition: SQL };

/** The same conditions as search/query.ts's listingFilter, written against listing_search. */
function conditionsFor(query: ListingSearchQuery, now: Date): KeyedCondition[] {
  const keyed: KeyedCondition[] = [];
  const put = (key: string, value: unknown, conditions: SQL | SQL[] | undefined) => {
    const list = conditions === undefined ? [] : Array.isArray(conditions) ? conditions : [conditions];
    list.forEach((condition, position) => keyed.push({ key: `${key}#${position}:${JSON.stringify(value)}`, condition }));
  };
  const words = (query.text ?? "").trim().split(/\s+/).filter(Boolean).slice(0, 8);
  for (const word of words) {
    const folded = foldWord(word);
    const categories = machineCategories.filter((category) => foldWord(category.label).includes(folded)).map((category) => category.value);
    const matches = sql`${s.searchText} like ${`%${escapeLike(folded)}%`}`;
    put("word", folded, categories.length ? or(matches, inArray(s.category, categories as (typeof machineCategories)[number]["value"][]))! : matches);
  }
  if (query.ids) put("ids", query.ids, idsCondition(query.ids));
  const statuses = query.statuses ?? ["published"];
  put("statuses", statuses, inArray(s.status, statuses as (typeof listings.status.enumValues)[number][]));
  if (query.categories?.length) put("categories", query.categories, inArray(s.category, query.categories as (typeof listings.category.enumValues)[number][]));
  if (query.grades?.length) put("grades", query.grades, inArray(s.grade, query.grades));
  if (query.verifiedOnly) put("verified", true, eq(s.verified, true));
  if (query.currency) put("currency", query.currency, eq(s.currency, query.currency));
  put("price", query.priceMinor ?? null, rangeOf(s.priceMinor, query.priceMinor));
  put("swing", query.swingMm ?? null, rangeOf(s.swingMm, query.swingMm));
  put("centres", query.betweenCentresMm ?? null, rangeOf(s.betweenCentresMm, query.betweenCentresMm));
  put("runout", query.maxSpindleRunoutUm ?? null, atMost(s.spindleRunoutUm, query.maxSpindleRunoutUm));
  put("axialSlip", query.maxAxialSlipUm ?? null, atMost(s.axialSlipUm, query.maxAxialSlipUm));
  put("parallelismVertical", query.maxSpindleParallelismUm ?? null, atMost(s.parallelismVerticalUm, query.maxSpindleParallelismUm));
  put("parallelismHorizontal", query.maxSpindleParallelismUm ?? null, atMost(s.parallelismHorizontalUm, query.maxSpindleParallelismUm));
  put("centreHeight", query.maxCentreHeightUm ?? null, atMost(s.centreHeightUm, query.maxCentreHeightUm));
  put("bedStraightness", query.maxBedStraightnessUm ?? null, atMost(s.bedStraightnessUm, query.maxBedStraightnessUm));
  put("tableFlatness", query.maxTableFlatnessUm ?? null, figureAtMost("tableFlatness", query.maxTableFlatnessUm));
  put("travelSquareness", query.maxTravelSquarenessUm ?? null, figureAtMost("travelSquareness", query.maxTravelSquarenessUm));
  put("xPositioningAccuracy", query.maxXPositioningAccuracyUm ?? null, figureAtMost("xPositioningAccuracy", query.maxXPositioningAccuracyUm));
  put("xRepeatability", query.maxXRepeatabilityUm ?? null, figureAtMost("xRepeatability", query.maxXRepeatabilityUm));
  put("yPositioningAccuracy", query.maxYPositioningAccuracyUm ?? null, figureAtMost("yPositioningAccuracy", query.maxYPositioningAccuracyUm));
  put("yRepeatability", query.maxYRepeatabilityUm ?? null, figureAtMost("yRepeatability", query.maxYRepeatabilityUm));
  put("zPositioningAccuracy", query.maxZPositioningAccuracyUm ?? null, figureAtMost("zPositioningAccuracy", query.maxZPositioningAccuracyUm));
  put("zRepeatability", query.maxZRepeatabilityUm ?? null, figureAtMost("zRepeatability", query.maxZRepeatabilityUm));
  if (query.maxReportAgeDays !== undefined) {
    const since = new Date(now.getTime() - query.maxReportAgeDays * 86_400_000).toISOString().slice(0, 10);
    put("reportAge", since, gte(s.measuredOn, since));
  }
  // Said again where a condition above implies it (a grade, figure, date or verified mark is a report's), so
  // that PostgreSQL may read the indexes kept for listings with a report (the best-accuracy order).
  const reportImplied =
    query.verifiedOnly || query.grades?.length || query.maxReportAgeDays !== undefined || accuracyLimitKeys.some((key) => query[key] !== undefined && query[key] !== null);
  if (reportImplied) put("hasReport", true, isNotNull(s.reportId));
  if (query.supply) put("supply", query.supply, supplyCondition(query.supply));
  if (query.countries?.length) put("countries", query.countries, inArray(s.country, query.countries));
  if (query.region) put("region", facetText(query.region), eq(s.regionKey, facetText(query.region)));
  return keyed;
}

const allOf = (keyed: KeyedCondition[]) => and(...keyed.map((entry) => entry.condition));

/** One column of a sort: its direction, and whether it can be null (nulls always sort last). */
type SortKey = { column: SQL; descending: boolean; nullable: boolean; cast: string };

const newestKeys: SortKey[] = [
  { column: sql`${s.publishedAt}`, descending: true, nullable: true, cast: "timestamptz" },
  { column: sql`${s.listingId}`, descending: true, nullable: false, cast: "uuid" },
];

// Each order matches an index of listing_search (nulls placed as the index places them), so a page is read
// from the index in order and stops at its last row.
function sortKeysFor(query: ListingSearchQuery): SortKey[] {
  switch (query.sort ?? "relevance") {
    case "price-ascending":
      return [{ column: sql`${s.priceMinor}`, descending: false, nullable: false, cast: "bigint" }, ...newestKeys];
    case "price-descending":
      return [{ column: sql`${s.priceMinor}`, descending: true, nullable: false, cast: "bigint" }, ...newestKeys];
    case "best-accuracy":
      return [
        { column: sql`${s.gradeRank}`, descending: false, nullable: true, cast: "smallint" },
        { column: sql`${s.spindleRunoutUm}`, descending: false, nullable: true, cast: "double precision" },
        ...newestKeys,
      ];
    default:
      // Without the index's text ranking, newest first is the most useful order.
      return newestKeys;
  }
}

const orderOf = (keys: SortKey[]) => keys.map((key) => sql`${key.column} ${sql.raw(key.descending ? "desc" : "asc")} nulls last`);

/** A sort column's value as a cursor carries it: timestamps as PostgreSQL's own text, so that no microsecond is lost. */
const keyValueOf = (key: SortKey) => (key.cast === "timestamptz" ? sql`${key.column}::text` : key.column);

/**
 * The rows strictly after `after` in the order of `keys` (nulls last): for each column, the rows equal on
 * every column before it and after it on this one. A non-null leading column also bounds the index scan.
 */
function afterCondition(keys: SortKey[], after: ListingCursorKey): SQL | undefined {
  if (after.length !== keys.length) return undefined;
  const value = (position: number) => sql`${after[position]}::${sql.raw(keys[position]!.cast)}`;
  const equal = (position: number) => (after[position] === null ? sql`${keys[position]!.column} is null` : sql`${keys[position]!.column} = ${value(position)}`);
  const beyond = (position: number): SQL | undefined => {
    const key = keys[position]!;
    // Nothing sorts after a null: the rows after it are those equal on it and after it on a later column.
    if (after[position] === null) return undefined;
    const strictly = sql`${key.column} ${sql.raw(key.descending ? "<" : ">")} ${value(position)}`;
    return key.nullable ? or(strictly, sql`${key.column} is null`) : strictly;
  };
  const terms = keys.map((_, position) => {
    const strictly = beyond(position);
    return strictly ? and(...Array.from({ length: position }, (_, before) => equal(before)), strictly) : undefined;
  });
  const lead = keys[0]!;
  const bound = after[0] !== null && !lead.nullable ? sql`${lead.column} ${sql.raw(lead.descending ? "<=" : ">=")} ${value(0)}` : undefined;
  return and(bound, or(...terms.filter((term): term is SQL => term !== undefined)) ?? sql`false`);
}

// The facets' columns: the counts are grouped by every facet asked for at once (one hash or one ordered pass
// over the facets index), and each facet's counts are the sums over the other columns.
const facetColumns: Record<ListingFacet, AnyPgColumn> = { category: s.category, grade: s.grade, verified: s.verified, country: s.country };

const c = listingSearchCounts;
const countedFacetColumns: Record<ListingFacet, AnyPgColumn> = { category: c.category, grade: c.grade, verified: c.verified, country: c.country };

// The filters listing_search_counts can answer: a listing's status and the facets' own columns. A report is implied
// by a verified mark or a grade there (the counts hold no listing without one under those values), so that
// condition is left out.
const countedFilters = new Set(["statuses", "categories", "grades", "verified", "countries", "hasReport"]);

/** The search's conditions on listing_search_counts, or null when it filters on anything else. */
function countsConditionsFor(query: ListingSearchQuery, keyed: KeyedCondition[]): KeyedCondition[] | null {
  const filterOf = (entry: KeyedCondition) => entry.key.slice(0, entry.key.indexOf("#"));
  if (!keyed.every((entry) => countedFilters.has(filterOf(entry)))) return null;
  const on: Record<string, () => SQL> = {
    statuses: () => inArray(c.status, (query.statuses ?? ["published"]) as (typeof listings.status.enumValues)[number][]),
    categories: () => inArray(c.category, query.categories as (typeof listings.category.enumValues)[number][]),
    grades: () => inArray(c.grade, query.grades!),
    verified: () => eq(c.verified, true),
    countries: () => inArray(c.country, query.countries!),
  };
  return keyed.filter((entry) => filterOf(entry) !== "hasReport").map((entry) => ({ key: entry.key, condition: on[filterOf(entry)]!() }));
}

type DatabaseResult = ListingSearchResult & {
  /** The page's last row's sort values (null past the last page): where a cursor continues. */
  nextKey: ListingCursorKey | null;
};

type CountRow = Record<string, unknown>;
type Prepared<Row> = { execute(): Promise<Row[]> };

// Drizzle builds a statement's text and parameters again on every execute(), which cost the search about a
// third of its CPU; its `_prepare()` (not in its types) builds them once and returns the unnamed statement that
// execute() itself runs. Without it (another Drizzle), the builder is run as it is.
function prepared<Row>(builder: unknown): Prepared<Row> {
  const preparable = builder as { _prepare?: () => Prepared<Row> } & Prepared<Row>;
  return typeof preparable._prepare === "function" ? preparable._prepare() : preparable;
}

type SearchStatements = { pageStatements: (Prepared<PageRow> | null)[]; countStatement: Prepared<CountRow> };

// The statements of a set of searches, built once and kept for the same searches asked again (their text and
// parameters only: every answer is read from the database anew). Per database client, since a statement runs on
// the client it was built with; the most recent few hundred.
const builtStatements = new WeakMap<Database, Map<string, SearchStatements>>();
const BUILT_STATEMENTS_KEPT = 300;

function statementsFor(db: Database, queries: ListingSearchRequest[], now: Date): SearchStatements {
  // The searches as asked, and the day a report's age counts from (the one condition that reads the clock).
  const key = JSON.stringify([queries, queries.some((query) => query.maxReportAgeDays !== undefined) ? now.toISOString().slice(0, 10) : null]);
  let kept = builtStatements.get(db);
  if (!kept) builtStatements.set(db, (kept = new Map()));
  const known = kept.get(key);
  if (known) {
    kept.delete(key);
    kept.set(key, known);
    return known;
  }
  const statements = buildStatements(db, queries, now);
  if (kept.size >= BUILT_STATEMENTS_KEPT) kept.delete(kept.keys().next().value!);
  kept.set(key, statements);
  return statements;
}

function buildStatements(db: Database, queries: ListingSearchRequest[], now: Date): SearchStatements {
  const conditions = queries.map((query) => conditionsFor(query, now));
  const facetNames = LISTING_FACETS.filter((facet) => queries.some((query) => (query.facets ?? LISTING_FACETS).includes(facet)));

  const pageRows = (query: ListingSearchRequest, where: SQL | undefined): Prepared<PageRow> | null => {
    const hitsPerPage = query.hitsPerPage ?? 20;
    if (hitsPerPage === 0) return null;
    // The page's ids first, in order, from listing_search alone (an index read in order that stops at the
    // page's last row); the listing, seller, report and cover are joined for those rows only.
    const keys = sortKeysFor(query);
    const order = orderOf(keys);
    const after = query.after ? afterCondition(keys, query.after) : undefined;
    // Ordered again outside by the same columns of the joined listing_search row (a window's row number would
    // make PostgreSQL sort every match instead of keeping the page's top rows).
    const ids = db
      .select({
        listingId: s.listingId,
        cursorKey: sql<ListingCursorKey>`json_build_array(${sql.join(keys.map(keyValueOf), sql`, `)})`.as("cursor_key"),
      })
      .from(s)
      .where(and(where, after))
      .orderBy(...order)
      .limit(hitsPerPage)
      .offset(after ? 0 : ((query.page ?? 1) - 1) * hitsPerPage)
      .as("page");
    return prepared<PageRow>(db
      .select({ ...pageSelection, cursorKey: ids.cursorKey })
      .from(ids)
      .innerJoin(listings, eq(listings.id, ids.listingId))
      .innerJoin(s, eq(s.listingId, ids.listingId))
      .leftJoin(reports, currentReportOf(s.reportId))
      .orderBy(...order));
  };

  // What every search filters on is the scan's condition; what differs is counted per search. Searches that
  // filter on the facets' columns alone are counted from listing_search_counts (a few hundred rows), the
  // others from listing_search.
  const countRows = (): Prepared<CountRow> => {
    const fromCounts = queries.map((query, position) => countsConditionsFor(query, conditions[position]!));
    const lists = fromCounts.every((list) => list !== null) ? (fromCounts as KeyedCondition[][]) : conditions;
    const source = lists === conditions ? { table: s, columns: facetColumns, counted: sql`1` } : { table: c, columns: countedFacetColumns, counted: sql`${c.listings}` };
    const shared = lists[0]!.filter((entry) => lists.every((own) => own.some((other) => other.key === entry.key)));
    const sharedKeys = new Set(shared.map((entry) => entry.key));
    const ownConditions = lists.map((own) => allOf(own.filter((entry) => !sharedKeys.has(entry.key))) ?? sql`true`);
    const anyOwn = ownConditions.length > 1 && lists.every((own) => own.some((entry) => !sharedKeys.has(entry.key))) ? or(...ownConditions) : undefined;
    const countColumns = Object.fromEntries(
      queries.map((_, position) => [
        `count_${position}`,
        (queries.length === 1 ? sql`coalesce(sum(${source.counted}), 0)` : sql`coalesce(sum(${source.counted}) filter (where ${ownConditions[position]}), 0)`).mapWith(Number),
      ]),
    );
    const where = and(allOf(shared), anyOwn);
    if (!facetNames.length) return prepared<CountRow>(db.select(countColumns).from(source.table).where(where));
    return prepared<CountRow>(
      db
        .select({ ...Object.fromEntries(facetNames.map((facet) => [facet, source.columns[facet]])), ...countColumns })
        .from(source.table)
        .where(where)
        .groupBy(...facetNames.map((facet) => source.columns[facet])),
    );
  };

  return { pageStatements: queries.map((query, position) => pageRows(query, allOf(conditions[position]!))), countStatement: countRows() };
}

/** The buyer's search run against PostgreSQL (searchListingsInDatabaseTogether with one search). */
export async function searchListingsInDatabase(db: Database, query: ListingSearchRequest, now: Date = new Date()): Promise<DatabaseResult> {
  const [result] = await searchListingsInDatabaseTogether(db, [query], now);
  return result!;
}

/**
 * The buyer's searches run against PostgreSQL: the same filters, sorts, pages and facet counts as the index,
 * with plain word matching instead of the index's ranking and typo tolerance. One query per page asked for
 * (the listing, seller, report and cover joined for its rows only), read after the request's cursor key
 * (`after`, keyset) or else at its page's offset; and one grouped pass over listing_search for every total
 * and facet of every search together: the conditions all searches share filter the rows, and each search
 * counts its own rows with `count(*) filter (where …)`.
 */
export async function searchListingsInDatabaseTogether(db: Database, queries: ListingSearchRequest[], now: Date = new Date()): Promise<DatabaseResult[]> {
  if (!queries.length) return [];
  const kept = keptSearchAnswers<DatabaseResult>(db);
  if (!kept) return readSearches(db, queries, now);
  // The same searches on the same day, answered from memory while nothing they read has changed
  // (kept-answers.server.ts). The number is read before the statements, so what is kept is at least that new.
  const started = performance.now();
  const key = JSON.stringify([queries, now.toISOString().slice(0, 10)]);
  const generation = await currentSearchGeneration(db);
  const known = kept.find(key, generation);
  if (known) return known.map((answer) => ({ ...answer, processingTimeMs: Math.round(performance.now() - started) }));
  const answers = await readSearches(db, queries, now);
  if (Number.isFinite(generation)) kept.keep(key, generation, answers);
  return answers;
}

async function readSearches(db: Database, queries: ListingSearchRequest[], now: Date): Promise<DatabaseResult[]> {
  const started = performance.now();
  const { pageStatements, countStatement } = statementsFor(db, queries, now);
  const facetNames = LISTING_FACETS.filter((facet) => queries.some((query) => (query.facets ?? LISTING_FACETS).includes(facet)));

  const [pages, grouped] = await Promise.all([
    Promise.all(pageStatements.map(async (statement) => (statement ? sealedPage(db, await statement.execute()) : []))),
    countStatement.execute(),
  ]);

  return queries.map((query, position) => {
    const hitsPerPage = query.hitsPerPage ?? 20;
    const page = query.page ?? 1;
    const asked = query.facets ?? LISTING_FACETS;
    const facets = Object.fromEntries(LISTING_FACETS.map((facet) => [facet, {} as Record<string, number>])) as ListingSearchResult["facets"];
    let total = 0;
    for (const row of grouped) {
      const counted = Number(row[`count_${position}`] ?? 0);
      if (counted === 0) continue;
      total += counted;
      for (const facet of facetNames) {
        const value = row[facet];
        if (!asked.includes(facet) || value === null || value === undefined) continue;
        const key = String(value);
        facets[facet][key] = (facets[facet][key] ?? 0) + counted;
      }
    }
    // Each facet's values in the index's order (alphabetical), whatever order the groups came in.
    for (const facet of facetNames) facets[facet] = Object.fromEntries(Object.entries(facets[facet]).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
    const rows = pages[position]!;
    const totalPages = hitsPerPage === 0 ? 0 : Math.ceil(total / hitsPerPage);
    const last = rows.at(-1);
    return {
      hits: rows.map(hitOf),
      totalHits: total,
      page,
      hitsPerPage,
      totalPages,
      facets,
      processingTimeMs: Math.round(performance.now() - started),
      nextKey: last && rows.length === hitsPerPage ? last.cursorKey : null,
    };
  });
}
