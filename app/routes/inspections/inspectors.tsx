import { data, Form, Link, useLoaderData } from "react-router";
import { z } from "zod";
import { safeText } from "~/modules/validation/text";
import { Badge, Button, Card, CardBody, SelectField, TextField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { listPublicInspectors } from "~/modules/inspections/profiles.server";
import { categoryLabel, inspectionCategories } from "~/modules/inspections/validation";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/inspectors";

export const meta: Route.MetaFunction = () => [
  { title: "Certified inspectors — Tenthmark" },
  { name: "description", content: "Certified inspectors who check used machine tools on site and file scored geometry reports." },
];

const filterSchema = z.object({
  category: z.enum(inspectionCategories).optional().catch(undefined),
});
const regionSchema = safeText({ label: "region or country", max: 80 }).optional();

export async function loader({ request, context }: Route.LoaderArgs) {
  const params = new URL(request.url).searchParams;
  const region = regionSchema.safeParse(params.get("region") ?? undefined);
  const filter = { ...filterSchema.parse(Object.fromEntries(params)), region: region.success ? region.data : undefined };
  if (!region.success) return data({ filter, inspectors: [], problem: region.error.issues[0]!.message }, { status: 400 });
  const inspectors = await listPublicInspectors(context.get(databaseContext), { category: filter.category, region: filter.region || undefined });
  return { filter, inspectors, problem: undefined };
}

export default function Inspectors() {
  const { filter, inspectors, problem } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Certified inspectors</h1>
      <p className="mt-2 max-w-3xl text-ink-600">
        Each inspector here has been certified by Tenthmark staff. They travel to the machine, take the trade's geometric tests with calibrated
        instruments and file a report that the server scores. Book one from the page of the machine you want checked.
      </p>
      <Form method="get" className="mt-6 flex flex-col gap-3 sm:flex-row sm:items-end">
        <SelectField
          label="Machine"
          name="category"
          defaultValue={filter.category ?? ""}
          placeholder="Any machine"
          options={inspectionCategories.map((value) => ({ value, label: categoryLabel(value) }))}
          className="sm:w-56"
        />
        <TextField label="Region or country" name="region" defaultValue={filter.region ?? ""} errors={problem ? [problem] : undefined} placeholder="e.g. Westmarch" className="sm:w-64" />
        <Button type="submit" variant="secondary">
          Show
        </Button>
      </Form>
      {inspectors.length === 0 ? (
        <Card className="mt-6">
          <CardBody className="py-10 text-center text-ink-600">No certified inspector matches. Try another region or machine.</CardBody>
        </Card>
      ) : (
        <ul className="mt-6 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          {inspectors.map((inspector) => (
            <li key={inspector.id}>
              <Link to={`/inspectors/${inspector.id}`} className="flex h-full flex-col rounded-panel border border-ink-200 bg-white p-5 shadow-panel hover:border-ink-400">
                <div className="flex items-start justify-between gap-2">
                  <p className="text-lg font-bold text-ink-900">{inspector.name}</p>
                  <Badge tone="within">Certified</Badge>
                </div>
                <p className="mt-1 text-sm text-ink-600">{inspector.headline}</p>
                <p className="mt-3 text-sm text-ink-700">
                  <span className="font-semibold">Travels from</span> {inspector.baseCity} <span className="font-semibold">to</span> {inspector.regions.join(", ")}
                </p>
                <div className="mt-3 flex flex-wrap gap-1.5">
                  {inspector.fees.map((fee) => (
                    <Badge key={fee.category}>
                      {categoryLabel(fee.category)} · {formatMoney(fee.amountMinor, inspector.currency)}
                    </Badge>
                  ))}
                </div>
              </Link>
            </li>
          ))}
        </ul>
      )}
      <div className="mt-10">
      </div>
    </div>
  );
}
