// Paying inspectors through Stripe Connect: the inspector's Express account and its onboarding, the share
// of each booking (held until the account can receive transfers, then transferred once, tied to the
// booking's charge), the share taken back in proportion when the buyer is refunded, and the staff alert
// when a transfer finally fails.
import { and, asc, eq, inArray, lt } from "drizzle-orm";
import type Stripe from "stripe";
import type { Database } from "~/db/client.server";
import { env } from "~/env.server";
import { enqueue } from "~/modules/jobs/queue.server";
import {
  createOnboardingLink,
  createPayoutAccount,
  recordTransfer,
  retrievePayment,
  retrievePayoutAccount,
  reverseTransfer,
  summariseAccount,
  type PayoutAccountState,
} from "~/modules/payments/stripe.server";
import { BookingRuleError } from "./errors";
import { ledgerTotals, statementMonths, type LedgerEntry } from "./ledger";
import { sendBookingNotice } from "./notices.server";
import type { Executor } from "./profiles.server";
import { bookingEvents, bookingRefunds, bookings, payoutAccounts, payoutReversals, payouts } from "./schema";

type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

export const PAYOUT_QUEUE = "inspections.payout";
/** Where pg-boss moves a payout job whose retries are spent: the staff are told and the share marked failed. */
export const PAYOUT_FAILED_QUEUE = "inspections.payout-failed";
export const REVERSAL_QUEUE = "inspections.share-reversal";
export const HELD_REVIEW_QUEUE = "inspections.held-shares-review";

/** Days a share may wait for its inspector's payout set-up before staff are asked to step in (docs/decisions/held-payouts.md). */
export const HELD_SHARE_DAYS = 90;

export type PayoutAccountView = typeof payoutAccounts.$inferSelect;

/** Whether Stripe will take a transfer to this account now. */
export function canReceiveTransfers(account: Pick<PayoutAccountView, "transfersCapability" | "payoutsEnabled"> | null | undefined): boolean {
  return Boolean(account && account.transfersCapability === "active" && account.payoutsEnabled);
}

/** Stripe's requirement names in plain words for the profile page. */
const requirementWords: Record<string, string> = {
  external_account: "a bank account for payouts",
  "individual.verification.document": "a photo of an identity document",
  "individual.dob.day": "your date of birth",
  "individual.first_name": "your first name",
  "individual.last_name": "your last name",
  "business_profile.url": "a website or profile address",
  "business_profile.mcc": "the kind of business",
  "tos_acceptance.date": "acceptance of the payment provider's terms",
};

export function describeRequirement(field: string): string {
  return requirementWords[field] ?? field.replace(/[._]/g, " ");
}

/** The account's state in plain words, for the inspector's profile and booking pages. */
export function payoutStateWords(account: PayoutAccountView | null | undefined): { ready: boolean; headline: string; missing: string[] } {
  if (!account) return { ready: false, headline: "Payouts are not set up yet. Your shares are held until you set them up.", missing: [] };
  const missing = account.requirementsDue.map(describeRequirement);
  if (canReceiveTransfers(account)) return { ready: true, headline: "Payouts are set up: your share of each booking is transferred when its report is filed.", missing };
  if (!account.detailsSubmitted) return { ready: false, headline: "Payout set-up was started but not finished. Your shares are held until it is.", missing };
  if (account.transfersCapability === "pending") return { ready: false, headline: "The payment provider is checking your details. Your shares are held until it has.", missing };
  return { ready: false, headline: "The payment provider still needs some details before it can pay you. Your shares are held until then.", missing };
}

export async function getPayoutAccount(db: Executor, userId: string): Promise<PayoutAccountView | null> {
  const [account] = await db.select().from(payoutAccounts).where(eq(payoutAccounts.userId, userId));
  return account ?? null;
}

const floorToSecond = (date: Date) => new Date(Math.floor(date.getTime() / 1000) * 1000);

