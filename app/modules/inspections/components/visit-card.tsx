// Meeting at the machine: where it stands and whom to ask for (shown to the booking's parties once accepted,
// given by the seller), the calendar file, and moving the visit by request and answer.
import { useFetcher } from "react-router";
import { Button, Card, CardBody, CardHeader, SelectField, TextAreaField, TextField } from "~/components/ui";
import { formatVisit, type MachinePlace } from "../local-time";
import { SLOT_DURATIONS } from "../validation";

type Visit = {
  role: "buyer" | "inspector" | "seller" | "admin";
  meeting: boolean;
  site: { streetAddress: string; contactName: string; contactPhone: string; accessNotes: string } | null;
  canEditSite: boolean;
  calendarUrl: string | null;
  place: MachinePlace;
  reschedule: { id: string; requestedBy: "buyer" | "inspector"; startsAt: string; endsAt: string; reason: string; mine: boolean; canDecide: boolean } | null;
  canRequestReschedule: boolean;
};

type Answer = { ok: boolean; intent: string; errors: Record<string, string[]> | null };

export function VisitCard({ bookingId, visit }: { bookingId: string; visit: Visit }) {
  if (!visit.meeting && !visit.canEditSite) return null;
  return (
    <Card data-testid="visit-card">
      <CardHeader title="Meeting at the machine" description={visit.meeting ? "For the buyer, the inspector and the seller only; never shown on the listing." : "Shown to the buyer and the inspector once the inspector accepts; never on the listing."} />
      <CardBody className="space-y-5">
        <SiteDetails visit={visit} />
        {visit.canEditSite ? <SiteForm bookingId={bookingId} site={visit.site} /> : null}
        {visit.calendarUrl ? (
          <a href={visit.calendarUrl} className="inline-flex items-center text-sm font-semibold underline underline-offset-2" data-testid="visit-calendar" download>
            Add the visit to your calendar (.ics)
          </a>
        ) : null}
        <Reschedule bookingId={bookingId} visit={visit} />
      </CardBody>
    </Card>
  );
}

function SiteDetails({ visit }: { visit: Visit }) {
  if (!visit.meeting) return null;
  if (!visit.site) return <p className="text-sm text-ink-600">The seller has not given the machine's address and contact yet.</p>;
  const rows: Array<[string, string]> = [
    ["Address", visit.site.streetAddress],
    ["Contact", `${visit.site.contactName}, ${visit.site.contactPhone}`],
  ];
  if (visit.site.accessNotes) rows.push(["Access", visit.site.accessNotes]);
  return (
    <dl className="divide-y divide-ink-100 text-sm" data-testid="visit-site">
      {rows.map(([label, value]) => (
        <div key={label} className="grid grid-cols-[6.5rem_minmax(0,1fr)] gap-3 py-2">
          <dt className="text-ink-500">{label}</dt>
          <dd className="whitespace-pre-line break-words text-ink-900">{label === "Contact" ? <ContactLine site={visit.site!} /> : value}</dd>
        </div>
      ))}
    </dl>
  );
}

function ContactLine({ site }: { site: NonNullable<Visit["site"]> }) {
  return (
    <>
      {site.contactName},{" "}
      <a className="whitespace-nowrap underline underline-offset-2" href={`tel:${site.contactPhone.replace(/[^+0-9]/g, "")}`}>
        {site.contactPhone}
      </a>
    </>
  );
}

function SiteForm({ bookingId, site }: { bookingId: string; site: Visit["site"] }) {
  const fetcher = useFetcher<Answer>();
  const errors = fetcher.data?.intent === "site" ? (fetcher.data.errors ?? {}) : {};
  const saved = fetcher.state === "idle" && fetcher.data?.intent === "site" && fetcher.data.ok;
  return (
    <fetcher.Form method="post" action={`/bookings/${bookingId}/visit`} className="space-y-3 rounded-control border border-ink-200 p-3" aria-label="Machine's address and contact">
      <input type="hidden" name="intent" value="site" />
      <p className="text-sm font-semibold text-ink-800">{site ? "Change the address or contact" : "Where the machine stands"}</p>
      <TextAreaField label="Street address" name="streetAddress" rows={2} defaultValue={site?.streetAddress ?? ""} errors={errors.streetAddress} maxLength={300} required />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Contact on site" name="contactName" defaultValue={site?.contactName ?? ""} errors={errors.contactName} maxLength={120} autoComplete="name" required />
        <TextField label="Phone" name="contactPhone" type="tel" defaultValue={site?.contactPhone ?? ""} errors={errors.contactPhone} maxLength={40} autoComplete="tel" required />
      </div>
      <TextAreaField label="Access notes" name="accessNotes" rows={2} hint="Loading dock, opening hours, where to report, parking." defaultValue={site?.accessNotes ?? ""} errors={errors.accessNotes} maxLength={1000} />
      {errors.form ? <p className="text-sm font-medium text-beyond" role="alert">{errors.form.join(" ")}</p> : null}
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={fetcher.state !== "idle"}>
          Save the site details
        </Button>
        {saved ? (
          <span className="text-sm font-medium text-within" role="status">
            Saved.
          </span>
        ) : null}
      </div>
    </fetcher.Form>
  );
}

