import { databaseContext } from "~/db/context";
import { env } from "~/env.server";
import { didDocument } from "~/modules/reports/signing.server";
import type { Route } from "./+types/well-known.did";

// GET /.well-known/did.json: the did:web document of this origin, with every key that has signed reports and
// the period it signed in, so credentials signed before a rotation still verify.
export async function loader({ context }: Route.LoaderArgs) {
  const document = await didDocument(context.get(databaseContext), env().APP_ORIGIN);
  return new Response(JSON.stringify(document, null, 2), {
    headers: { "content-type": "application/did+json", "cache-control": "public, max-age=300", "access-control-allow-origin": "*" },
  });
}
