import { data } from "react-router";
import { databaseContext } from "~/db/context";
import { handleStripeEvent } from "~/modules/inspections/webhook.server";
import { verifyWebhook, WebhookSignatureError } from "~/modules/payments/stripe.server";
import type { Route } from "./+types/api.webhooks.stripe";

// Stripe's events for bookings. The body is read as text, exactly as sent, since the signature covers those bytes.
export async function action({ request, context }: Route.ActionArgs) {
  if (request.method !== "POST") throw data({ error: "Use POST." }, { status: 405 });
  const rawBody = await request.text();
  let event;
  try {
    event = verifyWebhook(rawBody, request.headers.get("stripe-signature"));
  } catch (error) {
    if (error instanceof WebhookSignatureError) return data({ error: error.message, problem: error.problem }, { status: 400 });
    throw error;
  }
  const result = await handleStripeEvent(context.get(databaseContext), event);
  return data({ received: true, outcome: result.outcome });
}

export function loader() {
  throw data({ error: "Stripe sends its events here with POST." }, { status: 405 });
}
