// Demo inspectors, slots and bookings for `npm start`: an invented scenario (invented people and places).
// Every booking goes through this module's own functions and the payments stand-in, so each row is what the
// product itself writes; only the timestamps of bookings in the past are set back afterwards, so that their
// history reads as it happened (a visit a year ago was not paid for this morning).
import { addDays, addHours, addMinutes } from "date-fns";
import { and, eq, inArray } from "drizzle-orm";
import type Stripe from "stripe";
import { getDatabase, type Database } from "~/db/client.server";
import { env } from "~/env.server";
import type { MachineCategory } from "~/modules/listings/catalogue";
import { checkoutExpiryMarginMinutes } from "~/modules/payments/stripe.server";
import { listings } from "~/modules/listings/schema";
import { acceptBooking, cancelBookingAsBuyer, createBooking, declineBooking, releaseLapsedCheckouts } from "~/modules/inspections/bookings.server";
import { getPayoutAccount, refreshPayoutAccount, startPayoutOnboarding } from "~/modules/inspections/payouts.server";
import { freeSlots, saveProfile } from "~/modules/inspections/profiles.server";
import { bookingEvents, bookingRefunds, bookings, inspectorSlots, machineSites, payouts } from "~/modules/inspections/schema";
import { requestReschedule } from "~/modules/inspections/visits.server";
import { handleStripeEvent } from "~/modules/inspections/webhook.server";

export type DemoPerson = { id: string; email: string; name: string };

const DAY = 86_400_000;

/** Midnight UTC of the day the seed runs: every demo date is a whole number of days and hours from it. */
export function scenarioToday(now = new Date()) {
  return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate()));
}

export const demoInspectorProfiles = {
  renner: {
    headline: "Lathe rebuilder, geometry checks since 1997",
    bio: "Twenty-eight years rebuilding centre and toolroom lathes in the Haldmark workshops: scraping beds, regrinding spindles, fitting new bearings. I check a machine the way I would before buying it myself, and I write down what I find in plain words.",
    qualifications:
      "Journeyman machine-tool fitter (Haldmark trade board, 1995)\nCalibrated 0.001 mm lever indicators, a 300 mm test mandrel and an electronic level reading 2 µm/m, all calibrated within the year",
    baseCity: "Ostervik",
    regions: ["Lower Haldmark", "Marlshire"],
    currency: "EUR" as const,
    categories: ["centre_lathe", "toolroom_lathe", "cnc_lathe", "surface_grinder"] as MachineCategory[],
    feeMinorByCategory: { centre_lathe: 38_000, toolroom_lathe: 45_000, cnc_lathe: 52_000, surface_grinder: 30_000 },
  },
  mirelle: {
    headline: "Precision turning and CNC lathe inspection",
    bio: "Former quality lead of a turning shop in Saint-Aubrel. I specialise in spindle condition and axis alignment of CNC and toolroom lathes, and bring my own mandrels and levels.",
    qualifications: "Metrology technician diploma (Vernois technical institute)\n12 years of acceptance tests on new and reconditioned lathes",
    baseCity: "Saint-Aubrel",
    regions: ["Haute-Vernois", "Lower Haldmark"],
    currency: "EUR" as const,
    categories: ["centre_lathe", "toolroom_lathe", "cnc_lathe", "milling_machine"] as MachineCategory[],
    feeMinorByCategory: { centre_lathe: 34_000, toolroom_lathe: 41_000, cnc_lathe: 56_000, milling_machine: 36_000 },
  },
  beckstrand: {
    headline: "Toolroom machines and knee mills, Lindgau to Norrlända",
    bio: "I ran the toolroom of a gauge works in Falkenmoor for fifteen years and now check machines before they change hands. Electronic probe to 0.5 µm, mandrels from MT3 to MT6, and a van that reaches Tärnvik in a day.",
    qualifications: "Master toolmaker (Lindgau chamber of crafts, 2004)\nElectronic probe 0.5 µm and electronic level 2 µm/m, calibrated every year",
    baseCity: "Falkenmoor",
    regions: ["Lindgau", "Oost-Marwold", "Norrlända"],
    currency: "EUR" as const,
    categories: ["centre_lathe", "toolroom_lathe", "cnc_lathe", "milling_machine", "surface_grinder", "machining_centre"] as MachineCategory[],
    feeMinorByCategory: { centre_lathe: 36_000, toolroom_lathe: 44_000, cnc_lathe: 54_000, milling_machine: 34_000, surface_grinder: 29_000, machining_centre: 62_000 },
  },
};

