import { data } from "react-router";
import { databaseContext } from "~/db/context";
import { env } from "~/env.server";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import type { DisplayUnits } from "~/modules/units/format";
import { renderCertificate } from "~/modules/reports/certificate.server";
import { getPublicReport, unsealedMessage } from "~/modules/reports/service.server";
import type { Route } from "./+types/certificate";

// GET: the PDF certificate of a signed (or superseded) report, in the units asked for (?units=mm|inch) or
// else the signed-in reader's.
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const report = await getPublicReport(context.get(databaseContext), params.reportId, null);
  if (report?.kind === "unsealed") throw data(unsealedMessage(report.reason), { status: 409 });
  if (!report || report.kind !== "published") throw data("There is no signed report at this address.", { status: 404 });
  const requested = new URL(request.url).searchParams.get("units");
  const chosen = requested === "inch" || requested === "mm" ? requested : null;
  const units: DisplayUnits = chosen ?? (await getOptionalUser(request))?.displayUnits ?? "mm";
  const pdf = await renderCertificate(report, { units, origin: env().APP_ORIGIN });
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.length),
      "content-disposition": `attachment; filename="tenthmark-report-${report.id.slice(0, 8)}-r${report.content.revision}.pdf"`,
      // Without ?units= the file depends on who asks, so no shared cache keeps it.
      "cache-control": `${chosen ? "public" : "private"}, ${report.status === "signed" ? "max-age=300" : "max-age=86400"}`,
    },
  });
}
