// The visit's logistics, posted from the booking pages: the seller's site details, a request to move the
// visit, and the other side's answer. Answers data for the page's fetcher; no page of its own.
import { z } from "zod";
import { data } from "react-router";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { BookingRuleError } from "~/modules/inspections/errors";
import { machineSiteSchema, rescheduleDecisionSchema, rescheduleSchema } from "~/modules/inspections/validation";
import { decideReschedule, requestReschedule, saveMachineSite } from "~/modules/inspections/visits.server";
import type { Route } from "./+types/visit";

const intents = { site: machineSiteSchema, reschedule: rescheduleSchema, decide: rescheduleDecisionSchema } as const;

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireUser(request);
  const form = Object.fromEntries(await request.formData());
  const intent = String(form.intent ?? "");
  if (!(intent in intents)) return data({ ok: false, intent, errors: { form: ["Unknown action."] } as Record<string, string[]> }, { status: 400 });
  const parsed = intents[intent as keyof typeof intents].safeParse(form);
  if (!parsed.success) return data({ ok: false, intent, errors: z.flattenError(parsed.error as z.ZodError).fieldErrors as Record<string, string[]> }, { status: 422 });
  const db = context.get(databaseContext);
  try {
    if (intent === "site") await saveMachineSite(db, user, params.bookingId, parsed.data as z.infer<typeof machineSiteSchema>);
    else if (intent === "reschedule") await requestReschedule(db, user, params.bookingId, parsed.data as z.infer<typeof rescheduleSchema>);
    else {
      const decision = parsed.data as z.infer<typeof rescheduleDecisionSchema>;
      await decideReschedule(db, user, params.bookingId, decision.requestId, decision.decision);
    }
    return { ok: true, intent, errors: null };
  } catch (error) {
    if (error instanceof BookingRuleError) return data({ ok: false, intent, errors: { [error.field ?? "form"]: [error.message] } }, { status: error.status });
    throw error;
  }
}

export function loader() {
  return Response.json({ error: "Send the visit's details with POST from the booking page." }, { status: 405, headers: { Allow: "POST" } });
}
