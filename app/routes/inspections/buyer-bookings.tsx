import { Link, useLoaderData } from "react-router";
import { ButtonLink, Card, CardBody, Table, Td, Th, Tr } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { listBookingsForBuyer } from "~/modules/inspections/bookings.server";
import { BookingStatusBadge, SlotTime } from "~/modules/inspections/components/parts";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/buyer-bookings";

export const meta: Route.MetaFunction = () => [{ title: "Your inspection bookings — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { bookings: await listBookingsForBuyer(context.get(databaseContext), user.id) };
}

export default function BuyerBookings() {
  const { bookings } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Your inspection bookings</h1>
      <p className="mt-1 text-ink-600">Inspections you booked and paid for, newest first.</p>
      {bookings.length === 0 ? (
        <Card className="mt-6">
          <CardBody className="space-y-3 py-10 text-center">
            <p className="text-lg font-bold text-ink-900">No bookings yet</p>
            <p className="text-ink-600">Open a machine and choose “Book an inspection” to have a certified inspector check it on site.</p>
            <ButtonLink to="/machines" variant="secondary">
              Browse machines
            </ButtonLink>
          </CardBody>
        </Card>
      ) : (
        <>
          <ul className="mt-6 space-y-3 sm:hidden">
            {bookings.map(({ booking, listing, inspectorName }) => (
              <li key={booking.id}>
                <Link to={`/bookings/${booking.id}`} className="block rounded-panel border border-ink-200 bg-white p-4 shadow-panel">
                  <div className="flex items-start justify-between gap-2">
                    <p className="font-bold text-ink-900">
                      {listing.make} {listing.model}
                    </p>
                    <BookingStatusBadge status={booking.status} />
                  </div>
                  <p className="mt-1 text-sm text-ink-600">
                    <SlotTime startsAt={booking.startsAt} endsAt={booking.endsAt} place={listing} />
                  </p>
                  <p className="text-sm text-ink-600">
                    {inspectorName} · {formatMoney(booking.feeMinor, booking.currency)} · <span className="whitespace-nowrap font-mono">{booking.reference}</span>
                  </p>
                </Link>
              </li>
            ))}
          </ul>
          <div className="mt-6 hidden sm:block">
            <Table caption="Your bookings">
              <thead>
                <tr>
                  <Th>Machine</Th>
                  <Th>When</Th>
                  <Th>Inspector</Th>
                  <Th>Fee</Th>
                  <Th>Status</Th>
                  <Th>Reference</Th>
                </tr>
              </thead>
              <tbody>
                {bookings.map(({ booking, listing, inspectorName }) => (
                  <Tr key={booking.id}>
                    <Td>
                      <Link to={`/bookings/${booking.id}`} className="font-semibold text-ink-900 underline underline-offset-2">
                        {listing.make} {listing.model}
                      </Link>
                      <div className="text-xs text-ink-500">{listing.city}</div>
                    </Td>
                    <Td>
                      <SlotTime startsAt={booking.startsAt} endsAt={booking.endsAt} place={listing} />
                    </Td>
                    <Td>{inspectorName}</Td>
                    <Td className="tabular">{formatMoney(booking.feeMinor, booking.currency)}</Td>
                    <Td>
                      <BookingStatusBadge status={booking.status} />
                    </Td>
                    <Td className="whitespace-nowrap font-mono text-xs">{booking.reference}</Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          </div>
        </>
      )}
    </div>
  );
}
