import { data, redirect } from "react-router";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { startPayoutOnboarding } from "~/modules/inspections/payouts.server";
import { PaymentsUnavailableError } from "~/modules/payments/stripe.server";
import type { Route } from "./+types/payouts-refresh";

// The set-up link had expired or was used already: the provider sends the inspector here for a fresh one.
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(request, "inspector");
  try {
    return redirect(await startPayoutOnboarding(context.get(databaseContext), user));
  } catch (error) {
    if (error instanceof PaymentsUnavailableError) throw data("The payment provider is not answering. Go back to your profile and try again in a few minutes.", { status: 503 });
    throw error;
  }
}
