// The facts of one booking as its buyer, inspector, seller or an admin sees them: machine, time, money, history.
import { Link } from "react-router";
import { Card, CardBody, CardHeader } from "~/components/ui";
import { formatMoney } from "~/modules/units/format";
import { bookingStatusLabels, type BookingStatus } from "../rules";
import { BookingStatusBadge, SlotTime } from "./parts";

type Detail = {
  booking: {
    id: string;
    reference: string;
    status: BookingStatus;
    startsAt: string | Date;
    endsAt: string | Date;
    currency: string;
    // Money is shown to the buyer, the inspector and staff; a seller's view carries none.
    feeMinor?: number;
    platformFeeMinor?: number;
    inspectorShareMinor?: number;
    refundedMinor?: number;
    declineReason: string | null;
    cancelReason: string | null;
  };
  listing: { slug: string; make: string; model: string; city: string; country: string; region: string | null };
  inspectorName: string;
  /** Null in the seller's view: who booked is between the buyer, the inspector and us. */
  buyerName: string | null;
  history: Array<{ id: string; kind: string; toStatus: BookingStatus | null; note: string | null; createdAt: string | Date }>;
  refunds: Array<{ id: string; amountMinor: number; currency: string; rule: string; createdAt: string | Date }>;
};

const historyWords: Record<string, string> = {
  requested: "Slot held for payment",
  payment_received: "Payment received",
  payment_received_late: "Payment received after the hold lapsed",
  payment_failed: "Payment attempt failed",
  payment_pending: "Payment processing",
  checkout_expired: "Checkout expired",
  checkout_lapsed: "Checkout lapsed",
  checkout_failed: "Checkout could not be opened",
  accepted: "Accepted by the inspector",
  inspector_declined: "Declined by the inspector",
  inspector_cancelled: "Cancelled by the inspector",
  before_acceptance: "Cancelled by the buyer before acceptance",
  ample_notice: "Cancelled by the buyer with ample notice",
  short_notice: "Cancelled by the buyer at short notice",
  late_notice: "Cancelled by the buyer at late notice",
  released_by_buyer: "Hold released by the buyer",
  refund_issued: "Refund issued",
  refund_confirmed: "Refund confirmed by Stripe",
  admin_refund_ordered: "Refund ordered by staff",
  slot_lost: "Slot lost to another booking",
  report_filed: "Report filed",
  payout_recorded: "Inspector's share transferred",
};

export function BookingFacts({ detail, showSplit = false }: { detail: Detail; showSplit?: boolean }) {
  const { booking, listing } = detail;
  const rows: Array<[string, React.ReactNode]> = [
    ["Status", <BookingStatusBadge key="status" status={booking.status} />],
    ["Reference", <span key="ref" className="font-mono">{booking.reference}</span>],
    [
      "Machine",
      <Link key="machine" to={`/machines/${listing.slug}`} className="font-semibold underline underline-offset-2">
        {listing.make} {listing.model}, {listing.city}
      </Link>,
    ],
    ["When", <SlotTime key="when" startsAt={booking.startsAt} endsAt={booking.endsAt} place={listing} />],
    ["Inspector", detail.inspectorName],
  ];
  if (detail.buyerName !== null) rows.push(["Booked by", detail.buyerName]);
  if (booking.feeMinor !== undefined) rows.push(["Fee", <span key="fee" className="tabular">{formatMoney(booking.feeMinor, booking.currency)}</span>]);
  if (showSplit && booking.platformFeeMinor !== undefined && booking.inspectorShareMinor !== undefined) {
    rows.push(["Platform fee", <span key="pf" className="tabular">{formatMoney(booking.platformFeeMinor, booking.currency)}</span>]);
    rows.push(["Inspector's share", <span key="share" className="tabular">{formatMoney(booking.inspectorShareMinor, booking.currency)}</span>]);
  }
  if (booking.refundedMinor) rows.push(["Refunded", <span key="refunded" className="tabular">{formatMoney(booking.refundedMinor, booking.currency)}</span>]);
  if (booking.declineReason) rows.push(["Inspector's reason", booking.declineReason]);
  if (booking.cancelReason) rows.push(["Cancellation reason", booking.cancelReason]);
  return (
    <Card>
      <CardHeader title="Booking" />
      <CardBody>
        <dl className="divide-y divide-ink-100 text-sm">
          {rows.map(([label, value]) => (
            <div key={label} className="grid grid-cols-[9rem_1fr] gap-3 py-2">
              <dt className="text-ink-500">{label}</dt>
              <dd className="text-ink-900">{value}</dd>
            </div>
          ))}
        </dl>
      </CardBody>
    </Card>
  );
}

export function BookingHistory({ detail }: { detail: Detail }) {
  return (
    <Card>
      <CardHeader title="History" />
      <CardBody>
        <ol className="space-y-3 text-sm">
          {detail.history.map((event) => (
            <li key={event.id} className="flex gap-3">
              <span className="mt-1.5 size-2 shrink-0 rounded-full bg-brass-400" aria-hidden="true" />
              <div>
                <p className="font-semibold text-ink-900">
                  {historyWords[event.kind] ?? event.kind}
                  {event.toStatus ? <span className="font-normal text-ink-500"> → {bookingStatusLabels[event.toStatus]}</span> : null}
                </p>
                <p className="text-xs text-ink-500">
                  <time dateTime={new Date(event.createdAt).toISOString()}>{new Date(event.createdAt).toISOString().slice(0, 16).replace("T", " ")} UTC</time>
                  {event.note ? ` · ${event.note}` : ""}
                </p>
              </div>
            </li>
          ))}
        </ol>
      </CardBody>
    </Card>
  );
}
