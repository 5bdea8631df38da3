// Demo accuracy reports for `npm start`: an invented scenario. Three demo lathes are booked, paid on the
// payments stand-in and accepted through the inspections module, then filed and signed through this
// module, so every row is what the product itself would write. Readings are invented.
import { subDays, subMonths } from "date-fns";
import { and, eq, inArray } from "drizzle-orm";
import type Stripe from "stripe";
import { getDatabase } from "~/db/client.server";
import { env } from "~/env.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { acceptBooking, createBooking } from "~/modules/inspections/bookings.server";
import { freeSlots } from "~/modules/inspections/profiles.server";
import { bookings } from "~/modules/inspections/schema";
import { handleStripeEvent } from "~/modules/inspections/webhook.server";
import { listings } from "~/modules/listings/schema";
import type { ReportForm } from "./form";
import { reports } from "./schema";
import { signReport, submitReport } from "./service.server";

type Person = { id: string; email: string; name: string };
type Rows = Array<[number, number]>;

const points = (rows: Rows) => rows.map(([station, reading]) => ({ station: String(station), reading: String(reading) }));

function readings(grade: "A" | "C" | "D", travel: number) {
  const step = travel / 4;
  const along = (values: number[]): Rows => values.map((value, i) => [Math.round(step * i), value]);
  const common = {
    "L-BED-X": { kind: "level", points: points([[0, 10], [Math.round(travel / 2), 20], [travel, 24]]), instrumentId: "i2" },
    "L-CAR-H": { kind: "profile", points: points(along([0, 2, 3, 1, 0])), instrumentId: "i1" },
    "L-SP-CTR": { kind: "extremes", max: "5", min: "0", instrumentId: "i1" },
    "L-TS-SLV-V": { kind: "near-far", near: "0", far: "6", instrumentId: "i1" },
    "L-TS-SLV-H": { kind: "near-far", near: "0", far: "4", instrumentId: "i1" },
    "L-TS-TAP-V": { kind: "near-far", near: "0", far: "12", instrumentId: "i1" },
    "L-TS-TAP-H": { kind: "near-far", near: "0", far: "10", instrumentId: "i1" },
    "L-CTR-HT": { kind: "centre-height", headstockEnd: "0", tailstockEnd: "15", instrumentId: "i1" },
    "L-XS-SQ": { kind: "profile", points: points([[0, 0], [100, 1], [200, 2], [300, 3]]), instrumentId: "i1" },
  };
  if (grade === "A") {
    return {
      ...common,
      "L-BED-V": { kind: "profile", points: points(along([0, 2, 4, 3, 0])), instrumentId: "i1" },
      "L-SP-SLIP": { kind: "extremes", max: "3", min: "0", instrumentId: "i1" },
      "L-SP-NOSE": { kind: "sweep", readings: ["0", "2", "3", "1", "0", "1", "2", "1"], instrumentId: "i1" },
      "L-SP-TAP-N": { kind: "extremes", max: "4", min: "0", instrumentId: "i1" },
      "L-SP-TAP-F": { kind: "extremes", max: "7", min: "0", instrumentId: "i1" },
      "L-SP-PAR-V": { kind: "mandrel", near0: "2", near180: "-2", far0: "14", far180: "4", instrumentId: "i1" },
      "L-SP-PAR-H": { kind: "mandrel", near0: "1", near180: "-1", far0: "6", far180: "2", instrumentId: "i1" },
      "L-P-ROUND": { kind: "sweep", readings: ["0", "1", "3", "2", "1", "0"], instrumentId: "i1" },
    };
  }
  if (grade === "C") {
    return {
      ...common,
      "L-BED-V": { kind: "profile", points: points(along([0, 4, 7, 5, 0])), instrumentId: "i1" },
      "L-SP-SLIP": { kind: "extremes", max: "5", min: "0", instrumentId: "i1" },
      "L-SP-NOSE": { kind: "sweep", readings: ["0", "3", "6", "4", "1", "2"], instrumentId: "i1" },
      "L-SP-TAP-N": { kind: "extremes", max: "6", min: "0", instrumentId: "i1" },
      "L-SP-TAP-F": { kind: "extremes", max: "12", min: "0", instrumentId: "i1" },
      "L-SP-PAR-V": { kind: "mandrel", near0: "0", near180: "0", far0: "16", far180: "8", instrumentId: "i1" },
      // The free end leans 3 µm away from the tool: a direction failure, however small.
      "L-SP-PAR-H": { kind: "mandrel", near0: "1", near180: "-1", far0: "-2", far180: "-4", instrumentId: "i1" },
    };
  }
  return {
    ...common,
    "L-BED-V": { kind: "profile", points: points(along([0, 12, 24, 30, 8])), instrumentId: "i1" },
    "L-SP-SLIP": { kind: "extremes", max: "14", min: "0", instrumentId: "i1" },
    "L-SP-NOSE": { kind: "sweep", readings: ["0", "6", "14", "18", "9", "3"], instrumentId: "i1" },
    "L-SP-TAP-N": { kind: "extremes", max: "12", min: "0", instrumentId: "i1" },
    "L-SP-TAP-F": { kind: "extremes", max: "26", min: "0", instrumentId: "i1" },
    "L-SP-PAR-V": { kind: "mandrel", near0: "0", near180: "0", far0: "-8", far180: "-12", instrumentId: "i1" },
    "L-SP-PAR-H": { kind: "mandrel", near0: "0", near180: "0", far0: "9", far180: "5", instrumentId: "i1" },
  };
}

