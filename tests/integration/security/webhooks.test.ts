// Stripe's endpoint under hostile but correctly signed bodies, and signatures from the future.
import Stripe from "stripe";
import { describe, expect, it } from "vitest";
import { webhookToleranceSeconds } from "~/modules/payments/stripe.server";
import { bookingRow, completedSession, heldBooking, postWebhook, signedEvent } from "../../support/inspections";

/** Any body, signed with the endpoint's secret now (or at `timestamp`). */
function signed(payload: string, timestamp = Math.floor(Date.now() / 1000)) {
  const header = Stripe.webhooks.generateTestHeaderString({ payload, secret: process.env.STRIPE_WEBHOOK_SECRET!, timestamp });
  return { payload, header };
}

describe("POST /api/webhooks/stripe with signed bodies that are not events", () => {
  const event = { id: "evt_test_shape", object: "event", type: "checkout.session.completed", created: 1 };
  it.each([
    ["without data", event],
    ["with data but no object", { ...event, data: {} }],
    ["with data.object null", { ...event, data: { object: null } }],
    ["with data.object a string", { ...event, data: { object: "cs_test_x" } }],
    ["without a type", { id: "evt_test_shape", data: { object: {} } }],
    ["a JSON array", [event]],
    ["JSON null", null],
  ])("answers 400 for an event %s, not 500", async (_name, body) => {
    const response = await postWebhook(signed(JSON.stringify(body)));
    expect(response.status).toBe(400);
    expect(await response.json()).toMatchObject({ problem: expect.stringMatching(/not_an_event|malformed/) });
  });
});

describe("POST /api/webhooks/stripe timestamps (source: Stripe's documented 300 s tolerance, `common practice`)", () => {
  it(`refuses a signature more than ${webhookToleranceSeconds} s in the future like a stale one, and changes nothing`, async () => {
    const held = await heldBooking();
    const future = signedEvent("checkout.session.completed", completedSession(held), { timestamp: Math.floor(Date.now() / 1000) + webhookToleranceSeconds + 60 });
    const response = await postWebhook(future);
    expect(response.status).toBe(400);
    expect(await response.json()).toMatchObject({ problem: "stale" });
    expect((await bookingRow(held.bookingId)).status).toBe("awaiting_payment");
  });

  it("still takes a signature a little ahead of our clock (skew within the tolerance)", async () => {
    const held = await heldBooking();
    const ahead = signedEvent("checkout.session.completed", completedSession(held), { timestamp: Math.floor(Date.now() / 1000) + 60 });
    expect((await postWebhook(ahead)).status).toBe(200);
    expect((await bookingRow(held.bookingId)).status).toBe("paid");
  });

  it("refuses a stale one", async () => {
    const held = await heldBooking();
    const stale = signedEvent("checkout.session.completed", completedSession(held), { timestamp: Math.floor(Date.now() / 1000) - webhookToleranceSeconds - 60 });
    const response = await postWebhook(stale);
    expect(response.status).toBe(400);
    expect(await response.json()).toMatchObject({ problem: "stale" });
  });
});
