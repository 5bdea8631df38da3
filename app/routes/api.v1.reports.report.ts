import { databaseContext } from "~/db/context";
import { entityTag, holdsTag, notModified } from "~/modules/http/conditional.server";
import { reportForApi, unsealedMessage } from "~/modules/reports/service.server";
import type { Route } from "./+types/api.v1.reports.report";

const ALLOW = { Allow: "GET" };

// GET /api/v1/reports/:id: a signed or superseded report as public JSON; 404 for anything else.
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const report = await reportForApi(context.get(databaseContext), params.reportId);
  if (!report) return Response.json({ errors: { reportId: ["No signed report has this id."] } }, { status: 404 });
  if (report.kind === "unsealed") {
    return Response.json({ id: report.id, intact: false, mismatched: report.mismatched, errors: { report: [unsealedMessage(report.reason)] } }, { status: 409 });
  }
  // The answer changes only when a correction supersedes the report: a cache revalidates and gets 304 until then.
  const tag = entityTag([report.id, report.contentHash, report.status, report.supersededBy, report.links]);
  const headers = new Headers({ ETag: tag, "Cache-Control": report.status === "signed" ? "public, max-age=60" : "public, max-age=3600" });
  if (holdsTag(request, tag)) return notModified(headers);
  return Response.json(report, { headers });
}

// A signed report is immutable: no method changes it.
export function action() {
  return Response.json({ errors: { request: ["Signed reports cannot be changed. A correction is filed by its inspector as a new revision."] } }, { status: 405, headers: ALLOW });
}
