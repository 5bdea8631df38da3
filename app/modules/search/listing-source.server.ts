// What the search reads from PostgreSQL: listings with their current report, for indexing (the worker and
// the full re-index) and for the fallback search that runs the buyer's filters here when the search service
// is down or slow. It reads the listings' and reports' tables directly because those domains export no
// query of this shape; it never writes to them.
import { and, asc, count, desc, eq, gt, gte, inArray, isNotNull, lte, ne, or, sql, type SQL } from "drizzle-orm";
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
  gradeRanks,
  listingToSearchDocument,
  type ListingSearchDocument,
  type SearchableListing,
  type SearchableReport,
} from "../../../search/document.ts";
import type { ListingSearchQuery, NumberRange } from "../../../search/query.ts";
import type { ListingFacet, ListingSearchResult } from "./search.server";

/** A listing as the search sees it, with its current report and when that report was signed. */
export type SourceListing = { listing: SearchableListing; report: SearchableReport | null; reportSignedAt: Date | null };

// The listing's current report: its latest signed revision (a correction marks the one before superseded).
function currentReports(db: Database) {
  const figure = (name: keyof KeyFigures) => sql<number | null>`abs((${reports.keyFigures} ->> ${name})::double precision)`;
  return db
    .selectDistinctOn([reports.listingId], {
      listingId: reports.listingId,
      id: reports.id,
      grade: reports.grade,
      keyFigures: reports.keyFigures,
      measuredOn: reports.measuredOn,
      signedAt: reports.signedAt,
      contentHash: reports.contentHash,
      credential: reports.credential,
      profileKey: reports.profileKey,
      profileVersion: reports.profileVersion,
      spindleRunoutUm: figure("spindleRunOut").as("spindle_runout_um"),
      axialSlipUm: figure("axialSlip").as("axial_slip_um"),
      parallelismVerticalUm: figure("spindleParallelismVertical").as("parallelism_vertical_um"),
      parallelismHorizontalUm: figure("spindleParallelismHorizontal").as("parallelism_horizontal_um"),
      centreHeightUm: figure("centreHeight").as("centre_height_um"),
      bedStraightnessUm: figure("bedStraightness").as("bed_straightness_um"),
    })
    .from(reports)
    .where(eq(reports.status, "signed"))
    .orderBy(reports.listingId, desc(reports.signedAt))
    .as("current_report");
}

// The listing's cover: its first photo. As a correlated subquery it is one lookup on (listing_id, position)
// per row returned, and after ORDER BY … LIMIT only for the rows of the page.
const coverKey = sql<string | null>`(select ${listingPhotos.thumbnailKey} from ${listingPhotos} where ${listingPhotos.listingId} = ${listings.id} order by ${listingPhotos.position}, ${listingPhotos.createdAt} limit 1)`;

function joinedSelection(current: ReturnType<typeof currentReports>) {
  return {
    listing: listings,
    sellerName: user.name,
    coverKey,
    reportId: current.id,
    grade: current.grade,
    keyFigures: current.keyFigures,
    measuredOn: current.measuredOn,
    signedAt: current.signedAt,
    contentHash: current.contentHash,
    credential: current.credential,
    profileKey: current.profileKey,
    profileVersion: current.profileVersion,
  };
}

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
  const current = currentReports(db);
  const rows = await db
    .select(joinedSelection(current))
    .from(listings)
    .innerJoin(user, eq(user.id, listings.sellerId))
    .leftJoin(current, eq(current.listingId, listings.id))
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

function escapeLike(word: string) {
  return word.replace(/[\\%_]/g, (character) => `\\${character}`);
}

// Text is compared as the index compares it: compatibility-decomposed and lower case, and for word
// matching without combining marks (so that a composed and a decomposed “Î”, or “Präzision” and
// “prazision”, are the same). PostgreSQL's regular expressions have no \p{M}; these are the blocks of
// combining marks that Latin, Greek and Cyrillic text uses.
const combiningMarks = "[\u0300-\u036f\u1ab0-\u1aff\u1dc0-\u1dff\u20d0-\u20ff\ufe20-\ufe2f]";
const foldedText = (value: SQL | AnyPgColumn) => sql`regexp_replace(lower(normalize(${value}, NFKD)), ${combiningMarks}, '', 'g')`;
const foldWord = (word: string) => word.normalize("NFKD").replace(/\p{M}/gu, "").toLowerCase();
const facetText = (value: SQL | AnyPgColumn | string) => sql`lower(normalize(btrim(${value}), NFKD))`;

