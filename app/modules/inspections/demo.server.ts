// Demo inspectors, slots and bookings for `npm start`: an invented scenario (invented people and places).
import { addDays, addHours, startOfDay } from "date-fns";
import { eq } from "drizzle-orm";
import type Stripe from "stripe";
import { getDatabase } from "~/db/client.server";
import { env } from "~/env.server";
import { listings } from "~/modules/listings/schema";
import { acceptBooking, createBooking } from "./bookings.server";
import { saveProfile } from "./profiles.server";
import { bookings, inspectorProfiles, inspectorSlots } from "./schema";
import { handleStripeEvent } from "./webhook.server";

type Person = { id: string; email: string };

const profiles = [
  {
    headline: "Lathe rebuilder, geometry checks since 1997",
    bio: "Twenty-eight years rebuilding centre and toolroom lathes in the Haldmark workshops: scraping beds, regrinding spindles, fitting new bearings. I check a machine the way I would before buying it myself, and I write down what I find in plain words.",
    qualifications: "Journeyman machine-tool fitter (Haldmark trade board, 1995)\nCalibrated 0.001 mm dial test indicators, a 300 mm test mandrel and a 0.02 mm/m precision level, all calibrated within the year",
    baseCity: "Ostervik",
    regions: ["Lower Haldmark", "Marlshire"],
    currency: "EUR" as const,
    categories: ["centre_lathe", "toolroom_lathe", "cnc_lathe"] as const,
    fees: { centre_lathe: 38_000, toolroom_lathe: 45_000, cnc_lathe: 52_000 },
  },
  {
    headline: "Precision turning and CNC lathe inspection",
    bio: "Former quality lead of a turning shop in Saint-Aubrel. I specialise in spindle condition and axis alignment of CNC and toolroom lathes, and bring my own mandrels and levels.",
    qualifications: "Metrology technician diploma (Vernois technical institute)\n12 years of acceptance tests on new and reconditioned lathes",
    baseCity: "Saint-Aubrel",
    regions: ["Haute-Vernois", "Lower Haldmark"],
    currency: "EUR" as const,
    categories: ["centre_lathe", "toolroom_lathe", "cnc_lathe"] as const,
    fees: { centre_lathe: 34_000, toolroom_lathe: 41_000, cnc_lathe: 56_000 },
  },
];

async function addDemoSlots(inspectorId: string, offsetDays: number) {
  const first = startOfDay(addDays(new Date(), 3 + offsetDays));
  const slots = [];
  for (let day = 0; day < 21; day += 2) {
    const date = addDays(first, day);
    if (date.getUTCDay() === 0 || date.getUTCDay() === 6) continue;
    slots.push({ inspectorId, startsAt: addHours(date, 7), endsAt: addHours(date, 11) });
    slots.push({ inspectorId, startsAt: addHours(date, 12), endsAt: addHours(date, 16) });
  }
  await getDatabase().insert(inspectorSlots).values(slots);
}

/** Pays a demo booking on the payments stand-in, then applies its checkout.session.completed at once (the app is not up yet to receive it). */
async function payOnStandIn(bookingId: string, sessionId: string, buyerEmail: string) {
  const standIn = env().STRIPE_STAND_IN_URL;
  if (!standIn) return false;
  const paid = await fetch(`${standIn}/__stand-in/sessions/${sessionId}/pay`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ card_number: "4242 4242 4242 4242", expiry: "12/34", cvc: "123", email: buyerEmail }),
  });
  if (!paid.ok) throw new Error(`demo payment of ${bookingId} failed: ${paid.status}`);
  const events = (await (await fetch(`${standIn}/v1/events?limit=100`, { headers: { authorization: `Bearer ${env().STRIPE_SECRET_KEY}` } })).json()) as { data: Stripe.Event[] };
  const completed = events.data.find((event) => event.type === "checkout.session.completed" && (event.data.object as { id: string }).id === sessionId);
  if (completed) await handleStripeEvent(getDatabase(), completed);
  return Boolean(completed);
}

/**
 * Two certified inspectors with profiles and slots, and two bookings by the demo buyer: one paid request
 * waiting for the inspector, one accepted. Called from scripts/lib/seed.ts after the accounts and listings.
 */
export async function seedDemoInspections({ inspectors, buyer }: { inspectors: Person[]; buyer: Person }) {
  const db = getDatabase();
  const [existing] = await db.select({ id: inspectorProfiles.userId }).from(inspectorProfiles).where(eq(inspectorProfiles.userId, inspectors[0]!.id));
  if (existing) return 0;
  for (const [index, inspector] of inspectors.entries()) {
    const profile = profiles[index % profiles.length]!;
    await saveProfile(db, inspector.id, { ...profile, categories: [...profile.categories], feeMinorByCategory: profile.fees });
    await addDemoSlots(inspector.id, index);
  }
  const published = await db.select({ slug: listings.slug, category: listings.category, region: listings.region }).from(listings).where(eq(listings.status, "published"));
  const bookingsMade: string[] = [];
  const plans = [
    { inspector: inspectors[0]!, listing: published.find((listing) => listing.category === "centre_lathe" && listing.region === "Lower Haldmark"), accept: false },
    { inspector: inspectors[1] ?? inspectors[0]!, listing: published.find((listing) => listing.category === "toolroom_lathe" && listing.region === "Lower Haldmark"), accept: true },
  ];
  for (const plan of plans) {
    if (!plan.listing) continue;
    const [slot] = await db.select().from(inspectorSlots).where(eq(inspectorSlots.inspectorId, plan.inspector.id)).orderBy(inspectorSlots.startsAt).limit(1);
    if (!slot) continue;
    const { bookingId } = await createBooking(db, { booker: buyer, listingSlug: plan.listing.slug, inspectorId: plan.inspector.id, slotId: slot.id });
    const [{ sessionId }] = (await db.select({ sessionId: bookings.checkoutSessionId }).from(bookings).where(eq(bookings.id, bookingId))) as [{ sessionId: string }];
    if ((await payOnStandIn(bookingId, sessionId, buyer.email)) && plan.accept) await acceptBooking(db, plan.inspector, bookingId);
    bookingsMade.push(bookingId);
  }
  return bookingsMade.length;
}
