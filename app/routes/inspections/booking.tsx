import { data, Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { Button, Card, CardBody, CardHeader, TextAreaField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { cancelBookingAsBuyer, getBookingView } from "~/modules/inspections/bookings.server";
import { BookingFacts, BookingHistory, RefundList } from "~/modules/inspections/components/booking-detail";
import { RefundRules } from "~/modules/inspections/components/parts";
import { VisitCard } from "~/modules/inspections/components/visit-card";
import { visitLogistics } from "~/modules/inspections/visits.server";
import { BookingRuleError } from "~/modules/inspections/errors";
import { cancelSchema } from "~/modules/inspections/validation";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/booking";

export const meta: Route.MetaFunction = ({ data: loaded }) => [{ title: loaded ? `Booking ${loaded.detail.booking.reference} — Tenthmark` : "Booking — Tenthmark" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(request);
  try {
    const db = context.get(databaseContext);
    const detail = await getBookingView(db, params.bookingId, user);
    return { detail, visit: await visitLogistics(db, params.bookingId, user) };
  } catch (error) {
    if (error instanceof BookingRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireUser(request);
  const parsed = cancelSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: { reason: parsed.error.issues.map((issue) => issue.message) } }, { status: 422 });
  try {
    await cancelBookingAsBuyer(context.get(databaseContext), user, params.bookingId, parsed.data.reason);
    return { errors: null };
  } catch (error) {
    if (error instanceof BookingRuleError) return data({ errors: { reason: [error.message] } }, { status: error.status });
    throw error;
  }
}

export default function BookingPage() {
  const { detail, visit } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  const { booking } = detail;
  const refund = detail.refundIfCancelledNow;
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">
        Inspection of the {detail.listing.make} {detail.listing.model}
      </h1>
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]">
        <div className="space-y-6">
          <BookingFacts detail={detail} />
          <VisitCard bookingId={detail.booking.id} visit={visit} />
          <RefundList detail={detail} receipts={detail.role === "buyer"} />
          <BookingHistory detail={detail} />
        </div>
        <aside className="space-y-4">
          {detail.role === "buyer" && detail.booking.status === "awaiting_payment" && detail.booking.paymentProcessingSince ? (
            <Card>
              <CardHeader title="Payment processing" />
              <CardBody className="space-y-2 text-sm text-ink-700">
                <p>Your bank payment is on its way. The slot stays held for you while your bank processes it, which can take a few working days.</p>
                <p>We e-mail you when it arrives, or if it does not.</p>
              </CardBody>
            </Card>
          ) : null}
          {detail.role === "buyer" && detail.booking.paidAt ? (
            <Card>
              <CardHeader title="Receipts" />
              <CardBody className="space-y-2 text-sm text-ink-700">
                <a className="font-semibold underline underline-offset-2" href={`/bookings/${detail.booking.id}/receipts/payment.pdf`}>
                  Receipt for your payment (PDF)
                </a>
                {detail.refunds.length ? <p>Each refund has its receipt beside it under Refunds.</p> : null}
              </CardBody>
            </Card>
          ) : null}
          {detail.role === "buyer" && detail.booking.status === "awaiting_payment" && detail.booking.checkoutUrl ? (
            <Card>
              <CardHeader title="Payment not finished" />
              <CardBody className="space-y-3 text-sm text-ink-700">
                <p>The slot is held for you until the checkout lapses. Nothing has been charged yet.</p>
                <a href={detail.booking.checkoutUrl} className="inline-flex h-10 w-full items-center justify-center rounded-control bg-ink-900 px-4 text-sm font-semibold text-white hover:bg-ink-700">
                  Return to payment
                </a>
              </CardBody>
            </Card>
          ) : null}
          {detail.role === "buyer" && refund ? (
            <Card>
              <CardHeader title="Cancel this booking" />
              <CardBody>
                <Form method="post" className="space-y-3">
                  <p className="text-sm text-ink-700">
                    Cancelling now refunds <strong className="tabular">{formatMoney(refund.amountMinor, booking.currency)}</strong> ({refund.percent}% of the fee). {refund.explanation}
                  </p>
                  <TextAreaField label="Reason (optional)" name="reason" errors={actionData?.errors?.reason} />
                  <Button type="submit" variant="danger" className="w-full" disabled={busy}>
                    Cancel booking
                  </Button>
                </Form>
              </CardBody>
            </Card>
          ) : null}
          <Card>
            <CardBody>
              <RefundRules />
            </CardBody>
          </Card>
        </aside>
      </div>
    </div>
  );
}
