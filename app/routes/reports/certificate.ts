import { data } from "react-router";
import { databaseContext } from "~/db/context";
import { renderCertificate } from "~/modules/reports/certificate.server";
import { getPublicReport, unsealedMessage } from "~/modules/reports/service.server";
import type { Route } from "./+types/certificate";

// GET: the PDF certificate of a signed (or superseded) report.
export async function loader({ params, context }: Route.LoaderArgs) {
  const report = await getPublicReport(context.get(databaseContext), params.reportId, null);
  if (report?.kind === "unsealed") throw data(unsealedMessage(report.reason), { status: 409 });
  if (!report || report.kind !== "published") throw data("There is no signed report at this address.", { status: 404 });
  const pdf = await renderCertificate(report);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.length),
      "content-disposition": `attachment; filename="tenthmark-report-${report.id.slice(0, 8)}-r${report.content.revision}.pdf"`,
      "cache-control": report.status === "signed" ? "public, max-age=300" : "public, max-age=86400",
    },
  });
}
