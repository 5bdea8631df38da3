// Demo accuracy reports for `npm start`: an invented scenario. Fifteen demo machines are booked, paid on the
// payments stand-in and accepted through the inspections module, then filed and signed through this module,
// so every row is what the product itself would write. Readings are invented (see demo-readings.ts), and
// each set is scored by the engine before filing: a plan that does not score to its grade stops the seed.
import { addDays, addHours, addMinutes } from "date-fns";
import { and, eq } from "drizzle-orm";
import { getDatabase, type Database } from "~/db/client.server";
import type { Grade } from "~/geometry";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { acceptBooking } from "~/modules/inspections/bookings.server";
import { payInspector } from "~/modules/inspections/payouts.server";
import { backdateBooking, bookDemoInspection, scenarioToday, type DemoPerson } from "./inspections.server";
import type { DemoInspectorKey } from "./report-plans";
import { listings } from "~/modules/listings/schema";
import { demoReportPlans, formFor, type DemoBookerKey, type DemoReportPlan } from "./report-plans";
import { expectDemoGrade } from "./report-readings";
import { reports } from "~/modules/reports/schema";
import { signReport, startCorrection, submitReport } from "~/modules/reports/service.server";

const asInspector = (person: DemoPerson): SessionUser => ({
  id: person.id,
  email: person.email,
  name: person.name,
  emailVerified: true,
  roles: ["inspector"],
  displayUnits: "mm",
  inspectorStatus: "certified",
});

/** Files and signs one plan's report (and its correction), from booking to payout; returns the booking. */
async function fileDemoReport(db: Database, plan: DemoReportPlan, people: { inspectors: Record<DemoInspectorKey, DemoPerson>; bookers: Record<DemoBookerKey, DemoPerson> }, now: Date) {
  const today = scenarioToday(now);
  const [listing] = await db.select({ slug: listings.slug }).from(listings).where(and(eq(listings.model, plan.model), eq(listings.status, "published")));
  if (!listing) throw new Error(`demo report: no published listing ${plan.model}`);
  const inspector = people.inspectors[plan.inspector];
  // Visits fall on weekdays, in the morning or the afternoon slot.
  let day = addDays(today, -plan.measuredDaysAgo);
  while (day.getUTCDay() === 0 || day.getUTCDay() === 6) day = addDays(day, -1);
  const visit = addHours(day, Math.floor(plan.seed / 3) % 2 ? 12 : 7);
  const requested = addHours(addDays(visit, -(6 + (plan.seed % 7))), 3);
  const paid = addMinutes(requested, 6 + (plan.seed % 20));
  const accepted = addHours(requested, 18 + (plan.seed % 9));
  // The fresh report is signed as it is filed, after the saved searches it must alert.
  const signed = plan.fresh ? new Date() : addHours(visit, 8);

  const bookingId = await bookDemoInspection(db, { booker: people.bookers[plan.booker], listingSlug: listing.slug, inspectorId: inspector.id, startsAt: visit, requestedAt: requested });
  await acceptBooking(db, inspector, bookingId);
  const user = asInspector(inspector);

  const file = async (ratios: Record<string, number> | undefined, grade: Grade, notes: string, at: Date, label: string) => {
    const { form, score } = formFor(plan, ratios, visit, notes);
    expectDemoGrade(label, score, grade);
    const submitted = await submitReport(db, user, bookingId, { form }, at);
    if (!submitted.ok) throw new Error(`demo report ${label} was refused: ${JSON.stringify(submitted.errors)}`);
    const [stored] = await db.select({ grade: reports.grade }).from(reports).where(eq(reports.id, submitted.reportId));
    if (stored?.grade !== grade) throw new Error(`demo report ${label}: the server scored ${stored?.grade}, the plan says ${grade}`);
    await signReport(db, user, bookingId, submitted.reportId, at);
    return submitted.reportId;
  };

  if (plan.correction) {
    const first = await file(plan.correction.firstRatios, plan.correction.firstGrade, plan.correction.firstNotes, signed, `${plan.model} (revision 1)`);
    await startCorrection(db, user, first);
    await file(undefined, plan.grade, plan.notes, addDays(signed, plan.correction.daysLater), `${plan.model} (revision 2)`);
  } else {
    await file(undefined, plan.grade, plan.notes, signed, plan.model);
  }

  // The payout the queue would record at once; the fresh report's is left to the app's worker, so that one
  // booking shows "report filed" until the server has started.
  const byEvent: Record<string, Date> = { report_filed: signed };
  if (!plan.fresh) {
    await payInspector(db, bookingId);
    byEvent.payout_recorded = addMinutes(signed, 2);
  }
  await backdateBooking(db, bookingId, { requested, paid, accepted, ended: plan.fresh ? signed : addMinutes(signed, 2), byEvent });
  return bookingId;
}

/**
 * Signed demo reports across every grade, one corrected, one past its 12 months, for fifteen demo lathes.
 * `which` picks the archive (signed in the past) or the fresh one (signed now, after the saved searches).
 */
export async function seedDemoReports(
  people: { inspectors: Record<DemoInspectorKey, DemoPerson>; bookers: Record<DemoBookerKey, DemoPerson> },
  which: "archive" | "fresh",
  now = new Date(),
) {
  const db = getDatabase();
  let filed = 0;
  for (const plan of demoReportPlans) {
    if (Boolean(plan.fresh) !== (which === "fresh")) continue;
    await fileDemoReport(db, plan, people, now);
    filed += 1;
  }
  return filed;
}