function rangeOf(column: AnyPgColumn, bounds: NumberRange | undefined): SQL[] {
  const conditions: SQL[] = [];
  if (bounds?.min !== undefined && bounds.min !== null) conditions.push(gte(column, bounds.min));
  if (bounds?.max !== undefined && bounds.max !== null) conditions.push(lte(column, bounds.max));
  return conditions;
}

function idsCondition(ids: string[]): SQL {
  const valid = ids.filter((id) => /^[0-9a-f-]{36}$/i.test(id));
  return valid.length ? inArray(listings.id, valid) : sql`false`;
}

/** The same conditions as search/query.ts's listingFilter, written against the tables. */
function conditionsFor(query: ListingSearchQuery, current: ReturnType<typeof currentReports>, now: Date): SQL | undefined {
  const atMost = (column: SQL.Aliased<number | null>, limit: number | undefined) =>
    limit === undefined || limit === null ? [] : [sql`${column} <= ${limit}`];
  const words = (query.text ?? "").trim().split(/\s+/).filter(Boolean).slice(0, 8);
  const textConditions = words.map((word) => {
    const folded = foldWord(word);
    const pattern = `%${escapeLike(folded)}%`;
    const like = (value: SQL | AnyPgColumn) => sql`${foldedText(value)} like ${pattern}`;
    const categories = machineCategories.filter((category) => foldWord(category.label).includes(folded)).map((category) => category.value);
    return or(
      like(listings.make),
      like(listings.model),
      like(listings.description),
      like(listings.city),
      like(sql`coalesce(${listings.region}, '')`),
      like(listings.country),
      like(user.name),
      categories.length ? inArray(listings.category, categories as (typeof machineCategories)[number]["value"][]) : undefined,
    )!;
  });
  const conditions: (SQL | undefined)[] = [
    query.ids ? idsCondition(query.ids) : undefined,
    inArray(listings.status, (query.statuses ?? ["published"]) as (typeof listings.status.enumValues)[number][]),
    query.categories?.length ? inArray(listings.category, query.categories as (typeof listings.category.enumValues)[number][]) : undefined,
    query.grades?.length ? inArray(current.grade, query.grades) : undefined,
    query.verifiedOnly ? and(isNotNull(current.id), ne(current.grade, "incomplete")) : undefined,
    query.currency ? eq(listings.currency, query.currency) : undefined,
    ...rangeOf(listings.priceMinor, query.priceMinor),
    ...rangeOf(listings.swingOverBedMm, query.swingMm),
    ...rangeOf(listings.distanceBetweenCentresMm, query.betweenCentresMm),
    ...atMost(current.spindleRunoutUm, query.maxSpindleRunoutUm),
    ...atMost(current.axialSlipUm, query.maxAxialSlipUm),
    ...atMost(current.parallelismVerticalUm, query.maxSpindleParallelismUm),
    ...atMost(current.parallelismHorizontalUm, query.maxSpindleParallelismUm),
    ...atMost(current.centreHeightUm, query.maxCentreHeightUm),
    ...atMost(current.bedStraightnessUm, query.maxBedStraightnessUm),
    query.maxReportAgeDays === undefined
      ? undefined
      : gte(current.measuredOn, new Date(now.getTime() - query.maxReportAgeDays * 86_400_000).toISOString().slice(0, 10)),
    query.countries?.length ? inArray(listings.country, query.countries) : undefined,
    query.region ? sql`${facetText(listings.region)} = ${facetText(query.region)}` : undefined,
    ...textConditions,
  ];
  return and(...conditions);
}

function orderFor(query: ListingSearchQuery, current: ReturnType<typeof currentReports>): SQL[] {
  const newest = [sql`${listings.publishedAt} desc nulls last`, desc(listings.id)];
  switch (query.sort ?? "relevance") {
    case "price-ascending":
      return [asc(listings.priceMinor), ...newest];
    case "price-descending":
      return [desc(listings.priceMinor), ...newest];
    case "best-accuracy": {
      const rank = sql`case ${current.grade} ${sql.join(
        Object.entries(gradeRanks).map(([grade, rank]) => sql`when ${grade} then ${rank}`),
        sql` `,
      )} end`;
      return [sql`${rank} asc nulls last`, sql`${current.spindleRunoutUm} asc nulls last`, ...newest];
    }
    default:
      // Without the index's text ranking, newest first is the most useful order.
      return newest;
  }
}

