// E-mails about a booking: each change of status tells the people it concerns, through the mail queue.
import { and, eq, inArray } from "drizzle-orm";
import { env } from "~/env.server";
import { user, userRole } from "~/modules/accounts/schema";
import { listings } from "~/modules/listings/schema";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { EmailAction, EmailHeading, EmailLayout, EmailParagraph } from "~/modules/mail/templates/layout";
import { formatMoney } from "~/modules/units/format";
import { formatVisit, formatVisitDate } from "./local-time";
import type { Executor } from "./profiles.server";
import { bookings } from "./schema";

export type BookingNotice =
  | { kind: "paid" }
  | { kind: "accepted" }
  | { kind: "declined"; reason: string }
  | { kind: "cancelled_by_buyer"; reason: string }
  | { kind: "cancelled_by_inspector"; reason: string }
  | { kind: "refunded"; amountMinor: number; pending?: boolean; refundId?: string }
  | { kind: "refund_failed"; amountMinor: number; reason: string }
  | { kind: "expired" }
  | { kind: "payment_processing" }
  | { kind: "payment_failed" }
  | { kind: "slot_lost" }
  | { kind: "payout"; amountMinor: number }
  | { kind: "share_held"; amountMinor: number }
  | { kind: "share_unclaimed"; amountMinor: number }
  | { kind: "payout_failed"; amountMinor: number; reason: string };

/** Everyone who holds the staff role: told of money that did not move as it should. */
async function staffAddresses(db: Executor): Promise<string[]> {
  const rows = await db.select({ email: user.email }).from(user).innerJoin(userRole, and(eq(userRole.userId, user.id), eq(userRole.role, "admin")));
  return rows.map((row) => row.email);
}

type Letter = { to: string; subject: string; heading: string; paragraphs: string[]; action?: { href: string; label: string }; reason: string };

