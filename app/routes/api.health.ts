import { databaseContext } from "~/db/context";
import { checkDatabase } from "~/modules/health/health.server";
import type { Route } from "./+types/api.health";

export async function loader({ context }: Route.LoaderArgs) {
  const database = await checkDatabase(context.get(databaseContext));
  if (database.ok) return Response.json({ status: "ok", database: "ok" }, { headers: { "Cache-Control": "no-store" } });
  return Response.json(
    { status: "unavailable", database: "unreachable", reason: database.reason },
    { status: 503, headers: { "Cache-Control": "no-store", "Retry-After": "5" } },
  );
}
