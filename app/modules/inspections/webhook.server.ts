// Stripe's verified events applied to bookings. Each event id is written to processed_webhook_events in
// the same transaction as the change it causes, so a replay changes nothing; the booking's row is locked, so
// events for one booking apply one at a time; and every rule only ever moves a booking forward, so events
// arriving out of order reach the same end state.
import { eq, or } from "drizzle-orm";
import type Stripe from "stripe";
import type { Database } from "~/db/client.server";
import { enqueue } from "~/modules/jobs/queue.server";
import { summariseRefund } from "~/modules/payments/stripe.server";
import { afterRefundStates, applyRefundState, logBookingEvent, notify, SETTLE_REFUND_QUEUE, transition, type Booking, type RefundEffects } from "./bookings.server";
import { isExclusionViolation } from "./errors";
import type { BookingNotice } from "./notices.server";
import { afterAccountUpdated, applyAccountUpdated } from "./payouts.server";
import { refundFor } from "./rules";
import { bookingRefunds, bookings, processedWebhookEvents } from "./schema";

type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

export type WebhookOutcome = "duplicate" | "ignored" | "no_booking" | "applied" | "no_change";

type Target = { sessionId?: string; bookingId?: string };

function metadataBookingId(metadata: Stripe.Metadata | null | undefined): string | undefined {
  return metadata?.booking_id ?? metadata?.bookingId ?? undefined;
}

function targetOf(event: Stripe.Event): Target | null {
  switch (event.type) {
    case "checkout.session.completed":
    case "checkout.session.async_payment_succeeded":
    case "checkout.session.async_payment_failed":
    case "checkout.session.expired": {
      const session = event.data.object;
      return { sessionId: session.id, bookingId: metadataBookingId(session.metadata) ?? session.client_reference_id ?? undefined };
    }
    case "payment_intent.succeeded":
    case "payment_intent.payment_failed":
      return { bookingId: metadataBookingId(event.data.object.metadata) };
    case "charge.refunded":
    case "charge.succeeded":
      return { bookingId: metadataBookingId(event.data.object.metadata) };
    case "refund.created":
    case "refund.updated":
    case "refund.failed":
    case "charge.refund.updated":
      return { bookingId: metadataBookingId(event.data.object.metadata) };
    default:
      return null;
  }
}

async function findBooking(tx: Transaction, target: Target): Promise<Booking | undefined> {
  if (target.sessionId) {
    const [bySession] = await tx.select().from(bookings).where(eq(bookings.checkoutSessionId, target.sessionId)).for("update");
    if (bySession) return bySession;
  }
  // The id is a uuid; anything else in the metadata cannot name one of ours.
  if (target.bookingId && /^[0-9a-f-]{36}$/i.test(target.bookingId)) {
    const [byId] = await tx.select().from(bookings).where(eq(bookings.id, target.bookingId)).for("update");
    return byId;
  }
  return undefined;
}

type Effects = { notices: BookingNotice[]; refund: boolean; refunds: RefundEffects };

