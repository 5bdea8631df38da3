import { data, Link, useLoaderData } from "react-router";
import { Badge, Card, CardBody, CardHeader } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { SlotTime } from "~/modules/inspections/components/parts";
import { getPublicInspector } from "~/modules/inspections/profiles.server";
import { categoryLabel } from "~/modules/inspections/validation";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/inspector-public";

export const meta: Route.MetaFunction = ({ data: loaded }) => [{ title: loaded ? `${loaded.inspector.name}, certified inspector — Tenthmark` : "Inspector — Tenthmark" }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const found = await getPublicInspector(context.get(databaseContext), params.inspectorId);
  if (!found) throw data("There is no certified inspector at this address.", { status: 404 });
  return found;
}

export default function InspectorProfile() {
  const { inspector, slots } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <nav className="text-sm text-ink-500" aria-label="Breadcrumb">
        <Link to="/inspectors" className="underline underline-offset-2 hover:text-ink-800">
          Inspectors
        </Link>{" "}
        / {inspector.name}
      </nav>
      <div className="mt-2 flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">{inspector.name}</h1>
        <Badge tone="within">Certified inspector</Badge>
      </div>
      <p className="mt-1 text-lg text-ink-600">{inspector.headline}</p>
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]">
        <div className="space-y-6">
          <Card>
            <CardHeader title="About" />
            <CardBody className="space-y-4 text-ink-800">
              <p className="whitespace-pre-line">{inspector.bio}</p>
              <div>
                <h3 className="text-sm font-bold text-ink-900">Qualifications</h3>
                <p className="mt-1 whitespace-pre-line text-sm text-ink-700">{inspector.qualifications}</p>
              </div>
              {inspector.hasCertificate ? (
                <a href={`/inspectors/${inspector.id}/certificate`} className="inline-block text-sm font-semibold text-ink-900 underline underline-offset-2">
                  View certificate (PDF)
                </a>
              ) : null}
            </CardBody>
          </Card>
          <Card>
            <CardHeader title="Free slots" description="Times in UTC. Book from the page of the machine to be inspected." />
            <CardBody>
              {slots.length === 0 ? (
                <p className="text-sm text-ink-500">No free slot at the moment.</p>
              ) : (
                <ul className="grid gap-2 text-sm sm:grid-cols-2">
                  {slots.map((slot) => (
                    <li key={slot.id} className="rounded-control border border-ink-200 px-3 py-2">
                      <SlotTime startsAt={slot.startsAt} endsAt={slot.endsAt} />
                    </li>
                  ))}
                </ul>
              )}
            </CardBody>
          </Card>
        </div>
        <aside className="space-y-4">
          <Card>
            <CardHeader title="Fees" />
            <CardBody>
              <dl className="divide-y divide-ink-100 text-sm">
                {inspector.fees.map((fee) => (
                  <div key={fee.category} className="flex justify-between gap-3 py-2">
                    <dt className="text-ink-700">{categoryLabel(fee.category)}</dt>
                    <dd className="font-bold text-ink-900 tabular">{formatMoney(fee.amountMinor, inspector.currency)}</dd>
                  </div>
                ))}
              </dl>
              <p className="mt-3 text-sm text-ink-600">
                Based in {inspector.baseCity}; travels to {inspector.regions.join(", ")}.
              </p>
            </CardBody>
          </Card>
        </aside>
      </div>
    </div>
  );
}
