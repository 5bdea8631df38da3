import { databaseContext } from "~/db/context";
import { parseListingSearchParams } from "~/modules/search/search-params.server";
import { searchMachines } from "~/modules/search/service.server";
import type { Route } from "./+types/api.listings";

// GET /api/v1/listings: the search page's search as JSON (docs/api-listings.md).
export async function loader({ request, context }: Route.LoaderArgs) {
  const parsed = parseListingSearchParams(new URL(request.url).searchParams);
  if (!parsed.success) {
    return Response.json(
      { error: "invalid_query", message: "Some search parameters are not valid; see `errors` for each one.", errors: parsed.errors },
      { status: 400, headers: { "cache-control": "no-store" } },
    );
  }
  const search = await searchMachines(context.get(databaseContext), parsed.query, { units: parsed.units, after: parsed.after });
  return Response.json(search, { headers: { "cache-control": "no-store" } });
}
