import { Link, useLoaderData } from "react-router";
import { ButtonLink, Card, CardBody, CardHeader } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { listBookingsForInspector, type BookingSummary } from "~/modules/inspections/bookings.server";
import { BookingStatusBadge, InspectionSafetyNotice, SlotTime } from "~/modules/inspections/components/parts";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/inspector-bookings";

export const meta: Route.MetaFunction = () => [{ title: "Your inspection work — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(request, "inspector");
  return listBookingsForInspector(context.get(databaseContext), user.id);
}

function Section({ title, description, rows, empty }: { title: string; description: string; rows: BookingSummary[]; empty: string }) {
  return (
    <Card>
      <CardHeader title={`${title} (${rows.length})`} description={description} />
      {rows.length === 0 ? (
        <CardBody className="text-sm text-ink-500">{empty}</CardBody>
      ) : (
        <ul className="divide-y divide-ink-100">
          {rows.map(({ booking, listing, buyerName }) => (
            <li key={booking.id}>
              <Link to={`/inspector/bookings/${booking.id}`} className="flex flex-col gap-1 px-5 py-3 hover:bg-ink-50 sm:flex-row sm:items-center sm:justify-between">
                <div>
                  <p className="font-semibold text-ink-900">
                    {listing.make} {listing.model} · {listing.city}
                  </p>
                  <p className="text-sm text-ink-600">
                    <SlotTime startsAt={booking.startsAt} endsAt={booking.endsAt} place={listing} /> · for {buyerName}
                  </p>
                </div>
                <div className="flex items-center gap-3">
                  <span className="text-sm font-semibold text-ink-800 tabular">{formatMoney(booking.inspectorShareMinor, booking.currency)} to you</span>
                  <BookingStatusBadge status={booking.status} />
                </div>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

export default function InspectorBookings() {
  const { requests, upcoming, done, other } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Your inspection work</h1>
          <p className="mt-1 text-ink-600">Paid requests to answer, visits you have accepted, and finished reports.</p>
        </div>
        <ButtonLink to="/inspector/profile" variant="secondary">
          Profile and slots
        </ButtonLink>
      </div>
      <div className="mt-6 grid gap-6">
        <Section title="Requests" description="Paid by the buyer; accept or decline. Declining refunds the buyer in full." rows={requests} empty="No request waiting for you." />
        <Section title="Upcoming" description="Accepted visits, soonest first." rows={upcoming} empty="Nothing scheduled." />
        <Section title="Done" description="Reports filed; your share is transferred once the report is signed." rows={done} empty="No finished inspections yet." />
        {other.length ? <Section title="Declined or cancelled" description="Refunded by the rules." rows={other} empty="" /> : null}
        <InspectionSafetyNotice />
      </div>
    </div>
  );
}
