import { data, redirect } from "react-router";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { ReportRuleError, startCorrection } from "~/modules/reports/service.server";
import type { Route } from "./+types/correct";

// POST: open a correction of a signed report, prefilled from its readings.
export async function action({ request, params, context }: Route.ActionArgs) {
  const inspector = await requireRole(request, "inspector");
  try {
    const { bookingId } = await startCorrection(context.get(databaseContext), inspector, params.reportId);
    return redirect(`/inspector/bookings/${bookingId}/report`);
  } catch (error) {
    if (error instanceof ReportRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

export function loader() {
  throw data("Open a correction from the report page.", { status: 405 });
}
