// The accepted visit as an iCalendar file, for the booking's parties.
import { data } from "react-router";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { BookingRuleError } from "~/modules/inspections/errors";
import { visitCalendarFile } from "~/modules/inspections/visits.server";
import type { Route } from "./+types/visit-calendar";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(request);
  try {
    const file = await visitCalendarFile(context.get(databaseContext), user, params.bookingId);
    return new Response(file.body, {
      headers: {
        "content-type": "text/calendar; charset=utf-8",
        "content-disposition": `attachment; filename="${file.filename}"`,
        // The address is private to the parties: never kept by a shared cache.
        "cache-control": "private, no-store",
      },
    });
  } catch (error) {
    if (error instanceof BookingRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}