/**
 * Writes the account's state unless a newer one is stored already (`asOf` is the event's `created`, or the
 * time of a fresh read). Returns whether it was written, and whether it made the account ready for transfers.
 */
async function storeAccountState(tx: Executor, state: PayoutAccountState, asOf: Date): Promise<{ written: boolean; becameReady: boolean; userId: string | null }> {
  const [current] = await tx.select().from(payoutAccounts).where(eq(payoutAccounts.stripeAccountId, state.accountId)).for("update");
  if (!current) return { written: false, becameReady: false, userId: null };
  if (current.stateAsOf > asOf) return { written: false, becameReady: false, userId: current.userId };
  await tx
    .update(payoutAccounts)
    .set({
      detailsSubmitted: state.detailsSubmitted,
      transfersCapability: state.transfersCapability,
      payoutsEnabled: state.payoutsEnabled,
      requirementsDue: state.requirementsDue,
      disabledReason: state.disabledReason,
      stateAsOf: asOf,
      updatedAt: new Date(),
    })
    .where(eq(payoutAccounts.userId, current.userId));
  const ready = canReceiveTransfers({ transfersCapability: state.transfersCapability, payoutsEnabled: state.payoutsEnabled });
  return { written: true, becameReady: ready && !canReceiveTransfers(current), userId: current.userId };
}

/** Every share of this inspector that waits for set-up goes to the payout queue. */
async function releaseHeldShares(db: Executor, inspectorId: string) {
  const held = await db
    .select({ bookingId: payouts.bookingId })
    .from(payouts)
    .where(and(eq(payouts.inspectorId, inspectorId), inArray(payouts.status, ["held", "unclaimed"])));
  // No singleton key: a payout job of this booking may be running right now and about to find it held.
  // Paying is idempotent (row locks, one transfer key per booking), so a second job is harmless.
  for (const { bookingId } of held) await enqueue(PAYOUT_QUEUE, { bookingId });
}

/**
 * "Set up payouts": makes the inspector's Express account once (the key is their id, so a retry after a
 * lost answer gets the same account) and returns the hosted onboarding link to send them to.
 */
export async function startPayoutOnboarding(db: Database, inspector: { id: string; email: string }): Promise<string> {
  let account = await getPayoutAccount(db, inspector.id);
  if (!account) {
    const created = await createPayoutAccount({ userId: inspector.id, email: inspector.email });
    await db
      .insert(payoutAccounts)
      .values({
        userId: inspector.id,
        stripeAccountId: created.accountId,
        detailsSubmitted: created.detailsSubmitted,
        transfersCapability: created.transfersCapability,
        payoutsEnabled: created.payoutsEnabled,
        requirementsDue: created.requirementsDue,
        disabledReason: created.disabledReason,
        stateAsOf: new Date(0),
      })
      .onConflictDoNothing();
    account = (await getPayoutAccount(db, inspector.id))!;
  }
  const origin = env().APP_ORIGIN;
  const link = await createOnboardingLink({
    accountId: account.stripeAccountId,
    returnUrl: `${origin}/inspector/payouts/return`,
    refreshUrl: `${origin}/inspector/payouts/refresh`,
  });
  return link.url;
}

/** Back from the hosted onboarding: read the account afresh (the webhook may still be on its way). */
export async function refreshPayoutAccount(db: Database, inspectorId: string): Promise<PayoutAccountView | null> {
  const account = await getPayoutAccount(db, inspectorId);
  if (!account) return null;
  const state = await retrievePayoutAccount(account.stripeAccountId);
  const result = await db.transaction((tx) => storeAccountState(tx, state, floorToSecond(new Date())));
  if (result.becameReady) await releaseHeldShares(db, inspectorId);
  return getPayoutAccount(db, inspectorId);
}

