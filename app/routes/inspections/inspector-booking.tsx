import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { z } from "zod";
import { Button, ButtonLink, Card, CardBody, CardHeader, TextAreaField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { acceptBooking, declineBooking, getBookingView } from "~/modules/inspections/bookings.server";
import { BookingFacts, BookingHistory } from "~/modules/inspections/components/booking-detail";
import { VisitCard } from "~/modules/inspections/components/visit-card";
import { visitLogistics } from "~/modules/inspections/visits.server";
import { InspectionSafetyNotice } from "~/modules/inspections/components/parts";
import { BookingRuleError } from "~/modules/inspections/errors";
import { declineSchema } from "~/modules/inspections/validation";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/inspector-booking";

export const meta: Route.MetaFunction = ({ data: loaded }) => [{ title: loaded ? `Request ${loaded.detail.booking.reference} — Tenthmark` : "Request — Tenthmark" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(request, "inspector");
  try {
    const detail = await getBookingView(context.get(databaseContext), params.bookingId, user);
    if (detail.role !== "inspector") throw data("This request is for another inspector.", { status: 403 });
    return { detail, visit: await visitLogistics(context.get(databaseContext), params.bookingId, user) };
  } catch (error) {
    if (error instanceof BookingRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

const intentSchema = z.discriminatedUnion("intent", [z.object({ intent: z.literal("accept") }), declineSchema.extend({ intent: z.literal("decline") })]);

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(request, "inspector");
  const parsed = intentSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: { reason: parsed.error.issues.map((issue) => issue.message) }, done: null }, { status: 422 });
  const db = context.get(databaseContext);
  try {
    if (parsed.data.intent === "accept") await acceptBooking(db, user, params.bookingId);
    else await declineBooking(db, user, params.bookingId, parsed.data.reason);
    return { errors: null, done: parsed.data.intent };
  } catch (error) {
    if (error instanceof BookingRuleError) return data({ errors: { reason: [error.message] }, done: null }, { status: error.status });
    throw error;
  }
}

export default function InspectorBooking() {
  const { detail, visit } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  const { booking } = detail;
  const answerable = booking.status === "paid";
  const cancellable = booking.status === "accepted";
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">
        {answerable ? "Inspection request" : "Inspection"}: {detail.listing.make} {detail.listing.model}
      </h1>
      {actionData?.done === "accept" ? (
        <p role="status" className="mt-4 rounded-control border border-within/30 bg-within-soft px-4 py-3 text-sm font-semibold text-within">
          Accepted. The buyer and the seller have been told.
        </p>
      ) : null}
      {actionData?.done === "decline" ? (
        <p role="status" className="mt-4 rounded-control border border-ink-200 bg-ink-50 px-4 py-3 text-sm font-semibold text-ink-800">
          Declined. The buyer is refunded in full and has been told.
        </p>
      ) : null}
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]">
        <div className="space-y-6">
          <BookingFacts detail={detail} showSplit />
          <VisitCard bookingId={detail.booking.id} visit={visit} />
          <BookingHistory detail={detail} />
        </div>
        <aside className="space-y-4">
          {detail.share ? (
            <Card>
              <CardHeader title="Your share" />
              <CardBody className="space-y-2 text-sm text-ink-700" data-testid="share">
                {detail.share.share ? (
                  <p>
                    {formatMoney(detail.share.share.earnedMinor - detail.share.share.takenBackMinor, detail.share.share.currency)}:{" "}
                    {detail.share.share.status === "transferred"
                      ? "transferred to your payout account."
                      : detail.share.share.status === "held" || detail.share.share.status === "unclaimed"
                        ? "held until your payout set-up is finished."
                        : detail.share.share.status === "failed"
                          ? "the transfer failed; our staff have been told and will try again."
                          : "being transferred."}
                    {detail.share.share.takenBackMinor ? ` (${formatMoney(detail.share.share.takenBackMinor, detail.share.share.currency)} taken back after a refund.)` : ""}
                  </p>
                ) : (
                  <p>Your share is paid once you file the report.</p>
                )}
                {!detail.share.setUp.ready ? (
                  <p className="rounded-control border border-brass-200 bg-brass-100 px-3 py-2 text-ink-800">
                    {detail.share.setUp.headline}{" "}
                    <Link to="/inspector/profile" className="font-semibold underline underline-offset-2">
                      Finish payout set-up
                    </Link>
                  </p>
                ) : (
                  <Link to="/inspector/earnings" className="font-semibold underline underline-offset-2">
                    Your earnings
                  </Link>
                )}
              </CardBody>
            </Card>
          ) : null}
          {cancellable || booking.reportId ? (
            <ButtonLink to={cancellable ? `/inspector/bookings/${booking.id}/report` : `/reports/${booking.reportId}`} size="lg" className="w-full">
              {cancellable ? "File the report" : "Read the signed report"}
            </ButtonLink>
          ) : null}
          {detail.role === "inspector" && detail.rebuildUrl ? (
            <p className="text-sm text-ink-700">
              Did the seller recondition this machine?{" "}
              <Link to={detail.rebuildUrl} className="font-semibold text-ink-900 underline underline-offset-2">
                Enter its rebuild record
              </Link>{" "}
              (readings as found and as rebuilt, shown on the listing as entered by you, not as a signed report).
            </p>
          ) : null}
          {answerable || cancellable ? (
            <Card>
              <CardHeader title={answerable ? "Your answer" : "Cannot make it?"} />
              <CardBody className="space-y-4">
                {answerable ? (
                  <Form method="post">
                    <input type="hidden" name="intent" value="accept" />
                    <Button type="submit" size="lg" className="w-full" disabled={busy}>
                      Accept this inspection
                    </Button>
                  </Form>
                ) : null}
                <Form method="post" className="space-y-3">
                  <input type="hidden" name="intent" value="decline" />
                  <TextAreaField label={answerable ? "Or decline, with a reason for the buyer" : "Cancel, with a reason for the buyer"} name="reason" errors={actionData?.errors?.reason} required minLength={5} />
                  <Button type="submit" variant="secondary" className="w-full" disabled={busy}>
                    {answerable ? "Decline and refund" : "Cancel and refund"}
                  </Button>
                  <p className="text-xs text-ink-500">The buyer gets the whole fee back.</p>
                </Form>
              </CardBody>
            </Card>
          ) : null}
          <InspectionSafetyNotice />
        </aside>
      </div>
    </div>
  );
}
