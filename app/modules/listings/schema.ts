import { sql } from "drizzle-orm";
import {
  bigint,
  boolean,
  check,
  doublePrecision,
  index,
  integer,
  pgEnum,
  pgTable,
  primaryKey,
  smallint,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { user } from "../accounts/schema";

export const machineCategory = pgEnum("machine_category", [
  "centre_lathe",
  "toolroom_lathe",
  "cnc_lathe",
  "milling_machine",
  "machining_centre",
  "surface_grinder",
  "other",
]);
export const machineCondition = pgEnum("machine_condition", ["reconditioned", "used", "as_is"]);
export const listingStatus = pgEnum("listing_status", ["draft", "published", "sold", "withdrawn"]);

// A machine offered for sale. Sizes are held in millimetres, weight in kilograms, power in kilowatts,
// the price in minor units of its currency; pages convert to the reader's units.
export const listings = pgTable(
  "listings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    sellerId: text("seller_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    slug: text("slug").notNull(),
    status: listingStatus("status").notNull().default("draft"),
    category: machineCategory("category").notNull(),
    make: text("make").notNull(),
    model: text("model").notNull(),
    year: integer("year"),
    serialNumber: text("serial_number"),
    swingOverBedMm: doublePrecision("swing_over_bed_mm"),
    distanceBetweenCentresMm: doublePrecision("distance_between_centres_mm"),
    spindleBoreMm: doublePrecision("spindle_bore_mm"),
    /** Mills and grinders: the working surface of the table (or magnetic chuck), length along x and width. */
    tableLengthMm: doublePrecision("table_length_mm"),
    tableWidthMm: doublePrecision("table_width_mm"),
    spindleNose: text("spindle_nose"),
    // What a buyer asks before the rigger: the supply it runs on, its speeds, and (lathes) what fits it and what it cuts.
    /** Nominal supply voltage between lines (three-phase) or line and neutral (single-phase), in volts. */
    supplyVoltage: integer("supply_voltage"),
    supplyPhases: smallint("supply_phases"),
    supplyFrequencyHz: smallint("supply_frequency_hz"),
    spindleSpeedMinRpm: doublePrecision("spindle_speed_min_rpm"),
    spindleSpeedMaxRpm: doublePrecision("spindle_speed_max_rpm"),
    /** Lathes: the tailstock quill's taper as the trade writes it ("Morse taper 4"). */
    tailstockTaper: text("tailstock_taper"),
    /** Lathes: the thread-cutting range, metric pitches in mm and inch threads in threads per inch, as the gearbox plate gives them. */
    threadPitchMinMm: doublePrecision("thread_pitch_min_mm"),
    threadPitchMaxMm: doublePrecision("thread_pitch_max_mm"),
    threadTpiMin: doublePrecision("thread_tpi_min"),
    threadTpiMax: doublePrecision("thread_tpi_max"),
    swingOverCrossSlideMm: doublePrecision("swing_over_cross_slide_mm"),
    /** Floor space the machine stands on, length by width. */
    footprintLengthMm: doublePrecision("footprint_length_mm"),
    footprintWidthMm: doublePrecision("footprint_width_mm"),
    motorPowerKw: doublePrecision("motor_power_kw"),
    weightKg: integer("weight_kg"),
    city: text("city").notNull(),
    region: text("region"),
    country: text("country").notNull(),
    priceMinor: bigint("price_minor", { mode: "number" }).notNull(),
    currency: text("currency").notNull(),
    condition: machineCondition("condition").notNull(),
    toolingIncluded: text("tooling_included"),
    description: text("description").notNull(),
    publishedAt: timestamp("published_at", { withTimezone: true }),
    soldAt: timestamp("sold_at", { withTimezone: true }),
    withdrawnAt: timestamp("withdrawn_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    uniqueIndex("listings_slug_idx").on(table.slug),
    index("listings_seller_idx").on(table.sellerId),
    index("listings_published_idx").on(table.status, table.publishedAt),
    check("listings_price_positive", sql`${table.priceMinor} > 0`),
    check("listings_currency_code", sql`${table.currency} ~ '^[A-Z]{3}$'`),
    check("listings_supply_phases", sql`${table.supplyPhases} in (1, 3)`),
    check("listings_supply_frequency", sql`${table.supplyFrequencyHz} in (50, 60)`),
  ],
);

// Photos in gallery order: position 0 is the cover. Only the processed WebP variants are kept.
export const listingPhotos = pgTable(
  "listing_photos",
  {
    id: uuid("id").primaryKey(),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    thumbnailKey: text("thumbnail_key").notNull(),
    largeKey: text("large_key").notNull(),
    width: integer("width").notNull(),
    height: integer("height").notNull(),
    originalName: text("original_name").notNull(),
    originalBytes: integer("original_bytes").notNull(),
    /** What the photo shows, in the seller's words; shown under it in the gallery. */
    caption: text("caption"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("listing_photos_listing_idx").on(table.listingId, table.position)],
);

// Manuals, earlier inspection reports and the like, as PDF.
/** A presigned upload address handed out and not yet confirmed; a listing may have only so many at once. */
export const uploadTickets = pgTable(
  "upload_tickets",
  {
    uploadKey: text("upload_key").primaryKey(),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    /** A photo's place in the gallery, reserved when the seller chose it: uploads finish in any order. */
    position: integer("position"),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  },
  (table) => [index("upload_tickets_listing_idx").on(table.listingId)],
);

export const listingDocuments = pgTable(
  "listing_documents",
  {
    id: uuid("id").primaryKey(),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    title: text("title").notNull(),
    storageKey: text("storage_key").notNull(),
    bytes: integer("bytes").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("listing_documents_listing_idx").on(table.listingId)],
);

// A buyer's question to the seller; kept here and forwarded by e-mail.
export const listingInquiries = pgTable(
  "listing_inquiries",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    senderId: text("sender_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    message: text("message").notNull(),
    phone: text("phone"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("listing_inquiries_listing_idx").on(table.listingId, table.createdAt)],
);

export const listingWatches = pgTable(
  "listing_watches",
  {
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    // What the watcher was last told (at watching, then at each digest): the watchlist digest reports
    // what changed since. A lower price is a drop; a report signed after `toldThrough` is news.
    seenPriceMinor: bigint("seen_price_minor", { mode: "number" }),
    seenStatus: listingStatus("seen_status"),
    toldThrough: timestamp("told_through", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [primaryKey({ columns: [table.listingId, table.userId] }), index("listing_watches_user_idx").on(table.userId)],
);

// A watcher's digest: when the last one went out (at most one a day) and whether they turned it off.
export const watchDigests = pgTable("watch_digests", {
  userId: text("user_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "cascade" }),
  lastSentAt: timestamp("last_sent_at", { withTimezone: true }),
  digestsOff: boolean("digests_off").notNull().default(false),
});

// Views of a public listing page: one counter per listing and day, so a busy page adds no row per view.
// Bots and the listing's own seller are not counted.
export const listingDailyViews = pgTable(
  "listing_daily_views",
  {
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "cascade" }),
    day: text("day").notNull(),
    views: integer("views").notNull().default(0),
  },
  (table) => [primaryKey({ columns: [table.listingId, table.day] })],
);

// A seller's public page address: a random id of its own, so no page shows the account's internal id.
export const sellerPages = pgTable("seller_pages", {
  userId: text("user_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "cascade" }),
  publicId: uuid("public_id").notNull().unique().defaultRandom(),
});

export type Listing = typeof listings.$inferSelect;
export type ListingPhoto = typeof listingPhotos.$inferSelect;
export type ListingDocument = typeof listingDocuments.$inferSelect;
