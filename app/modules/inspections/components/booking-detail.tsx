// The facts of one booking as its buyer, inspector, seller or an admin sees them: machine, time, money, history.
import { Link } from "react-router";
import { Card, CardBody, CardHeader } from "~/components/ui";
import { formatMoney } from "~/modules/units/format";
import { bookingStatusLabels, type BookingStatus } from "../rules";
import { BookingStatusBadge, SlotTime } from "./parts";
import { formatDate } from "~/modules/units/dates";

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
    reportId?: string | null;
  };
  listing: { slug: string; make: string; model: string; city: string; country: string; region: string | null };
  inspectorName: string;
  /** Null in the seller's view: who booked is between the buyer, the inspector and us. */
  buyerName: string | null;
  history: Array<{ id: string; kind: string; toStatus: BookingStatus | null; note: string | null; createdAt: string | Date }>;
  refunds: Array<{ id: string; amountMinor: number; currency: string; rule: string; status: string; failureReason?: string | null; createdAt: string | Date }>;
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
  refund_pending: "Refund pending at the bank",
  refund_succeeded: "Refund completed",
  refund_failed: "Refund failed — staff notified",
  share_held: "Inspector's share held until payout set-up",
  share_unclaimed: "Inspector's share unclaimed for 90 days",
  share_reversed: "Part of the inspector's share taken back",
  payout_failed: "Transfer to the inspector failed — staff notified",
  completed: "Inspection completed",
  reschedule_requested_by_buyer: "The buyer asked to move the visit",
  reschedule_requested_by_inspector: "The inspector asked to move the visit",
  reschedule_accepted: "Visit moved to the new time",
  reschedule_declined: "Request to move the visit declined",
  reschedule_withdrawn: "Request to move the visit withdrawn",
};

/** A refund's state in the buyer's words. */
export const refundStateWords: Record<string, { label: string; tone: string }> = {
  requested: { label: "Refund on its way", tone: "text-ink-700" },
  pending: { label: "Refund pending", tone: "text-caution" },
  succeeded: { label: "Refunded", tone: "text-within" },
  failed: { label: "Refund failed — staff notified", tone: "text-beyond" },
  canceled: { label: "Refund cancelled — staff notified", tone: "text-beyond" },
};

/** Each refund with its state; the buyer gets a receipt for each one that was sent. */
export function RefundList({ detail, receipts = false }: { detail: Detail; receipts?: boolean }) {
  if (!detail.refunds.length) return null;
  return (
    <Card>
      <CardHeader title="Refunds" />
      <CardBody>
        <ul className="divide-y divide-ink-100 text-sm">
          {detail.refunds.map((refund) => {
            const state = refundStateWords[refund.status] ?? { label: refund.status, tone: "text-ink-700" };
            return (
              <li key={refund.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2" data-testid="refund">
                <span className="tabular font-semibold text-ink-900">{formatMoney(refund.amountMinor, refund.currency)}</span>
                <span className={`font-semibold ${state.tone}`}>{state.label}</span>
                <span className="text-xs text-ink-500">
                  {formatDate(refund.createdAt)}
                  {refund.failureReason ? ` · ${refund.failureReason}` : ""}
                </span>
                {receipts && refund.status !== "failed" && refund.status !== "canceled" ? (
                  <a className="text-xs font-semibold underline underline-offset-2" href={`/bookings/${detail.booking.id}/receipts/refund-${refund.id}.pdf`}>
                    Receipt (PDF)
                  </a>
                ) : null}
              </li>
            );
          })}
        </ul>
      </CardBody>
    </Card>
  );
}

export function BookingFacts({ detail, showSplit = false }: { detail: Detail; showSplit?: boolean }) {
  const { booking, listing } = detail;
  const rows: Array<[string, React.ReactNode]> = [
    ["Status", <BookingStatusBadge key="status" status={booking.status} className="whitespace-normal" />],
    ["Reference", <span key="ref" className="whitespace-nowrap font-mono">{booking.reference}</span>],
    [
      "Machine",
      <Link key="machine" to={`/machines/${listing.slug}`} className="font-semibold underline underline-offset-2">
        {listing.make} {listing.model}, {listing.city}
      </Link>,
    ],
    ["When", <SlotTime key="when" startsAt={booking.startsAt} endsAt={booking.endsAt} place={listing} />],
    ["Inspector", detail.inspectorName],
  ];
  if (booking.reportId) {
    rows.push([
      "Report",
      <Link key="report" to={`/reports/${booking.reportId}`} className="font-semibold underline underline-offset-2" data-testid="booking-report-link">
        Read the accuracy report
      </Link>,
    ]);
  }
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
            <div key={label} className="grid grid-cols-[6.5rem_minmax(0,1fr)] gap-3 py-2 sm:grid-cols-[9rem_minmax(0,1fr)]">
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
          {detail.history.map((event) => {
            const words = historyWords[event.kind] ?? event.kind;
            // "Report filed → Report filed" says one thing twice: the new state only when it adds something.
            const state = event.toStatus && bookingStatusLabels[event.toStatus] !== words ? bookingStatusLabels[event.toStatus] : null;
            return (
            <li key={event.id} className="flex gap-3" data-testid="history-entry">
              <span className="mt-1.5 size-2 shrink-0 rounded-full bg-brass-400" aria-hidden="true" />
              <div>
                <p className="font-semibold text-ink-900">
                  {words}
                  {state ? <span className="font-normal text-ink-500"> → {state}</span> : null}
                </p>
                <p className="text-xs text-ink-500">
                  <time dateTime={new Date(event.createdAt).toISOString()}>{new Date(event.createdAt).toISOString().slice(0, 16).replace("T", " ")} UTC</time>
                  {event.note ? ` · ${event.note}` : ""}
                </p>
              </div>
            </li>
            );
          })}
        </ol>
      </CardBody>
    </Card>
  );
}
