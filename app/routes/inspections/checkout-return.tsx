import { useEffect, useState } from "react";
import { data, Link, useLoaderData, useRevalidator } from "react-router";
import { ButtonLink, Card, CardBody } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { getBookingView } from "~/modules/inspections/bookings.server";
import { SlotTime } from "~/modules/inspections/components/parts";
import { BookingRuleError } from "~/modules/inspections/errors";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/checkout-return";

export const meta: Route.MetaFunction = () => [{ title: "Payment — Tenthmark" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(request);
  try {
    const detail = await getBookingView(context.get(databaseContext), params.bookingId, user);
    if (detail.role !== "buyer") throw data("Only the person who booked can see this page.", { status: 403 });
    return { detail };
  } catch (error) {
    if (error instanceof BookingRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

// Stripe's confirmation reaches us by webhook, usually within seconds of the redirect: ask again now and then.
const POLL_MS = [1000, 1500, 2000, 3000, 5000, 8000];
const GIVE_UP_AFTER = 24;

export default function CheckoutReturn() {
  const { detail } = useLoaderData<typeof loader>();
  const revalidator = useRevalidator();
  const [polls, setPolls] = useState(0);
  const { booking } = detail;
  const confirmed = booking.status !== "awaiting_payment";
  useEffect(() => {
    if (confirmed || polls >= GIVE_UP_AFTER) return;
    const timer = setTimeout(() => {
      if (document.visibilityState === "visible") void revalidator.revalidate();
      setPolls((count) => count + 1);
    }, POLL_MS[Math.min(polls, POLL_MS.length - 1)]);
    return () => clearTimeout(timer);
  }, [confirmed, polls, revalidator]);

  return (
    <div className="mx-auto max-w-2xl px-4 py-12 sm:px-6">
      <Card>
        <CardBody className="space-y-4 py-8 text-center">
          {booking.status === "paid" || booking.status === "accepted" ? (
            <>
              <p className="text-sm font-bold uppercase tracking-wide text-within">Booking confirmed</p>
              <h1 className="text-2xl font-extrabold text-ink-950">Your inspection is booked and paid</h1>
              <p className="text-ink-700">
                {detail.inspectorName} inspects the {detail.listing.make} {detail.listing.model} on <SlotTime startsAt={booking.startsAt} endsAt={booking.endsAt} place={detail.listing} />.
                We received {formatMoney(booking.feeMinor, booking.currency)}. {booking.status === "paid" ? "The inspector has been told and will accept shortly; we e-mail you when they do." : "The inspector has accepted."}
              </p>
              <p className="whitespace-nowrap font-mono text-sm text-ink-500">{booking.reference}</p>
              <ButtonLink to={`/bookings/${booking.id}`}>Open the booking</ButtonLink>
            </>
          ) : booking.status === "awaiting_payment" ? (
            <>
              <p className="text-sm font-bold uppercase tracking-wide text-caution">Confirming</p>
              <h1 className="text-2xl font-extrabold text-ink-950">Waiting for the payment confirmation…</h1>
              <p className="text-ink-700" role="status" aria-live="polite">
                {polls < GIVE_UP_AFTER
                  ? "Stripe is confirming your payment. This page updates by itself; it usually takes a few seconds."
                  : "The confirmation is taking longer than usual. You can leave this page: we e-mail you as soon as the payment is confirmed."}
              </p>
              <div className="flex justify-center gap-3">
                <ButtonLink to={`/bookings/${booking.id}`} variant="secondary">
                  Open the booking
                </ButtonLink>
              </div>
            </>
          ) : (
            <>
              <h1 className="text-2xl font-extrabold text-ink-950">This booking is no longer active</h1>
              <p className="text-ink-700">See the booking for what happened and any refund.</p>
              <ButtonLink to={`/bookings/${booking.id}`}>Open the booking</ButtonLink>
            </>
          )}
        </CardBody>
      </Card>
      <p className="mt-6 text-center text-sm text-ink-500">
        <Link to="/bookings" className="underline underline-offset-2">
          All your bookings
        </Link>
      </p>
    </div>
  );
}
