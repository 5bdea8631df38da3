// Meeting at the machine once the inspector has accepted: the machine's street address, a contact and access
// notes (entered by the seller, read only by the booking's parties), the visit as a calendar file, and a
// request to move the visit that the other side accepts or declines.
import { and, desc, eq } from "drizzle-orm";
import { env } from "~/env.server";
import { user } from "~/modules/accounts/schema";
import { listings } from "~/modules/listings/schema";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { EmailAction, EmailHeading, EmailLayout, EmailParagraph } from "~/modules/mail/templates/layout";
import { logBookingEvent, type Viewer } from "./bookings.server";
import type { BookingRole } from "./booking-view.server";
import { visitCalendar } from "./calendar";
import { BookingRuleError, isExclusionViolation } from "./errors";
import { formatVisit, instantAtMachine } from "./local-time";
import type { Executor } from "./profiles.server";
import type { BookingStatus } from "./rules";
import { bookings, machineSites, rescheduleRequests } from "./schema";
import type { MachineSiteInput } from "./validation";
import type { Database } from "~/db/client.server";
import type { z } from "zod";
import type { rescheduleSchema } from "./validation";

/** Once the inspector has accepted, the parties need to meet; before that nobody but the seller reads the address. */
const MEETING_STATES: readonly BookingStatus[] = ["accepted", "report_filed", "closed"];

async function bookingWithPlace(db: Executor, bookingId: string) {
  const [row] = await db
    .select({
      booking: bookings,
      listing: { id: listings.id, slug: listings.slug, make: listings.make, model: listings.model, city: listings.city, region: listings.region, country: listings.country, sellerId: listings.sellerId },
    })
    .from(bookings)
    .innerJoin(listings, eq(listings.id, bookings.listingId))
    .where(eq(bookings.id, bookingId));
  return row ?? null;
}
type BookingWithPlace = NonNullable<Awaited<ReturnType<typeof bookingWithPlace>>>;

function roleIn(row: BookingWithPlace, viewer: Viewer): BookingRole | null {
  if (row.booking.buyerId === viewer.id) return "buyer";
  if (row.booking.inspectorId === viewer.id) return "inspector";
  if (row.listing.sellerId === viewer.id) return "seller";
  return viewer.roles.includes("admin") ? "admin" : null;
}

async function partyOf(db: Executor, bookingId: string, viewer: Viewer) {
  const row = await bookingWithPlace(db, bookingId);
  const role = row ? roleIn(row, viewer) : null;
  if (!row || !role) throw new BookingRuleError("This booking is not yours.", 404);
  return { row, role };
}

async function siteOf(db: Executor, listingId: string) {
  const [site] = await db.select().from(machineSites).where(eq(machineSites.listingId, listingId));
  return site ?? null;
}

/** What the booking page shows of the visit to `role`: the site once accepted, the open request to move it, what they may do. */
export async function visitLogistics(db: Executor, bookingId: string, viewer: Viewer) {
  const { row, role } = await partyOf(db, bookingId, viewer);
  const status = row.booking.status as BookingStatus;
  const meeting = MEETING_STATES.includes(status);
  const site = role === "seller" || meeting ? await siteOf(db, row.listing.id) : null;
  const [pending] = await db
    .select()
    .from(rescheduleRequests)
    .where(and(eq(rescheduleRequests.bookingId, bookingId), eq(rescheduleRequests.status, "pending")))
    .orderBy(desc(rescheduleRequests.createdAt))
    .limit(1);
  const party = role === "buyer" || role === "inspector" ? role : null;
  return {
    role,
    meeting,
    site: site ? { streetAddress: site.streetAddress, contactName: site.contactName, contactPhone: site.contactPhone, accessNotes: site.accessNotes } : null,
    canEditSite: role === "seller" && !["declined", "refunded", "cancelled", "expired", "closed"].includes(status),
    calendarUrl: status === "accepted" ? `/bookings/${bookingId}/visit.ics` : null,
    place: { city: row.listing.city, region: row.listing.region, country: row.listing.country },
    // A request left open when the booking was cancelled or reported on is moot.
    reschedule: pending && status === "accepted"
      ? {
          id: pending.id,
          requestedBy: pending.requestedBy,
          startsAt: pending.startsAt.toISOString(),
          endsAt: pending.endsAt.toISOString(),
          reason: pending.reason,
          mine: pending.requestedBy === party,
          canDecide: party !== null && pending.requestedBy !== party,
        }
      : null,
    canRequestReschedule: status === "accepted" && party !== null && !pending,
  };
}

export type VisitLogistics = Awaited<ReturnType<typeof visitLogistics>>;