export type DemoInspectorKey = keyof typeof demoInspectorProfiles;

/** Two four-hour slots on every other weekday of the next three weeks, for buyers to book in the demo. */
async function addFutureSlots(db: Database, inspectorId: string, offsetDays: number, today: Date) {
  const slots = [];
  for (let day = 3 + offsetDays; day < 25 + offsetDays; day += 2) {
    const date = addDays(today, day);
    if (date.getUTCDay() === 0 || date.getUTCDay() === 6) continue;
    slots.push({ inspectorId, startsAt: addHours(date, 7), endsAt: addHours(date, 11) });
    slots.push({ inspectorId, startsAt: addHours(date, 12), endsAt: addHours(date, 16) });
  }
  await db.insert(inspectorSlots).values(slots);
}

/** Pays a demo booking on the payments stand-in, then applies its checkout.session.completed at once (the app is not serving yet). */
async function payOnStandIn(db: Database, sessionId: string, email: string) {
  const standIn = env().STRIPE_STAND_IN_URL;
  if (!standIn) throw new Error("the demo bookings need the payments stand-in (STRIPE_STAND_IN_URL)");
  const paid = await fetch(`${standIn}/__stand-in/sessions/${sessionId}/pay`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ card_number: "4242 4242 4242 4242", expiry: "12/34", cvc: "123", email }),
  });
  if (!paid.ok) throw new Error(`demo payment of ${sessionId} failed: ${paid.status} ${await paid.text()}`);
  const listed = await fetch(`${standIn}/v1/events?type=checkout.session.completed&limit=100`, { headers: { authorization: `Bearer ${env().STRIPE_SECRET_KEY}` } });
  const events = (await listed.json()) as { data: Stripe.Event[] };
  const completed = events.data.find((event) => (event.data.object as { id: string }).id === sessionId);
  if (!completed) throw new Error(`the payments stand-in sent no checkout.session.completed for ${sessionId}`);
  await handleStripeEvent(db, completed);
}

/**
 * Books an inspector for a listing at the given time, as `booker` would on the booking page: a slot of the
 * inspector's, a hold, a checkout session and (unless `pay` is false) the payment on the stand-in.
 */
export async function bookDemoInspection(
  db: Database,
  input: { booker: DemoPerson; listingSlug: string; inspectorId: string; startsAt: Date; requestedAt: Date; pay?: boolean },
) {
  const [slot] = await db
    .insert(inspectorSlots)
    .values({ inspectorId: input.inspectorId, startsAt: input.startsAt, endsAt: addHours(input.startsAt, 4) })
    .returning({ id: inspectorSlots.id });
  const { bookingId } = await createBooking(db, { booker: input.booker, listingSlug: input.listingSlug, inspectorId: input.inspectorId, slotId: slot!.id }, input.requestedAt);
  if (input.pay ?? true) {
    const [booking] = await db.select({ sessionId: bookings.checkoutSessionId }).from(bookings).where(eq(bookings.id, bookingId));
    await payOnStandIn(db, booking!.sessionId!, input.booker.email);
  }
  return bookingId;
}

/** Sets a finished demo booking's timestamps back to when its story says each step happened. */
export async function backdateBooking(db: Database, bookingId: string, at: { requested: Date; paid?: Date; accepted?: Date; ended?: Date; byEvent?: Record<string, Date> }) {
  const ended = at.ended ?? at.accepted ?? at.paid ?? at.requested;
  await db
    .update(bookings)
    .set({
      createdAt: at.requested,
      updatedAt: ended,
      ...(at.paid ? { paidAt: at.paid } : {}),
      ...(at.accepted ? { acceptedAt: at.accepted } : {}),
    })
    .where(eq(bookings.id, bookingId));
  const times: Record<string, Date> = {
    requested: at.requested,
    ...(at.paid ? { payment_received: at.paid } : {}),
    ...(at.accepted ? { accepted: at.accepted } : {}),
    ...at.byEvent,
  };
  for (const [kind, time] of Object.entries(times)) {
    await db.update(bookingEvents).set({ createdAt: time }).where(and(eq(bookingEvents.bookingId, bookingId), eq(bookingEvents.kind, kind)));
  }
  if (at.byEvent?.refund_issued) await db.update(bookingRefunds).set({ createdAt: at.byEvent.refund_issued }).where(eq(bookingRefunds.bookingId, bookingId));
  if (at.byEvent?.payout_recorded) await db.update(payouts).set({ createdAt: at.byEvent.payout_recorded }).where(eq(payouts.bookingId, bookingId));
}

