// Money that moves later or not at all, through the app against the payments stand-in: refunds keyed by
// their own record, refunds that pend or fail, bank debits that settle days later, inspectors' shares held
// until payout set-up, transfers tied to their charge, reversals after a refund, and the staff alerts.
// Stripe's behaviour assumed here is its published API (docs.stripe.com/api) and Connect guide to separate
// charges and transfers; the stand-in's controls stand for time passing at Stripe.
import { randomUUID } from "node:crypto";
import { addDays, addMinutes } from "date-fns";
import { eq, sql } from "drizzle-orm";
import Stripe from "stripe";
import { describe, expect, it } from "vitest";
import { acceptBooking, recordReportFiled, refundAsAdmin, releaseLapsedCheckouts } from "~/modules/inspections/bookings.server";
import { env } from "~/env.server";
import { getPayoutAccount, PAYOUT_QUEUE, payInspector, recordPayoutFailure, reviewHeldShares, startPayoutOnboarding } from "~/modules/inspections/payouts.server";
import { bookingEvents, bookingRefunds, payoutAccounts, payoutReversals, payouts } from "~/modules/inspections/schema";
import { createTestUser } from "../../support/accounts";
import { latestEmailTo } from "../../support/mailbox";
import { bookingRow, db, heldBooking, paidBooking, postWebhook, signedEvent, standInControl, until } from "../../support/inspections";

const payoutOf = async (bookingId: string) => (await db.select().from(payouts).where(eq(payouts.bookingId, bookingId)))[0];
const refundsOf = (bookingId: string) => db.select().from(bookingRefunds).where(eq(bookingRefunds.bookingId, bookingId)).orderBy(bookingRefunds.createdAt);

async function filedBooking(card?: string) {
  const held = await paidBooking(card);
  await acceptBooking(db, held.inspector, held.bookingId);
  await recordReportFiled(db, { bookingId: held.bookingId, reportId: randomUUID(), inspectorId: held.inspector.id });
  // Filing queues the payout job: wait for it, so that it cannot run over what the test sets next (it would put
  // a share the test marked failed back on hold).
  await until(async () => {
    const { rows } = await db.execute(
      sql`select state from ${sql.identifier(env().JOB_QUEUE_SCHEMA)}.job where name = ${PAYOUT_QUEUE} and data->>'bookingId' = ${held.bookingId}`,
    );
    return rows.length > 0 && rows.every((row) => row.state === "completed" || row.state === "failed");
  }, "the payout job queued by the filing", 20_000);
  return held;
}

/** The inspector goes through the stand-in's hosted onboarding page and picks how it ends. */
async function onboard(inspector: { id: string; email: string }, choice: "complete" | "requirements_due") {
  const url = await startPayoutOnboarding(db, inspector);
  const answer = await fetch(url, { method: "POST", body: new URLSearchParams({ choice }), redirect: "manual" });
  expect(answer.headers.get("location")).toMatch(/\/inspector\/payouts\/return$/);
  return (await getPayoutAccount(db, inspector.id))!;
}

describe("refunds keyed by their own record", () => {
  it("two equal partial refunds of one payment within a day both land", async () => {
    const held = await paidBooking();
    const admin = await createTestUser({ roles: ["admin"] });
    expect(await refundAsAdmin(db, admin, held.bookingId, 5_000, "Travel cut short")).toEqual({ issuedMinor: 5_000, queued: false });
    expect(await refundAsAdmin(db, admin, held.bookingId, 5_000, "Second part")).toEqual({ issuedMinor: 5_000, queued: false });
    const refunds = await refundsOf(held.bookingId);
    expect(refunds.map((refund) => [refund.amountMinor, refund.status])).toEqual([
      [5_000, "succeeded"],
      [5_000, "succeeded"],
    ]);
    expect(refunds[0]!.stripeRefundId).not.toBe(refunds[1]!.stripeRefundId);
    expect((await bookingRow(held.bookingId)).refundedMinor).toBe(10_000);
  });
});

