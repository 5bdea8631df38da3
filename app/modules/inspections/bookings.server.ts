// Paid inspection bookings: the hold on an inspector's time, checkout, acceptance, decline and cancellation
// with the refund rules, the inspector's payout, and the lists behind the dashboards.
import { and, asc, desc, eq, inArray, isNotNull, isNull, lt, or, sql } from "drizzle-orm";
import { z } from "zod";
import { alias } from "drizzle-orm/pg-core";
import type { Database } from "~/db/client.server";
import { env } from "~/env.server";
import { user, userRole } from "~/modules/accounts/schema";
import { configureQueue, enqueue, registerWorker } from "~/modules/jobs/queue.server";
import { listings } from "~/modules/listings/schema";
import {
  createCheckoutSession,
  expireCheckoutSession,
  PaymentsRejectedError,
  PaymentsUnavailableError,
  refundPayment,
  type CheckoutSessionSummary,
  type RefundSummary,
} from "~/modules/payments/stripe.server";
import { bookingFor, historyFor, refundsFor } from "./booking-view.server";
import { BookingRuleError, isExclusionViolation, SlotTakenError } from "./errors";
import { sendBookingNotice, type BookingNotice } from "./notices.server";
import { findListingBySlug, inspectorUserIdFor, listCertifiedInspectors, regionMatches, type Executor } from "./profiles.server";
import { bookingReference, CHECKOUT_MINUTES, refundFor, splitFee, type BookingStatus, type RefundRule, VISIT_TAKEN_ON } from "./rules";
import {
  HELD_REVIEW_QUEUE,
  PAYOUT_FAILED_QUEUE,
  PAYOUT_QUEUE,
  payInspector,
  recordPayoutFailure,
  REVERSAL_QUEUE,
  reverseShareForRefunds,
  reviewHeldShares,
  shareOfBooking,
} from "./payouts.server";
import { bookingEvents, bookingRefunds, bookings, inspectorSlots, payoutReversals, payouts, type RefundStatus } from "./schema";
import { categoryLabel } from "./validation";

export type Booking = typeof bookings.$inferSelect;
type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
type Person = { id: string; email: string };

export const SETTLE_REFUND_QUEUE = "inspections.settle-refund";

// A payout whose retries are spent (about two hours of them) moves to its dead-letter queue, whose worker
// marks the share failed and tells the staff. Configured where the queue is used, so that whichever process
// creates it first creates it with this setting.
configureQueue(PAYOUT_QUEUE, { retryLimit: 12, retryDelay: 2, retryBackoff: true, deadLetter: PAYOUT_FAILED_QUEUE });

/** Moves a booking from the status it was read with to the next, with a line in its history; false if it moved meanwhile. */
export async function transition(
  tx: Transaction,
  booking: Pick<Booking, "id" | "status">,
  to: BookingStatus,
  event: { kind: string; actorId?: string | null; stripeEventId?: string; note?: string },
  set: Partial<typeof bookings.$inferInsert> = {},
): Promise<boolean> {
  const moved = await tx
    .update(bookings)
    .set({ ...set, status: to, updatedAt: new Date() })
    .where(and(eq(bookings.id, booking.id), eq(bookings.status, booking.status)))
    .returning({ id: bookings.id });
  if (!moved.length) return false;
  await tx.insert(bookingEvents).values({
    bookingId: booking.id,
    kind: event.kind,
    fromStatus: booking.status,
    toStatus: to,
    actorId: event.actorId ?? null,
    stripeEventId: event.stripeEventId,
    note: event.note,
  });
  return true;
}

export async function logBookingEvent(tx: Executor, bookingId: string, event: { kind: string; actorId?: string | null; stripeEventId?: string; note?: string }) {
  await tx.insert(bookingEvents).values({ bookingId, kind: event.kind, actorId: event.actorId ?? null, stripeEventId: event.stripeEventId, note: event.note });
}

/** Sends each notice; a failure to queue mail is reported but never undoes the committed change. */
export async function notify(db: Executor, notices: Array<{ bookingId: string; notice: BookingNotice }>) {
  for (const { bookingId, notice } of notices) await sendBookingNotice(db, bookingId, notice);
}

async function lockBooking(tx: Transaction, bookingId: string): Promise<Booking | undefined> {
  const [booking] = await tx.select().from(bookings).where(eq(bookings.id, bookingId)).for("update");
  return booking;
}

/**
 * Releases unpaid holds whose checkout session has lapsed (Stripe refuses payment after `expires_at`), and
 * holds that never got a session. The webhook's `checkout.session.expired` does the same as it arrives.
 */
