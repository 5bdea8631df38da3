import { databaseContext } from "~/db/context";
import { openCertificate } from "~/modules/inspections/profiles.server";
import type { Route } from "./+types/inspector-certificate";

// A certified inspector's certificate, public so that buyers can check it.
export async function loader({ params, context }: Route.LoaderArgs) {
  const certificate = await openCertificate(context.get(databaseContext), params.inspectorId);
  if (!certificate) return new Response("Not found", { status: 404 });
  const headers = new Headers({
    "content-type": "application/pdf",
    "content-disposition": `inline; filename="${certificate.fileName.replace(/"/g, "")}"`,
    "x-content-type-options": "nosniff",
    "cache-control": "private, max-age=300",
  });
  if (certificate.contentLength !== undefined) headers.set("content-length", String(certificate.contentLength));
  return new Response(certificate.body as ReadableStream, { headers });
}