describe("refunds that pend or fail", () => {
  it("pending, then succeeded: the buyer is told it is on its way, and the record follows Stripe", async () => {
    const held = await paidBooking("4000 0000 0000 7726");
    const admin = await createTestUser({ roles: ["admin"] });
    await refundAsAdmin(db, admin, held.bookingId, 10_000, "Part of the fee back");
    const [refund] = await refundsOf(held.bookingId);
    expect(refund).toMatchObject({ status: "pending", amountMinor: 10_000 });
    await latestEmailTo(held.buyer.email, { matching: (message) => /refund pending/.test(message.text) });
    await standInControl(`refunds/${refund!.stripeRefundId}/settle`);
    await until(async () => (await refundsOf(held.bookingId))[0]!.status === "succeeded", "refund.updated to succeeded");
  });

  it("pending, then failed: the amount is refundable again, the buyer and staff are told", async () => {
    const held = await paidBooking("4000 0000 0000 7726");
    const admin = await createTestUser({ roles: ["admin"] });
    await refundAsAdmin(db, admin, held.bookingId, 10_000, "Part of the fee back");
    const [refund] = await refundsOf(held.bookingId);
    await standInControl(`refunds/${refund!.stripeRefundId}/settle`, { outcome: "failed" });
    await until(async () => (await refundsOf(held.bookingId))[0]!.status === "failed", "refund.failed");
    expect((await refundsOf(held.bookingId))[0]!.failureReason).toBe("expired_or_canceled_card");
    expect((await bookingRow(held.bookingId)).refundedMinor).toBe(0);
    await latestEmailTo(held.buyer.email, { matching: (message) => /did not go through/.test(message.subject) });
    await latestEmailTo(admin.email, { matching: (message) => message.subject.startsWith("Refund failed for") && message.subject.includes(held.booking.reference) });
    // Replayed, the failure changes nothing twice.
    const events = await db.select().from(bookingEvents).where(eq(bookingEvents.bookingId, held.bookingId));
    expect(events.filter((event) => event.kind === "refund_failed")).toHaveLength(1);
  });
});

describe("a bank debit that settles days later", () => {
  async function debit(iban: string) {
    const held = await heldBooking();
    const paid = await standInControl(`sessions/${held.booking.checkoutSessionId}/pay-by-bank-debit`, { iban });
    expect(paid.status).toBe(200);
    await until(async () => (await bookingRow(held.bookingId)).paymentProcessingSince, "checkout.session.completed (unpaid)");
    return { ...held, intentId: paid.body.payment_intent.id as string };
  }

  it("keeps the slot held past the checkout's lapse while processing, then is paid", async () => {
    const held = await debit("DE89370400440532013000");
    expect((await bookingRow(held.bookingId)).status).toBe("awaiting_payment");
    await releaseLapsedCheckouts(db, held.inspector.id, addMinutes(new Date(), 90));
    expect((await bookingRow(held.bookingId)).status).toBe("awaiting_payment");
    await latestEmailTo(held.buyer.email, { matching: (message) => /payment is processing/.test(message.subject) });
    await standInControl(`payment_intents/${held.intentId}/settle`);
    await until(async () => (await bookingRow(held.bookingId)).status === "paid", "async_payment_succeeded");
    expect((await bookingRow(held.bookingId)).paymentProcessingSince).toBeNull();
  });

  it("fails: the slot is released and the buyer hears that the payment failed, not that it expired", async () => {
    const held = await debit("DE62370400440532013001");
    await standInControl(`payment_intents/${held.intentId}/settle`);
    await until(async () => (await bookingRow(held.bookingId)).status === "cancelled", "async_payment_failed");
    const mail = await latestEmailTo(held.buyer.email, { matching: (message) => /bank payment failed/.test(message.subject) });
    expect(mail.subject).not.toMatch(/not paid/);
  });
});

