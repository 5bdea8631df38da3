import { index, pgTable, primaryKey, text, timestamp, uuid, boolean } from "drizzle-orm/pg-core";
import { user } from "../../accounts/schema";
import { listings } from "../../listings/schema";

// A buyer's search kept under a name, with e-mail alerts when a new listing matches it. The search is kept
// as the page's query string (the same parameters as GET /api/v1/listings), parsed again when it is used.
export const savedSearches = pgTable(
  "saved_searches",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    queryString: text("query_string").notNull(),
    alertsEnabled: boolean("alerts_enabled").notNull().default(true),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("saved_searches_user_idx").on(table.userId, table.createdAt), index("saved_searches_alerts_idx").on(table.alertsEnabled)],
);

// One row per alert sent: a saved search hears once about a listing being listed and once about it being
// verified, however often the listing is re-indexed.
export const savedSearchAlerts = pgTable(
  "saved_search_alerts",
  {
    savedSearchId: uuid("saved_search_id")
      .notNull()
      .references(() => savedSearches.id, { onDelete: "cascade" }),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    /** `listed` or `verified`. */
    occasion: text("occasion").notNull(),
    sentAt: timestamp("sent_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [primaryKey({ columns: [table.savedSearchId, table.listingId, table.occasion] }), index("saved_search_alerts_listing_idx").on(table.listingId)],
);

export type SavedSearch = typeof savedSearches.$inferSelect;
