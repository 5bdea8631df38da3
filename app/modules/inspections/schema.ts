import { sql } from "drizzle-orm";
import { customType, index, integer, jsonb, pgEnum, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "../accounts/schema";
import { listings } from "../listings/schema";

/** PostgreSQL's range of timestamps with time zone; read back as its text form, e.g. `["2027-03-01 08:00:00+00","2027-03-01 11:00:00+00")`. */
const tstzrange = customType<{ data: string; driverData: string }>({ dataType: () => "tstzrange" });

// The inspector's public profile and terms of work. Certification itself (the "inspector" role) is the
// accounts domain's; a profile is only shown to buyers while its owner holds that role.
export const inspectorProfiles = pgTable("inspector_profiles", {
  userId: text("user_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "cascade" }),
  headline: text("headline").notNull().default(""),
  bio: text("bio").notNull().default(""),
  qualifications: text("qualifications").notNull().default(""),
  baseCity: text("base_city").notNull().default(""),
  regions: text("regions").array().notNull().default(sql`'{}'::text[]`),
  categories: text("categories").array().notNull().default(sql`'{}'::text[]`),
  currency: text("currency").notNull().default("EUR"),
  certificateFileKey: text("certificate_file_key"),
  certificateFileName: text("certificate_file_name"),
  certificateUploadedAt: timestamp("certificate_uploaded_at", { withTimezone: true }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

/** The inspector's fee for one category of machine, in minor units of the profile's currency. */
export const inspectorFees = pgTable(
  "inspector_fees",
  {
    inspectorId: text("inspector_id")
      .notNull()
      .references(() => inspectorProfiles.userId, { onDelete: "cascade" }),
    category: text("category").notNull(),
    amountMinor: integer("amount_minor").notNull(),
  },
  (table) => [primaryKey({ columns: [table.inspectorId, table.category] })],
);

/** Time the inspector offers for on-site checks. Slots of one inspector never overlap (constraint in the custom migration). */
export const inspectorSlots = pgTable(
  "inspector_slots",
  {
    id: text("id")
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    inspectorId: text("inspector_id")
      .notNull()
      .references(() => inspectorProfiles.userId, { onDelete: "cascade" }),
    startsAt: timestamp("starts_at", { withTimezone: true }).notNull(),
    endsAt: timestamp("ends_at", { withTimezone: true }).notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("inspector_slots_inspector_starts_idx").on(table.inspectorId, table.startsAt)],
);

export const bookingStatus = pgEnum("booking_status", [
  "awaiting_payment",
  "paid",
  "accepted",
  "report_filed",
  "closed",
  "declined",
  "cancelled",
  "refunded",
  "expired",
]);

/** Statuses that hold the inspector's time; the exclusion constraint covers exactly these. */
export const ACTIVE_BOOKING_STATUSES = ["awaiting_payment", "paid", "accepted", "report_filed"] as const;

export const bookings = pgTable(
  "bookings",
  {
    id: text("id")
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    reference: text("reference").notNull().unique(),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "restrict" }),
    buyerId: text("buyer_id")
      .notNull()
      .references(() => user.id, { onDelete: "restrict" }),
    inspectorId: text("inspector_id")
      .notNull()
      .references(() => inspectorProfiles.userId, { onDelete: "restrict" }),
    slotId: text("slot_id").references(() => inspectorSlots.id, { onDelete: "set null" }),
    category: text("category").notNull(),
    startsAt: timestamp("starts_at", { withTimezone: true }).notNull(),
    endsAt: timestamp("ends_at", { withTimezone: true }).notNull(),
    period: tstzrange("period").generatedAlwaysAs(sql`tstzrange(starts_at, ends_at, '[)')`),
    status: bookingStatus("status").notNull().default("awaiting_payment"),
    feeMinor: integer("fee_minor").notNull(),
    currency: text("currency").notNull(),
    platformFeeMinor: integer("platform_fee_minor").notNull(),
    inspectorShareMinor: integer("inspector_share_minor").notNull(),
    refundedMinor: integer("refunded_minor").notNull().default(0),
    /** What the refund rules owe the buyer once the booking is declined or cancelled. */
    refundDueMinor: integer("refund_due_minor"),
    checkoutSessionId: text("checkout_session_id").unique(),
    checkoutUrl: text("checkout_url"),
    checkoutExpiresAt: timestamp("checkout_expires_at", { withTimezone: true }),
    paymentIntentId: text("payment_intent_id"),
    declineReason: text("decline_reason"),
    cancelReason: text("cancel_reason"),
    reportId: text("report_id"),
    paidAt: timestamp("paid_at", { withTimezone: true }),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index("bookings_buyer_idx").on(table.buyerId, table.startsAt),
    index("bookings_inspector_idx").on(table.inspectorId, table.startsAt),
    index("bookings_listing_idx").on(table.listingId),
  ],
);

/** The booking's history: every change of status and every payment fact, with who caused it. */
export const bookingEvents = pgTable(
  "booking_events",
  {
    id: text("id")
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    bookingId: text("booking_id")
      .notNull()
      .references(() => bookings.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    fromStatus: bookingStatus("from_status"),
    toStatus: bookingStatus("to_status"),
    actorId: text("actor_id").references(() => user.id, { onDelete: "set null" }),
    /** The Stripe event that caused it, when one did. */
    stripeEventId: text("stripe_event_id"),
    note: text("note"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("booking_events_booking_idx").on(table.bookingId, table.createdAt)],
);

/** Each verified Stripe event id, written in the same transaction as the change it caused, so it is handled once. */
export const processedWebhookEvents = pgTable("processed_webhook_events", {
  eventId: text("event_id").primaryKey(),
  type: text("type").notNull(),
  bookingId: text("booking_id"),
  outcome: text("outcome").notNull(),
  processedAt: timestamp("processed_at", { withTimezone: true }).notNull().defaultNow(),
});

export const bookingRefunds = pgTable(
  "booking_refunds",
  {
    id: text("id")
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    bookingId: text("booking_id")
      .notNull()
      .references(() => bookings.id, { onDelete: "restrict" }),
    stripeRefundId: text("stripe_refund_id").notNull().unique(),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    reason: text("reason").notNull(),
    rule: text("rule").notNull(),
    issuedBy: text("issued_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("booking_refunds_booking_idx").on(table.bookingId)],
);

/** The inspector's share, recorded as a transfer once the report is filed. One per booking. */
export const payouts = pgTable(
  "payouts",
  {
    id: text("id")
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    bookingId: text("booking_id")
      .notNull()
      .references(() => bookings.id, { onDelete: "restrict" }),
    inspectorId: text("inspector_id")
      .notNull()
      .references(() => user.id, { onDelete: "restrict" }),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    stripeTransferId: text("stripe_transfer_id").notNull(),
    details: jsonb("details"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [uniqueIndex("payouts_booking_unique").on(table.bookingId)],
);
