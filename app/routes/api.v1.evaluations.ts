import { databaseContext } from "~/db/context";
import { scoreEvaluationRequest } from "~/modules/profiles/service.server";
import type { Route } from "./+types/api.v1.evaluations";

const ALLOW = { Allow: "POST" };

// POST /api/v1/evaluations: score a measurement set against a published (or retired) tolerance profile
// version. The engine is pure; the profiles come from the database.
export async function action({ request, context }: Route.ActionArgs) {
  if (request.method !== "POST") return methodNotAllowed();

  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return Response.json({ errors: { request: ["The body must be JSON (Content-Type: application/json)."] } }, { status: 400 });
  }

  const scored = await scoreEvaluationRequest(context.get(databaseContext), body);
  if (!scored.ok) return Response.json({ errors: scored.errors }, { status: 422 });
  return Response.json(scored.response);
}

export function loader() {
  return methodNotAllowed();
}

function methodNotAllowed() {
  return Response.json(
    { errors: { request: ["Send the measurements with POST as JSON."] } },
    { status: 405, headers: ALLOW },
  );
}