/** `account.updated`: keeps our copy of the account's state; an event older than the stored state changes nothing. */
export async function applyAccountUpdated(tx: Transaction, account: Stripe.Account, eventCreated: number): Promise<{ changed: boolean; releaseFor: string | null }> {
  const result = await storeAccountState(tx, summariseAccount(account), new Date(eventCreated * 1000));
  return { changed: result.written, releaseFor: result.becameReady ? result.userId : null };
}

export async function afterAccountUpdated(db: Database, releaseFor: string | null) {
  if (releaseFor) await releaseHeldShares(db, releaseFor);
}

// ── the share of a booking ─────────────────────────────────────────────────────────────────────────────

/**
 * The share still to take back for the booking's refunds so far: the whole share times the part of the fee
 * refunded, less what was taken back already (computed on the running total, so rounding never drifts).
 */
async function cutShareForRefunds(tx: Transaction, booking: typeof bookings.$inferSelect, payout: typeof payouts.$inferSelect) {
  const refunds = await tx
    .select()
    .from(bookingRefunds)
    .where(and(eq(bookingRefunds.bookingId, booking.id), eq(bookingRefunds.status, "succeeded")))
    .orderBy(asc(bookingRefunds.createdAt));
  const cut = await tx.select({ refundId: payoutReversals.refundId }).from(payoutReversals).where(eq(payoutReversals.payoutId, payout.id));
  const done = new Set(cut.map((row) => row.refundId));
  let refundedSoFar = refunds.filter((refund) => done.has(refund.id)).reduce((sum, refund) => sum + refund.amountMinor, 0);
  let reversed = payout.reversedMinor;
  const sentAlready = payout.status === "due" || payout.status === "transferred";
  let due = false;
  for (const refund of refunds) {
    if (done.has(refund.id)) continue;
    refundedSoFar += refund.amountMinor;
    const target = Math.min(payout.amountMinor, Math.round((payout.amountMinor * refundedSoFar) / booking.feeMinor));
    const amount = Math.max(0, target - reversed);
    reversed += amount;
    await tx.insert(payoutReversals).values({
      payoutId: payout.id,
      refundId: refund.id,
      amountMinor: amount,
      currency: payout.currency,
      // A share not transferred yet is simply transferred smaller; one already sent is reversed at Stripe.
      status: sentAlready && amount > 0 ? "due" : "done",
    });
    if (sentAlready && amount > 0) due = true;
  }
  if (reversed !== payout.reversedMinor) {
    await tx.update(payouts).set({ reversedMinor: reversed, updatedAt: new Date() }).where(eq(payouts.id, payout.id));
  }
  return { reversedMinor: reversed, reversalDue: due };
}

/** The refunds of a booking that succeeded: cut the share in proportion, and reverse transfers already made. */
export async function reverseShareForRefunds(db: Database, bookingId: string) {
  const due = await db.transaction(async (tx) => {
    const [booking] = await tx.select().from(bookings).where(eq(bookings.id, bookingId)).for("update");
    const [payout] = await tx.select().from(payouts).where(eq(payouts.bookingId, bookingId));
    if (!booking || !payout) return false;
    const { reversalDue } = await cutShareForRefunds(tx, booking, payout);
    return reversalDue;
  });
  if (due) await makeDueReversals(db, bookingId);
}

/** Sends each reversal still due at Stripe, once the transfer it takes from exists; keyed by the reversal's record. */
async function makeDueReversals(db: Database, bookingId: string) {
  const [payout] = await db.select().from(payouts).where(eq(payouts.bookingId, bookingId));
  if (!payout?.stripeTransferId || payout.status !== "transferred") return;
  const due = await db.select().from(payoutReversals).where(and(eq(payoutReversals.payoutId, payout.id), eq(payoutReversals.status, "due")));
  for (const reversal of due) {
    const made = await reverseTransfer({ transferId: payout.stripeTransferId, amountMinor: reversal.amountMinor, bookingId, reversalRecordId: reversal.id });
    await db.transaction(async (tx) => {
      await tx.update(payoutReversals).set({ status: "done", stripeReversalId: made.id, updatedAt: new Date() }).where(eq(payoutReversals.id, reversal.id));
      await tx.insert(bookingEvents).values({ bookingId, kind: "share_reversed", note: `Transfer reversal ${made.id} of ${made.amountMinor} after a refund.` });
    });
  }
}