/** Money arrived for the booking: awaiting payment becomes paid; a hold released meanwhile is taken again if the time is still free. */
async function applyPayment(tx: Transaction, booking: Booking, eventId: string, payment: { paymentIntentId: string | null; amountMinor: number; currency: string }, effects: Effects) {
  if (payment.amountMinor !== booking.feeMinor || payment.currency.toLowerCase() !== booking.currency.toLowerCase()) {
    await logBookingEvent(tx, booking.id, {
      kind: "payment_mismatch",
      stripeEventId: eventId,
      note: `Paid ${payment.amountMinor} ${payment.currency}, expected ${booking.feeMinor} ${booking.currency}; left for an admin.`,
    });
    return false;
  }
  const set = { paymentIntentId: booking.paymentIntentId ?? payment.paymentIntentId, paidAt: booking.paidAt ?? new Date(), paymentProcessingSince: null };
  if (booking.status === "awaiting_payment") {
    await transition(tx, booking, "paid", { kind: "payment_received", stripeEventId: eventId }, set);
    effects.notices.push({ kind: "paid" });
    return true;
  }
  if (booking.status === "expired" || (booking.status === "cancelled" && !booking.paidAt)) {
    // The slot was released before the money came; take it back under the constraint, or refund in full.
    try {
      await tx.transaction((savepoint) => transition(savepoint, booking, "paid", { kind: "payment_received_late", stripeEventId: eventId }, set));
      effects.notices.push({ kind: "paid" });
    } catch (error) {
      if (!isExclusionViolation(error)) throw error;
      const refund = refundFor({ by: "system", status: booking.status, feeMinor: booking.feeMinor, startsAt: booking.startsAt, at: new Date() });
      await tx.update(bookings).set({ ...set, refundDueMinor: refund.amountMinor, updatedAt: new Date() }).where(eq(bookings.id, booking.id));
      await logBookingEvent(tx, booking.id, { kind: "slot_lost", stripeEventId: eventId, note: "Paid after the slot went to another booking; refunded in full." });
      if (booking.status === "expired") await transition(tx, { ...booking }, "cancelled", { kind: "slot_lost", stripeEventId: eventId });
      effects.notices.push({ kind: "slot_lost" });
      effects.refund = true;
    }
    return true;
  }
  // Already paid (the other of completed/succeeded came first) or further on: nothing to do.
  if (!booking.paymentIntentId && payment.paymentIntentId) {
    await tx.update(bookings).set({ paymentIntentId: payment.paymentIntentId }).where(eq(bookings.id, booking.id));
  }
  return false;
}

async function apply(tx: Transaction, event: Stripe.Event, booking: Booking, effects: Effects): Promise<boolean> {
  switch (event.type) {
    case "checkout.session.completed":
    case "checkout.session.async_payment_succeeded": {
      const session = event.data.object;
      if (session.payment_status !== "paid") {
        // A method that settles later (a bank debit): the slot stays held while it processes (docs/decisions/payment-processing.md).
        await logBookingEvent(tx, booking.id, { kind: "payment_pending", stripeEventId: event.id, note: "Checkout finished; the payment is still being processed." });
        if (booking.status !== "awaiting_payment" || booking.paymentProcessingSince) return false;
        const paymentIntentId = typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null);
        await tx.update(bookings).set({ paymentProcessingSince: new Date(), paymentIntentId: booking.paymentIntentId ?? paymentIntentId, updatedAt: new Date() }).where(eq(bookings.id, booking.id));
        effects.notices.push({ kind: "payment_processing" });
        return true;
      }
      const paymentIntentId = typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null);
      return applyPayment(tx, booking, event.id, { paymentIntentId, amountMinor: session.amount_total ?? 0, currency: session.currency ?? "" }, effects);
    }
    case "payment_intent.succeeded": {
      const intent = event.data.object;
      const chargeId = typeof intent.latest_charge === "string" ? intent.latest_charge : (intent.latest_charge?.id ?? null);
      if (chargeId && !booking.chargeId) await tx.update(bookings).set({ chargeId }).where(eq(bookings.id, booking.id));
      return applyPayment(tx, booking, event.id, { paymentIntentId: intent.id, amountMinor: intent.amount_received, currency: intent.currency }, effects);
    }
    case "charge.succeeded": {
      const charge = event.data.object;
      if (!booking.chargeId && (!booking.paymentIntentId || booking.paymentIntentId === charge.payment_intent)) {
        await tx.update(bookings).set({ chargeId: charge.id }).where(eq(bookings.id, booking.id));
      }
      return false;
    }
    case "refund.created":
    case "refund.updated":
    case "refund.failed":
    case "charge.refund.updated": {
      const refund = event.data.object;
      const recordId = refund.metadata?.refund_record;
      const [record] = await tx
        .select()
        .from(bookingRefunds)
        .where(recordId && /^[0-9a-f-]{36}$/i.test(recordId) ? or(eq(bookingRefunds.stripeRefundId, refund.id), eq(bookingRefunds.id, recordId)) : eq(bookingRefunds.stripeRefundId, refund.id));
      if (!record || record.bookingId !== booking.id) return false;
      return applyRefundState(tx, booking, record, summariseRefund(refund), effects.refunds, event.id);
    }
    case "checkout.session.expired":
      if (booking.status !== "awaiting_payment") return false;
      await transition(tx, booking, "expired", { kind: "checkout_expired", stripeEventId: event.id });
      effects.notices.push({ kind: "expired" });
      return true;
    case "checkout.session.async_payment_failed":
      if (booking.status === "awaiting_payment" && booking.paymentProcessingSince) {
        // The bank debit did not pay: the slot goes back, and the buyer hears why (not "expired").
        await transition(tx, booking, "cancelled", { kind: "payment_failed", stripeEventId: event.id, note: "The bank debit failed." }, { paymentProcessingSince: null });
        effects.notices.push({ kind: "payment_failed" });
        return true;
      }
      await logBookingEvent(tx, booking.id, { kind: "payment_failed", stripeEventId: event.id, note: "The payment failed." });
      return false;
    case "payment_intent.payment_failed": {
      // A declined card leaves the booking unpaid; the buyer may try another card until the session lapses.
      const message =
        event.type === "payment_intent.payment_failed" ? (event.data.object.last_payment_error?.message ?? "The card was declined.") : "The payment failed.";
      await logBookingEvent(tx, booking.id, { kind: "payment_failed", stripeEventId: event.id, note: message });
      return false;
    }
    case "charge.refunded":
      await logBookingEvent(tx, booking.id, { kind: "refund_confirmed", stripeEventId: event.id, note: `Stripe reports ${event.data.object.amount_refunded} refunded in all.` });
      return false;
    default:
      return false;
  }
}

