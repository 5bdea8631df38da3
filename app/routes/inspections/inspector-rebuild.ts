// From an inspector's booking to the rebuild record of its machine: the booking page names the booking only,
// and the way on to the listing's record opens for the inspector whose visit it is.
import { data, redirect } from "react-router";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { listingOfVisit } from "~/modules/inspections/bookings.server";
import type { Route } from "./+types/inspector-rebuild";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const inspector = await requireRole(request, "inspector");
  const listingId = await listingOfVisit(context.get(databaseContext), inspector.id, params.bookingId);
  if (!listingId) throw data("There is no visit of yours at this address whose machine you can record.", { status: 404 });
  return redirect(`/sell/listings/${listingId}/rebuild`);
}