/** The seller records where the machine stands and who lets the inspector in; kept per machine for later visits. */
export async function saveMachineSite(db: Database, viewer: Viewer, bookingId: string, input: MachineSiteInput) {
  const { row, role } = await partyOf(db, bookingId, viewer);
  if (role !== "seller") throw new BookingRuleError("Only the machine's seller gives its address.", 403);
  const values = { ...input, updatedAt: new Date() };
  await db.insert(machineSites).values({ listingId: row.listing.id, ...values }).onConflictDoUpdate({ target: machineSites.listingId, set: values });
}

/** The calendar file of an accepted visit, for its parties. */
export async function visitCalendarFile(db: Executor, viewer: Viewer, bookingId: string, now = new Date()) {
  const { row } = await partyOf(db, bookingId, viewer);
  if (row.booking.status !== "accepted") throw new BookingRuleError("The visit goes in a calendar once the inspector has accepted it.", 409);
  const site = await siteOf(db, row.listing.id);
  const moves = await db.select({ id: rescheduleRequests.id }).from(rescheduleRequests).where(and(eq(rescheduleRequests.bookingId, bookingId), eq(rescheduleRequests.status, "accepted")));
  const origin = env().APP_ORIGIN;
  const where = site ? `${site.streetAddress.replace(/\s*\n\s*/g, ", ")}` : [row.listing.city, row.listing.region, row.listing.country].filter(Boolean).join(", ");
  const description = [
    `Inspection ${row.booking.reference} of the ${row.listing.make} ${row.listing.model}.`,
    site ? `Contact: ${site.contactName}, ${site.contactPhone}.` : "The seller has not given the address yet; see the booking page.",
    site?.accessNotes ? `Access: ${site.accessNotes}` : "",
    `Booking: ${origin}/bookings/${bookingId}`,
  ].filter(Boolean);
  return {
    filename: `inspection-${row.booking.reference}.ics`,
    body: visitCalendar({
      uid: `${row.booking.id}@tenthmark`,
      sequence: moves.length,
      startsAt: row.booking.startsAt,
      endsAt: row.booking.endsAt,
      stampedAt: now,
      summary: `Machine inspection: ${row.listing.make} ${row.listing.model} (${row.booking.reference})`,
      location: where,
      description: description.join("\n"),
      url: `${origin}/bookings/${bookingId}`,
    }),
  };
}

type NewTime = z.infer<typeof rescheduleSchema>;

/** The buyer or the inspector asks to move an accepted visit; the other side is e-mailed. */
export async function requestReschedule(db: Database, viewer: Viewer, bookingId: string, input: NewTime, now = new Date()) {
  const { row, role } = await partyOf(db, bookingId, viewer);
  if (role !== "buyer" && role !== "inspector") throw new BookingRuleError("Only the buyer or the inspector can move the visit.", 403);
  if (row.booking.status !== "accepted") throw new BookingRuleError("Only an accepted visit can be moved.", 409);
  const startsAt = instantAtMachine(input.date, input.startTime, row.listing);
  const endsAt = new Date(startsAt.getTime() + input.durationMinutes * 60_000);
  if (startsAt.getTime() <= now.getTime() + 60 * 60_000) throw new BookingRuleError("Propose a time at least an hour from now.", 422, "date");
  if (startsAt.getTime() === row.booking.startsAt.getTime() && endsAt.getTime() === row.booking.endsAt.getTime()) {
    throw new BookingRuleError("That is the time already booked.", 422, "date");
  }
  try {
    await db.transaction(async (tx) => {
      await tx.insert(rescheduleRequests).values({ bookingId, requestedBy: role, requesterId: viewer.id, startsAt, endsAt, reason: input.reason });
      await logBookingEvent(tx, bookingId, { kind: `reschedule_requested_by_${role}`, actorId: viewer.id, note: formatVisit(startsAt, endsAt, row.listing) });
    });
  } catch (error) {
    if ((error as { cause?: { code?: string } }).cause?.code === "23505" || (error as { code?: string }).code === "23505") {
      throw new BookingRuleError("A request to move this visit is already open.", 409);
    }
    throw error;
  }
  const other = role === "buyer" ? row.booking.inspectorId : row.booking.buyerId;
  await tell(db, row, [other], {
    subject: `Request to move inspection ${row.booking.reference}`,
    heading: "A new time is proposed for the visit",
    paragraphs: [
      `The ${role} asks to move the inspection of the ${row.listing.make} ${row.listing.model} from ${formatVisit(row.booking.startsAt, row.booking.endsAt, row.listing, "long")} to ${formatVisit(startsAt, endsAt, row.listing, "long")}.`,
      input.reason ? `Their reason: “${input.reason}”` : "",
      "Accept or decline it on the booking page. Until then the visit stays as booked.",
    ],
  });
}

