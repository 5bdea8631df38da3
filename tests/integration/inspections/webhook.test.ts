import { randomUUID } from "node:crypto";
import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { bookingEvents, processedWebhookEvents } from "~/modules/inspections/schema";
import { latestEmailTo } from "../../support/mailbox";
import { bookingRow, completedSession, db, failedIntent, heldBooking, postWebhook, signedEvent } from "../../support/inspections";

async function statusChanges(bookingId: string) {
  return db
    .select({ from: bookingEvents.fromStatus, to: bookingEvents.toStatus, kind: bookingEvents.kind })
    .from(bookingEvents)
    .where(and(eq(bookingEvents.bookingId, bookingId), sql`${bookingEvents.toStatus} is not null`));
}

describe("POST /api/webhooks/stripe", () => {
  it("applies a checkout.session.completed replayed ten times at once exactly once", async () => {
    const held = await heldBooking();
    const event = signedEvent("checkout.session.completed", completedSession(held));
    const responses = await Promise.all(Array.from({ length: 10 }, () => postWebhook(event)));
    expect(responses.map((response) => response.status)).toEqual(Array(10).fill(200));
    const outcomes = await Promise.all(responses.map(async (response) => ((await response.json()) as { outcome: string }).outcome));
    expect(outcomes.filter((outcome) => outcome === "applied")).toHaveLength(1);
    expect(outcomes.filter((outcome) => outcome === "duplicate")).toHaveLength(9);

    const booking = await bookingRow(held.bookingId);
    expect(booking.status).toBe("paid");
    expect(await statusChanges(held.bookingId)).toEqual([{ from: "awaiting_payment", to: "paid", kind: "payment_received" }]);
    const processed = await db.select().from(processedWebhookEvents).where(eq(processedWebhookEvents.eventId, event.id));
    expect(processed).toHaveLength(1);
    // The inspector is told of the new request once.
    const notice = await latestEmailTo(held.inspector.email, { matching: (message) => message.subject.startsWith("New inspection request") });
    expect(notice.text).toContain(`/inspector/bookings/${held.bookingId}`);
  });

  it("reaches the same end state whatever order a decline, the payment and a lapse arrive in", async () => {
    const forward = await heldBooking();
    const backward = await heldBooking();
    const eventsFor = (held: typeof forward) => {
      const intent = `pi_test_${randomUUID().replace(/-/g, "").slice(0, 24)}`;
      return [
        signedEvent("payment_intent.payment_failed", failedIntent(held, intent)),
        signedEvent("checkout.session.completed", completedSession(held, intent)),
        signedEvent("payment_intent.succeeded", { ...failedIntent(held, intent), amount_received: held.booking.feeMinor, status: "succeeded", last_payment_error: null }),
        signedEvent("checkout.session.expired", { ...completedSession(held, intent), status: "expired", payment_status: "unpaid" }),
      ];
    };
    for (const event of eventsFor(forward)) expect((await postWebhook(event)).status).toBe(200);
    for (const event of eventsFor(backward).reverse()) expect((await postWebhook(event)).status).toBe(200);

    const [a, b] = [await bookingRow(forward.bookingId), await bookingRow(backward.bookingId)];
    const endState = (row: typeof a) => ({ status: row.status, paid: Boolean(row.paidAt), intent: row.paymentIntentId?.startsWith("pi_test_"), refunded: row.refundedMinor });
    expect(endState(a)).toEqual({ status: "paid", paid: true, intent: true, refunded: 0 });
    expect(endState(b)).toEqual(endState(a));
    // Forward, the payment lands first and the stale lapse is ignored: one change only.
    expect(await statusChanges(forward.bookingId)).toHaveLength(1);
  });

  it("refuses a bad signature and a stale timestamp with 400 and changes nothing", async () => {
    const held = await heldBooking();
    const forged = signedEvent("checkout.session.completed", completedSession(held), { secret: "whsec_someone_else" });
    const stale = signedEvent("checkout.session.completed", completedSession(held), { timestamp: Math.floor(Date.now() / 1000) - 15 * 60 });
    const tampered = signedEvent("checkout.session.completed", completedSession(held));
    const unsigned = { payload: tampered.payload, header: "" };

    for (const [event, problem] of [
      [forged, "mismatch"],
      [stale, "stale"],
      [{ ...tampered, payload: tampered.payload.replace('"paid"', '"unpaid"') }, "mismatch"],
      [unsigned, "missing"],
    ] as const) {
      const response = await postWebhook(event);
      expect(response.status).toBe(400);
      expect(((await response.json()) as { problem: string }).problem).toBe(problem);
    }
    expect((await bookingRow(held.bookingId)).status).toBe("awaiting_payment");
    const processed = await db.select().from(processedWebhookEvents).where(sql`${processedWebhookEvents.eventId} in (${forged.id}, ${stale.id}, ${tampered.id})`);
    expect(processed).toEqual([]);
  });

  it("leaves the booking unpaid when the card is declined on the stand-in's checkout", async () => {
    const held = await heldBooking();
    const standIn = process.env.STRIPE_STAND_IN_URL!;
    const response = await fetch(`${standIn}/__stand-in/sessions/${held.booking.checkoutSessionId}/pay`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ card_number: "4000 0000 0000 0002", expiry: "12/34", cvc: "123" }),
    });
    expect(response.status).toBe(402);
    // The stand-in delivers payment_intent.payment_failed before it answers; the history shows it.
    const deadline = Date.now() + 5_000;
    let failures: unknown[] = [];
    while (Date.now() < deadline && !failures.length) {
      failures = await db.select().from(bookingEvents).where(and(eq(bookingEvents.bookingId, held.bookingId), eq(bookingEvents.kind, "payment_failed")));
      if (!failures.length) await new Promise((resolve) => setTimeout(resolve, 100));
    }
    expect(failures).toHaveLength(1);
    const booking = await bookingRow(held.bookingId);
    expect(booking.status).toBe("awaiting_payment");
    expect(booking.paidAt).toBeNull();
  });
});