export async function releaseLapsedCheckouts(db: Database, inspectorId?: string, now = new Date()) {
  const released = await db.transaction(async (tx) => {
    const lapsed = await tx
      .select({ id: bookings.id, status: bookings.status })
      .from(bookings)
      .where(
        and(
          eq(bookings.status, "awaiting_payment"),
          // A bank debit in progress keeps its slot until Stripe says whether the money came.
          isNull(bookings.paymentProcessingSince),
          inspectorId ? eq(bookings.inspectorId, inspectorId) : undefined,
          or(
            lt(bookings.checkoutExpiresAt, now),
            and(sql`${bookings.checkoutSessionId} is null`, lt(bookings.createdAt, new Date(now.getTime() - 10 * 60_000))),
          ),
        ),
      )
      .for("update", { skipLocked: true });
    const done: string[] = [];
    for (const booking of lapsed) {
      if (await transition(tx, booking, "expired", { kind: "checkout_lapsed", note: "The checkout session lapsed unpaid." })) done.push(booking.id);
    }
    return done;
  });
  await notify(db, released.map((bookingId) => ({ bookingId, notice: { kind: "expired" } as const })));
  return released.length;
}

/**
 * Holds the slot for this person and opens a Stripe Checkout session for the fee. The hold is inserted
 * first, under the exclusion constraint: the loser of a race gets SlotTakenError and no session, so is
 * never charged.
 */
/** The booking form's request: the inspector by the public id the page showed, then `createBooking`. */
export async function createBookingWithPublicInspector(
  db: Database,
  input: { booker: Person; listingSlug: string; inspectorPublicId: string; slotId: string },
  now = new Date(),
) {
  const inspectorId = await inspectorUserIdFor(db, input.inspectorPublicId);
  if (!inspectorId) throw new BookingRuleError("Choose one of the inspectors on this page.", 422, "inspectorId");
  return createBooking(db, { booker: input.booker, listingSlug: input.listingSlug, inspectorId, slotId: input.slotId }, now);
}

