import { index, pgTable, primaryKey, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { user } from "../accounts/schema";
import { listings } from "../listings/schema";

// One physical machine, seen across listings and owners. A listing joins a machine only when its seller
// confirms the suggested match; staff can take a listing out again.
export const machines = pgTable("machines", {
  id: uuid("id").primaryKey().defaultRandom(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
});

export const machineListings = pgTable(
  "machine_listings",
  {
    listingId: uuid("listing_id")
      .primaryKey()
      .references(() => listings.id, { onDelete: "cascade" }),
    machineId: uuid("machine_id")
      .notNull()
      .references(() => machines.id, { onDelete: "cascade" }),
    confirmedBy: text("confirmed_by").references(() => user.id, { onDelete: "set null" }),
    confirmedAt: timestamp("confirmed_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("machine_listings_machine_idx").on(table.machineId)],
);

/** A match the seller turned down or staff split: never suggested again. */
export const machineMatchRefusals = pgTable(
  "machine_match_refusals",
  {
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    otherListingId: uuid("other_listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    refusedBy: text("refused_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [primaryKey({ columns: [table.listingId, table.otherListingId] })],
);
