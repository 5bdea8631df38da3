// Connect, funds that settle later, delayed payment methods and refunds that pend or fail, on the payments
// stand-in through the stripe SDK. Expected shapes and rules follow Stripe's API reference
// (docs.stripe.com/api: Accounts, Account Links, Transfers, Transfer Reversals, Balance, Balance
// Transactions, Refunds) and its Connect guide to separate charges and transfers (`source_transaction`).
import { randomUUID } from "node:crypto";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { checkoutExpiryMarginMinutes } from "~/modules/payments/stripe.server";
import { startPaymentsHarness, waitFor, type PaymentsHarness } from "../../support/payments";

let harness: PaymentsHarness;
let stripe: Stripe;

beforeAll(async () => {
  harness = await startPaymentsHarness();
  stripe = new Stripe(harness.standIn.env.STRIPE_SECRET_KEY, harness.sdkOptions);
});
afterAll(async () => {
  await harness?.stop();
});

async function control(pathname: string, body: Record<string, unknown> = {}) {
  const response = await fetch(`${harness.standIn.url}/__stand-in/${pathname}`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  return { status: response.status, body: (await response.json()) as Record<string, any> };
}

async function paidWith(card: string, amountMinor = 20_000) {
  const bookingId = randomUUID();
  const session = await harness.client.createCheckoutSession({
    bookingId,
    amountMinor,
    currency: "EUR",
    description: "On-site geometry check",
    platformFeeMinor: Math.round(amountMinor * 0.15),
    successUrl: `${harness.receiver.origin}/ok`,
    cancelUrl: `${harness.receiver.origin}/back`,
  });
  expect((await control(`sessions/${session.id}/pay`, { card_number: card })).status).toBe(200);
  const intent = await stripe.paymentIntents.retrieve((await harness.client.retrieveCheckoutSession(session.id)).paymentIntentId!);
  return { bookingId, sessionId: session.id, intentId: intent.id, chargeId: intent.latest_charge as string };
}

async function readyAccount() {
  const account = await harness.client.createPayoutAccount({ userId: randomUUID(), email: "inspector@example.test" });
  await control(`accounts/${account.accountId}/state`, { state: "complete" });
  return account.accountId;
}

const eventsOf = (type: string, id: string) => harness.receiver.received.filter((webhook) => webhook.event.type === type && webhook.event.data.object.id === id);

describe("Express accounts and onboarding links", () => {
  it("makes an account that cannot take transfers until onboarding completes, and says what is due", async () => {
    const created = await stripe.accounts.create({ type: "express", country: "DE", email: "a@example.test", capabilities: { transfers: { requested: true } } });
    expect(created).toMatchObject({ object: "account", type: "express", details_submitted: false, payouts_enabled: false, capabilities: { transfers: "inactive" } });
    expect(created.requirements?.currently_due).toContain("external_account");
    const link = await stripe.accountLinks.create({ account: created.id, type: "account_onboarding", return_url: `${harness.receiver.origin}/done`, refresh_url: `${harness.receiver.origin}/again` });
    expect(link).toMatchObject({ object: "account_link" });
    expect(link.expires_at).toBeGreaterThan(link.created);

    // The hosted page: "leave requirements due" returns to the app with the account still unable to take transfers.
    const page = await fetch(link.url);
    expect(await page.text()).toContain("Leave requirements due");
    const left = await fetch(link.url, { method: "POST", body: new URLSearchParams({ choice: "requirements_due" }), redirect: "manual" });
    expect(left.status).toBe(303);
    expect(left.headers.get("location")).toBe(`${harness.receiver.origin}/done`);
    const due = await stripe.accounts.retrieve(created.id);
    expect(due).toMatchObject({ details_submitted: true, payouts_enabled: false, capabilities: { transfers: "inactive" } });
    expect(due.requirements?.currently_due).toEqual(["external_account", "individual.verification.document"]);
    const updated = await waitFor(() => eventsOf("account.updated", created.id)[0], { what: "account.updated" });
    expect(updated.event).toMatchObject({ account: created.id });
    expect(Stripe.webhooks.constructEvent(updated.body, updated.signature!, harness.standIn.env.STRIPE_WEBHOOK_SECRET).type).toBe("account.updated");

    // A used link leads to its refresh URL; a new one completes set-up.
    const reused = await fetch(link.url, { redirect: "manual" });
    expect(reused.headers.get("location")).toBe(`${harness.receiver.origin}/again`);
    const second = await harness.client.createOnboardingLink({ accountId: created.id, returnUrl: `${harness.receiver.origin}/done`, refreshUrl: `${harness.receiver.origin}/again` });
    await fetch(second.url, { method: "POST", body: new URLSearchParams({ choice: "complete" }), redirect: "manual" });
    expect(await harness.client.retrievePayoutAccount(created.id)).toEqual({
      accountId: created.id,
      detailsSubmitted: true,
      transfersCapability: "active",
      payoutsEnabled: true,
      requirementsDue: [],
      disabledReason: null,
    });
  });

  it("refuses a transfer to an account before onboarding, and to an account that does not exist", async () => {
    const { chargeId, bookingId } = await paidWith("4242424242424242");
    const account = await harness.client.createPayoutAccount({ userId: randomUUID(), email: "b@example.test" });
    await expect(
      harness.client.recordTransfer({ amountMinor: 1_000, currency: "eur", destination: account.accountId, bookingId, sourceChargeId: chargeId }),
    ).rejects.toMatchObject({ name: "PaymentsRejectedError", code: "insufficient_capabilities_for_transfer" });
    await expect(stripe.transfers.create({ amount: 100, currency: "eur", destination: "acct_NoSuchAccount1", source_transaction: chargeId })).rejects.toMatchObject({
      code: "resource_missing",
      param: "destination",
    });
    await control(`accounts/${account.accountId}/state`, { state: "complete" });
    const made = await harness.client.recordTransfer({ amountMinor: 1_000, currency: "eur", destination: account.accountId, bookingId, sourceChargeId: chargeId });
    expect(made.amountMinor).toBe(1_000);
  });
});

describe("funds that settle later", () => {
  it("a card charge is pending; a transfer without its charge is refused for lack of funds, one tied to it is made and waits in the account until the charge settles", async () => {
    const { chargeId, bookingId } = await paidWith("4242424242424242", 30_000);
    const charge = await stripe.charges.retrieve(chargeId, { expand: ["balance_transaction"] });
    const funds = charge.balance_transaction as Stripe.BalanceTransaction;
    expect(funds).toMatchObject({ object: "balance_transaction", type: "charge", status: "pending", amount: 30_000 });
    expect(funds.available_on).toBeGreaterThan(funds.created);
    const destination = await readyAccount();

    // What the app did before: no source_transaction, and the platform's available balance is short.
    await expect(stripe.transfers.create({ amount: 25_500, currency: "eur", destination })).rejects.toMatchObject({ code: "balance_insufficient" });

    const transfer = await harness.client.recordTransfer({ amountMinor: 25_500, currency: "eur", destination, bookingId, sourceChargeId: chargeId });
    const onTheirSide = () => stripe.balance.retrieve({}, { stripeAccount: destination });
    expect((await onTheirSide()).pending).toEqual([expect.objectContaining({ amount: 25_500, currency: "eur" })]);
    expect((await onTheirSide()).available).toEqual([]);

    const settled = await control(`charges/${chargeId}/settle`);
    expect(settled.body.data.length).toBe(2);
    expect((await onTheirSide()).available).toEqual([expect.objectContaining({ amount: 25_500 })]);
    expect((await stripe.balanceTransactions.retrieve(funds.id)).status).toBe("available");
    // The same booking's transfer again is the same transfer (the key is the booking).
    expect((await harness.client.recordTransfer({ amountMinor: 25_500, currency: "eur", destination, bookingId, sourceChargeId: chargeId })).id).toBe(transfer.id);
  });

  it("reverses part of a transfer, then the rest, and refuses more", async () => {
    const { chargeId, bookingId } = await paidWith("4242424242424242");
    const destination = await readyAccount();
    const transfer = await harness.client.recordTransfer({ amountMinor: 17_000, currency: "eur", destination, bookingId, sourceChargeId: chargeId });
    const first = await harness.client.reverseTransfer({ transferId: transfer.id, amountMinor: 8_500, bookingId, reversalRecordId: "rv-1" });
    expect(first).toMatchObject({ amountMinor: 8_500, currency: "eur", transferId: transfer.id });
    expect(first.id).toMatch(/^trr_/);
    // A retry of the same record is the same reversal.
    expect((await harness.client.reverseTransfer({ transferId: transfer.id, amountMinor: 8_500, bookingId, reversalRecordId: "rv-1" })).id).toBe(first.id);
    await harness.client.reverseTransfer({ transferId: transfer.id, amountMinor: 8_500, bookingId, reversalRecordId: "rv-2" });
    const reversed = await stripe.transfers.retrieve(transfer.id);
    expect(reversed).toMatchObject({ amount_reversed: 17_000, reversed: true });
    expect((await stripe.transfers.listReversals(transfer.id)).data).toHaveLength(2);
    await expect(harness.client.reverseTransfer({ transferId: transfer.id, amountMinor: 1, bookingId, reversalRecordId: "rv-3" })).rejects.toMatchObject({ code: "transfer_already_reversed" });
    await waitFor(() => harness.receiver.received.find((webhook) => webhook.event.type === "transfer.reversed" && webhook.event.data.object.id === transfer.id), { what: "transfer.reversed" });
  });
});

describe("refunds that pend or fail", () => {
  it("two refunds of the same amount on one payment are two refunds", async () => {
    const { intentId, bookingId } = await paidWith("4242424242424242");
    const one = await harness.client.refundPayment({ paymentIntentId: intentId, amountMinor: 2_500, reason: "part", bookingId, refundRecordId: randomUUID() });
    const two = await harness.client.refundPayment({ paymentIntentId: intentId, amountMinor: 2_500, reason: "part", bookingId, refundRecordId: randomUUID() });
    expect(two.id).not.toBe(one.id);
    expect((await harness.client.retrievePayment(intentId)).amountRefundedMinor).toBe(5_000);
  });

  it("4000 0000 0000 7726: the refund is pending, then succeeds (refund.updated)", async () => {
    const { intentId, bookingId } = await paidWith("4000000000007726");
    const refund = await harness.client.refundPayment({ paymentIntentId: intentId, amountMinor: 4_000, reason: "x", bookingId, refundRecordId: randomUUID() });
    expect(refund.status).toBe("pending");
    expect((await stripe.refunds.retrieve(refund.id)).pending_reason).toBe("processing");
    expect((await control(`refunds/${refund.id}/settle`)).body.status).toBe("succeeded");
    const updated = await waitFor(() => eventsOf("refund.updated", refund.id)[0], { what: "refund.updated" });
    expect(updated.event.data.object.status).toBe("succeeded");
  });

  it("a pending refund that fails gives the amount back to the charge (refund.failed)", async () => {
    const { intentId, bookingId } = await paidWith("4000000000007726");
    const refund = await harness.client.refundPayment({ paymentIntentId: intentId, amountMinor: 4_000, reason: "x", bookingId, refundRecordId: randomUUID() });
    const failed = await control(`refunds/${refund.id}/settle`, { outcome: "failed" });
    expect(failed.body).toMatchObject({ status: "failed", failure_reason: "expired_or_canceled_card" });
    await waitFor(() => eventsOf("refund.failed", refund.id)[0], { what: "refund.failed" });
    expect((await harness.client.retrievePayment(intentId)).amountRefundedMinor).toBe(0);
  });

  it("4000 0000 0000 5126: the refund answers succeeded and fails later", async () => {
    const { intentId, bookingId } = await paidWith("4000000000005126");
    const refund = await harness.client.refundPayment({ paymentIntentId: intentId, amountMinor: 4_000, reason: "x", bookingId, refundRecordId: randomUUID() });
    expect(refund.status).toBe("succeeded");
    expect((await control(`refunds/${refund.id}/settle`)).body.status).toBe("failed");
    // A refund of a card that refunds normally cannot be made to fail after it succeeded.
    const normal = await paidWith("4242424242424242");
    const done = await harness.client.refundPayment({ paymentIntentId: normal.intentId, amountMinor: 1_000, reason: "x", bookingId: normal.bookingId, refundRecordId: randomUUID() });
    expect((await control(`refunds/${done.id}/settle`, { outcome: "failed" })).status).toBe(400);
  });
});

describe("a payment method that settles later", () => {
  async function debit(iban: string) {
    const bookingId = randomUUID();
    const session = await harness.client.createCheckoutSession({ bookingId, amountMinor: 12_000, currency: "EUR", description: "Check", platformFeeMinor: 1_800, successUrl: `${harness.receiver.origin}/ok`, cancelUrl: `${harness.receiver.origin}/back` });
    const paid = await control(`sessions/${session.id}/pay-by-bank-debit`, { iban });
    expect(paid.status).toBe(200);
    return { sessionId: session.id, intentId: paid.body.payment_intent.id as string };
  }

  it("completes unpaid, then async_payment_succeeded", async () => {
    const { sessionId, intentId } = await debit("DE89370400440532013000");
    expect(await stripe.checkout.sessions.retrieve(sessionId)).toMatchObject({ status: "complete", payment_status: "unpaid" });
    expect((await stripe.paymentIntents.retrieve(intentId)).status).toBe("processing");
    const completed = await waitFor(() => eventsOf("checkout.session.completed", sessionId)[0], { what: "completed" });
    expect(completed.event.data.object.payment_status).toBe("unpaid");
    await control(`payment_intents/${intentId}/settle`);
    expect(await stripe.checkout.sessions.retrieve(sessionId)).toMatchObject({ payment_status: "paid" });
    const succeeded = await waitFor(() => eventsOf("checkout.session.async_payment_succeeded", sessionId)[0], { what: "async_payment_succeeded" });
    expect(succeeded.event.data.object.payment_status).toBe("paid");
  });

  it("completes unpaid, then async_payment_failed", async () => {
    const { sessionId, intentId } = await debit("DE62370400440532013001");
    await control(`payment_intents/${intentId}/settle`);
    expect((await stripe.paymentIntents.retrieve(intentId)).status).toBe("requires_payment_method");
    await waitFor(() => eventsOf("checkout.session.async_payment_failed", sessionId)[0], { what: "async_payment_failed" });
  });
});

describe("checkout expiry", () => {
  it(`asks for 30 + ${checkoutExpiryMarginMinutes} minutes, so a retry a minute later is still accepted; the stand-in allows no slack below 30`, async () => {
    const before = Math.floor(Date.now() / 1000);
    const session = await harness.client.createCheckoutSession({ bookingId: randomUUID(), amountMinor: 5_000, currency: "EUR", description: "Check", platformFeeMinor: 750, successUrl: `${harness.receiver.origin}/ok`, cancelUrl: `${harness.receiver.origin}/back` });
    const seconds = session.expiresAt.getTime() / 1000 - before;
    expect(seconds).toBeGreaterThanOrEqual((30 + checkoutExpiryMarginMinutes) * 60);
    expect(seconds).toBeLessThanOrEqual((30 + checkoutExpiryMarginMinutes) * 60 + 5);
    const line = [{ quantity: 1, price_data: { currency: "eur", unit_amount: 100, product_data: { name: "x" } } }];
    await expect(stripe.checkout.sessions.create({ mode: "payment", line_items: line, expires_at: Math.floor(Date.now() / 1000) + 30 * 60 - 2 })).rejects.toMatchObject({ param: "expires_at" });
  });
});