export async function createBooking(
  db: Database,
  input: { booker: Person; listingSlug: string; inspectorId: string; slotId: string },
  now = new Date(),
): Promise<{ bookingId: string; checkoutUrl: string }> {
  const listing = await findListingBySlug(db, input.listingSlug);
  if (!listing || (listing.status !== "published" && listing.sellerId !== input.booker.id)) throw new BookingRuleError("No such listing.", 404);
  if (input.inspectorId === listing.sellerId) throw new BookingRuleError("An inspector cannot inspect a listing of their own.", 403, "inspectorId");
  if (input.inspectorId === input.booker.id) throw new BookingRuleError("You cannot book yourself.", 403, "inspectorId");
  const [inspector] = (await listCertifiedInspectors(db, { category: listing.category })).filter((candidate) => candidate.userId === input.inspectorId);
  const fee = inspector?.fees.find((candidate) => candidate.category === listing.category);
  if (!inspector || !fee || !regionMatches(inspector.regions, listing)) {
    throw new BookingRuleError("This inspector does not take bookings for this machine or region.", 422, "inspectorId");
  }
  const [slot] = await db
    .select()
    .from(inspectorSlots)
    .where(and(eq(inspectorSlots.id, input.slotId), eq(inspectorSlots.inspectorId, inspector.userId)));
  if (!slot) throw new BookingRuleError("Choose one of the inspector's slots.", 422, "slotId");
  if (slot.startsAt <= now) throw new BookingRuleError("This slot has already begun; choose a later one.", 422, "slotId");

  await releaseLapsedCheckouts(db, inspector.userId, now);

  const { platformFeeMinor, inspectorShareMinor } = splitFee(fee.amountMinor);
  let booking: Booking;
  try {
    booking = await db.transaction(async (tx) => {
      // Holds for one inspector take turns. Concurrent inserts checked by one exclusion constraint can
      // otherwise deadlock on each other's speculative rows; in turn, each loser meets the constraint cleanly.
      await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`booking-holds:${inspector.userId}`}))`);
      const [created] = await tx
        .insert(bookings)
        .values({
          reference: bookingReference(),
          listingId: listing.id,
          buyerId: input.booker.id,
          inspectorId: inspector.userId,
          slotId: slot.id,
          category: listing.category,
          startsAt: slot.startsAt,
          endsAt: slot.endsAt,
          feeMinor: fee.amountMinor,
          currency: inspector.currency,
          platformFeeMinor,
          inspectorShareMinor,
        })
        .returning();
      await logBookingEvent(tx, created!.id, { kind: "requested", actorId: input.booker.id, note: "Slot held while the buyer pays." });
      return created!;
    });
  } catch (error) {
    if (isExclusionViolation(error, "bookings_no_overlap_per_inspector")) throw new SlotTakenError();
    throw error;
  }

  const origin = env().APP_ORIGIN;
  let session: CheckoutSessionSummary;
  try {
    session = await createCheckoutSession({
      bookingId: booking.id,
      amountMinor: booking.feeMinor,
      currency: booking.currency,
      description: `On-site inspection ${booking.reference}: ${categoryLabel(listing.category)} ${listing.make} ${listing.model}, ${listing.city}, by ${inspector.name}`,
      platformFeeMinor,
      successUrl: `${origin}/bookings/${booking.id}/paid`,
      cancelUrl: `${origin}/bookings/${booking.id}/checkout-cancelled`,
      customerEmail: input.booker.email,
      expiresInMinutes: CHECKOUT_MINUTES,
    });
  } catch (error) {
    // No session, no charge: free the slot again at once, then let the caller say the payment service is down.
    await db.transaction((tx) =>
      transition(tx, booking, "cancelled", { kind: "checkout_failed", note: error instanceof Error ? error.message : String(error) }),
    );
    throw error;
  }
  await db
    .update(bookings)
    .set({
      checkoutSessionId: session.id,
      checkoutUrl: session.url,
      checkoutExpiresAt: session.expiresAt,
      updatedAt: new Date(),
    })
    .where(eq(bookings.id, booking.id));
  return { bookingId: booking.id, checkoutUrl: session.url! };
}

export type Viewer = { id: string; roles: readonly string[] };

const inspectorUser = alias(user, "inspector_user");
const buyerUser = alias(user, "buyer_user");

function bookingSummaryQuery(db: Executor) {
  return db
    .select({
      booking: bookings,
      listing: { slug: listings.slug, make: listings.make, model: listings.model, city: listings.city, region: listings.region, country: listings.country, sellerId: listings.sellerId },
      inspectorName: inspectorUser.name,
      buyerName: buyerUser.name,
      buyerEmail: buyerUser.email,
    })
    .from(bookings)
    .innerJoin(listings, eq(listings.id, bookings.listingId))
    .innerJoin(inspectorUser, eq(inspectorUser.id, bookings.inspectorId))
    .innerJoin(buyerUser, eq(buyerUser.id, bookings.buyerId));
}

export type BookingSummary = Awaited<ReturnType<typeof listBookingsForInspector>>["requests"][number];

/** One booking with its history, for its buyer, its inspector, the listing's seller or an admin. */
export async function getBookingView(db: Executor, bookingId: string, viewer: Viewer, now = new Date()) {
  const [row] = await bookingSummaryQuery(db).where(eq(bookings.id, bookingId));
  if (!row) throw new BookingRuleError("No such booking.", 404);
  const role =
    row.booking.buyerId === viewer.id
      ? "buyer"
      : row.booking.inspectorId === viewer.id
        ? "inspector"
        : row.listing.sellerId === viewer.id
          ? "seller"
          : viewer.roles.includes("admin")
            ? "admin"
            : null;
  if (!role) throw new BookingRuleError("This booking is not yours.", 403);
  const history = await db.select().from(bookingEvents).where(eq(bookingEvents.bookingId, bookingId)).orderBy(asc(bookingEvents.createdAt));
  const refunds = await db.select().from(bookingRefunds).where(eq(bookingRefunds.bookingId, bookingId)).orderBy(asc(bookingRefunds.createdAt));
  const cancellable = role === "buyer" && (row.booking.status === "paid" || row.booking.status === "accepted");
  const refundIfCancelledNow = cancellable
    ? refundFor({ by: "buyer", status: row.booking.status, feeMinor: row.booking.feeMinor, startsAt: row.booking.startsAt, at: now })
    : null;
  // Each party loads only its part of the booking (booking-view.server.ts).
  const share = role === "inspector" || role === "admin" ? await shareOfBooking(db, bookingId, row.booking.inspectorId) : null;
  return { ...bookingFor(role, row), history: historyFor(role, history), refunds: refundsFor(role, refunds), refundIfCancelledNow, share };
}

export type BookingView = Awaited<ReturnType<typeof getBookingView>>;

export async function listBookingsForBuyer(db: Executor, buyerId: string) {
  // Newest first: the booking made last on top, whatever day its visit falls on.
  const rows = await bookingSummaryQuery(db).where(eq(bookings.buyerId, buyerId)).orderBy(desc(bookings.createdAt), desc(bookings.id));
  return rows.map((row) => bookingFor("buyer", row));
}

/** The inspector's requests to answer, upcoming visits, finished work and the rest. */
export async function listBookingsForInspector(db: Executor, inspectorId: string, now = new Date()) {
  const rows = (await bookingSummaryQuery(db).where(eq(bookings.inspectorId, inspectorId)).orderBy(asc(bookings.startsAt))).map((row) => bookingFor("inspector", row));
  return {
    requests: rows.filter((row) => row.booking.status === "paid"),
    upcoming: rows.filter((row) => row.booking.status === "accepted"),
    done: rows.filter((row) => row.booking.status === "report_filed" || row.booking.status === "closed").reverse(),
    other: rows.filter((row) => ["declined", "cancelled", "refunded"].includes(row.booking.status) && row.booking.paidAt).reverse(),
    now,
  };
}

export async function acceptBooking(db: Database, inspector: Person, bookingId: string) {
  const accepted = await db.transaction(async (tx) => {
    const booking = await lockBooking(tx, bookingId);
    if (!booking || booking.inspectorId !== inspector.id) throw new BookingRuleError("No such request of yours.", 404);
    if (booking.status === "accepted") return false;
    if (booking.status !== "paid") throw new BookingRuleError("Only a paid request can be accepted.", 409);
    return transition(tx, booking, "accepted", { kind: "accepted", actorId: inspector.id }, { acceptedAt: new Date() });
  });
  if (accepted) await notify(db, [{ bookingId, notice: { kind: "accepted" } }]);
}

/** Writes the refund the rules owe and tries to issue it now; if Stripe is unreachable, a queued job retries. */
async function refundAfterCommit(db: Database, bookingId: string, actorId: string | null) {
  try {
    await settleRefund(db, bookingId, actorId);
  } catch (error) {
    console.warn(`[inspections] refund of booking ${bookingId} queued for retry: ${error instanceof Error ? error.message : String(error)}`);
    await enqueue(SETTLE_REFUND_QUEUE, { bookingId, actorId }, { singletonKey: bookingId });
  }
}

/** The inspector declines a paid request, or cancels an accepted one: the buyer is refunded in full. */
export async function declineBooking(db: Database, inspector: Person, bookingId: string, reason: string) {
  const kind = await db.transaction(async (tx) => {
    const booking = await lockBooking(tx, bookingId);
    if (!booking || booking.inspectorId !== inspector.id) throw new BookingRuleError("No such request of yours.", 404);
    if (booking.status === "declined" || booking.status === "refunded") return null;
    if (booking.status !== "paid" && booking.status !== "accepted") throw new BookingRuleError("This booking can no longer be declined.", 409);
    const refund = refundFor({ by: "inspector", status: booking.status, feeMinor: booking.feeMinor, startsAt: booking.startsAt, at: new Date() });
    await transition(tx, booking, "declined", { kind: refund.rule, actorId: inspector.id, note: reason }, { declineReason: reason, refundDueMinor: refund.amountMinor });
    return booking.status === "accepted" ? ("cancelled_by_inspector" as const) : ("declined" as const);
  });
  if (!kind) return;
  await notify(db, [{ bookingId, notice: { kind, reason } }]);
  await refundAfterCommit(db, bookingId, inspector.id);
}

/** The buyer cancels: an unpaid hold is simply released; a paid booking is refunded by the written rules. */
export async function cancelBookingAsBuyer(db: Database, buyer: Person, bookingId: string, reason: string, now = new Date()) {
  const outcome = await db.transaction(async (tx) => {
    const booking = await lockBooking(tx, bookingId);
    if (!booking || booking.buyerId !== buyer.id) throw new BookingRuleError("No such booking of yours.", 404);
    if (booking.status === "awaiting_payment") {
      await transition(tx, booking, "cancelled", { kind: "released_by_buyer", actorId: buyer.id, note: reason || undefined }, { cancelReason: reason || null });
      return "released" as const;
    }
    if (booking.status !== "paid" && booking.status !== "accepted") throw new BookingRuleError("This booking can no longer be cancelled.", 409);
    const refund = refundFor({ by: "buyer", status: booking.status, feeMinor: booking.feeMinor, startsAt: booking.startsAt, at: now });
    await transition(tx, booking, "cancelled", { kind: refund.rule, actorId: buyer.id, note: reason || undefined }, { cancelReason: reason || null, refundDueMinor: refund.amountMinor });
    return "cancelled" as const;
  });
  if (outcome === "released") {
    // End the session too, so the released slot cannot be paid for afterwards; a late payment would be refunded anyway.
    const [released] = await db.select({ sessionId: bookings.checkoutSessionId }).from(bookings).where(eq(bookings.id, bookingId));
    if (released?.sessionId) await expireCheckoutSession(released.sessionId).catch((error: unknown) => console.warn(`[inspections] could not expire ${released.sessionId}: ${String(error)}`));
  }
  if (outcome === "cancelled") {
    await notify(db, [{ bookingId, notice: { kind: "cancelled_by_buyer", reason } }]);
    await refundAfterCommit(db, bookingId, buyer.id);
  }
  return outcome;
}

/** The order refund states move in; a state never moves back (events may arrive in any order). */
const refundStateRank: Record<RefundStatus, number> = { requested: 0, pending: 1, succeeded: 2, failed: 3, canceled: 3 };

export type RefundEffects = { reverseShare: boolean; failed: Array<{ amountMinor: number; reason: string }> };

/**
 * Moves one refund record to the state Stripe reports, if that is further on. A refund that fails gives its
 * amount back to what is owed and refundable (staff decide what next); one that succeeds cuts the
 * inspector's share. Runs inside the caller's transaction, with the booking's row locked.
 */
export async function applyRefundState(
  tx: Transaction,
  booking: Booking,
  record: typeof bookingRefunds.$inferSelect,
  refund: Pick<RefundSummary, "id" | "status" | "failureReason">,
  effects: RefundEffects,
  stripeEventId?: string,
): Promise<boolean> {
  const to: RefundStatus = refund.status;
  const idChanged = record.stripeRefundId !== refund.id;
  if (refundStateRank[to] <= refundStateRank[record.status]) {
    if (idChanged && !record.stripeRefundId && refund.id.startsWith("re_")) await tx.update(bookingRefunds).set({ stripeRefundId: refund.id }).where(eq(bookingRefunds.id, record.id));
    return false;
  }
  await tx
    .update(bookingRefunds)
    .set({ stripeRefundId: refund.id.startsWith("re_") ? refund.id : record.stripeRefundId, status: to, failureReason: refund.failureReason, updatedAt: new Date() })
    .where(eq(bookingRefunds.id, record.id));
  if (to === "succeeded") {
    effects.reverseShare = true;
    await logBookingEvent(tx, booking.id, { kind: "refund_succeeded", stripeEventId, note: `Refund ${refund.id}` });
  } else if (to === "pending") {
    await logBookingEvent(tx, booking.id, { kind: "refund_pending", stripeEventId, note: `Refund ${refund.id} is pending.` });
  } else {
    // failed or canceled: the money did not reach the buyer; it is owed again, by a person's decision.
    await tx
      .update(bookings)
      .set({ refundedMinor: sql`${bookings.refundedMinor} - ${record.amountMinor}`, refundDueMinor: sql`greatest(coalesce(${bookings.refundDueMinor}, 0) - ${record.amountMinor}, 0)`, updatedAt: new Date() })
      .where(eq(bookings.id, booking.id));
    const reason = refund.failureReason ?? to;
    await logBookingEvent(tx, booking.id, { kind: "refund_failed", stripeEventId, note: `Refund ${refund.id} ${to}: ${reason}. Staff notified.` });
    effects.failed.push({ amountMinor: record.amountMinor, reason });
  }
  return true;
}

/** After the commit: the share cut for refunds that succeeded, and people told of those that failed. */
export async function afterRefundStates(db: Database, bookingId: string, effects: RefundEffects) {
  if (effects.reverseShare) {
    try {
      await reverseShareForRefunds(db, bookingId);
    } catch (error) {
      console.warn(`[inspections] share reversal of booking ${bookingId} queued for retry: ${error instanceof Error ? error.message : String(error)}`);
      await enqueue(REVERSAL_QUEUE, { bookingId }, { singletonKey: bookingId });
    }
  }
  for (const failure of effects.failed) await notify(db, [{ bookingId, notice: { kind: "refund_failed", amountMinor: failure.amountMinor, reason: failure.reason } }]);
}

/**
 * Issues what is still owed (refund due less refunded so far). The refund's record is written first, with the
 * amount counted as refunded so that no other settler refunds it again; Stripe is then asked with the
 * record's id as idempotency key, so a retry (by the queue, after Stripe was unreachable) repeats this
 * refund and never makes a second. Returns the amount asked for now (0 if nothing was owed).
 */
export async function settleRefund(db: Database, bookingId: string, actorId: string | null, rule?: RefundRule): Promise<number> {
  const pending = await db.transaction(async (tx) => {
    const booking = await lockBooking(tx, bookingId);
    if (!booking) throw new BookingRuleError("No such booking.", 404);
    const waiting = await tx.select().from(bookingRefunds).where(and(eq(bookingRefunds.bookingId, bookingId), eq(bookingRefunds.status, "requested")));
    const owed = (booking.refundDueMinor ?? 0) - booking.refundedMinor;
    if (owed > 0 && booking.paymentIntentId) {
      const history = await tx.select({ kind: bookingEvents.kind }).from(bookingEvents).where(eq(bookingEvents.bookingId, bookingId)).orderBy(desc(bookingEvents.createdAt));
      const appliedRule = rule ?? history.find((event) => event.kind in ruleKinds)?.kind ?? "admin";
      const [record] = await tx
        .insert(bookingRefunds)
        .values({ bookingId, amountMinor: owed, currency: booking.currency, reason: booking.declineReason ?? booking.cancelReason ?? "", rule: appliedRule, issuedBy: actorId })
        .returning();
      await tx.update(bookings).set({ refundedMinor: booking.refundedMinor + owed, updatedAt: new Date() }).where(eq(bookings.id, bookingId));
      waiting.push(record!);
    }
    return { paymentIntentId: booking.paymentIntentId, waiting };
  });
  let asked = 0;
  for (const record of pending.waiting) {
    let refund: RefundSummary;
    try {
      refund = await refundPayment({ paymentIntentId: pending.paymentIntentId!, amountMinor: record.amountMinor, reason: record.reason || "requested_by_customer", bookingId, refundRecordId: record.id });
    } catch (error) {
      if (!(error instanceof PaymentsRejectedError)) throw error;
      // Stripe refused this refund as asked (e.g. nothing left to refund): it will not succeed on a retry.
      refund = { id: `refused:${record.id}`, amountMinor: record.amountMinor, currency: record.currency, status: "failed", failureReason: error.message, paymentIntentId: pending.paymentIntentId, bookingId };
    }
    const effects: RefundEffects = { reverseShare: false, failed: [] };
    await db.transaction(async (tx) => {
      const booking = (await lockBooking(tx, bookingId))!;
      const [current] = await tx.select().from(bookingRefunds).where(eq(bookingRefunds.id, record.id));
      const issued = refund.status !== "failed" && refund.status !== "canceled";
      if (current!.status === "requested") {
        await tx.update(bookingRefunds).set({ status: "pending", stripeRefundId: refund.id.startsWith("re_") ? refund.id : null, updatedAt: new Date() }).where(eq(bookingRefunds.id, record.id));
      }
      const [fresh] = await tx.select().from(bookingRefunds).where(eq(bookingRefunds.id, record.id));
      if (refund.status !== "pending") await applyRefundState(tx, booking, fresh!, refund, effects);
      if (!issued) return;
      const note = `Refund ${refund.id}`;
      if (booking.status === "declined" || booking.status === "cancelled") {
        await transition(tx, booking, "refunded", { kind: "refund_issued", actorId, note });
      } else {
        const [logged] = await tx.select({ id: bookingEvents.id }).from(bookingEvents).where(and(eq(bookingEvents.bookingId, bookingId), eq(bookingEvents.kind, "refund_issued"), eq(bookingEvents.note, note)));
        if (!logged) await logBookingEvent(tx, bookingId, { kind: "refund_issued", actorId, note });
      }
    });
    if (refund.status !== "failed" && refund.status !== "canceled") {
      asked += record.amountMinor;
      await notify(db, [{ bookingId, notice: { kind: "refunded", amountMinor: record.amountMinor, pending: refund.status === "pending", refundId: record.id } }]);
    }
    await afterRefundStates(db, bookingId, effects);
  }
  return asked;
}

const ruleKinds: Record<string, true> = {
  inspector_declined: true,
  inspector_cancelled: true,
  before_acceptance: true,
  ample_notice: true,
  short_notice: true,
  late_notice: true,
  slot_lost: true,
  admin: true,
};

/**
 * An admin refunds part or all of what was paid and not yet refunded, with a written reason. If Stripe is
 * unreachable the refund waits in the queue (its record is kept) and is sent when Stripe answers again.
 */
export async function refundAsAdmin(db: Database, admin: Person, bookingId: string, amountMinor: number, reason: string): Promise<{ issuedMinor: number; queued: boolean }> {
  await db.transaction(async (tx) => {
    const booking = await lockBooking(tx, bookingId);
    if (!booking) throw new BookingRuleError("No such booking.", 404);
    if (!booking.paymentIntentId || !booking.paidAt) throw new BookingRuleError("Nothing was paid for this booking.", 409);
    const refundable = booking.feeMinor - booking.refundedMinor;
    if (amountMinor > refundable) throw new BookingRuleError(`At most ${(refundable / 100).toFixed(2)} can still be refunded.`, 422, "amount");
    await tx.update(bookings).set({ refundDueMinor: booking.refundedMinor + amountMinor, cancelReason: booking.cancelReason ?? reason }).where(eq(bookings.id, bookingId));
    await logBookingEvent(tx, bookingId, { kind: "admin_refund_ordered", actorId: admin.id, note: reason });
  });
  try {
    return { issuedMinor: await settleRefund(db, bookingId, admin.id, "admin"), queued: false };
  } catch (error) {
    if (!(error instanceof PaymentsUnavailableError)) throw error;
    await enqueue(SETTLE_REFUND_QUEUE, { bookingId, actorId: admin.id }, { singletonKey: bookingId });
    return { issuedMinor: 0, queued: true };
  }
}

/** The reports domain calls this when the inspector signs the report of an accepted booking; the payout follows. */
export async function recordReportFiled(db: Database, input: { bookingId: string; reportId: string; inspectorId: string }) {
  const filed = await db.transaction(async (tx) => {
    const booking = await lockBooking(tx, input.bookingId);
    if (!booking || booking.inspectorId !== input.inspectorId) throw new BookingRuleError("No such booking of yours.", 404);
    if (booking.status === "report_filed" || booking.status === "closed") return false;
    if (booking.status !== "accepted") throw new BookingRuleError("A report can only be filed for an accepted booking.", 409);
    return transition(tx, booking, "report_filed", { kind: "report_filed", actorId: input.inspectorId }, { reportId: input.reportId });
  });
  if (filed) await enqueue(PAYOUT_QUEUE, { bookingId: input.bookingId }, { singletonKey: input.bookingId });
}

/** Every booking that took money, with its refunds and payout, newest first, for the admin's payments page. */
export async function listPayments(db: Executor) {
  const rows = await bookingSummaryQuery(db).where(isNotNull(bookings.paidAt)).orderBy(desc(bookings.paidAt)).limit(200);
  const ids = rows.map((row) => row.booking.id);
  const refunds = ids.length ? await db.select().from(bookingRefunds).where(inArray(bookingRefunds.bookingId, ids)).orderBy(asc(bookingRefunds.createdAt)) : [];
  const shares = ids.length ? await db.select().from(payouts).where(inArray(payouts.bookingId, ids)) : [];
  const reversals = shares.length ? await db.select().from(payoutReversals).where(inArray(payoutReversals.payoutId, shares.map((share) => share.id))) : [];

  // Every movement of money, dated, for the per-booking list and the monthly totals.
  type Movement = { bookingId: string; at: Date; kind: "paid" | "refunded" | "refund_pending" | "refund_failed" | "transferred" | "reversed"; amountMinor: number; currency: string; ref: string | null };
  const movements: Movement[] = [];
  for (const { booking } of rows) movements.push({ bookingId: booking.id, at: booking.paidAt!, kind: "paid", amountMinor: booking.feeMinor, currency: booking.currency, ref: booking.paymentIntentId });
  for (const refund of refunds) {
    const kind = refund.status === "succeeded" ? "refunded" : refund.status === "failed" || refund.status === "canceled" ? "refund_failed" : "refund_pending";
    movements.push({ bookingId: refund.bookingId, at: refund.createdAt, kind, amountMinor: refund.amountMinor, currency: refund.currency, ref: refund.stripeRefundId });
  }
  for (const share of shares) {
    if (share.status === "transferred" && share.transferredMinor > 0) {
      movements.push({ bookingId: share.bookingId, at: share.transferredAt ?? share.updatedAt, kind: "transferred", amountMinor: share.transferredMinor, currency: share.currency, ref: share.stripeTransferId });
    }
  }
  for (const reversal of reversals) {
    const share = shares.find((candidate) => candidate.id === reversal.payoutId)!;
    if (reversal.stripeReversalId) movements.push({ bookingId: share.bookingId, at: reversal.updatedAt, kind: "reversed", amountMinor: reversal.amountMinor, currency: reversal.currency, ref: reversal.stripeReversalId });
  }
  movements.sort((a, b) => a.at.getTime() - b.at.getTime());

  type Totals = { paid: number; platform: number; refunded: number; refundsOpen: number; paidOut: number; reversed: number; held: number };
  const empty = (): Totals => ({ paid: 0, platform: 0, refunded: 0, refundsOpen: 0, paidOut: 0, reversed: 0, held: 0 });
  const totals = new Map<string, Totals>();
  const monthly = new Map<string, Totals & { month: string; currency: string }>();
  for (const movement of movements) {
    const all = totals.get(movement.currency) ?? empty();
    totals.set(movement.currency, all);
    const key = `${movement.at.toISOString().slice(0, 7)} ${movement.currency}`;
    const month = monthly.get(key) ?? { ...empty(), month: movement.at.toISOString().slice(0, 7), currency: movement.currency };
    monthly.set(key, month);
    for (const sum of [all, month]) {
      if (movement.kind === "paid") sum.paid += movement.amountMinor;
      else if (movement.kind === "refunded") sum.refunded += movement.amountMinor;
      else if (movement.kind === "refund_pending") sum.refundsOpen += movement.amountMinor;
      else if (movement.kind === "transferred") sum.paidOut += movement.amountMinor;
      else if (movement.kind === "reversed") sum.reversed += movement.amountMinor;
    }
  }
  for (const { booking } of rows) totals.get(booking.currency)!.platform += booking.platformFeeMinor;
  for (const share of shares) {
    if (share.status !== "transferred") totals.get(share.currency)!.held += share.amountMinor - share.reversedMinor;
  }
  return {
    rows: rows.map((row) => ({
      ...row,
      refunds: refunds.filter((refund) => refund.bookingId === row.booking.id),
      payout: shares.find((share) => share.bookingId === row.booking.id) ?? null,
      movements: movements.filter((movement) => movement.bookingId === row.booking.id),
    })),
    totals: [...totals.entries()].map(([currency, total]) => ({ currency, ...total })),
    monthly: [...monthly.values()].sort((a, b) => b.month.localeCompare(a.month) || a.currency.localeCompare(b.currency)),
    attention: {
      failedRefunds: refunds.filter((refund) => refund.status === "failed" || refund.status === "canceled").length,
      failedPayouts: shares.filter((share) => share.status === "failed").length,
      unclaimedShares: shares.filter((share) => share.status === "unclaimed").length,
    },
  };
}

/** Whether this inspector has an accepted or completed booking on this listing (their standing to record its rebuild). */
export async function hasVisitToListing(db: Executor, inspectorId: string, listingId: string) {
  const [row] = await db
    .select({ id: bookings.id })
    .from(bookings)
    .where(and(eq(bookings.inspectorId, inspectorId), eq(bookings.listingId, listingId), inArray(bookings.status, [...VISIT_TAKEN_ON])))
    .limit(1);
  return Boolean(row);
}

/**
 * The listing of an inspector's own booking whose visit is taken on, for the way from the booking to its rebuild
 * record (the booking page carries the booking's id only, never the listing's); null for any other booking.
 */
export async function listingOfVisit(db: Executor, inspectorId: string, bookingId: string): Promise<string | null> {
  if (!z.uuid().safeParse(bookingId).success) return null;
  const [row] = await db
    .select({ listingId: bookings.listingId })
    .from(bookings)
    .where(and(eq(bookings.id, bookingId), eq(bookings.inspectorId, inspectorId), inArray(bookings.status, [...VISIT_TAKEN_ON])));
  return row?.listingId ?? null;
}

/** Whether this person is a certified inspector (holds the role an admin grants). */
export async function isCertifiedInspector(db: Executor, userId: string) {
  const [row] = await db.select().from(userRole).where(and(eq(userRole.userId, userId), eq(userRole.role, "inspector")));
  return Boolean(row);
}

/** The queue workers of this domain; declared with the others in ~/modules/jobs/workers.server. */
export function declareInspectionWorkers(getDb: () => Database) {
  registerWorker<{ bookingId: string; actorId: string | null }>(SETTLE_REFUND_QUEUE, async ({ bookingId, actorId }) => {
    await settleRefund(getDb(), bookingId, actorId);
  });
  // The dead-letter queue first: pg-boss requires it to exist before the queue that names it.
  registerWorker<{ bookingId: string }>(PAYOUT_FAILED_QUEUE, async ({ bookingId }) => {
    await recordPayoutFailure(getDb(), bookingId, null);
  });
  registerWorker<{ bookingId: string }>(PAYOUT_QUEUE, async ({ bookingId }) => {
    if (!bookingId) return;
    await payInspector(getDb(), bookingId);
  });
  registerWorker<{ bookingId: string }>(REVERSAL_QUEUE, async ({ bookingId }) => {
    await reverseShareForRefunds(getDb(), bookingId);
  });
  registerWorker(HELD_REVIEW_QUEUE, async () => {
    await reviewHeldShares(getDb());
  }, undefined, { cron: "17 6 * * *" });
}

/** Each listing's latest booking status (by when it was made), for the seller's dashboard; no buyer or inspector detail. */
export async function latestBookingStatusOfListings(db: Database, listingIds: string[]) {
  const found = new Map<string, BookingStatus>();
  if (!listingIds.length) return found;
  const rows = await db
    .selectDistinctOn([bookings.listingId], { listingId: bookings.listingId, status: bookings.status })
    .from(bookings)
    .where(inArray(bookings.listingId, listingIds))
    .orderBy(bookings.listingId, desc(bookings.createdAt));
  for (const row of rows) found.set(row.listingId, row.status);
  return found;
}
