import { databaseContext } from "~/db/context";
import { reportForApi, unsealedMessage } from "~/modules/reports/service.server";
import type { Route } from "./+types/api.v1.reports.report";

const ALLOW = { Allow: "GET" };

// GET /api/v1/reports/:id: a signed or superseded report as public JSON; 404 for anything else.
export async function loader({ params, context }: Route.LoaderArgs) {
  const report = await reportForApi(context.get(databaseContext), params.reportId);
  if (!report) return Response.json({ errors: { reportId: ["No signed report has this id."] } }, { status: 404 });
  if (report.kind === "unsealed") {
    return Response.json({ id: report.id, intact: false, mismatched: report.mismatched, errors: { report: [unsealedMessage(report.reason)] } }, { status: 409 });
  }
  return Response.json(report, { headers: { "cache-control": report.status === "signed" ? "public, max-age=60" : "public, max-age=3600" } });
}

// A signed report is immutable: no method changes it.
export function action() {
  return Response.json({ errors: { request: ["Signed reports cannot be changed. A correction is filed by its inspector as a new revision."] } }, { status: 405, headers: ALLOW });
}