/** The other side accepts or declines the request; the requester may withdraw it. Accepting moves the visit. */
export async function decideReschedule(db: Database, viewer: Viewer, bookingId: string, requestId: string, decision: "accept" | "decline" | "withdraw", now = new Date()) {
  const { row, role } = await partyOf(db, bookingId, viewer);
  if (role !== "buyer" && role !== "inspector") throw new BookingRuleError("Only the buyer or the inspector can answer a request to move the visit.", 403);
  const outcome = await db
    .transaction(async (tx) => {
      const [request] = await tx
        .select()
        .from(rescheduleRequests)
        .where(and(eq(rescheduleRequests.id, requestId), eq(rescheduleRequests.bookingId, bookingId)))
        .for("update");
      if (!request) throw new BookingRuleError("No such request.", 404);
      if (request.status !== "pending") throw new BookingRuleError("This request has been answered already.", 409);
      const own = request.requestedBy === role;
      if (decision === "withdraw" ? !own : own) throw new BookingRuleError(own ? "The other side answers your request; you may withdraw it." : "Only who asked may withdraw a request.", 403);
      const status = decision === "accept" ? "accepted" : decision === "decline" ? "declined" : "withdrawn";
      await tx.update(rescheduleRequests).set({ status, decidedAt: now }).where(eq(rescheduleRequests.id, request.id));
      if (decision === "accept") {
        const [moved] = await tx
          .update(bookings)
          .set({ startsAt: request.startsAt, endsAt: request.endsAt, updatedAt: now })
          .where(and(eq(bookings.id, bookingId), eq(bookings.status, "accepted")))
          .returning({ id: bookings.id });
        if (!moved) throw new BookingRuleError("Only an accepted visit can be moved.", 409);
      }
      await logBookingEvent(tx, bookingId, { kind: `reschedule_${status}`, actorId: viewer.id, note: formatVisit(request.startsAt, request.endsAt, row.listing) });
      return { request, status };
    })
    .catch((error: unknown) => {
      if (isExclusionViolation(error)) throw new BookingRuleError("The inspector has another booking at that time; decline it and propose another.", 409);
      throw error;
    });
  if (outcome.status === "withdrawn") return;
  const { request } = outcome;
  const newTime = formatVisit(request.startsAt, request.endsAt, row.listing, "long");
  const requester = request.requestedBy === "buyer" ? row.booking.buyerId : row.booking.inspectorId;
  const accepted = outcome.status === "accepted";
  await tell(db, row, accepted ? [row.booking.buyerId, row.booking.inspectorId, row.listing.sellerId] : [requester], {
    subject: accepted ? `Inspection ${row.booking.reference} moved to ${newTime}` : `Inspection ${row.booking.reference} stays as booked`,
    heading: accepted ? "The visit has a new time" : "The request to move the visit was declined",
    paragraphs: accepted
      ? [`The inspection of the ${row.listing.make} ${row.listing.model} now takes place on ${newTime}.`, "Replace the old calendar entry with the new file from the booking page."]
      : [`The visit stays on ${formatVisit(row.booking.startsAt, row.booking.endsAt, row.listing, "long")}.`, "You may propose another time on the booking page."],
    calendar: accepted,
  });
}

/** One e-mail to each of `userIds`, with a link to the booking page (the inspector's own for the inspector). */
async function tell(db: Executor, row: BookingWithPlace, userIds: string[], letter: { subject: string; heading: string; paragraphs: string[]; calendar?: boolean }) {
  const origin = env().APP_ORIGIN;
  for (const id of [...new Set(userIds)]) {
    const [person] = await db.select({ email: user.email }).from(user).where(eq(user.id, id));
    if (!person) continue;
    const page = id === row.booking.inspectorId ? `${origin}/inspector/bookings/${row.booking.id}` : `${origin}/bookings/${row.booking.id}`;
    const paragraphs = [...letter.paragraphs.filter(Boolean), ...(letter.calendar ? [`Calendar file (after signing in): ${origin}/bookings/${row.booking.id}/visit.ics`] : [])];
    const { html, text } = await renderEmail(
      <EmailLayout preview={letter.subject} reason={`You receive this because you are a party to inspection ${row.booking.reference} on Tenthmark.`}>
        <EmailHeading>{letter.heading}</EmailHeading>
        {paragraphs.map((paragraph) => (
          <EmailParagraph key={paragraph}>{paragraph}</EmailParagraph>
        ))}
        <EmailAction href={page}>Open the booking</EmailAction>
      </EmailLayout>,
    );
    await queueEmail({ to: person.email, subject: letter.subject, html, text, tag: "booking-reschedule" });
  }
}