/**
 * The report is filed: the inspector's share is owed. Held while their account cannot receive transfers;
 * otherwise transferred once (the key is the booking), tied to the booking's charge, so Stripe makes it
 * even while the charge's funds are pending. A failure throws, and the queue tries again.
 */
export async function payInspector(db: Database, bookingId: string): Promise<"held" | "transferred" | "nothing"> {
  const plan = await db.transaction(async (tx) => {
    const [booking] = await tx.select().from(bookings).where(eq(bookings.id, bookingId)).for("update");
    if (!booking || (booking.status !== "report_filed" && booking.status !== "closed")) return null;
    let [payout] = await tx.select().from(payouts).where(eq(payouts.bookingId, bookingId));
    if (!payout) {
      if (booking.status !== "report_filed") return null;
      [payout] = await tx
        .insert(payouts)
        .values({ bookingId, inspectorId: booking.inspectorId, amountMinor: booking.inspectorShareMinor, currency: booking.currency, status: "held", heldSince: new Date() })
        .returning();
    }
    if (payout!.status === "transferred") return { kind: "done" as const, booking, payout: payout! };
    const { reversedMinor } = await cutShareForRefunds(tx, booking, payout!);
    const net = payout!.amountMinor - reversedMinor;
    if (payout!.status !== "due") {
      const account = await getPayoutAccount(tx, booking.inspectorId);
      if (net <= 0) {
        await tx.update(payouts).set({ status: "transferred", transferredMinor: 0, transferredAt: new Date(), updatedAt: new Date() }).where(eq(payouts.id, payout!.id));
        await closeBooking(tx, booking, "Nothing left to transfer after refunds.");
        return { kind: "done" as const, booking, payout: payout! };
      }
      if (!canReceiveTransfers(account)) {
        const first = payout!.status !== "held" && payout!.status !== "unclaimed";
        if (payout!.status === "failed") await tx.update(payouts).set({ status: "held", heldSince: payout!.heldSince ?? new Date(), updatedAt: new Date() }).where(eq(payouts.id, payout!.id));
        const [logged] = await tx.select({ id: bookingEvents.id }).from(bookingEvents).where(and(eq(bookingEvents.bookingId, bookingId), eq(bookingEvents.kind, "share_held")));
        if (!logged) await tx.insert(bookingEvents).values({ bookingId, kind: "share_held", note: "The inspector's payout set-up is not finished; the share is held until it is." });
        return { kind: "held" as const, booking, payout: payout!, notify: first || !logged };
      }
      // From here on the transfer's amount and account are fixed: a retry sends exactly the same request.
      await tx
        .update(payouts)
        .set({ status: "due", destination: account!.stripeAccountId, transferredMinor: net, updatedAt: new Date() })
        .where(eq(payouts.id, payout!.id));
      payout = { ...payout!, status: "due", destination: account!.stripeAccountId, transferredMinor: net };
    }
    return { kind: "transfer" as const, booking, payout: payout! };
  });
  if (!plan) return "nothing";
  if (plan.kind === "held") {
    if (plan.notify) await sendBookingNotice(db, bookingId, { kind: "share_held", amountMinor: plan.payout.amountMinor });
    return "held";
  }
  if (plan.kind === "done") {
    await makeDueReversals(db, bookingId);
    return "nothing";
  }

  const { booking, payout } = plan;
  let transfer;
  try {
    let chargeId = booking.chargeId;
    if (!chargeId && booking.paymentIntentId) {
      chargeId = (await retrievePayment(booking.paymentIntentId)).latestChargeId;
      if (chargeId) await db.update(bookings).set({ chargeId }).where(eq(bookings.id, bookingId));
    }
    if (!chargeId) throw new Error(`booking ${bookingId} has no charge to tie its transfer to`);
    transfer = await recordTransfer({ amountMinor: payout.transferredMinor, currency: payout.currency, destination: payout.destination!, bookingId, sourceChargeId: chargeId });
  } catch (error) {
    await db.update(payouts).set({ lastError: error instanceof Error ? error.message : String(error), updatedAt: new Date() }).where(eq(payouts.id, payout.id));
    throw error;
  }
  await db.transaction(async (tx) => {
    await tx
      .update(payouts)
      .set({ status: "transferred", stripeTransferId: transfer.id, transferredAt: new Date(), lastError: null, updatedAt: new Date() })
      .where(eq(payouts.id, payout.id));
    const [current] = await tx.select().from(bookings).where(eq(bookings.id, bookingId)).for("update");
    if (current) await closeBooking(tx, current, `Transfer ${transfer.id}`);
  });
  await makeDueReversals(db, bookingId);
  await sendBookingNotice(db, bookingId, { kind: "payout", amountMinor: payout.transferredMinor });
  return "transferred";
}

