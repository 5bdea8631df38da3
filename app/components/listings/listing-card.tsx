import { Link } from "react-router";
import { Badge, Card } from "~/components/ui";
import { countryName, labelOf, machineCategories, machineConditions } from "~/modules/listings/catalogue";
import { formatLength, formatMoney, type DisplayUnits } from "~/modules/units/format";

export type ListingCardData = {
  slug: string;
  title: string;
  category: string;
  condition: string;
  year: number | null;
  swingOverBedMm: number | null;
  distanceBetweenCentresMm: number | null;
  city: string;
  region: string | null;
  country: string;
  priceMinor: number;
  currency: string;
  coverUrl: string | null;
};

export function ListingCard({ listing, units }: { listing: ListingCardData; units: DisplayUnits }) {
  const sizes = [
    listing.swingOverBedMm ? `${formatLength(listing.swingOverBedMm, units)} swing` : null,
    listing.distanceBetweenCentresMm ? `${formatLength(listing.distanceBetweenCentresMm, units)} between centres` : null,
  ].filter(Boolean);
  return (
    <Card className="group flex flex-col overflow-hidden">
      <Link to={`/machines/${listing.slug}`} className="flex flex-1 flex-col focus-visible:outline-offset-[-2px]">
        {listing.coverUrl ? (
          <img src={listing.coverUrl} alt="" className="aspect-[4/3] w-full object-cover" width={480} height={360} loading="lazy" />
        ) : (
          <div className="flex aspect-[4/3] w-full items-center justify-center bg-ink-100 text-sm text-ink-500">No photo yet</div>
        )}
        <div className="flex flex-1 flex-col p-4">
          <p className="text-xs font-bold uppercase tracking-wide text-brass-600">
            {labelOf(machineCategories, listing.category)}
            {listing.year ? ` · ${listing.year}` : ""}
          </p>
          <h2 className="mt-1 text-lg font-bold text-ink-900 group-hover:underline">{listing.title}</h2>
          {sizes.length ? <p className="mt-1 text-sm text-ink-600 tabular">{sizes.join(" · ")}</p> : null}
          <p className="mt-1 text-sm text-ink-500">
            {listing.city}, {countryName(listing.country)}
          </p>
          <div className="mt-auto flex items-end justify-between gap-2 pt-4">
            <p className="text-lg font-extrabold text-ink-900 tabular">{formatMoney(listing.priceMinor, listing.currency)}</p>
            <div className="flex flex-wrap justify-end gap-1">
              <Badge>{labelOf(machineConditions, listing.condition)}</Badge>
              <Badge tone="caution">Not yet verified</Badge>
            </div>
          </div>
        </div>
      </Link>
    </Card>
  );
}