const facetColumns = (current: ReturnType<typeof currentReports>): Record<ListingFacet, SQL> => ({
  category: sql`${listings.category}::text`,
  grade: sql`${current.grade}`,
  verified: sql`case when ${current.id} is not null and ${current.grade} <> 'incomplete' then 'true' else 'false' end`,
  country: sql`${listings.country}`,
});

/** Whether only listings with a current report can match (then the report is joined, not left-joined). */
function needsReport(query: ListingSearchQuery): boolean {
  return Boolean(
    query.grades?.length ||
      query.verifiedOnly ||
      query.maxReportAgeDays !== undefined ||
      accuracyLimits.some((key) => query[key] !== undefined && query[key] !== null),
  );
}

const accuracyLimits = ["maxSpindleRunoutUm", "maxAxialSlipUm", "maxSpindleParallelismUm", "maxCentreHeightUm", "maxBedStraightnessUm"] as const;

/** The bit GROUPING() sets for each facet's row (1 = aggregated away; first argument highest), and the total's. */
const facetGroupings: Record<ListingFacet, number> = { category: 0b0111, grade: 0b1011, verified: 0b1101, country: 0b1110 };
const totalGrouping = 0b1111;

/**
 * The buyer's search run against PostgreSQL: the same filters, sorts, page and facet counts as the index,
 * with plain word matching instead of the index's ranking and typo tolerance. Two queries: the page (the
 * cover photo looked up for its rows only), and the total with every facet's counts in one grouped pass;
 * a search for counts alone (`hitsPerPage: 0`) runs the second only.
 */
export async function searchListingsInDatabase(db: Database, query: ListingSearchQuery, now: Date = new Date()): Promise<ListingSearchResult> {
  const started = performance.now();
  const hitsPerPage = query.hitsPerPage ?? 20;
  const page = query.page ?? 1;
  const current = currentReports(db);
  const where = conditionsFor(query, current, now);
  const reportJoin = needsReport(query) ? "inner" : "left";
  const hasWords = Boolean(query.text?.trim());
  const columns = facetColumns(current);
  const facetNames = Object.keys(columns) as ListingFacet[];

  const pageRows = async (): Promise<JoinedRow[]> => {
    if (hitsPerPage === 0) return [];
    const base = db
      .select(joinedSelection(current))
      .from(listings)
      .innerJoin(user, eq(user.id, listings.sellerId))
      .$dynamic();
    const joined = reportJoin === "inner" ? base.innerJoin(current, eq(current.listingId, listings.id)) : base.leftJoin(current, eq(current.listingId, listings.id));
    return joined
      .where(where)
      .orderBy(...orderFor(query, current))
      .limit(hitsPerPage)
      .offset((page - 1) * hitsPerPage);
  };
  const facetRows = async () => {
    const base = db
      .select({
        grouping: sql<number>`grouping(${columns.category}, ${columns.grade}, ${columns.verified}, ${columns.country})`.mapWith(Number),
        category: columns.category,
        grade: columns.grade,
        verified: columns.verified,
        country: columns.country,
        count: count(),
      })
      .from(listings)
      .$dynamic();
    // The seller's name is only read by word matching.
    const withSeller = hasWords ? base.innerJoin(user, eq(user.id, listings.sellerId)) : base;
    const joined = reportJoin === "inner" ? withSeller.innerJoin(current, eq(current.listingId, listings.id)) : withSeller.leftJoin(current, eq(current.listingId, listings.id));
    return joined
      .where(where)
      .groupBy(sql`grouping sets ((${columns.category}), (${columns.grade}), (${columns.verified}), (${columns.country}), ())`);
  };
  const [rows, grouped] = await Promise.all([pageRows().then((found) => sealed(db, found)), facetRows()]);

  const facets = Object.fromEntries(facetNames.map((facet) => [facet, {} as Record<string, number>])) as ListingSearchResult["facets"];
  let total = 0;
  for (const row of grouped) {
    if (row.grouping === totalGrouping) {
      total = Number(row.count);
      continue;
    }
    const facet = facetNames.find((name) => facetGroupings[name] === row.grouping);
    const value = facet ? row[facet] : null;
    if (facet && value !== null && value !== undefined) facets[facet][String(value)] = Number(row.count);
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
