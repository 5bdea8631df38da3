import { data, Form, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import { z } from "zod";
import { Button, Card, CardBody, Table, Td, Th, Tr } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { listPayments, refundAsAdmin } from "~/modules/inspections/bookings.server";
import { refundStateWords } from "~/modules/inspections/components/booking-detail";
import { retryFailedPayout } from "~/modules/inspections/payouts.server";
import { BookingStatusBadge } from "~/modules/inspections/components/parts";
import { BookingRuleError } from "~/modules/inspections/errors";
import { adminRefundSchema } from "~/modules/inspections/validation";
import { PaymentsRejectedError, PaymentsUnavailableError } from "~/modules/payments/stripe.server";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/admin-payments";

export const meta: Route.MetaFunction = () => [{ title: "Payments — Tenthmark staff" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  return listPayments(context.get(databaseContext));
}

type Result = { bookingId: string; errors: Record<string, string[] | undefined> | null; message?: string };

export async function action({ request, context }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const form = Object.fromEntries(await request.formData());
  const bookingId = String(form.bookingId ?? "");
  if (form.intent === "retry-payout") {
    try {
      await retryFailedPayout(context.get(databaseContext), bookingId);
      return { bookingId, errors: null, message: "The transfer is queued again." } satisfies Result;
    } catch (error) {
      if (error instanceof BookingRuleError) return data<Result>({ bookingId, errors: { amount: [error.message] } }, { status: error.status });
      throw error;
    }
  }
  const parsed = adminRefundSchema.safeParse(form);
  if (!parsed.success) return data<Result>({ bookingId, errors: z.flattenError(parsed.error).fieldErrors }, { status: 422 });
  try {
    const refunded = await refundAsAdmin(context.get(databaseContext), admin, bookingId, parsed.data.amount, parsed.data.reason);
    const message = refunded.queued
      ? "The payment service is not answering: the refund is recorded and will be sent when it is back."
      : refunded.issuedMinor
        ? "Refund issued."
        : "Nothing was owed.";
    return { bookingId, errors: null, message } satisfies Result;
  } catch (error) {
    if (error instanceof BookingRuleError) return data<Result>({ bookingId, errors: { [error.field ?? "amount"]: [error.message] } }, { status: error.status });
    if (error instanceof PaymentsUnavailableError || error instanceof PaymentsRejectedError) return data<Result>({ bookingId, errors: { amount: [error.message] } }, { status: 503 });
    throw error;
  }
}

export default function AdminPayments() {
  const { rows, totals, monthly, attention } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <nav aria-label="Staff" className="flex flex-wrap gap-4 border-b border-ink-200 pb-2 text-sm font-semibold text-ink-600">
        <Link to="/admin/users" className="hover:text-ink-900">People</Link>
        <Link to="/admin/inspector-applications" className="hover:text-ink-900">Inspector applications</Link>
        <span aria-current="page" className="text-ink-900">Payments</span>
      </nav>
      <h1 className="mt-4 text-3xl font-extrabold tracking-tight text-ink-950">Payments</h1>
      <p className="mt-1 text-ink-600">Inspection fees taken through Stripe, their refunds and the inspectors' transfers.</p>
      {attention.failedRefunds || attention.failedPayouts || attention.unclaimedShares ? (
        <p role="alert" className="mt-4 rounded-control border border-beyond/30 bg-beyond-soft px-4 py-3 text-sm font-semibold text-beyond">
          Needs attention: {attention.failedRefunds} failed refund{attention.failedRefunds === 1 ? "" : "s"}, {attention.failedPayouts} failed transfer
          {attention.failedPayouts === 1 ? "" : "s"}, {attention.unclaimedShares} share{attention.unclaimedShares === 1 ? "" : "s"} unclaimed for 90 days.
        </p>
      ) : null}
      <div className="mt-5 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {totals.map((total) => (
          <Card key={total.currency}>
            <CardBody className="space-y-1 text-sm">
              <p className="font-bold text-ink-900">{total.currency}</p>
              <p className="text-ink-700">Paid: <span className="tabular">{formatMoney(total.paid, total.currency)}</span></p>
              <p className="text-ink-700">Refunded: <span className="tabular">{formatMoney(total.refunded, total.currency)}</span></p>
              <p className="text-ink-700">Refunds pending: <span className="tabular">{formatMoney(total.refundsOpen, total.currency)}</span></p>
              <p className="text-ink-700">Platform fees: <span className="tabular">{formatMoney(total.platform, total.currency)}</span></p>
              <p className="text-ink-700">Transferred: <span className="tabular">{formatMoney(total.paidOut, total.currency)}</span></p>
              <p className="text-ink-700">Reversed: <span className="tabular">{formatMoney(total.reversed, total.currency)}</span></p>
              <p className="text-ink-700">Shares held: <span className="tabular">{formatMoney(total.held, total.currency)}</span></p>
            </CardBody>
          </Card>
        ))}
      </div>
      <div className="mt-6">
        <Table caption="Totals per month">
          <thead>
            <tr>
              <Th>Month</Th>
              <Th>Paid</Th>
              <Th>Refunded</Th>
              <Th>Refunds pending</Th>
              <Th>Transferred</Th>
              <Th>Reversed</Th>
            </tr>
          </thead>
          <tbody>
            {monthly.map((month) => (
              <Tr key={`${month.month}-${month.currency}`}>
                <Td className="whitespace-nowrap text-sm font-semibold">
                  {month.month} · {month.currency}
                </Td>
                <Td className="tabular text-sm">{formatMoney(month.paid, month.currency)}</Td>
                <Td className="tabular text-sm">{formatMoney(month.refunded, month.currency)}</Td>
                <Td className="tabular text-sm">{formatMoney(month.refundsOpen, month.currency)}</Td>
                <Td className="tabular text-sm">{formatMoney(month.paidOut, month.currency)}</Td>
                <Td className="tabular text-sm">{formatMoney(month.reversed, month.currency)}</Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      </div>
      <div className="mt-6">
        <Table caption="Payments">
          <thead>
            <tr>
              <Th>Booking</Th>
              <Th>Paid</Th>
              <Th>Status</Th>
              <Th>Fee / platform / inspector</Th>
              <Th>Refunds</Th>
              <Th>Refund</Th>
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <Tr>
                <Td colSpan={6} className="py-8 text-center text-ink-500">
                  No inspection fee has been paid yet.
                </Td>
              </Tr>
            ) : null}
            {rows.map(({ booking, listing, inspectorName, buyerName, refunds, payout }) => {
              const errors = actionData?.bookingId === booking.id ? actionData.errors : null;
              const refundable = booking.feeMinor - booking.refundedMinor;
              return (
                <Tr key={booking.id}>
                  <Td>
                    <Link to={`/bookings/${booking.id}`} className="whitespace-nowrap font-mono text-xs font-semibold underline">
                      {booking.reference}
                    </Link>
                    <div className="text-xs text-ink-600">
                      {listing.make} {listing.model} · {buyerName} → {inspectorName}
                    </div>
                    <div className="font-mono text-[11px] text-ink-400">{booking.paymentIntentId}</div>
                  </Td>
                  <Td className="whitespace-nowrap text-xs">{booking.paidAt ? new Date(booking.paidAt).toISOString().slice(0, 16).replace("T", " ") : ""}</Td>
                  <Td>
                    <BookingStatusBadge status={booking.status} />
                  </Td>
                  <Td className="whitespace-nowrap tabular text-xs">
                    {formatMoney(booking.feeMinor, booking.currency)} / {formatMoney(booking.platformFeeMinor, booking.currency)} / {formatMoney(booking.inspectorShareMinor, booking.currency)}
                    {payout ? (
                      <div className={payout.status === "transferred" ? "text-within" : payout.status === "failed" ? "font-semibold text-beyond" : "text-caution"}>
                        share {payout.status === "transferred" ? `transferred ${payout.stripeTransferId ?? ""}` : payout.status === "failed" ? `transfer failed: ${payout.lastError ?? ""}` : payout.status}
                        {payout.reversedMinor ? ` · ${formatMoney(payout.reversedMinor, payout.currency)} taken back` : ""}
                      </div>
                    ) : null}
                    {payout?.status === "failed" ? (
                      <Form method="post">
                        <input type="hidden" name="bookingId" value={booking.id} />
                        <input type="hidden" name="intent" value="retry-payout" />
                        <Button type="submit" size="sm" variant="secondary" disabled={busy}>
                          Try the transfer again
                        </Button>
                      </Form>
                    ) : null}
                  </Td>
                  <Td className="text-xs">
                    {refunds.length === 0
                      ? "—"
                      : refunds.map((refund) => (
                          <div key={refund.id} className="tabular" data-testid="staff-refund">
                            {formatMoney(refund.amountMinor, refund.currency)} ({refund.rule}) ·{" "}
                            <span className={`font-semibold ${refundStateWords[refund.status]?.tone ?? ""}`}>{refundStateWords[refund.status]?.label ?? refund.status}</span>
                            {refund.failureReason ? <span className="text-ink-500"> ({refund.failureReason})</span> : null}
                          </div>
                        ))}
                  </Td>
                  <Td className="min-w-44">
                    {refundable > 0 ? (
                      <Form method="post" className="space-y-1.5">
                        <input type="hidden" name="bookingId" value={booking.id} />
                        <div className="flex flex-col gap-1.5">
                          <input name="amount" aria-label={`Amount to refund for ${booking.reference}`} defaultValue={(refundable / 100).toFixed(2)} inputMode="decimal" className="w-24 rounded-control border border-ink-300 px-2 py-1 text-sm tabular" />
                          <input name="reason" aria-label={`Reason for the refund of ${booking.reference}`} placeholder="Reason" className="w-full rounded-control border border-ink-300 px-2 py-1 text-sm" />
                        </div>
                        <Button type="submit" size="sm" variant="secondary" disabled={busy}>
                          Refund
                        </Button>
                        {errors ? <p role="alert" className="text-xs font-medium text-beyond">{Object.values(errors).flat().join(" ")}</p> : null}
                        {actionData?.bookingId === booking.id && actionData.message ? <p className="text-xs font-medium text-within">{actionData.message}</p> : null}
                      </Form>
                    ) : (
                      <span className="text-xs text-ink-500">Fully refunded</span>
                    )}
                  </Td>
                </Tr>
              );
            })}
          </tbody>
        </Table>
      </div>
    </div>
  );
}
