// Inspectors, listings, bookings and signed Stripe events for the inspections tests. Every call makes new,
// uniquely named rows, so tests never depend on each other or on an empty database.
import { randomUUID } from "node:crypto";
import { addDays, addHours } from "date-fns";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { getDatabase } from "~/db/client.server";
import { createBooking } from "~/modules/inspections/bookings.server";
import { saveProfile } from "~/modules/inspections/profiles.server";
import { bookings, inspectorProfiles, inspectorSlots } from "~/modules/inspections/schema";
import { listings } from "~/modules/listings/schema";
import { createTestUser, type TestUser } from "./accounts";

export const appOrigin = process.env.TEST_APP_ORIGIN!;
export const db = getDatabase();

/** A certified inspector with a profile serving `region`, a fee for centre lathes and one slot a few days out. */
export async function certifiedInspector(options: { region?: string; feeMinor?: number; slotStartsAt?: Date } = {}) {
  const person = await createTestUser({ roles: ["inspector"], inspectorStatus: "certified" });
  const region = options.region ?? `Westmarch ${randomUUID().slice(0, 6)}`;
  await saveProfile(db, person.id, {
    headline: "Lathe rebuilder",
    bio: "Thirty years of rebuilding centre lathes and checking their geometry.",
    qualifications: "Master machinist; calibrated 1 µm indicators",
    baseCity: "Harrowgate",
    regions: [region],
    currency: "EUR",
    categories: ["centre_lathe"],
    feeMinorByCategory: { centre_lathe: options.feeMinor ?? 42_000 },
  });
  const startsAt = options.slotStartsAt ?? addHours(addDays(new Date(), 10), Math.floor(Math.random() * 100));
  const [slot] = await db
    .insert(inspectorSlots)
    .values({ inspectorId: person.id, startsAt, endsAt: addHours(startsAt, 4) })
    .returning();
  return { ...person, publicId: await publicIdOf(person.id), region, slot: slot! };
}

/** The public id of an inspector's profile: what public pages, links and the booking form use. */
export async function publicIdOf(inspectorUserId: string) {
  const [profile] = await db.select({ publicId: inspectorProfiles.publicId }).from(inspectorProfiles).where(eq(inspectorProfiles.userId, inspectorUserId));
  if (!profile) throw new Error(`no inspector profile for ${inspectorUserId}`);
  return profile.publicId;
}

/** A published centre lathe in `region`, listed by a new seller (or the one given). */
export async function publishedLathe(region: string, seller?: TestUser) {
  const owner = seller ?? (await createTestUser({ roles: ["seller"] }));
  const slug = `test-lathe-${randomUUID().slice(0, 8)}`;
  const [listing] = await db
    .insert(listings)
    .values({
      sellerId: owner.id,
      slug,
      status: "published",
      category: "centre_lathe",
      make: "Korvath",
      model: "KL-400",
      city: "Harrowgate",
      region,
      country: "DE",
      priceMinor: 1_850_000,
      currency: "EUR",
      condition: "reconditioned",
      description: "Test lathe",
      publishedAt: new Date(),
    })
    .returning();
  return { ...listing!, seller: owner };
}

/** A booking awaiting payment with a real checkout session at the stand-in. */
export async function heldBooking() {
  const inspector = await certifiedInspector();
  const listing = await publishedLathe(inspector.region);
  const buyer = await createTestUser();
  const { bookingId, checkoutUrl } = await createBooking(db, {
    booker: buyer,
    listingSlug: listing.slug,
    inspectorId: inspector.id,
    slotId: inspector.slot.id,
  });
  return { inspector, listing, buyer, bookingId, checkoutUrl, booking: await bookingRow(bookingId) };
}

export async function bookingRow(bookingId: string) {
  const [row] = await db.select().from(bookings).where(eq(bookings.id, bookingId));
  return row!;
}

const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET!;

/** A Stripe event as JSON with a Stripe-Signature header made with the endpoint's secret. */
export function signedEvent(type: string, object: Record<string, unknown>, options: { timestamp?: number; secret?: string; id?: string } = {}) {
  const payload = JSON.stringify({
    id: options.id ?? `evt_test_${randomUUID().replace(/-/g, "")}`,
    object: "event",
    api_version: "2025-01-27.acacia",
    created: Math.floor(Date.now() / 1000),
    data: { object },
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type,
  });
  const header = Stripe.webhooks.generateTestHeaderString({
    payload,
    secret: options.secret ?? webhookSecret,
    timestamp: options.timestamp ?? Math.floor(Date.now() / 1000),
  });
  return { payload, header, id: (JSON.parse(payload) as { id: string }).id };
}

export function postWebhook(event: { payload: string; header: string }) {
  return fetch(`${appOrigin}/api/webhooks/stripe`, {
    method: "POST",
    headers: { "content-type": "application/json", "stripe-signature": event.header },
    body: event.payload,
  });
}

type Held = Awaited<ReturnType<typeof heldBooking>>;

export function completedSession(held: Held, paymentIntentId = `pi_test_${randomUUID().replace(/-/g, "").slice(0, 24)}`) {
  return {
    id: held.booking.checkoutSessionId,
    object: "checkout.session",
    amount_total: held.booking.feeMinor,
    currency: held.booking.currency.toLowerCase(),
    client_reference_id: held.bookingId,
    metadata: { booking_id: held.bookingId },
    mode: "payment",
    payment_intent: paymentIntentId,
    payment_status: "paid",
    status: "complete",
  };
}

export function failedIntent(held: Held, paymentIntentId: string) {
  return {
    id: paymentIntentId,
    object: "payment_intent",
    amount: held.booking.feeMinor,
    amount_received: 0,
    currency: held.booking.currency.toLowerCase(),
    metadata: { booking_id: held.bookingId },
    status: "requires_payment_method",
    last_payment_error: { type: "card_error", code: "card_declined", message: "Your card was declined." },
  };
}

/** A test-only control request to the payments stand-in that `npm test` started (stand-ins/payments/README.md). */
export async function standInControl(pathname: string, body: Record<string, unknown> = {}) {
  const response = await fetch(`${process.env.STRIPE_STAND_IN_URL}/__stand-in/${pathname}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  return { status: response.status, body: (await response.json()) as Record<string, any> };
}

export async function until<T>(probe: () => Promise<T | undefined | null | false>, what: string, timeoutMs = 10_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** A held booking paid on the stand-in with the given test card (4242… by default), once the app has recorded it. */
export async function paidBooking(card = "4242 4242 4242 4242") {
  const held = await heldBooking();
  const paid = await standInControl(`sessions/${held.booking.checkoutSessionId}/pay`, { card_number: card, expiry: "12/34", cvc: "123" });
  if (paid.status !== 200) throw new Error(`the stand-in refused the payment: ${JSON.stringify(paid.body)}`);
  await until(async () => (await bookingRow(held.bookingId)).status === "paid", "the payment webhook");
  return held;
}
