import { Link, useLoaderData } from "react-router";
import { Badge, Card, CardBody, CardHeader, Table, Td, Th, Tr } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { getPayoutAccount, listEarnings, payoutStateWords } from "~/modules/inspections/payouts.server";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/inspector-earnings";

export const meta: Route.MetaFunction = () => [{ title: "Your earnings — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(request, "inspector");
  const db = context.get(databaseContext);
  const earnings = await listEarnings(db, user.id);
  return { perBooking: earnings.perBooking, totals: earnings.totals, months: earnings.months, currencies: earnings.totals.map((total) => total.currency), payouts: payoutStateWords(await getPayoutAccount(db, user.id)) };
}

const shareStatus = {
  held: { label: "Held until payout set-up", tone: "caution" },
  unclaimed: { label: "Held over 90 days", tone: "caution" },
  due: { label: "Being transferred", tone: "brass" },
  transferred: { label: "Transferred", tone: "within" },
  failed: { label: "Transfer failed, staff told", tone: "beyond" },
} as const;

const monthName = (month: string) => new Date(`${month}-01T00:00:00Z`).toLocaleDateString("en-GB", { month: "long", year: "numeric", timeZone: "UTC" });

export default function InspectorEarnings() {
  const { perBooking, totals, months, currencies, payouts } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Your earnings</h1>
      <p className="mt-1 text-ink-600">Your share of each booking (the fee less the platform's 15 %), where it is, and monthly statements.</p>
      {!payouts.ready ? (
        <p className="mt-4 rounded-control border border-brass-200 bg-brass-100 px-4 py-3 text-sm text-ink-800">
          {payouts.headline}{" "}
          <Link to="/inspector/profile" className="font-semibold underline underline-offset-2">
            Set up payouts
          </Link>
        </p>
      ) : null}
      <div className="mt-5 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
        {totals.length === 0 ? <p className="text-sm text-ink-600">Nothing earned yet: your share is counted when you file a booking's report.</p> : null}
        {totals.map((total) => (
          <Card key={total.currency}>
            <CardBody className="space-y-1 text-sm text-ink-700">
              <p className="font-bold text-ink-900">{total.currency}</p>
              <p>Earned: <span className="tabular">{formatMoney(total.earned, total.currency)}</span></p>
              <p>Held for you: <span className="tabular">{formatMoney(total.held, total.currency)}</span></p>
              <p>Transferred: <span className="tabular">{formatMoney(total.transferred, total.currency)}</span></p>
              <p>Taken back after refunds: <span className="tabular">{formatMoney(total.heldReversed + total.transferReversed, total.currency)}</span></p>
            </CardBody>
          </Card>
        ))}
      </div>
      <div className="mt-6">
        <Table caption="Your share per booking">
          <thead>
            <tr>
              <Th>Booking</Th>
              <Th>Fee / platform fee</Th>
              <Th>Your share</Th>
              <Th>Held</Th>
              <Th>Transferred</Th>
              <Th>Taken back</Th>
              <Th>State</Th>
            </tr>
          </thead>
          <tbody>
            {perBooking.length === 0 ? (
              <Tr>
                <Td colSpan={7} className="py-8 text-center text-ink-500">
                  No filed reports yet.
                </Td>
              </Tr>
            ) : null}
            {perBooking.map((row) => (
              <Tr key={row.bookingId}>
                <Td>
                  <Link to={`/inspector/bookings/${row.bookingId}`} className="whitespace-nowrap font-mono text-xs font-semibold underline">
                    {row.reference}
                  </Link>
                </Td>
                <Td className="whitespace-nowrap tabular text-xs">
                  {formatMoney(row.feeMinor, row.currency)} / {formatMoney(row.platformFeeMinor, row.currency)}
                </Td>
                <Td className="tabular text-sm">{formatMoney(row.earnedMinor, row.currency)}</Td>
                <Td className="tabular text-sm">{formatMoney(row.heldMinor, row.currency)}</Td>
                <Td className="tabular text-sm">{formatMoney(row.transferredMinor, row.currency)}</Td>
                <Td className="tabular text-sm">{row.reversedMinor ? `-${formatMoney(row.reversedMinor, row.currency)}` : "—"}</Td>
                <Td>
                  <Badge tone={shareStatus[row.status].tone}>{shareStatus[row.status].label}</Badge>
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      </div>
      <Card className="mt-6">
        <CardHeader title="Monthly statements" description="Every movement of your shares in a calendar month (UTC), with what we held for you at its start and end." />
        <CardBody>
          {months.length === 0 ? <p className="text-sm text-ink-600">No statements yet.</p> : null}
          <ul className="divide-y divide-ink-100">
            {months.map((month) =>
              currencies.map((currency) => (
                <li key={`${month}-${currency}`} className="flex flex-wrap items-center justify-between gap-2 py-2 text-sm">
                  <span className="font-semibold text-ink-900">
                    {monthName(month)} · {currency}
                  </span>
                  <span className="flex gap-4">
                    <a className="font-semibold underline underline-offset-2" href={`/inspector/earnings/statements/${month}-${currency.toLowerCase()}.pdf`}>
                      PDF
                    </a>
                    <a className="font-semibold underline underline-offset-2" href={`/inspector/earnings/statements/${month}-${currency.toLowerCase()}.csv`}>
                      CSV
                    </a>
                  </span>
                </li>
              )),
            )}
          </ul>
        </CardBody>
      </Card>
    </div>
  );
}
