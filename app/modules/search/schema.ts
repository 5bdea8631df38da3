import { sql } from "drizzle-orm";
import { bigint, boolean, check, date, doublePrecision, index, jsonb, pgTable, smallint, text, timestamp, unique, uuid } from "drizzle-orm/pg-core";
import { listings, listingStatus, machineCategory } from "../listings/schema";

// What the PostgreSQL search filters, counts and sorts on: one row per listing with its current report's
// figures, kept in step by triggers on listings, reports and user (drizzle/0015_listing-search-triggers.sql)
// in the same transaction as every write, so it is never behind. App code only reads it. Text matching uses
// `search_text` (every searched field folded as the index folds it) through a trigram index.
export const listingSearch = pgTable(
  "listing_search",
  {
    listingId: uuid("listing_id")
      .primaryKey()
      .references(() => listings.id, { onDelete: "cascade" }),
    status: listingStatus("status").notNull(),
    category: machineCategory("category").notNull(),
    publishedAt: timestamp("published_at", { withTimezone: true }),
    priceMinor: bigint("price_minor", { mode: "number" }).notNull(),
    currency: text("currency").notNull(),
    country: text("country").notNull(),
    /** The region folded for comparison (trimmed, NFKD, lower case). */
    regionKey: text("region_key"),
    swingMm: doublePrecision("swing_mm"),
    betweenCentresMm: doublePrecision("between_centres_mm"),
    /** Make, model, description, city, region, country and the seller's name, folded (NFKD, lower case, no combining marks). */
    searchText: text("search_text").notNull(),
    // The current report: the latest signed revision of the listing's reports.
    reportId: uuid("report_id"),
    grade: text("grade"),
    gradeRank: smallint("grade_rank"),
    /** A current report that graded the machine (an incomplete one proves nothing yet). */
    verified: boolean("verified").notNull(),
    measuredOn: date("measured_on"),
    /** The report's key figures as stored, for figures without a column of their own. */
    keyFigures: jsonb("key_figures"),
    // Key figures as magnitudes in µm.
    spindleRunoutUm: doublePrecision("spindle_runout_um"),
    axialSlipUm: doublePrecision("axial_slip_um"),
    parallelismVerticalUm: doublePrecision("parallelism_vertical_um"),
    parallelismHorizontalUm: doublePrecision("parallelism_horizontal_um"),
    centreHeightUm: doublePrecision("centre_height_um"),
    bedStraightnessUm: doublePrecision("bed_straightness_um"),
  },
  (table) => [
    // Newest first (browsing, relevance without words, and every sort's tie-break).
    index("listing_search_newest_idx").on(table.status, table.publishedAt.desc().nullsLast(), table.listingId.desc()),
    index("listing_search_category_idx").on(table.category, table.status, table.publishedAt.desc().nullsLast(), table.listingId.desc()),
    index("listing_search_price_idx").on(table.status, table.priceMinor, table.publishedAt.desc().nullsLast(), table.listingId.desc()),
    // Verified machines, best accuracy first: the order of the accuracy sort, for the published ones only.
    index("listing_search_best_accuracy_idx")
      .on(table.gradeRank, table.spindleRunoutUm, table.publishedAt.desc().nullsLast(), table.listingId.desc())
      .where(sql`${table.status} = 'published' and ${table.reportId} is not null`),
    // An accuracy limit (`<=`) only matches listings that have the figure: each figure's index holds those.
    // These four and the best-accuracy index also carry the facets' columns (INCLUDE, which this builder cannot
    // declare: drizzle/0031_search-covering-indexes.sql), so their searches count facets from the index alone.
    index("listing_search_runout_idx").on(table.spindleRunoutUm).where(sql`${table.spindleRunoutUm} is not null`),
    index("listing_search_axial_slip_idx").on(table.axialSlipUm).where(sql`${table.axialSlipUm} is not null`),
    index("listing_search_parallelism_idx").on(table.parallelismVerticalUm).where(sql`${table.parallelismVerticalUm} is not null`),
    index("listing_search_centre_height_idx").on(table.centreHeightUm).where(sql`${table.centreHeightUm} is not null`),
    index("listing_search_country_idx").on(table.country, table.status),
    // The facets' columns together: the counts of a broad search read this narrow index, not the rows.
    index("listing_search_facets_idx").on(table.status, table.category, table.grade, table.verified, table.country),
  ],
);

// How many listings each combination of the facets' columns holds, kept in step with listing_search by its own
// statement triggers (drizzle/0032_listing-search-counts.sql), in the same transaction as every write. A search
// that filters on nothing but these columns (browsing, a category, grades, verified, countries) counts its
// facets and total from these few hundred rows instead of every listing it matches.
export const listingSearchCounts = pgTable(
  "listing_search_counts",
  {
    status: listingStatus("status").notNull(),
    category: machineCategory("category").notNull(),
    grade: text("grade"),
    verified: boolean("verified").notNull(),
    country: text("country").notNull(),
    listings: bigint("listings", { mode: "number" }).notNull(),
  },
  (table) => [unique("listing_search_counts_facets_key").on(table.status, table.category, table.grade, table.verified, table.country).nullsNotDistinct()],
);

// One number that every statement changing what a PostgreSQL search can answer moves on, in the same transaction
// (statement triggers on listings, their photos, listing_search, reports and the signing keys:
// drizzle/0033_search-generation.sql). A search answer kept in the app's memory is reused only while the number
// it was read under is still the current one (app/modules/search/kept-results.server.ts).
export const searchGeneration = pgTable(
  "search_generation",
  {
    id: smallint("id").primaryKey().default(1),
    generation: bigint("generation", { mode: "number" }).notNull(),
  },
  (table) => [check("search_generation_one_row", sql`${table.id} = 1`)],
);
