import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { saveColumnMapping } from "~/modules/reports/column-mappings.server";
import type { Route } from "./+types/column-mapping";

// POST (JSON mapping): the inspector's column mapping for instrument tables, offered on their next import.
export async function action({ request, context }: Route.ActionArgs) {
  if (request.method !== "POST") return Response.json({ error: "Send the mapping with POST." }, { status: 405, headers: { Allow: "POST" } });
  const inspector = await requireRole(request, "inspector");
  const length = Number(request.headers.get("content-length") ?? 0);
  if (length > 4_000) return Response.json({ error: "A column mapping is a few numbers; this is too long." }, { status: 413 });
  let body: unknown;
  try {
    const text = await request.text();
    if (text.length > 4_000) return Response.json({ error: "A column mapping is a few numbers; this is too long." }, { status: 413 });
    body = JSON.parse(text);
  } catch {
    return Response.json({ error: "The mapping must be JSON." }, { status: 400 });
  }
  const saved = await saveColumnMapping(context.get(databaseContext), inspector, body);
  if (!saved.ok) return Response.json({ error: "The mapping could not be read; nothing was saved.", errors: saved.errors }, { status: 422 });
  return Response.json({ mapping: saved.mapping });
}

export function loader() {
  return Response.json({ error: "Send the mapping with POST." }, { status: 405, headers: { Allow: "POST" } });
}