export async function sendBookingNotice(db: Executor, bookingId: string, notice: BookingNotice) {
  const [row] = await db
    .select({
      booking: bookings,
      machine: { make: listings.make, model: listings.model, city: listings.city, region: listings.region, country: listings.country, sellerId: listings.sellerId, slug: listings.slug },
    })
    .from(bookings)
    .innerJoin(listings, eq(listings.id, bookings.listingId))
    .where(eq(bookings.id, bookingId));
  if (!row) return;
  const { booking, machine } = row;
  const people = await db
    .select({ id: user.id, name: user.name, email: user.email })
    .from(user)
    .where(inArray(user.id, [booking.buyerId, booking.inspectorId, machine.sellerId]));
  const person = (id: string) => people.find((candidate) => candidate.id === id);
  const buyer = person(booking.buyerId)!;
  const inspector = person(booking.inspectorId)!;
  const seller = machine.sellerId !== booking.buyerId ? person(machine.sellerId) : undefined;
  const origin = env().APP_ORIGIN;
  const buyerLink = { href: `${origin}/bookings/${booking.id}`, label: "Open the booking" };
  const calendarAddress = `${origin}/bookings/${booking.id}/visit.ics`;
  const receiptAddress = (file: string) => `${origin}/bookings/${booking.id}/receipts/${file}.pdf`;
  const inspectorLink = { href: `${origin}/inspector/bookings/${booking.id}`, label: "Open the request" };
  const what = `${machine.make} ${machine.model} in ${machine.city}`;
  // The visit's time where the machine stands, with UTC beside it.
  const slot = formatVisit(booking.startsAt, booking.endsAt, machine, "long");
  const fee = formatMoney(booking.feeMinor, booking.currency);
  const ref = booking.reference;
  const forBuyer = `You receive this because you booked inspection ${ref} on Tenthmark.`;
  const forInspector = `You receive this because you are the inspector of booking ${ref} on Tenthmark.`;
  const forSeller = `You receive this because an inspection of your listing was booked on Tenthmark (${ref}).`;

  const letters: Letter[] = [];
  switch (notice.kind) {
    case "paid":
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref} paid — waiting for ${inspector.name}`,
        heading: "Your inspection is paid",
        paragraphs: [
          `We received ${fee} for the inspection of the ${what} on ${slot}.`,
          `${inspector.name} will accept or decline shortly; if they decline, the whole fee is refunded.`,
          `Your receipt (PDF, after signing in): ${receiptAddress("payment")}`,
        ],
        action: buyerLink,
        reason: forBuyer,
      });
      letters.push({
        to: inspector.email,
        subject: `New inspection request ${ref}: ${machine.make} ${machine.model}, ${formatVisitDate(booking.startsAt, machine)}`,
        heading: "A new inspection request",
        paragraphs: [`${buyer.name} booked and paid you (${fee}) to inspect the ${what} on ${slot}.`, "Please accept or decline it. Declining refunds the buyer in full."],
        action: { href: inspectorLink.href, label: "Accept or decline" },
        reason: forInspector,
      });
      break;
    case "accepted":
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref} accepted for ${formatVisitDate(booking.startsAt, machine)}`,
        heading: "Your inspection is scheduled",
        paragraphs: [
          `${inspector.name} accepted the inspection of the ${what} on ${slot}.`,
          "The machine's address, the contact on site and the access notes are on the booking page, for you and the inspector only.",
          `Calendar file (after signing in): ${calendarAddress}`,
        ],
        action: buyerLink,
        reason: forBuyer,
      });
      if (seller)
        letters.push({
          to: seller.email,
          subject: `An inspector visits your ${machine.make} ${machine.model} on ${formatVisitDate(booking.startsAt, machine)}`,
          heading: "An inspection of your machine is scheduled",
          paragraphs: [
            `${inspector.name} will inspect the ${what} on ${slot}, booked by ${buyer.name}.`,
            "Please have the machine connected, clean and warmed up, with its manual at hand. Guarding and safety of the machine remain your responsibility under local rules.",
            `Give the machine's street address, a contact on site and access notes (loading dock, hours) on the booking page: ${origin}/bookings/${booking.id}. Only the buyer and the inspector see them.`,
            `Calendar file (after signing in): ${calendarAddress}`,
          ],
          reason: forSeller,
        });
      break;
    case "declined":
    case "cancelled_by_inspector":
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref} ${notice.kind === "declined" ? "declined" : "cancelled by the inspector"} — full refund`,
        heading: notice.kind === "declined" ? "The inspector declined your request" : "The inspector cancelled your booking",
        paragraphs: [`${inspector.name} cannot inspect the ${what} on ${slot}. Their reason: “${notice.reason}”`, `The whole fee (${fee}) is refunded to your card; you will get a second e-mail when it is issued.`],
        action: { href: `${origin}/machines/${machine.slug}/book`, label: "Book another inspector" },
        reason: forBuyer,
      });
      break;
    case "cancelled_by_buyer":
      letters.push({
        to: inspector.email,
        subject: `Inspection ${ref} cancelled by the buyer`,
        heading: "A booking was cancelled",
        paragraphs: [`${buyer.name} cancelled the inspection of the ${what} on ${slot}.${notice.reason ? ` Their reason: “${notice.reason}”` : ""}`, "The slot is free for other bookings again."],
        action: inspectorLink,
        reason: forInspector,
      });
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref} cancelled`,
        heading: "Your booking is cancelled",
        paragraphs: [`You cancelled the inspection of the ${what} on ${slot}.`, booking.refundDueMinor ? `By the refund rules you get ${formatMoney(booking.refundDueMinor, booking.currency)} back; a second e-mail follows when it is issued.` : "By the refund rules no refund is due for this notice."],
        action: buyerLink,
        reason: forBuyer,
      });
      break;
    case "refunded":
      letters.push({
        to: buyer.email,
        subject: `Refund of ${formatMoney(notice.amountMinor, booking.currency)} issued for ${ref}`,
        heading: notice.pending ? "Your refund is on its way" : "Your refund is issued",
        paragraphs: [
          notice.pending
            ? `We refunded ${formatMoney(notice.amountMinor, booking.currency)} for the inspection of the ${what}. Your bank is still processing it (refund pending); it can take a few more working days.`
            : `We refunded ${formatMoney(notice.amountMinor, booking.currency)} for the inspection of the ${what}. It shows on your statement within a few working days.`,
          notice.refundId
            ? `Your receipt for the refund (PDF, after signing in): ${receiptAddress(`refund-${notice.refundId}`)}`
            : "Your receipt for the refund (PDF) is on the booking page.",
        ],
        action: buyerLink,
        reason: forBuyer,
      });
      break;
    case "refund_failed": {
      letters.push({
        to: buyer.email,
        subject: `Refund for ${ref} did not go through — our staff are on it`,
        heading: "Your refund did not go through",
        paragraphs: [
          `The refund of ${formatMoney(notice.amountMinor, booking.currency)} for the inspection of the ${what} was returned by your bank or card issuer (${notice.reason.replace(/_/g, " ")}).`,
          "Our staff have been told and will contact you to pay it another way. You do not need to do anything yet.",
        ],
        action: buyerLink,
        reason: forBuyer,
      });
      for (const to of await staffAddresses(db))
        letters.push({
          to,
          subject: `Refund failed for ${ref}: ${formatMoney(notice.amountMinor, booking.currency)}`,
          heading: "A refund failed",
          paragraphs: [`The refund of ${formatMoney(notice.amountMinor, booking.currency)} to ${buyer.name} for ${ref} failed (${notice.reason}).`, "The amount is refundable again from the payments page once the buyer has been reached."],
          action: { href: `${origin}/admin/payments`, label: "Open payments" },
          reason: "You receive this because you are Tenthmark staff.",
        });
      break;
    }
    case "payment_processing":
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref}: your bank payment is processing`,
        heading: "Your payment is processing",
        paragraphs: [`Your bank debit of ${fee} for the inspection of the ${what} on ${slot} is on its way. The slot stays held for you while the bank processes it, which can take a few working days; we write again when it arrives.`],
        action: buyerLink,
        reason: forBuyer,
      });
      break;
    case "payment_failed":
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref}: the bank payment failed — slot released`,
        heading: "Your bank payment did not go through",
        paragraphs: [`Your bank did not pay the ${fee} for the inspection of the ${what} on ${slot}, so the slot was released. Nothing was taken from your account.`],
        action: { href: `${origin}/machines/${machine.slug}/book`, label: "Book again" },
        reason: forBuyer,
      });
      break;
    case "expired":
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref} not paid — slot released`,
        heading: "The held slot was released",
        paragraphs: [`The payment for the inspection of the ${what} on ${slot} was not completed in time, so the slot was released. Nothing was charged.`],
        action: { href: `${origin}/machines/${machine.slug}/book`, label: "Book again" },
        reason: forBuyer,
      });
      break;
    case "slot_lost":
      letters.push({
        to: buyer.email,
        subject: `Inspection ${ref}: payment arrived too late — full refund`,
        heading: "Your payment arrived after the slot was released",
        paragraphs: [`The slot on ${slot} was released before your payment arrived, and another booking took it. The whole fee (${fee}) is refunded.`],
        action: { href: `${origin}/machines/${machine.slug}/book`, label: "Choose another slot" },
        reason: forBuyer,
      });
      break;
    case "payout":
      letters.push({
        to: inspector.email,
        subject: `Payout of ${formatMoney(notice.amountMinor, booking.currency)} for ${ref}`,
        heading: "Your share is on its way",
        paragraphs: [`Thank you for the report on the ${what}. Your share of ${formatMoney(notice.amountMinor, booking.currency)} has been transferred to your payout account.`],
        action: { href: `${origin}/inspector/earnings`, label: "Open your earnings" },
        reason: forInspector,
      });
      break;
    case "share_held":
    case "share_unclaimed":
      letters.push({
        to: inspector.email,
        subject: `Your share for ${ref} is waiting: finish payout set-up`,
        heading: "Your share is waiting for you",
        paragraphs: [
          `Your share of ${formatMoney(notice.amountMinor, booking.currency)} for the report on the ${what} is held until your payout set-up is finished.`,
          notice.kind === "share_unclaimed" ? "It has now waited over 90 days; our staff will contact you. It stays yours and is transferred as soon as set-up is finished." : "Finish set-up from your inspector profile and it is transferred at once.",
        ],
        action: { href: `${origin}/inspector/profile`, label: "Set up payouts" },
        reason: forInspector,
      });
      if (notice.kind === "share_unclaimed")
        for (const to of await staffAddresses(db))
          letters.push({
            to,
            subject: `Share unclaimed for 90 days: ${ref}, ${inspector.name}`,
            heading: "An inspector's share is unclaimed",
            paragraphs: [`${inspector.name}'s share of ${formatMoney(notice.amountMinor, booking.currency)} for ${ref} has been held for over 90 days because payout set-up is not finished. Please contact them.`],
            action: { href: `${origin}/admin/payments`, label: "Open payments" },
            reason: "You receive this because you are Tenthmark staff.",
          });
      break;
    case "payout_failed":
      for (const to of await staffAddresses(db))
        letters.push({
          to,
          subject: `Payout failed for ${ref}: ${formatMoney(notice.amountMinor, booking.currency)} to ${inspector.name}`,
          heading: "A payout to an inspector failed",
          paragraphs: [`The transfer of ${inspector.name}'s share (${formatMoney(notice.amountMinor, booking.currency)}) for ${ref} failed after every retry: ${notice.reason}`, "Fix the cause, then try it again from the payments page."],
          action: { href: `${origin}/admin/payments`, label: "Open payments" },
          reason: "You receive this because you are Tenthmark staff.",
        });
      break;
  }

  for (const letter of letters) {
    const { html, text } = await renderEmail(
      <EmailLayout preview={letter.subject} reason={letter.reason}>
        <EmailHeading>{letter.heading}</EmailHeading>
        {letter.paragraphs.map((paragraph) => (
          <EmailParagraph key={paragraph}>{paragraph}</EmailParagraph>
        ))}
        {letter.action ? <EmailAction href={letter.action.href}>{letter.action.label}</EmailAction> : null}
      </EmailLayout>,
    );
    await queueEmail({ to: letter.to, subject: letter.subject, html, text, tag: `booking-${notice.kind}` });
  }
}