type BookingPeople = { buyer: DemoPerson; otherBuyers: [DemoPerson, DemoPerson] };

/** The seller's site details for the machine of a demo booking. */
async function addDemoSite(db: Database, bookingId: string, site: { streetAddress: string; contactName: string; contactPhone: string; accessNotes: string }) {
  const [row] = await db.select({ listingId: bookings.listingId }).from(bookings).where(eq(bookings.id, bookingId));
  await db.insert(machineSites).values({ listingId: row!.listingId, ...site }).onConflictDoNothing();
}

async function slugOf(db: Database, model: string) {
  const [row] = await db.select({ slug: listings.slug }).from(listings).where(and(eq(listings.model, model), eq(listings.status, "published")));
  if (!row) throw new Error(`demo listing ${model} is missing or not published`);
  return row.slug;
}

/** A connected account on the payments stand-in with set-up finished, as if the inspector had gone through its page. */
async function setUpDemoPayouts(db: Database, person: DemoPerson) {
  const standIn = env().STRIPE_STAND_IN_URL;
  if (!standIn) throw new Error("the demo payouts need the payments stand-in (STRIPE_STAND_IN_URL)");
  await startPayoutOnboarding(db, person);
  const account = await getPayoutAccount(db, person.id);
  const finished = await fetch(`${standIn}/__stand-in/accounts/${account!.stripeAccountId}/state`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ state: "complete" }),
  });
  if (!finished.ok) throw new Error(`the payments stand-in did not finish the demo account: ${finished.status}`);
  await refreshPayoutAccount(db, person.id);
}

/**
 * Profiles and slots for the three certified inspectors, then a booking in each state a booking can be in
 * (besides those the reports demo files): not paid in time, released unpaid, awaiting payment, paid and
 * waiting, accepted and scheduled, declined and refunded, cancelled at short notice and half refunded.
 */