async function closeBooking(tx: Transaction, booking: typeof bookings.$inferSelect, note: string) {
  if (booking.status !== "report_filed") {
    await tx.insert(bookingEvents).values({ bookingId: booking.id, kind: "payout_recorded", note });
    return;
  }
  await tx.update(bookings).set({ status: "closed", updatedAt: new Date() }).where(and(eq(bookings.id, booking.id), eq(bookings.status, "report_filed")));
  await tx.insert(bookingEvents).values({ bookingId: booking.id, kind: "payout_recorded", fromStatus: "report_filed", toStatus: "closed", note });
}

/** The queue gave up on a transfer: the share is marked failed, and staff and the inspector are told. */
export async function recordPayoutFailure(db: Database, bookingId: string, reason: string | null) {
  const failed = await db.transaction(async (tx) => {
    const [payout] = await tx.select().from(payouts).where(eq(payouts.bookingId, bookingId)).for("update");
    if (!payout || payout.status === "transferred" || payout.status === "failed") return null;
    const lastError = reason ?? payout.lastError ?? "The transfer could not be made.";
    // The amount and account stay as they were sent, so a later retry by staff repeats the same request.
    await tx.update(payouts).set({ status: "failed", lastError, updatedAt: new Date() }).where(eq(payouts.id, payout.id));
    await tx.insert(bookingEvents).values({ bookingId, kind: "payout_failed", note: lastError });
    return { ...payout, lastError };
  });
  if (failed) await sendBookingNotice(db, bookingId, { kind: "payout_failed", amountMinor: failed.amountMinor - failed.reversedMinor, reason: failed.lastError });
}

/** Staff try a failed transfer again (after fixing what stopped it). */
export async function retryFailedPayout(db: Database, bookingId: string) {
  const [payout] = await db.select().from(payouts).where(eq(payouts.bookingId, bookingId));
  if (!payout || payout.status !== "failed") throw new BookingRuleError("Only a failed transfer can be tried again.", 409);
  await db.update(payouts).set({ status: payout.stripeTransferId ? "transferred" : payout.destination ? "due" : "held", updatedAt: new Date() }).where(eq(payouts.id, payout.id));
  await enqueue(PAYOUT_QUEUE, { bookingId }, { singletonKey: bookingId });
}

/**
 * Daily: a share held for over 90 days becomes "unclaimed" — staff are told to reach the inspector, and the
 * inspector is reminded. It is never forfeited: it is still paid as soon as set-up is finished.
 */
