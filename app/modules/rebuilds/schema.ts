import { sql } from "drizzle-orm";
import { check, date, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "../accounts/schema";
import { listings } from "../listings/schema";

// A listing's rebuild record: readings as found and as rebuilt, taken with the report form and scored by the same
// engine, with the work done. Declared by whoever entered it; a signed report is what confirms it.
export const rebuildRecords = pgTable(
  "rebuild_records",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    authorId: text("author_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    status: text("status").notNull().default("draft"),
    profileKey: text("profile_key").notNull(),
    profileVersion: integer("profile_version").notNull(),
    units: text("units").notNull(),
    /** The two report forms as typed (strings, entry units): { asFound, asRebuilt }. */
    forms: jsonb("forms").notNull(),
    /** The engine's results of each set when last saved: { asFound: TestResult[], asRebuilt: TestResult[] }. */
    results: jsonb("results").notNull(),
    asFoundOn: date("as_found_on", { mode: "string" }),
    asRebuiltOn: date("as_rebuilt_on", { mode: "string" }),
    workDone: jsonb("work_done").$type<string[]>().notNull().default([]),
    notes: text("notes").notNull().default(""),
    /** Listing photos (listing_photos.id) that show the work; a photo deleted from the listing drops out when read. */
    photoIds: jsonb("photo_ids").$type<string[]>().notNull().default([]),
    publishedAt: timestamp("published_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    uniqueIndex("rebuild_records_listing_idx").on(table.listingId),
    index("rebuild_records_author_idx").on(table.authorId),
    check("rebuild_records_status", sql`${table.status} in ('draft', 'published')`),
    check("rebuild_records_units", sql`${table.units} in ('mm', 'inch')`),
  ],
);
