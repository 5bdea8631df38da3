import { evaluationRequestSchema, fieldErrors, GeometryInputError, scoreEvaluation } from "~/geometry";
import type { Route } from "./+types/api.v1.evaluations";

const ALLOW = { Allow: "POST" };

// POST /api/v1/evaluations: score a measurement set against a tolerance profile. The engine is pure,
// so this route only parses, scores and answers.
export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return methodNotAllowed();

  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return Response.json({ errors: { request: ["The body must be JSON (Content-Type: application/json)."] } }, { status: 400 });
  }

  const parsed = evaluationRequestSchema.safeParse(body);
  if (!parsed.success) return Response.json({ errors: fieldErrors(parsed.error) }, { status: 422 });

  try {
    return Response.json(scoreEvaluation(parsed.data));
  } catch (error) {
    // The schema catches what it can; the engine's own checks are the last word on the readings.
    if (error instanceof GeometryInputError) {
      const field = error.path.length > 0 ? error.path.join(".") : "measurements";
      return Response.json({ errors: { [field]: [error.message] } }, { status: 422 });
    }
    throw error;
  }
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
