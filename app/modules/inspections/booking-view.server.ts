// What each party to a booking may see of it. The buyer, the inspector, the listing's seller and staff share
// one booking row, but not its payment details, the buyer's address or each other's account ids: every page
// that shows a booking loads it through one of these shapes, never the row itself.
import { VISIT_TAKEN_ON, type BookingStatus } from "./rules";
import type { bookingEvents, bookingRefunds, bookings } from "./schema";

export type BookingRole = "buyer" | "inspector" | "seller" | "admin";

type Row = {
  booking: typeof bookings.$inferSelect;
  listing: { slug: string; make: string; model: string; city: string; region: string | null; country: string };
  inspectorName: string;
  buyerName: string;
  buyerEmail: string;
};

/** The facts every party may read: what, when, where, the state it is in, and the reasons given. */
function sharedFacts(booking: Row["booking"]) {
  return {
    id: booking.id,
    reference: booking.reference,
    status: booking.status as BookingStatus,
    startsAt: booking.startsAt,
    endsAt: booking.endsAt,
    currency: booking.currency,
    declineReason: booking.declineReason,
    cancelReason: booking.cancelReason,
    reportId: booking.reportId,
  };
}

const place = (listing: Row["listing"]) => ({ slug: listing.slug, make: listing.make, model: listing.model, city: listing.city, region: listing.region, country: listing.country });

/** The buyer: what they paid and, while the hold lasts, the way back to their own checkout. */
function forBuyer(row: Row) {
  const { booking } = row;
  const waiting = booking.status === "awaiting_payment";
  return {
    role: "buyer" as const,
    booking: {
      ...sharedFacts(booking),
      feeMinor: booking.feeMinor,
      refundedMinor: booking.refundedMinor,
      paidAt: booking.paidAt,
      paymentProcessingSince: booking.paymentProcessingSince,
      checkoutUrl: waiting && !booking.paymentProcessingSince ? booking.checkoutUrl : null,
      checkoutExpiresAt: waiting ? booking.checkoutExpiresAt : null,
    },
    listing: place(row.listing),
    inspectorName: row.inspectorName,
    buyerName: row.buyerName,
  };
}

/** The inspector: the fee and their share of it, and who booked (by name; they meet at the machine). */
function forInspector(row: Row) {
  const { booking } = row;
  return {
    role: "inspector" as const,
    booking: {
      ...sharedFacts(booking),
      feeMinor: booking.feeMinor,
      refundedMinor: booking.refundedMinor,
      platformFeeMinor: booking.platformFeeMinor,
      inspectorShareMinor: booking.inspectorShareMinor,
      paidAt: booking.paidAt,
    },
    listing: place(row.listing),
    inspectorName: row.inspectorName,
    buyerName: row.buyerName,
    /** Once the visit is taken on, the inspector may record the machine's rebuild for its seller. */
    rebuildUrl: VISIT_TAKEN_ON.includes(booking.status) ? `/inspector/bookings/${booking.id}/rebuild` : null,
  };
}

/** The seller: that an inspection of their machine is booked, when and by which inspector; no money, no buyer. */
function forSeller(row: Row) {
  return {
    role: "seller" as const,
    booking: sharedFacts(row.booking),
    listing: place(row.listing),
    inspectorName: row.inspectorName,
    buyerName: null,
  };
}

/** Staff: the money and the payment references needed to answer a question, but not the buyer's live checkout. */
function forStaff(row: Row) {
  const { booking } = row;
  return {
    role: "admin" as const,
    booking: {
      ...sharedFacts(booking),
      feeMinor: booking.feeMinor,
      refundedMinor: booking.refundedMinor,
      platformFeeMinor: booking.platformFeeMinor,
      inspectorShareMinor: booking.inspectorShareMinor,
      paymentIntentId: booking.paymentIntentId,
      paidAt: booking.paidAt,
    },
    listing: place(row.listing),
    inspectorName: row.inspectorName,
    buyerName: row.buyerName,
    buyerEmail: row.buyerEmail,
  };
}

/** One booking row as `role` may see it. */
export function bookingFor<R extends BookingRole>(role: R, row: Row) {
  const shaped = role === "buyer" ? forBuyer(row) : role === "inspector" ? forInspector(row) : role === "seller" ? forSeller(row) : forStaff(row);
  return shaped as Extract<ReturnType<typeof forBuyer | typeof forInspector | typeof forSeller | typeof forStaff>, { role: R }>;
}

type Event = typeof bookingEvents.$inferSelect;
type Refund = typeof bookingRefunds.$inferSelect;

/** What happened to the inspector's share: between the inspector and us, not the buyer's or the seller's business. */
const PAYOUT_KINDS = new Set(["payout_recorded", "share_held", "share_unclaimed", "share_reversed", "payout_failed"]);

/**
 * The history: staff read every note; the parties read what happened and when (notes carry payment, transfer
 * and staff references). The buyer and the seller read no payout lines: a payout that closed the booking is
 * told to them as the inspection completed.
 */
export function historyFor(role: BookingRole, events: Event[]) {
  const seesPayouts = role === "admin" || role === "inspector";
  return events.flatMap((event) => {
    const toStatus = event.toStatus as BookingStatus | null;
    const shown = { id: event.id, kind: event.kind, toStatus, note: role === "admin" ? event.note : null, createdAt: event.createdAt };
    if (seesPayouts || !PAYOUT_KINDS.has(event.kind)) return [shown];
    return toStatus ? [{ ...shown, kind: "completed" }] : [];
  });
}

/** Refunds as amounts and rules; the seller sees none (the money is between the buyer, the inspector and us). */
export function refundsFor(role: BookingRole, refunds: Refund[]) {
  if (role === "seller") return [];
  return refunds.map((refund) => ({
    id: refund.id,
    amountMinor: refund.amountMinor,
    currency: refund.currency,
    rule: refund.rule,
    // Whether the money reached the buyer: requested and pending are on their way, failed is with staff.
    status: refund.status,
    failureReason: role === "admin" ? refund.failureReason : null,
    createdAt: refund.createdAt,
  }));
}
