// Pieces shared by the inspections pages: status badge, times, refund rules and the safety cautions.
import { Badge } from "~/components/ui";
import { SafetyCautions } from "~/modules/reports/components/safety";
import { formatVisit, visitParts, type MachinePlace } from "../local-time";
import { bookingStatusLabels, bookingStatusTones, refundRulesText, type BookingStatus } from "../rules";

/** A slot as the inspector offered it, in UTC (their own profile and public page: no machine yet). */
export function formatSlot(startsAt: Date | string, endsAt: Date | string) {
  return formatVisit(startsAt, endsAt);
}

/** A visit's time: at the machine's place when `place` is given and its zone is known, with UTC beside it. */
export function SlotTime({ startsAt, endsAt, place }: { startsAt: Date | string; endsAt: Date | string; place?: MachinePlace | null }) {
  const { zone, day, local, utc } = visitParts(startsAt, endsAt, place);
  return (
    <time dateTime={new Date(startsAt).toISOString()} title={zone ? `Local time: ${zone}` : undefined}>
      {local ? (
        <>
          {day}, {local} <span className="whitespace-nowrap text-ink-500">({utc})</span>
        </>
      ) : (
        `${day}, ${utc}`
      )}
    </time>
  );
}

export function BookingStatusBadge({ status, className }: { status: BookingStatus; className?: string }) {
  return (
    <Badge tone={bookingStatusTones[status]} className={className}>
      {bookingStatusLabels[status]}
    </Badge>
  );
}

export function RefundRules({ className }: { className?: string }) {
  return (
    <div className={className}>
      <h3 className="text-sm font-bold text-ink-900">Refund rules</h3>
      <ul className="mt-2 list-disc space-y-1 pl-5 text-sm text-ink-700" data-testid="refund-rules">
        {refundRulesText.map((entry) => (
          <li key={entry.rule}>{entry.text}</li>
        ))}
      </ul>
      <p className="mt-2 text-sm text-ink-500">If the payment is not completed within 30 minutes, the slot is released and nothing is charged.</p>
    </div>
  );
}

/** The usual cautions, in full, wherever inspection work on a machine is described (inspectors' pages). */
export function InspectionSafetyNotice() {
  return <SafetyCautions heading="Safety on site" />;
}
