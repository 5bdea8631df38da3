import { sql } from "drizzle-orm";
import { index, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "../accounts/schema";
import { listings } from "../listings/schema";

// A buyer's or seller's request for an inspector where none serves yet: one per person and region
// (the region compared without case), answered when an inspector starts serving it.
export const inspectorRequests = pgTable(
  "inspector_requests",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    /** ISO 3166-1 alpha-2. */
    country: text("country").notNull(),
    /** The listing's region, or its city when it names no region. */
    region: text("region").notNull(),
    /** The machine that prompted it (kept for staff; the request outlives a sold listing). */
    listingId: uuid("listing_id").references(() => listings.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    /** When an inspector started serving the region and the requester was told. */
    servedAt: timestamp("served_at", { withTimezone: true }),
  },
  (table) => [
    uniqueIndex("inspector_requests_person_region_idx").on(table.userId, table.country, sql`lower(${table.region})`),
    index("inspector_requests_open_idx").on(table.country).where(sql`${table.servedAt} is null`),
  ],
);
