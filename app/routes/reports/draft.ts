import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { ReportRuleError, saveDraft } from "~/modules/reports/service.server";
import type { Route } from "./+types/draft";

// POST (JSON { form }): the entry page's autosave and its last-gasp beacon. Answers JSON only.
export async function action({ request, params, context }: Route.ActionArgs) {
  if (request.method !== "POST") return Response.json({ error: "Send the draft with POST." }, { status: 405, headers: { Allow: "POST" } });
  const inspector = await requireRole(request, "inspector");
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return Response.json({ error: "The draft must be JSON." }, { status: 400 });
  }
  try {
    return Response.json(await saveDraft(context.get(databaseContext), inspector, params.bookingId, body));
  } catch (error) {
    if (error instanceof ReportRuleError) return Response.json({ error: error.message, errors: error.errors }, { status: error.status });
    throw error;
  }
}

export function loader() {
  return Response.json({ error: "Send the draft with POST." }, { status: 405, headers: { Allow: "POST" } });
}
