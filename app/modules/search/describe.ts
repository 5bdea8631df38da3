// A buyer's search in words, for saved-search lists, default names and e-mails. Pure: server and browser.
import { countryName, labelOf, machineCategories } from "~/modules/listings/catalogue";
import { formatLength, formatMoney, type DisplayUnits } from "~/modules/units/format";
import { supplyClassOf, type ListingSearchQuery } from "../../../search/query.ts";
import { accuracyFilters, labelInText, formatDeviation } from "./figures";

/** "Centre lathe · verified · spindle run-out ≤ 5 µm · up to €20,000" in the reader's units. */
export function describeSearch(query: ListingSearchQuery, units: DisplayUnits): string {
  const parts: string[] = [];
  if (query.text) parts.push(`“${query.text}”`);
  if (query.categories?.length) parts.push(query.categories.map((category) => labelOf(machineCategories, category)).join(" or "));
  if (query.verifiedOnly) parts.push("verified");
  if (query.grades?.length) parts.push(`grade ${query.grades.join("/")}`);
  for (const filter of accuracyFilters) {
    const limit = query[filter.key];
    if (limit !== undefined) parts.push(`${labelInText(filter.label)} ≤ ${formatDeviation(limit, units)}`);
  }
  if (query.maxReportAgeDays) parts.push(`report at most ${query.maxReportAgeDays} days old`);
  const { priceMinor, currency } = query;
  if (currency && priceMinor?.min != null && priceMinor.max != null) parts.push(`${formatMoney(priceMinor.min, currency)}–${formatMoney(priceMinor.max, currency)}`);
  else if (currency && priceMinor?.max != null) parts.push(`up to ${formatMoney(priceMinor.max, currency)}`);
  else if (currency && priceMinor?.min != null) parts.push(`from ${formatMoney(priceMinor.min, currency)}`);
  if (query.swingMm?.min != null) parts.push(`swing ≥ ${formatLength(query.swingMm.min, units)}`);
  if (query.swingMm?.max != null) parts.push(`swing ≤ ${formatLength(query.swingMm.max, units)}`);
  if (query.betweenCentresMm?.min != null) parts.push(`centres ≥ ${formatLength(query.betweenCentresMm.min, units)}`);
  if (query.betweenCentresMm?.max != null) parts.push(`centres ≤ ${formatLength(query.betweenCentresMm.max, units)}`);
  const supply = supplyClassOf(query.supply);
  if (supply) parts.push(`runs on ${supply.label.replace(/ \(.*\)$/, "").toLowerCase()}`);
  if (query.countries?.length) parts.push(query.countries.map(countryName).join(", "));
  return parts.length ? parts.join(" · ") : "Every machine";
}
