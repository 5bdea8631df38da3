import { data, Link } from "react-router";
import { StatusBadge } from "~/components/listings/status-badge";
import { Badge, Card } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { countryName, labelOf, machineCategories } from "~/modules/listings/catalogue";
import { getSellerPage } from "~/modules/listings/service.server";
import { currentReportsForListings } from "~/modules/reports/service.server";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/seller";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `${data.name}: machines for sale — Tenthmark` : "Seller not found — Tenthmark" }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const db = context.get(databaseContext);
  const page = await getSellerPage(db, params.publicId);
  if (!page) throw data("There is no seller at this address, or they have no machine on show.", { status: 404 });
  const reports = await currentReportsForListings(db, page.listings.map((listing) => listing.id));
  const listings = page.listings.map(({ id, ...listing }) => ({ ...listing, grade: reports.get(id)?.grade ?? null }));
  return { name: page.name, town: page.town, listings, verified: listings.filter((listing) => listing.grade).length };
}

export default function SellerPage({ loaderData }: Route.ComponentProps) {
  const { name, town, listings, verified } = loaderData;
  const place = [town.city, town.region, countryName(town.country)].filter(Boolean).join(", ");
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Seller</p>
      <h1 className="mt-1 text-3xl font-extrabold text-ink-900">{name}</h1>
      <p className="mt-2 text-ink-600">{place}</p>
      <p className="mt-4 text-ink-800" data-testid="seller-counts">
        {listings.length} {listings.length === 1 ? "machine" : "machines"} on show, {verified} verified by a certified inspector
      </p>
      <ul className="mt-8 grid gap-4 sm:grid-cols-2 lg:grid-cols-3" aria-label={`Machines offered by ${name}`}>
        {listings.map((listing) => (
          <li key={listing.slug}>
            <Card className="h-full overflow-hidden">
              {listing.coverUrl ? (
                <img src={listing.coverUrl} alt="" width={480} height={360} className="aspect-[4/3] w-full object-cover" loading="lazy" />
              ) : (
                <div className="flex aspect-[4/3] items-center justify-center bg-ink-100 text-sm text-ink-500">No photo</div>
              )}
              <div className="space-y-2 p-4">
                <p className="text-xs font-bold uppercase tracking-wide text-brass-600">
                  {labelOf(machineCategories, listing.category)}
                  {listing.year ? ` · ${listing.year}` : ""}
                </p>
                <Link to={`/machines/${listing.slug}`} className="block font-bold text-ink-900 hover:underline">
                  {listing.title}
                </Link>
                <p className="text-sm text-ink-600">
                  {listing.city}, {countryName(listing.country)}
                </p>
                <div className="flex flex-wrap items-center gap-2">
                  <span className="font-bold text-ink-900 tabular">{formatMoney(listing.priceMinor, listing.currency)}</span>
                  {listing.grade ? <Badge tone="within">Verified · grade {listing.grade}</Badge> : <Badge tone="caution">Not yet verified</Badge>}
                  {listing.status !== "published" ? <StatusBadge status={listing.status} /> : null}
                </div>
              </div>
            </Card>
          </li>
        ))}
      </ul>
    </div>
  );
}
