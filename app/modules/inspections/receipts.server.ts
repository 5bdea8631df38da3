// The buyer's receipts: one for the payment of a booking, one for each refund of it. Only the buyer (and
// staff) may read them.
import { and, eq } from "drizzle-orm";
import { user } from "~/modules/accounts/schema";
import { listings } from "~/modules/listings/schema";
import { BookingRuleError } from "./errors";
import { formatVisit } from "./local-time";
import { renderReceiptPdf } from "./money-pdf.server";
import type { Executor } from "./profiles.server";
import { bookingRefunds, bookings } from "./schema";

/** `payment.pdf` or `refund-<refund record id>.pdf`. */
export const receiptFilePattern = /^(payment|refund-[0-9a-f-]{36})\.pdf$/;

export async function renderReceipt(db: Executor, bookingId: string, viewer: { id: string; roles: readonly string[] }, file: string) {
  const match = file.match(receiptFilePattern);
  if (!match) throw new BookingRuleError("No such receipt.", 404);
  const [row] = await db
    .select({ booking: bookings, listing: { make: listings.make, model: listings.model, city: listings.city, region: listings.region, country: listings.country } })
    .from(bookings)
    .innerJoin(listings, eq(listings.id, bookings.listingId))
    .where(eq(bookings.id, bookingId));
  if (!row || (row.booking.buyerId !== viewer.id && !viewer.roles.includes("admin"))) throw new BookingRuleError("No such receipt.", 404);
  const { booking, listing } = row;
  if (!booking.paidAt) throw new BookingRuleError("This booking has not been paid, so it has no receipt.", 404);
  const people = await db.select({ id: user.id, name: user.name, email: user.email }).from(user).where(eq(user.id, booking.buyerId));
  const [inspector] = await db.select({ name: user.name }).from(user).where(eq(user.id, booking.inspectorId));
  const common = {
    reference: booking.reference,
    currency: booking.currency,
    buyer: { name: people[0]!.name, email: people[0]!.email },
    what: `${listing.make} ${listing.model} in ${listing.city}`,
    visit: formatVisit(booking.startsAt, booking.endsAt, listing, "long"),
    inspectorName: inspector?.name ?? "the inspector",
  };
  if (match[1] === "payment") {
    return {
      filename: `tenthmark-receipt-${booking.reference}.pdf`,
      pdf: await renderReceiptPdf({ ...common, kind: "payment", number: `${booking.reference}-P`, at: booking.paidAt, amountMinor: booking.feeMinor, refundedMinor: booking.refundedMinor }),
    };
  }
  const refundId = match[1]!.slice("refund-".length);
  const [refund] = await db.select().from(bookingRefunds).where(and(eq(bookingRefunds.id, refundId), eq(bookingRefunds.bookingId, bookingId)));
  if (!refund) throw new BookingRuleError("No such receipt.", 404);
  return {
    filename: `tenthmark-refund-${booking.reference}-${refund.id.slice(0, 8)}.pdf`,
    pdf: await renderReceiptPdf({
      ...common,
      kind: "refund",
      number: `${booking.reference}-R${refund.id.slice(0, 6).toUpperCase()}`,
      at: refund.createdAt,
      amountMinor: refund.amountMinor,
      refund: { reason: refund.reason, status: refund.status },
    }),
  };
}
