import { addHours } from "date-fns";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { acceptBooking, cancelBookingAsBuyer, createBooking, declineBooking } from "~/modules/inspections/bookings.server";
import { SlotTakenError } from "~/modules/inspections/errors";
import { eligibleInspectors } from "~/modules/inspections/profiles.server";
import { bookingRefunds, bookings } from "~/modules/inspections/schema";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { latestEmailTo, linkIn } from "../../support/mailbox";
import { bookingRow, certifiedInspector, completedSession, db, heldBooking, postWebhook, publishedLathe, signedEvent } from "../../support/inspections";

async function paidBooking() {
  const held = await heldBooking();
  const standIn = process.env.STRIPE_STAND_IN_URL!;
  // Pay on the stand-in, which makes a real payment intent (refundable) and delivers the signed events.
  const response = await fetch(`${standIn}/__stand-in/sessions/${held.booking.checkoutSessionId}/pay`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ card_number: "4242 4242 4242 4242", expiry: "12/34", cvc: "123" }),
  });
  expect(response.status).toBe(200);
  const deadline = Date.now() + 5_000;
  while ((await bookingRow(held.bookingId)).status !== "paid") {
    if (Date.now() > deadline) throw new Error("the payment webhook did not arrive");
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  return held;
}

describe("booking an inspector's slot", () => {
  it("gives fifty buyers racing for one slot exactly one booking and a checkout; the rest hear 'slot just taken'", async () => {
    const inspector = await certifiedInspector();
    const listing = await publishedLathe(inspector.region);
    const buyers = await Promise.all(Array.from({ length: 50 }, () => createTestUser()));
    const results = await Promise.allSettled(
      buyers.map((buyer) => createBooking(db, { booker: buyer, listingSlug: listing.slug, inspectorId: inspector.id, slotId: inspector.slot.id })),
    );
    const won = results.filter((result) => result.status === "fulfilled");
    const lost = results.filter((result): result is PromiseRejectedResult => result.status === "rejected");
    const otherFailures = lost
      .filter((loss) => !(loss.reason instanceof SlotTakenError))
      .map((loss) => `${loss.reason?.cause?.code ?? ""} ${loss.reason?.cause?.message ?? loss.reason?.message}`);
    expect(otherFailures).toEqual([]);
    expect(won).toHaveLength(1);
    expect(lost).toHaveLength(49);
    for (const loss of lost) {
      expect(loss.reason).toBeInstanceOf(SlotTakenError);
      expect(loss.reason.message).toMatch(/just taken.*Nothing was charged/);
    }
    const rows = await db.select().from(bookings).where(eq(bookings.inspectorId, inspector.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]!.checkoutSessionId).toMatch(/^cs_/);
  });

  it("is held by the database: an overlapping active booking inserted directly is refused by the exclusion constraint", async () => {
    const held = await heldBooking();
    const { id: _id, reference: _reference, period: _period, checkoutSessionId: _session, ...copy } = held.booking;
    const overlapping = { ...copy, reference: `IB-TEST-${Date.now()}`, startsAt: addHours(held.booking.startsAt, 1), endsAt: addHours(held.booking.endsAt, 1) };
    await expect(db.insert(bookings).values(overlapping)).rejects.toSatisfy((error: unknown) => JSON.stringify(error).includes("23P01") || String((error as { cause?: { code?: string } }).cause?.code) === "23P01");
    // A booking that no longer holds the time does not block it.
    await expect(db.insert(bookings).values({ ...overlapping, status: "expired" })).resolves.toBeDefined();
  });

  it("never offers an inspector for their own listing, nor one who is not certified or serves another region", async () => {
    const dealerInspector = await certifiedInspector();
    const ownListing = await publishedLathe(dealerInspector.region, dealerInspector);
    const colleague = await certifiedInspector({ region: dealerInspector.region });
    const elsewhere = await certifiedInspector();
    const applicant = await createTestUser({ inspectorStatus: "pending" });
    const offered = (await eligibleInspectors(db, ownListing, null)).map((inspector) => inspector.id);
    // The page offers inspectors by their profiles' public ids.
    expect(offered).toContain(colleague.publicId);
    expect(offered).not.toContain(dealerInspector.publicId);
    expect(offered).not.toContain(elsewhere.publicId);
    expect(offered).not.toContain(applicant.id);
    const buyer = await createTestUser();
    await expect(
      createBooking(db, { booker: buyer, listingSlug: ownListing.slug, inspectorId: dealerInspector.id, slotId: dealerInspector.slot.id }),
    ).rejects.toThrow(/own/);
  });

  it("refunds the whole fee when the inspector declines, records it and e-mails the buyer", async () => {
    const held = await paidBooking();
    await declineBooking(db, held.inspector, held.bookingId, "I am at another site that week.");
    const booking = await bookingRow(held.bookingId);
    expect(booking.status).toBe("refunded");
    expect(booking.refundedMinor).toBe(booking.feeMinor);
    const refunds = await db.select().from(bookingRefunds).where(eq(bookingRefunds.bookingId, held.bookingId));
    expect(refunds).toHaveLength(1);
    expect(refunds[0]).toMatchObject({ amountMinor: booking.feeMinor, rule: "inspector_declined" });
    expect(refunds[0]!.stripeRefundId).toMatch(/^re_/);
    const declined = await latestEmailTo(held.buyer.email, { matching: (message) => message.subject.includes("declined") });
    expect(declined.text).toContain("I am at another site that week.");
    const refunded = await latestEmailTo(held.buyer.email, { matching: (message) => message.subject.startsWith("Refund of") });
    expect(refunded.subject).toContain("€420");
    // The e-mails link the buyer's receipts (PDF), which open for the buyer once signed in.
    const paidMail = await latestEmailTo(held.buyer.email, { matching: (message) => message.subject.includes("paid") });
    const buyerCookie = await signInCookie(held.buyer.email, held.buyer.password);
    for (const receipt of [linkIn(paidMail, `${testAppOrigin}/bookings/${held.bookingId}/receipts/payment.pdf`), linkIn(refunded, `${testAppOrigin}/bookings/${held.bookingId}/receipts/refund-${refunds[0]!.id}.pdf`)]) {
      const response = await fetch(receipt, { headers: { cookie: buyerCookie } });
      expect(response.status, receipt).toBe(200);
      expect(response.headers.get("content-type")).toContain("application/pdf");
    }
    // Declining again changes nothing and refunds nothing more.
    await declineBooking(db, held.inspector, held.bookingId, "Again");
    expect(await db.select().from(bookingRefunds).where(eq(bookingRefunds.bookingId, held.bookingId))).toHaveLength(1);
  });

  it("refunds half when the buyer cancels an accepted booking two days ahead, by the written rules", async () => {
    const held = await paidBooking();
    await acceptBooking(db, held.inspector, held.bookingId);
    const twoDaysBefore = addHours(held.booking.startsAt, -48);
    await cancelBookingAsBuyer(db, held.buyer, held.bookingId, "Bought another machine", twoDaysBefore);
    const booking = await bookingRow(held.bookingId);
    expect(booking).toMatchObject({ status: "refunded", refundedMinor: Math.round(booking.feeMinor / 2) });
    const [refund] = await db.select().from(bookingRefunds).where(eq(bookingRefunds.bookingId, held.bookingId));
    expect(refund!.rule).toBe("short_notice");
  });

  it("releases the slot when payment lapses, and lets a paid late-comer keep it only if it is still free", async () => {
    const held = await heldBooking();
    const expired = signedEvent("checkout.session.expired", { ...completedSession(held), status: "expired", payment_status: "unpaid" });
    expect((await postWebhook(expired)).status).toBe(200);
    expect((await bookingRow(held.bookingId)).status).toBe("expired");
    const second = await createTestUser();
    await expect(
      createBooking(db, { booker: second, listingSlug: held.listing.slug, inspectorId: held.inspector.id, slotId: held.inspector.slot.id }),
    ).resolves.toMatchObject({ checkoutUrl: expect.stringContaining("http") });
  });
});