function Reschedule({ bookingId, visit }: { bookingId: string; visit: Visit }) {
  const request = useFetcher<Answer>();
  const answer = useFetcher<Answer>();
  const errors = request.data?.intent === "reschedule" ? (request.data.errors ?? {}) : {};
  const answerErrors = answer.data?.errors ?? {};
  const pending = visit.reschedule;
  const who = pending?.requestedBy === "buyer" ? "The buyer" : "The inspector";
  return (
    <div className="space-y-3">
      {pending ? (
        <div className="space-y-2 rounded-control border border-caution/40 bg-caution-soft p-3 text-sm" data-testid="reschedule-request">
          <p className="font-semibold text-ink-900">
            {pending.mine ? "You asked to move the visit to" : `${who} asks to move the visit to`} {formatVisit(pending.startsAt, pending.endsAt, visit.place)}.
          </p>
          {pending.reason ? <p className="text-ink-700">“{pending.reason}”</p> : null}
          <p className="text-ink-600">{pending.mine ? "Waiting for the other side's answer; until then the visit stays as booked." : "Until you answer, the visit stays as booked."}</p>
          <answer.Form method="post" action={`/bookings/${bookingId}/visit`} className="flex flex-wrap gap-2">
            <input type="hidden" name="intent" value="decide" />
            <input type="hidden" name="requestId" value={pending.id} />
            {pending.canDecide ? (
              <>
                <Button type="submit" name="decision" value="accept" disabled={answer.state !== "idle"}>
                  Accept the new time
                </Button>
                <Button type="submit" name="decision" value="decline" variant="secondary" disabled={answer.state !== "idle"}>
                  Decline
                </Button>
              </>
            ) : pending.mine ? (
              <Button type="submit" name="decision" value="withdraw" variant="secondary" disabled={answer.state !== "idle"}>
                Withdraw the request
              </Button>
            ) : null}
          </answer.Form>
          {Object.values(answerErrors).flat().length ? <p className="font-medium text-beyond" role="alert">{Object.values(answerErrors).flat().join(" ")}</p> : null}
        </div>
      ) : null}
      {visit.canRequestReschedule ? (
        <details className="rounded-control border border-ink-200 p-3" open={Boolean(request.data && !request.data.ok)}>
          <summary className="cursor-pointer text-sm font-semibold text-ink-800">Propose another time</summary>
          <request.Form method="post" action={`/bookings/${bookingId}/visit`} className="mt-3 space-y-3">
            <input type="hidden" name="intent" value="reschedule" />
            <div className="grid gap-3 sm:grid-cols-3">
              <TextField label="Day" name="date" type="date" errors={errors.date} required />
              <TextField label="Start (at the machine)" name="startTime" type="time" errors={errors.startTime} required />
              <SelectField label="Length" name="durationMinutes" defaultValue="240" errors={errors.durationMinutes} options={SLOT_DURATIONS.map((minutes) => ({ value: String(minutes), label: `${minutes / 60} hours` }))} />
            </div>
            <TextAreaField label="Reason (optional)" name="reason" rows={2} maxLength={500} errors={errors.reason} />
            {errors.form ? <p className="text-sm font-medium text-beyond" role="alert">{errors.form.join(" ")}</p> : null}
            <Button type="submit" variant="secondary" disabled={request.state !== "idle"}>
              Send the request
            </Button>
          </request.Form>
        </details>
      ) : null}
    </div>
  );
}
