import { databaseContext } from "~/db/context";
import { reportCredential } from "~/modules/reports/service.server";
import type { Route } from "./+types/api.v1.reports.credential";

const ALLOW = { Allow: "GET" };

// GET /api/v1/reports/:id/credential: the report's W3C Verifiable Credential with its eddsa-jcs-2022 proof,
// byte for byte as signed (RFC 8785 JSON). Anyone may check it with the keys in /.well-known/did.json.
export async function loader({ params, context }: Route.LoaderArgs) {
  const credential = await reportCredential(context.get(databaseContext), params.reportId);
  if (!credential) return Response.json({ errors: { reportId: ["No signed report with a credential has this id."] } }, { status: 404 });
  return new Response(credential, {
    headers: {
      "content-type": "application/vc",
      "content-disposition": `inline; filename="tenthmark-report-${params.reportId}.credential.json"`,
      "cache-control": "public, max-age=3600",
      "access-control-allow-origin": "*",
    },
  });
}

export function action() {
  return Response.json({ errors: { request: ["A credential cannot be changed."] } }, { status: 405, headers: ALLOW });
}
