// The stand-in's reading of form bodies against the stripe SDK's own writing of them: whatever the SDK
// encodes (nested objects, arrays, metadata with awkward characters), parseStripeForm gives back.
import http from "node:http";
import fc from "fast-check";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort } from "../../../scripts/lib/ports.ts";
import { parseStripeForm } from "../../../stand-ins/payments/form.ts";

let server: http.Server;
let lastBody = "";
let stripe: Stripe;

beforeAll(async () => {
  const port = await freePort();
  // Records what the SDK sends and answers with an empty object.
  server = http.createServer((request, response) => {
    const chunks: Buffer[] = [];
    request.on("data", (chunk: Buffer) => chunks.push(chunk));
    request.on("end", () => {
      lastBody = Buffer.concat(chunks).toString("utf8");
      response.writeHead(200, { "Content-Type": "application/json" });
      response.end("{}");
    });
  });
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", resolve));
  stripe = new Stripe("sk_test_encoding", { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0 });
});
afterAll(() => {
  server.closeAllConnections();
  server.close();
});

describe("parseStripeForm", () => {
  it("reads back a Checkout session as the SDK encodes it", async () => {
    const params = {
      mode: "payment" as const,
      line_items: [
        { quantity: 1, price_data: { currency: "eur", unit_amount: 18_500, product_data: { name: "Check & report [lathe] = 1" } } },
        { quantity: 2, price_data: { currency: "eur", unit_amount: 0, product_data: { name: "Travel" } } },
      ],
      success_url: "http://127.0.0.1:3000/bookings/b1?session={CHECKOUT_SESSION_ID}",
      metadata: { booking_id: "b1", "odd key": "ä+ö/ü%20" },
      payment_intent_data: { application_fee_amount: 2_775, transfer_data: { destination: "acct_1" } },
      expand: ["payment_intent", "payment_intent.latest_charge"],
    };
    await stripe.checkout.sessions.create(params);
    expect(lastBody).toContain("line_items[0][price_data][currency]=eur");
    expect(parseStripeForm(lastBody)).toEqual({
      ...params,
      line_items: params.line_items.map((item) => ({
        quantity: String(item.quantity),
        price_data: { ...item.price_data, unit_amount: String(item.price_data.unit_amount) },
      })),
      payment_intent_data: { application_fee_amount: "2775", transfer_data: { destination: "acct_1" } },
    });
  });

  it("reads back any metadata the SDK encodes", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.dictionary(
          fc.string({ minLength: 1, maxLength: 40 }).filter((key) => !/[[\]]/.test(key) && !/^\d+$/.test(key)),
          fc.string({ minLength: 1, maxLength: 60, unit: "grapheme" }),
          { maxKeys: 8 },
        ),
        async (metadata) => {
          await stripe.refunds.create({ payment_intent: "pi_x", metadata });
          const parsed = parseStripeForm(lastBody);
          expect(parsed.metadata ?? {}).toEqual(metadata);
        },
      ),
      { numRuns: 60 },
    );
  });
});