/** Applies one verified event; safe to call any number of times, concurrently, in any order. */
export async function handleStripeEvent(db: Database, event: Stripe.Event): Promise<{ outcome: WebhookOutcome; bookingId?: string }> {
  const target = targetOf(event);
  const effects: Effects = { notices: [], refund: false, refunds: { reverseShare: false, failed: [] } };
  let releaseFor: string | null = null;
  const result = await db.transaction(async (tx) => {
    // A concurrent copy of this event waits on the primary key here until the first one commits, then skips.
    const claimed = await tx
      .insert(processedWebhookEvents)
      .values({ eventId: event.id, type: event.type, outcome: "pending" })
      .onConflictDoNothing()
      .returning({ eventId: processedWebhookEvents.eventId });
    if (!claimed.length) return { outcome: "duplicate" as const };
    const record = (outcome: WebhookOutcome, bookingId?: string) =>
      tx.update(processedWebhookEvents).set({ outcome, bookingId }).where(eq(processedWebhookEvents.eventId, event.id));
    if (event.type === "account.updated") {
      // The inspector's connected account: its state on our side; an older event than the stored state changes nothing.
      const applied = await applyAccountUpdated(tx, event.data.object, event.created);
      releaseFor = applied.releaseFor;
      await record(applied.changed ? "applied" : "no_change");
      return { outcome: applied.changed ? ("applied" as const) : ("no_change" as const) };
    }
    if (!target) {
      await record("ignored");
      return { outcome: "ignored" as const };
    }
    const booking = await findBooking(tx, target);
    if (!booking) {
      await record("no_booking");
      return { outcome: "no_booking" as const };
    }
    const changed = await apply(tx, event, booking, effects);
    const outcome = changed ? ("applied" as const) : ("no_change" as const);
    await record(outcome, booking.id);
    return { outcome, bookingId: booking.id };
  });
  if (result.bookingId) {
    // After the commit: mail and refunds go through the queue, so the answer to Stripe stays quick.
    await notify(db, effects.notices.map((notice) => ({ bookingId: result.bookingId!, notice })));
    if (effects.refund) await enqueue(SETTLE_REFUND_QUEUE, { bookingId: result.bookingId, actorId: null }, { singletonKey: result.bookingId });
    await afterRefundStates(db, result.bookingId, effects.refunds);
  }
  await afterAccountUpdated(db, releaseFor);
  return result;
}
