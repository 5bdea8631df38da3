import { data, redirect, useActionData, useLoaderData } from "react-router";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { ReportEntry } from "~/modules/reports/components/entry/report-entry";
import { getReportEntry, ReportRuleError, submitReport } from "~/modules/reports/service.server";
import type { Route } from "./+types/entry";

export const meta: Route.MetaFunction = ({ data: loaded }) => [{ title: loaded ? `Report: ${loaded.entry.machine.title} — Tenthmark` : "Report — Tenthmark" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const inspector = await requireRole(request, "inspector");
  try {
    // `?profile=key@version`: the profile just chosen in the form, whose tests and tolerances the page then loads.
    const [key, version] = (new URL(request.url).searchParams.get("profile") ?? "").split("@");
    const wanted = key && Number.isSafeInteger(Number(version)) ? { key: key.slice(0, 200), version: Number(version) } : undefined;
    return { entry: await getReportEntry(context.get(databaseContext), inspector, params.bookingId, new Date(), wanted) };
  } catch (error) {
    if (error instanceof ReportRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const inspector = await requireRole(request, "inspector");
  const formData = await request.formData();
  let form: unknown;
  try {
    form = JSON.parse(String(formData.get("form") ?? ""));
  } catch {
    return data({ errors: { form: ["The form could not be read. Reload the page; your readings are kept on this device."] } }, { status: 400 });
  }
  try {
    const submitted = await submitReport(context.get(databaseContext), inspector, params.bookingId, { form });
    if (!submitted.ok) return data({ errors: submitted.errors }, { status: 422 });
    return redirect(`/inspector/bookings/${params.bookingId}/report/review`);
  } catch (error) {
    if (error instanceof ReportRuleError) return data({ errors: { ...error.errors, form: [error.message] } }, { status: error.status });
    throw error;
  }
}

export default function ReportEntryPage() {
  const { entry } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const base = `/inspector/bookings/${entry.booking.id}/report`;
  return <ReportEntry key={entry.draft?.version ?? 0} data={entry} errors={actionData?.errors ?? null} draftUrl={`${base}/draft`} photosUrl={`${base}/photos`} columnMappingUrl="/inspector/column-mapping" />;
}
