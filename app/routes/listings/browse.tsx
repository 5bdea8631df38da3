import { Link } from "react-router";
import { z } from "zod";
import { ListingCard } from "~/components/listings/listing-card";
import { ButtonLink, Card, cx } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { browseListings } from "~/modules/listings/service.server";
import type { Route } from "./+types/browse";

export const meta: Route.MetaFunction = () => [
  { title: "Machines for sale — Tenthmark" },
  { name: "description", content: "Used lathes and machine tools for sale, newest first." },
];

const query = z.object({ page: z.coerce.number().int().min(1).catch(1) });

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = await getOptionalUser(request);
  const { page } = query.parse(Object.fromEntries(new URL(request.url).searchParams));
  const result = await browseListings(context.get(databaseContext), { page });
  return { ...result, units: viewer?.displayUnits ?? "mm" };
}

export default function Machines({ loaderData }: Route.ComponentProps) {
  const { listings, page, pageCount, total, units } = loaderData;
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-extrabold text-ink-900">Machines for sale</h1>
          <p className="mt-1 text-ink-600">
            {total === 1 ? "1 machine" : `${total} machines`}, newest first. Sizes in {units === "inch" ? "inches" : "millimetres"}.
          </p>
        </div>
        <ButtonLink to="/sell/new" variant="secondary">
          Sell a machine
        </ButtonLink>
      </div>

      {listings.length ? (
        <ul className="mt-8 grid gap-5 sm:grid-cols-2 lg:grid-cols-3">
          {listings.map((listing) => (
            <li key={listing.id} className="flex">
              <ListingCard listing={listing} units={units} />
            </li>
          ))}
        </ul>
      ) : (
        <Card className="mt-8 p-8 text-center text-ink-600">No machines are listed yet. Check back soon, or list one of yours.</Card>
      )}

      {pageCount > 1 ? (
        <nav aria-label="Pages" className="mt-10 flex flex-wrap items-center justify-center gap-2">
          {page > 1 ? (
            <Link to={`?page=${page - 1}`} className="rounded-(--radius-control) px-3 py-2 text-sm font-semibold text-ink-700 hover:bg-ink-100" rel="prev">
              ← Newer
            </Link>
          ) : null}
          {Array.from({ length: pageCount }, (_, index) => index + 1).map((number) => (
            <Link
              key={number}
              to={`?page=${number}`}
              aria-current={number === page ? "page" : undefined}
              className={cx(
                "min-w-10 rounded-(--radius-control) px-3 py-2 text-center text-sm font-semibold tabular",
                number === page ? "bg-ink-900 text-white" : "text-ink-700 hover:bg-ink-100",
              )}
            >
              {number}
            </Link>
          ))}
          {page < pageCount ? (
            <Link to={`?page=${page + 1}`} className="rounded-(--radius-control) px-3 py-2 text-sm font-semibold text-ink-700 hover:bg-ink-100" rel="next">
              Older →
            </Link>
          ) : null}
        </nav>
      ) : null}
    </div>
  );
}
