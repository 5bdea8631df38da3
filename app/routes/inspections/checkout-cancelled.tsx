import { data, Form, redirect, useLoaderData } from "react-router";
import { Button, ButtonLink, Card, CardBody } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { cancelBookingAsBuyer, getBookingView } from "~/modules/inspections/bookings.server";
import { SlotTime } from "~/modules/inspections/components/parts";
import { BookingRuleError } from "~/modules/inspections/errors";
import type { Route } from "./+types/checkout-cancelled";

export const meta: Route.MetaFunction = () => [{ title: "Payment not completed — Tenthmark" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(request);
  try {
    const detail = await getBookingView(context.get(databaseContext), params.bookingId, user);
    if (detail.role !== "buyer") throw data("Only the person who booked can see this page.", { status: 403 });
    if (detail.booking.status !== "awaiting_payment") throw redirect(`/bookings/${detail.booking.id}`);
    return { detail };
  } catch (error) {
    if (error instanceof BookingRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireUser(request);
  const db = context.get(databaseContext);
  try {
    const detail = await getBookingView(db, params.bookingId, user);
    await cancelBookingAsBuyer(db, user, params.bookingId, "Checkout left by the buyer");
    return redirect(`/machines/${detail.listing.slug}/book`);
  } catch (error) {
    if (error instanceof BookingRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

export default function CheckoutCancelled() {
  const { detail } = useLoaderData<typeof loader>();
  const { booking } = detail;
  return (
    <div className="mx-auto max-w-2xl px-4 py-12 sm:px-6">
      <Card>
        <CardBody className="space-y-4 py-8 text-center">
          <p className="text-sm font-bold uppercase tracking-wide text-caution">Payment not completed</p>
          <h1 className="text-2xl font-extrabold text-ink-950">Nothing was charged</h1>
          <p className="text-ink-700">
            The slot with {detail.inspectorName} on <SlotTime startsAt={booking.startsAt} endsAt={booking.endsAt} place={detail.listing} /> stays held for you until{" "}
            {booking.checkoutExpiresAt ? new Date(booking.checkoutExpiresAt).toISOString().slice(11, 16) + " UTC" : "the checkout lapses"}. Pay now, or let it
            go so someone else can book it.
          </p>
          <div className="flex flex-col justify-center gap-3 sm:flex-row">
            {booking.checkoutUrl ? (
              <a href={booking.checkoutUrl} className="inline-flex h-10 items-center justify-center rounded-control bg-ink-900 px-4 text-sm font-semibold text-white hover:bg-ink-700">
                Return to payment
              </a>
            ) : null}
            <Form method="post">
              <Button type="submit" variant="secondary" className="w-full">
                Release the slot and choose again
              </Button>
            </Form>
          </div>
          <ButtonLink to={`/machines/${detail.listing.slug}`} variant="quiet">
            Back to the machine
          </ButtonLink>
        </CardBody>
      </Card>
    </div>
  );
}
