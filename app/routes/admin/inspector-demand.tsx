import { Card } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { StaffNav } from "~/modules/accounts/components/staff-nav";
import { requireRole } from "~/modules/accounts/guards.server";
import { openDemandByRegion } from "~/modules/demand/service.server";
import type { Route } from "./+types/inspector-demand";

export const meta: Route.MetaFunction = () => [{ title: "Inspector demand — Tenthmark staff" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  return { regions: await openDemandByRegion(context.get(databaseContext)) };
}

export default function InspectorDemand({ loaderData }: Route.ComponentProps) {
  const { regions } = loaderData;
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <StaffNav current="demand" />
      <h1 className="mt-4 text-3xl font-extrabold tracking-tight text-ink-950">Inspector demand</h1>
      <p className="mt-1 max-w-3xl text-ink-600">
        Regions where buyers or sellers asked for an inspector and nobody serves yet, most asked first. A request closes, and its requester is
        e-mailed, when a certified inspector adds the region to their profile.
      </p>
      {regions.length ? (
        <Card className="mt-6 overflow-x-auto">
          <table className="w-full text-left text-sm" data-testid="demand-table">
            <thead className="border-b border-ink-200 text-ink-600">
              <tr>
                <th scope="col" className="px-4 py-3 font-semibold">Region</th>
                <th scope="col" className="px-4 py-3 font-semibold">Country</th>
                <th scope="col" className="px-4 py-3 text-right font-semibold">Open requests</th>
                <th scope="col" className="px-4 py-3 font-semibold">First asked</th>
                <th scope="col" className="px-4 py-3 font-semibold">Last asked</th>
              </tr>
            </thead>
            <tbody>
              {regions.map((row) => (
                <tr key={`${row.country}:${row.region}`} className="border-b border-ink-100 last:border-0" data-region={row.region}>
                  <td className="px-4 py-3 font-semibold text-ink-900">{row.region}</td>
                  <td className="px-4 py-3 text-ink-700">{row.country}</td>
                  <td className="px-4 py-3 text-right tabular font-bold text-ink-900">{row.requests}</td>
                  <td className="whitespace-nowrap px-4 py-3 tabular text-ink-600">{row.firstAsked}</td>
                  <td className="whitespace-nowrap px-4 py-3 tabular text-ink-600">{row.lastAsked}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      ) : (
        <Card className="mt-6 p-8 text-center text-ink-600">No open requests: every region somebody asked about is served.</Card>
      )}
    </div>
  );
}