export async function reviewHeldShares(db: Database, now = new Date()) {
  const cutoff = new Date(now.getTime() - HELD_SHARE_DAYS * 86_400_000);
  const overdue = await db
    .update(payouts)
    .set({ status: "unclaimed", updatedAt: now })
    .where(and(eq(payouts.status, "held"), lt(payouts.heldSince, cutoff)))
    .returning({ bookingId: payouts.bookingId, amountMinor: payouts.amountMinor, reversedMinor: payouts.reversedMinor });
  for (const share of overdue) {
    await db.insert(bookingEvents).values({ bookingId: share.bookingId, kind: "share_unclaimed", note: `Held for over ${HELD_SHARE_DAYS} days; staff told.` });
    await sendBookingNotice(db, share.bookingId, { kind: "share_unclaimed", amountMinor: share.amountMinor - share.reversedMinor });
  }
  return overdue.length;
}


// ── the inspector's earnings ───────────────────────────────────────────────────────────────────────────

/** The inspector's ledger: every movement of their shares, and each booking's money in one row. */
export async function listEarnings(db: Executor, inspectorId: string) {
  const rows = await db
    .select({ payout: payouts, reference: bookings.reference, feeMinor: bookings.feeMinor, platformFeeMinor: bookings.platformFeeMinor, bookingStatus: bookings.status })
    .from(payouts)
    .innerJoin(bookings, eq(bookings.id, payouts.bookingId))
    .where(eq(payouts.inspectorId, inspectorId))
    .orderBy(asc(payouts.createdAt));
  const reversals = rows.length
    ? await db.select().from(payoutReversals).where(inArray(payoutReversals.payoutId, rows.map((row) => row.payout.id))).orderBy(asc(payoutReversals.createdAt))
    : [];
  const entries: LedgerEntry[] = [];
  const perBooking = rows.map(({ payout, reference, feeMinor, platformFeeMinor }) => {
    const base = { bookingId: payout.bookingId, reference, currency: payout.currency };
    entries.push({ ...base, at: payout.createdAt, kind: "earned", amountMinor: payout.amountMinor });
    let heldReversed = 0;
    let transferReversed = 0;
    for (const reversal of reversals.filter((candidate) => candidate.payoutId === payout.id && candidate.amountMinor > 0)) {
      if (reversal.stripeReversalId) {
        transferReversed += reversal.amountMinor;
        entries.push({ ...base, at: reversal.updatedAt, kind: "transfer_reversed", amountMinor: reversal.amountMinor });
      } else if (reversal.status === "done") {
        heldReversed += reversal.amountMinor;
        entries.push({ ...base, at: reversal.createdAt, kind: "held_reversed", amountMinor: reversal.amountMinor });
      }
    }
    const transferred = payout.status === "transferred" ? payout.transferredMinor : 0;
    if (transferred > 0) entries.push({ ...base, at: payout.transferredAt ?? payout.updatedAt, kind: "transferred", amountMinor: transferred });
    return {
      bookingId: payout.bookingId,
      reference,
      currency: payout.currency,
      feeMinor,
      platformFeeMinor,
      earnedMinor: payout.amountMinor,
      heldMinor: payout.amountMinor - heldReversed - transferred,
      transferredMinor: transferred,
      reversedMinor: heldReversed + transferReversed,
      status: payout.status,
      heldSince: payout.heldSince,
      transferredAt: payout.transferredAt,
    };
  });
  return { entries, perBooking: perBooking.reverse(), totals: ledgerTotals(entries), months: statementMonths(entries) };
}

/** The share of one booking as its inspector (and staff) see it, with the inspector's set-up in plain words. */
export async function shareOfBooking(db: Executor, bookingId: string, inspectorId: string) {
  const [payout] = await db.select().from(payouts).where(eq(payouts.bookingId, bookingId));
  const words = payoutStateWords(await getPayoutAccount(db, inspectorId));
  return {
    setUp: words,
    share: payout
      ? { status: payout.status, earnedMinor: payout.amountMinor, takenBackMinor: payout.reversedMinor, transferredMinor: payout.status === "transferred" ? payout.transferredMinor : 0, currency: payout.currency }
      : null,
  };
}
