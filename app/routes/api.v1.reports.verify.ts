import { databaseContext } from "~/db/context";
import { ReportRuleError, verifyReportHash } from "~/modules/reports/service.server";
import type { Route } from "./+types/api.v1.reports.verify";

// GET /api/v1/reports/verify?hash=<sha256 hex>: whether the hash is that of a signed report, and which.
export async function loader({ request, context }: Route.LoaderArgs) {
  const hash = new URL(request.url).searchParams.get("hash") ?? "";
  try {
    return Response.json(await verifyReportHash(context.get(databaseContext), hash.trim().toLowerCase()));
  } catch (error) {
    if (error instanceof ReportRuleError) return Response.json({ errors: { hash: [error.message] } }, { status: error.status });
    throw error;
  }
}

export function action() {
  return Response.json({ errors: { request: ["Use GET with ?hash=<64 hexadecimal characters>."] } }, { status: 405, headers: { Allow: "GET" } });
}