const plans = [
  { model: "KD 320", grade: "A" as const, measured: (now: Date) => subDays(now, 20), notes: "Reground bed and new spindle bearings show: every test well inside tolerance." },
  { model: "Series 14 x 40", grade: "C" as const, measured: (now: Date) => subMonths(now, 2), notes: "Headstock sits slightly twisted on the bed: the spindle axis leans away from the tool. Shimming the headstock would correct it." },
  { model: "OL 400", grade: "D" as const, measured: (now: Date) => subMonths(now, 14), notes: "Worn spindle bearings and a dipped bed near the chuck. Sold as is; priced for a rebuild." },
];

/** Pays a demo booking on the stand-in and applies the checkout event at once (the app is not serving yet). */
async function payOnStandIn(sessionId: string, email: string) {
  const standIn = env().STRIPE_STAND_IN_URL;
  if (!standIn) return false;
  const paid = await fetch(`${standIn}/__stand-in/sessions/${sessionId}/pay`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ card_number: "4242 4242 4242 4242", expiry: "12/34", cvc: "123", email }),
  });
  if (!paid.ok) return false;
  const events = (await (await fetch(`${standIn}/v1/events?limit=100`, { headers: { authorization: `Bearer ${env().STRIPE_SECRET_KEY}` } })).json()) as { data: Stripe.Event[] };
  const completed = events.data.find((event) => event.type === "checkout.session.completed" && (event.data.object as { id: string }).id === sessionId);
  if (completed) await handleStripeEvent(getDatabase(), completed);
  return Boolean(completed);
}

/** Signed demo reports across grades (A, C, and an expired D) for three demo lathes; 0 when reports exist already. */
export async function seedDemoReports({ inspector, buyer }: { inspector: Person; buyer: Person }) {
  const db = getDatabase();
  const [existing] = await db.select({ id: reports.id }).from(reports).limit(1);
  if (existing) return 0;
  const candidates = await db
    .select()
    .from(listings)
    .where(and(eq(listings.status, "published"), inArray(listings.model, plans.map((plan) => plan.model))));
  const asInspector = { id: inspector.id, email: inspector.email, name: inspector.name, emailVerified: true, roles: ["inspector"], displayUnits: "mm", inspectorStatus: "certified" } as SessionUser;
  let signed = 0;
  for (const plan of plans) {
    const listing = candidates.find((candidate) => candidate.model === plan.model);
    const [slot] = await freeSlots(db, inspector.id);
    if (!listing || !slot) continue;
    const { bookingId } = await createBooking(db, { booker: buyer, listingSlug: listing.slug, inspectorId: inspector.id, slotId: slot.id });
    const [booking] = await db.select({ sessionId: bookings.checkoutSessionId }).from(bookings).where(eq(bookings.id, bookingId));
    if (!booking?.sessionId || !(await payOnStandIn(booking.sessionId, buyer.email))) continue;
    await acceptBooking(db, inspector, bookingId);
    const measured = plan.measured(new Date());
    const travel = listing.distanceBetweenCentresMm && listing.distanceBetweenCentresMm <= 1500 ? Math.floor(listing.distanceBetweenCentresMm / 100) * 100 : 1000;
    const form = {
      units: "mm",
      profile: { key: "centre-lathe-normal", version: 1, reason: "" },
      measuredOn: measured.toISOString().slice(0, 10),
      conditions: { ambientTemperatureC: "19.5", warmUpMinutes: "40", levelled: "yes", notes: "Machine levelled on its own feet before the tests." },
      instruments: [
        { id: "i1", kind: "lever-indicator", description: "Orvik lever indicator, 0.001 mm", resolution: "1", calibrationDue: "2031-03-01" },
        { id: "i2", kind: "electronic-level", description: "Quellmark electronic level, 1 µm/m", resolution: "1", calibrationDue: "2031-03-01" },
        { id: "i3", kind: "test-mandrel", description: "300 mm test mandrel, MT5", resolution: "", calibrationDue: "" },
      ],
      tests: readings(plan.grade, travel),
      notes: plan.notes,
      safetyAcknowledged: true,
    } satisfies Omit<ReportForm, "tests"> & { tests: Record<string, Record<string, unknown>> };
    const submitted = await submitReport(db, asInspector, bookingId, { form }, measured);
    if (!submitted.ok) throw new Error(`demo report for ${plan.model} was refused: ${JSON.stringify(submitted.errors)}`);
    await signReport(db, asInspector, bookingId, submitted.reportId, measured);
    signed += 1;
  }
  return signed;
}