describe("the inspector's share", () => {
  it("is held before payout set-up (no transfer), and transferred, tied to its charge, once set-up completes", async () => {
    const held = await filedBooking();
    await payInspector(db, held.bookingId);
    expect(await payoutOf(held.bookingId)).toMatchObject({ status: "held", stripeTransferId: null });
    await latestEmailTo(held.inspector.email, { matching: (message) => /finish payout set-up/.test(message.subject) });

    // Set-up left with requirements due: still held.
    const due = await onboard(held.inspector, "requirements_due");
    await until(async () => (await getPayoutAccount(db, held.inspector.id))!.detailsSubmitted, "account.updated");
    expect((await getPayoutAccount(db, held.inspector.id))!.requirementsDue).toContain("individual.verification.document");
    expect(await payInspector(db, held.bookingId)).toBe("held");

    await standInControl(`accounts/${due.stripeAccountId}/state`, { state: "complete" });
    const paid = await until(async () => {
      const payout = await payoutOf(held.bookingId);
      return payout?.status === "transferred" ? payout : undefined;
    }, "the held share transferred after account.updated", 20_000);
    expect(paid).toMatchObject({ destination: due.stripeAccountId, transferredMinor: held.booking.inspectorShareMinor });
    expect((await bookingRow(held.bookingId)).status).toBe("closed");
    const transfer = await fetch(`${process.env.STRIPE_STAND_IN_URL}/v1/transfers/${paid.stripeTransferId}`, { headers: { authorization: `Bearer ${process.env.STRIPE_SECRET_KEY}` } }).then((response) => response.json());
    expect(transfer.source_transaction).toBe((await bookingRow(held.bookingId)).chargeId);
    expect(transfer.source_transaction).toMatch(/^ch_/);
  });

  it("a refund after the payout reverses the transfer in proportion, recorded on both sides", async () => {
    const held = await filedBooking();
    await onboard(held.inspector, "complete");
    await until(async () => (await payoutOf(held.bookingId))?.status === "transferred", "the transfer", 20_000);
    const admin = await createTestUser({ roles: ["admin"] });
    await refundAsAdmin(db, admin, held.bookingId, 10_500, "A quarter back after a dispute about the visit");
    const expected = Math.round((held.booking.inspectorShareMinor * 10_500) / held.booking.feeMinor);
    const [reversal] = await until(async () => {
      const rows = await db.select().from(payoutReversals).where(eq(payoutReversals.payoutId, (await payoutOf(held.bookingId))!.id));
      return rows.length && rows[0]!.status === "done" ? rows : undefined;
    }, "the reversal");
    expect(reversal).toMatchObject({ amountMinor: expected });
    expect(reversal!.stripeReversalId).toMatch(/^trr_/);
    expect((await payoutOf(held.bookingId))!.reversedMinor).toBe(expected);
    const transfer = await fetch(`${process.env.STRIPE_STAND_IN_URL}/v1/transfers/${(await payoutOf(held.bookingId))!.stripeTransferId}`, { headers: { authorization: `Bearer ${process.env.STRIPE_SECRET_KEY}` } }).then((response) => response.json());
    expect(transfer.amount_reversed).toBe(expected);
  });

  it("account.updated replayed and out of order changes nothing twice", async () => {
    const inspector = await createTestUser({ roles: ["inspector"], inspectorStatus: "certified" });
    await startPayoutOnboarding(db, inspector);
    const account = (await getPayoutAccount(db, inspector.id))!;
    const object = (state: "complete" | "due") => ({
      id: account.stripeAccountId,
      object: "account",
      type: "express",
      details_submitted: true,
      payouts_enabled: state === "complete",
      charges_enabled: state === "complete",
      capabilities: { transfers: state === "complete" ? "active" : "inactive" },
      requirements: { currently_due: state === "complete" ? [] : ["external_account"], past_due: [], disabled_reason: null },
    });
    // The newer state arrives first; the older, sent earlier, arrives after it.
    const now = Math.floor(Date.now() / 1000);
    const newerPayload = { ...JSON.parse(signedEvent("account.updated", object("complete")).payload), created: now };
    const olderPayload = { ...JSON.parse(signedEvent("account.updated", object("due")).payload), created: now - 60 };
    const sign = (payload: object) => {
      const text = JSON.stringify(payload);
      return { payload: text, header: Stripe.webhooks.generateTestHeaderString({ payload: text, secret: process.env.STRIPE_WEBHOOK_SECRET! }) };
    };
    const first = await postWebhook(sign(newerPayload));
    expect((await first.json()).outcome).toBe("applied");
    for (let i = 0; i < 3; i++) expect((await (await postWebhook(sign(newerPayload))).json()).outcome).toBe("duplicate");
    expect((await (await postWebhook(sign(olderPayload))).json()).outcome).toBe("no_change");
    const [stored] = await db.select().from(payoutAccounts).where(eq(payoutAccounts.userId, inspector.id));
    expect(stored).toMatchObject({ transfersCapability: "active", payoutsEnabled: true, requirementsDue: [] });
  });

  it("a transfer that finally fails is marked failed and the staff are told; a share held 90 days becomes unclaimed", async () => {
    const held = await filedBooking();
    await payInspector(db, held.bookingId);
    const admin = await createTestUser({ roles: ["admin"] });
    // The held share is not a failure; once due and given up on by the queue, it is.
    await db.update(payouts).set({ status: "due", destination: "acct_Gone", lastError: "No such destination: 'acct_Gone'" }).where(eq(payouts.bookingId, held.bookingId));
    await recordPayoutFailure(db, held.bookingId, null);
    expect(await payoutOf(held.bookingId)).toMatchObject({ status: "failed" });
    await latestEmailTo(admin.email, { matching: (message) => message.subject.startsWith("Payout failed for") && message.subject.includes(held.booking.reference) });

    const waiting = await filedBooking();
    await payInspector(db, waiting.bookingId);
    await reviewHeldShares(db, addDays(new Date(), 91));
    expect((await payoutOf(waiting.bookingId))!.status).toBe("unclaimed");
    await latestEmailTo(admin.email, { matching: (message) => message.subject.startsWith("Share unclaimed") && message.subject.includes(waiting.booking.reference) });
  });
});