export async function seedDemoInspections(inspectors: Record<DemoInspectorKey, DemoPerson>, people: BookingPeople, now = new Date()) {
  const db = getDatabase();
  const today = scenarioToday(now);
  for (const [index, key] of (Object.keys(demoInspectorProfiles) as DemoInspectorKey[]).entries()) {
    const profile = demoInspectorProfiles[key];
    await saveProfile(db, inspectors[key].id, { ...profile, categories: [...profile.categories] });
    await setUpDemoPayouts(db, inspectors[key]);
    await addFutureSlots(db, inspectors[key].id, index, today);
  }
  const { buyer } = people;
  const [rafe, greta] = people.otherBuyers;
  const nextFree = async (inspector: DemoInspectorKey, skip = 0) => (await freeSlots(db, inspectors[inspector].id, now))[skip]!;
  const book = async (booker: DemoPerson, inspector: DemoInspectorKey, model: string, options: { pay: boolean; skip?: number; requestedDaysAgo?: number }) => {
    const slot = await nextFree(inspector, options.skip ?? 0);
    const requestedAt = options.requestedDaysAgo ? new Date(now.getTime() - options.requestedDaysAgo * DAY) : now;
    const { bookingId } = await createBooking(db, { booker, listingSlug: await slugOf(db, model), inspectorId: inspectors[inspector].id, slotId: slot.id }, requestedAt);
    if (options.pay) {
      const [row] = await db.select({ sessionId: bookings.checkoutSessionId }).from(bookings).where(eq(bookings.id, bookingId));
      await payOnStandIn(db, row!.sessionId!, booker.email);
    }
    return { bookingId, requestedAt };
  };
  const made: string[] = [];

  // Not paid in time: the checkout lapsed and the slot went back (first, so that no other hold of hers lapses with it).
  const lapsed = await book(greta, "mirelle", "FV 5 Vertical", { pay: false });
  await releaseLapsedCheckouts(db, inspectors.mirelle.id, addMinutes(now, 30 + checkoutExpiryMarginMinutes + 1));
  made.push(lapsed.bookingId);

  // Released by the buyer before paying.
  const released = await book(rafe, "beckstrand", "FK 3 Knee Mill", { pay: false, skip: 3 });
  await cancelBookingAsBuyer(db, rafe, released.bookingId, "Found the machine's own test certificate from last year; I will look at it first.");
  made.push(released.bookingId);

  // Awaiting payment: the buyer's checkout is open (the stand-in lapses it after 30 minutes).
  made.push((await book(buyer, "renner", "Series 17 x 60", { pay: false, skip: 4 })).bookingId);

  // Paid, waiting for the demo inspector to accept or decline.
  const waiting = await book(buyer, "renner", "OK-65 Bar", { pay: true, requestedDaysAgo: 1 });
  await backdateBooking(db, waiting.bookingId, { requested: waiting.requestedAt, paid: addMinutes(waiting.requestedAt, 7) });
  made.push(waiting.bookingId);

  // Accepted and scheduled: one for the demo inspector to file a report on, one far north.
  const forRenner = await book(rafe, "renner", "Series 12 x 36", { pay: true, skip: 1, requestedDaysAgo: 3 });
  await acceptBooking(db, inspectors.renner, forRenner.bookingId);
  await backdateBooking(db, forRenner.bookingId, { requested: forRenner.requestedAt, paid: addMinutes(forRenner.requestedAt, 12), accepted: addHours(forRenner.requestedAt, 20) });
  made.push(forRenner.bookingId);
  const north = await book(buyer, "beckstrand", "VH 5", { pay: true, requestedDaysAgo: 2 });
  await acceptBooking(db, inspectors.beckstrand, north.bookingId);
  await backdateBooking(db, north.bookingId, { requested: north.requestedAt, paid: addMinutes(north.requestedAt, 5), accepted: addHours(north.requestedAt, 6) });
  made.push(north.bookingId);

  // Where the two scheduled machines stand and whom to ask for (invented addresses), and a new time the buyer of
  // the demo inspector's visit has proposed, waiting for the inspector's answer.
  await addDemoSite(db, forRenner.bookingId, { streetAddress: "Kiln Row 7, Unit 4\nHarrowgate Trading Estate", contactName: "Pell Odegaard", contactPhone: "+44 113 496 0712", accessNotes: "Roller door on the east side; open 07:30–16:00, Friday until 13:00. Ask at the goods-in window." });
  await addDemoSite(db, north.bookingId, { streetAddress: "Fjellveien 41\n9516 Nordvik", contactName: "Sigrun Tvedt", contactPhone: "+47 784 49 213", accessNotes: "Loading dock behind the blue hall; forklift on site. Ring on arrival." });
  const proposed = addDays(today, 24);
  await requestReschedule(db, { ...rafe, roles: [] }, forRenner.bookingId, { date: proposed.toISOString().slice(0, 10), startTime: "09:00", durationMinutes: 240, reason: "The machine is moved to the front bay that week; the following one suits better." }, now);

  // Declined by the inspector: refunded in full.
  const declined = await book(buyer, "beckstrand", "OK-42 Turn", { pay: true, skip: 1, requestedDaysAgo: 2 });
  await declineBooking(db, inspectors.beckstrand, declined.bookingId, "I am away on a rebuild in Tärnvik that week. Book me for the week after and I will come to Falkenmoor first thing.");
  await backdateBooking(db, declined.bookingId, {
    requested: declined.requestedAt,
    paid: addMinutes(declined.requestedAt, 9),
    ended: addHours(declined.requestedAt, 5),
    byEvent: { inspector_declined: addHours(declined.requestedAt, 5), refund_issued: addHours(declined.requestedAt, 5) },
  });
  made.push(declined.bookingId);

  // Cancelled by the buyer two days before an accepted visit: half the fee back (the short-notice rule).
  let visitDay = addDays(today, -12);
  while (visitDay.getUTCDay() === 0 || visitDay.getUTCDay() === 6) visitDay = addDays(visitDay, -1);
  const visit = addHours(visitDay, 7);
  const requested = addHours(addDays(today, -26), 10);
  const cancelledId = await bookDemoInspection(db, { booker: buyer, listingSlug: await slugOf(db, "SG 824"), inspectorId: inspectors.renner.id, startsAt: visit, requestedAt: requested });
  await acceptBooking(db, inspectors.renner, cancelledId);
  const cancelledAt = addHours(visit, -48);
  await cancelBookingAsBuyer(db, buyer, cancelledId, "The seller sold the grinder to someone who came with cash.", cancelledAt);
  await backdateBooking(db, cancelledId, {
    requested,
    paid: addMinutes(requested, 14),
    accepted: addHours(requested, 22),
    ended: cancelledAt,
    byEvent: { short_notice: cancelledAt, refund_issued: addMinutes(cancelledAt, 1) },
  });
  made.push(cancelledId);

  const states = await db.select({ status: bookings.status }).from(bookings).where(inArray(bookings.id, made));
  return { bookings: made.length, states: states.map((row) => row.status) };
}
