import { redirect } from "react-router";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { refreshPayoutAccount } from "~/modules/inspections/payouts.server";
import { PaymentsUnavailableError } from "~/modules/payments/stripe.server";
import type { Route } from "./+types/payouts-return";

// Back from the payment provider's hosted set-up: read the account's state now (its webhook may still be on the way).
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(request, "inspector");
  try {
    await refreshPayoutAccount(context.get(databaseContext), user.id);
  } catch (error) {
    // The webhook brings the same state later; the profile says so.
    if (!(error instanceof PaymentsUnavailableError)) throw error;
  }
  return redirect("/inspector/profile?payouts=returned");
}
