import { sql } from "drizzle-orm";
import { boolean, customType, index, integer, jsonb, pgEnum, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
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
  /** The id public pages and links use, so that no page shows the account id behind it. */
  publicId: uuid("public_id").notNull().unique().defaultRandom(),
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
    /** The charge the fee was taken in; each transfer of the inspector's share is tied to it (`source_transaction`). */
    chargeId: text("charge_id"),
    /**
     * Set while a payment that settles later (a bank debit) is processing: the booking stays awaiting payment
     * and keeps its slot past the checkout's lapse, until Stripe says the money arrived or did not.
     */
    paymentProcessingSince: timestamp("payment_processing_since", { withTimezone: true }),
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
    /** Null until Stripe has answered: the row is written first, and its id is the request's idempotency key. */
    stripeRefundId: text("stripe_refund_id").unique(),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    reason: text("reason").notNull(),
    rule: text("rule").notNull(),
    /** `requested` (not yet accepted by Stripe), then Stripe's `pending`, `succeeded`, `failed` or `canceled`. */
    status: text("status").$type<RefundStatus>().notNull().default("requested"),
    failureReason: text("failure_reason"),
    issuedBy: text("issued_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("booking_refunds_booking_idx").on(table.bookingId)],
);

export type RefundStatus = "requested" | "pending" | "succeeded" | "failed" | "canceled";

/**
 * `held`: the inspector has not finished payout set-up; `unclaimed`: held for over 90 days, staff told
 * (still paid once set-up is finished); `due`: a transfer is being made; `transferred`; `failed`: the
 * queue gave up, staff told.
 */
export type PayoutStatus = "held" | "unclaimed" | "due" | "transferred" | "failed";

/** The inspector's share of a booking, owed once the report is filed. One per booking. */
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
    /** The share earned; what is transferred is this less `reversedMinor` (refunds cut the share in proportion). */
    amountMinor: integer("amount_minor").notNull(),
    reversedMinor: integer("reversed_minor").notNull().default(0),
    currency: text("currency").notNull(),
    status: text("status").$type<PayoutStatus>().notNull().default("transferred"),
    /** The connected account the transfer went to, copied from the inspector's payout account at the time. */
    destination: text("destination"),
    stripeTransferId: text("stripe_transfer_id").unique(),
    transferredMinor: integer("transferred_minor").notNull().default(0),
    lastError: text("last_error"),
    heldSince: timestamp("held_since", { withTimezone: true }),
    transferredAt: timestamp("transferred_at", { withTimezone: true }),
    details: jsonb("details"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [uniqueIndex("payouts_booking_unique").on(table.bookingId), index("payouts_inspector_idx").on(table.inspectorId, table.createdAt)],
);

/**
 * The inspector's share taken back when the buyer is refunded: in proportion to the refund, from the share
 * still held (no Stripe call) or from the transfer already made (a Stripe transfer reversal). One per refund.
 */
export const payoutReversals = pgTable(
  "payout_reversals",
  {
    id: text("id")
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    payoutId: text("payout_id")
      .notNull()
      .references(() => payouts.id, { onDelete: "restrict" }),
    refundId: text("refund_id")
      .notNull()
      .unique()
      .references(() => bookingRefunds.id, { onDelete: "restrict" }),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    /** Null when the share had not been transferred yet (it is simply transferred smaller). */
    stripeReversalId: text("stripe_reversal_id").unique(),
    /** `due` (a Stripe reversal is to be made), `done`. */
    status: text("status").$type<"due" | "done">().notNull().default("due"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("payout_reversals_payout_idx").on(table.payoutId)],
);

/**
 * The inspector's Stripe Connect account (Express) and its state as the last `account.updated` told it.
 * Transfers only ever go to the account stored here.
 */
export const payoutAccounts = pgTable("payout_accounts", {
  userId: text("user_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "restrict" }),
  stripeAccountId: text("stripe_account_id").notNull().unique(),
  detailsSubmitted: boolean("details_submitted").notNull().default(false),
  /** Stripe's state of the `transfers` capability: `inactive`, `pending` or `active`. */
  transfersCapability: text("transfers_capability").notNull().default("inactive"),
  payoutsEnabled: boolean("payouts_enabled").notNull().default(false),
  /** Stripe's `requirements.currently_due` and `past_due`, e.g. `individual.verification.document`. */
  requirementsDue: text("requirements_due").array().notNull().default(sql`'{}'::text[]`),
  disabledReason: text("disabled_reason"),
  /** The `created` time of the event (or the read) the state came from; an older event changes nothing. */
  stateAsOf: timestamp("state_as_of", { withTimezone: true }).notNull().defaultNow(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

/**
 * Where the machine stands and who lets the inspector in: entered by the seller, read only by the parties to
 * an accepted booking of it. Its own table, never joined into a listing's public reads, so no public page,
 * API answer or search document can carry it.
 */
export const machineSites = pgTable("machine_sites", {
  listingId: uuid("listing_id")
    .primaryKey()
    .references(() => listings.id, { onDelete: "cascade" }),
  streetAddress: text("street_address").notNull(),
  contactName: text("contact_name").notNull(),
  contactPhone: text("contact_phone").notNull(),
  accessNotes: text("access_notes").notNull().default(""),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

/** A request to move an accepted visit, by the buyer or the inspector, which the other side accepts or declines. */
export const rescheduleRequests = pgTable(
  "reschedule_requests",
  {
    id: text("id")
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    bookingId: text("booking_id")
      .notNull()
      .references(() => bookings.id, { onDelete: "cascade" }),
    requestedBy: text("requested_by", { enum: ["buyer", "inspector"] }).notNull(),
    requesterId: text("requester_id").references(() => user.id, { onDelete: "set null" }),
    startsAt: timestamp("starts_at", { withTimezone: true }).notNull(),
    endsAt: timestamp("ends_at", { withTimezone: true }).notNull(),
    reason: text("reason").notNull().default(""),
    status: text("status", { enum: ["pending", "accepted", "declined", "withdrawn"] }).notNull().default("pending"),
    decidedAt: timestamp("decided_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  // One open request per booking at a time.
  (table) => [uniqueIndex("reschedule_requests_one_pending").on(table.bookingId).where(sql`status = 'pending'`)],
);
