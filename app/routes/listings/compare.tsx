import { data, Link } from "react-router";
import { Badge, ButtonLink } from "~/components/ui";
import { databaseContext } from "~/db/context";
import type { KeyFigureName } from "~/geometry/types";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { countryName, isLathe, labelOf, machineCategories, machineConditions } from "~/modules/listings/catalogue";
import { bestDeviations } from "~/modules/listings/compare";
import { compareMachines, MAX_COMPARED, parseComparedSlugs, type ComparedMachine } from "~/modules/listings/compare.server";
import { formatDeviation } from "~/modules/search/figures";
import { formatDate } from "~/modules/units/dates";
import { formatLength, formatMoney, type DisplayUnits } from "~/modules/units/format";
import { formatFootprint, formatSpeedRange, formatSupply, formatThreadRange } from "~/modules/units/machine-specs";
import { formatPower, formatWeight } from "~/modules/units/weight-power";
import type { Route } from "./+types/compare";

export const meta: Route.MetaFunction = () => [{ title: "Compare machines — Tenthmark" }, { name: "robots", content: "noindex" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const parsed = parseComparedSlugs(new URL(request.url).searchParams);
  if (!parsed.ok) throw data(parsed.message, { status: 400 });
  const viewer = await getOptionalUser(request);
  const machines = await compareMachines(context.get(databaseContext), parsed.slugs);
  return { machines, units: (viewer?.displayUnits ?? "mm") as DisplayUnits };
}

// The figures a buyer compares, each a deviation: the smaller the better.
const figureRows: Array<{ key: KeyFigureName; label: string }> = [
  { key: "spindleRunOut", label: "Spindle run-out" },
  { key: "axialSlip", label: "Axial slip" },
  { key: "spindleParallelismVertical", label: "Spindle-axis parallelism, vertical" },
  { key: "spindleParallelismHorizontal", label: "Spindle-axis parallelism, horizontal" },
  { key: "centreHeight", label: "Centre height difference" },
  { key: "bedStraightness", label: "Bed straightness" },
  { key: "tableFlatness", label: "Table flatness" },
  { key: "travelSquareness", label: "Squareness of travels" },
];

type Spec = (machine: ComparedMachine, units: DisplayUnits) => string | null;

const specRows: Array<{ label: string; value: Spec }> = [
  { label: "Price", value: (m) => formatMoney(m.listing.priceMinor, m.listing.currency) },
  { label: "Where it stands", value: (m) => [m.listing.city, countryName(m.listing.country)].join(", ") },
  { label: "Kind of machine", value: (m) => labelOf(machineCategories, m.listing.category) },
  { label: "Condition", value: (m) => labelOf(machineConditions, m.listing.condition) },
  { label: "Year of manufacture", value: (m) => (m.listing.year ? String(m.listing.year) : null) },
  { label: "Swing over bed", value: (m, u) => (m.listing.swingOverBedMm ? formatLength(m.listing.swingOverBedMm, u) : null) },
  { label: "Swing over the cross-slide", value: (m, u) => (isLathe(m.listing.category) && m.listing.swingOverCrossSlideMm ? formatLength(m.listing.swingOverCrossSlideMm, u) : null) },
  { label: "Distance between centres", value: (m, u) => (m.listing.distanceBetweenCentresMm ? formatLength(m.listing.distanceBetweenCentresMm, u) : null) },
  { label: "Table", value: (m, u) => (m.listing.tableLengthMm && m.listing.tableWidthMm ? `${formatLength(m.listing.tableLengthMm, u)} × ${formatLength(m.listing.tableWidthMm, u)}` : null) },
  { label: "Spindle bore", value: (m, u) => (m.listing.spindleBoreMm ? formatLength(m.listing.spindleBoreMm, u) : null) },
  { label: "Spindle nose", value: (m) => m.listing.spindleNose },
  { label: "Spindle speeds", value: (m) => formatSpeedRange(m.listing.spindleSpeedMinRpm, m.listing.spindleSpeedMaxRpm) },
  { label: "Tailstock taper", value: (m) => (isLathe(m.listing.category) ? m.listing.tailstockTaper : null) },
  { label: "Thread cutting", value: (m, u) => (isLathe(m.listing.category) ? formatThreadRange(m.listing, u) : null) },
  { label: "Main motor", value: (m, u) => (m.listing.motorPowerKw ? formatPower(m.listing.motorPowerKw, u) : null) },
  { label: "Electrical supply", value: (m) => formatSupply(m.listing) },
  { label: "Weight", value: (m, u) => (m.listing.weightKg ? formatWeight(m.listing.weightKg, u) : null) },
  { label: "Footprint (length × width)", value: (m, u) => formatFootprint(m.listing.footprintLengthMm, m.listing.footprintWidthMm, u) },
];

export default function CompareMachines({ loaderData }: Route.ComponentProps) {
  const { machines, units } = loaderData;
  const available = machines.filter((machine): machine is ComparedMachine => machine.available);
  const slugs = machines.map((machine) => machine.slug);
  const without = (slug: string) => {
    const params = new URLSearchParams();
    for (const other of slugs) if (other !== slug) params.append("m", other);
    return `/compare${params.size ? `?${params}` : ""}`;
  };
  // Only rows some machine has: a lathe's tailstock means nothing beside a grinder.
  const specs = specRows.filter((row) => available.some((machine) => row.value(machine, units) !== null));
  const figures = figureRows.filter((row) => available.some((machine) => machine.report?.keyFigures[row.key] != null));
  const cell = "min-w-[11rem] border-b border-ink-100 px-3 py-2.5 align-top";
  const head = "sticky left-0 z-10 min-w-[9rem] max-w-[11rem] border-b border-ink-100 bg-white px-3 py-2.5 text-left align-top text-sm font-semibold text-ink-600";

  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <nav aria-label="Breadcrumb" className="text-sm text-ink-500">
        <Link to="/machines" className="font-semibold hover:text-ink-900">
          Machines
        </Link>{" "}
        / Compare
      </nav>
      <h1 className="mt-2 text-3xl font-extrabold text-ink-900">Compare machines</h1>
      {machines.length ? (
        <p className="mt-2 max-w-3xl text-ink-600">
          Up to {MAX_COMPARED} machines side by side. For each measured figure, the smallest deviation among them is marked “Best of these”: lower is
          better. The address of this page shows the same comparison to anyone you send it to.
        </p>
      ) : (
        <div className="mt-4 max-w-3xl space-y-3 text-ink-700">
          <p>No machines chosen yet. Tick “Compare” on up to {MAX_COMPARED} machines in the search results or among your watched machines, then choose “Compare the ticked machines”.</p>
          <ButtonLink to="/machines" variant="secondary">
            Search machines
          </ButtonLink>
        </div>
      )}

      {machines.length ? (
        <div className="mt-6 overflow-x-auto rounded-panel border border-ink-200 bg-white" data-testid="comparison">
          <table className="w-full border-collapse text-sm">
            <caption className="sr-only">Specifications and verified figures of the compared machines, one machine per column</caption>
            <thead>
              <tr>
                <td className={head} />
                {machines.map((machine) => (
                  <th key={machine.slug} scope="col" className={`${cell} text-left`} data-compared={machine.slug}>
                    {machine.available ? (
                      <div className="space-y-2">
                        {machine.photoUrl ? <img src={machine.photoUrl} alt="" className="aspect-[4/3] w-full max-w-[14rem] rounded-control object-cover" width={224} height={168} /> : null}
                        <Link to={`/machines/${machine.slug}`} className="block text-base font-bold text-ink-900 underline-offset-2 hover:underline">
                          {machine.title}
                        </Link>
                        <p className="text-xs font-normal text-ink-500">Offered by {machine.sellerName}</p>
                        {machine.status === "sold" ? <Badge tone="caution">Sold</Badge> : null}
                      </div>
                    ) : (
                      <div className="space-y-1">
                        <p className="text-base font-bold text-ink-500">Unavailable</p>
                        <p className="text-xs font-normal text-ink-500">This machine is no longer offered, or the link is mistyped.</p>
                      </div>
                    )}
                    <Link to={without(machine.slug)} className="mt-2 inline-block text-xs font-semibold text-ink-700 underline underline-offset-2">
                      Remove<span className="sr-only"> {machine.available ? machine.title : "the unavailable machine"} from the comparison</span>
                    </Link>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              <tr>
                <th scope="rowgroup" colSpan={machines.length + 1} className="bg-ink-50 px-3 py-2 text-left text-xs font-bold uppercase tracking-wide text-ink-600">
                  Specification
                </th>
              </tr>
              {specs.map((row) => (
                <tr key={row.label}>
                  <th scope="row" className={head}>
                    {row.label}
                  </th>
                  {machines.map((machine) => {
                    const value = machine.available ? row.value(machine, units) : null;
                    return (
                      <td key={machine.slug} className={`${cell} tabular ${value ? "text-ink-900" : "text-ink-400"}`}>
                        {machine.available ? (value ?? "not given") : "—"}
                      </td>
                    );
                  })}
                </tr>
              ))}
              <tr>
                <th scope="rowgroup" colSpan={machines.length + 1} className="bg-ink-50 px-3 py-2 text-left text-xs font-bold normal-case tracking-normal text-ink-600">
                  Verified accuracy (lower is better)
                </th>
              </tr>
              <tr>
                <th scope="row" className={head}>
                  Current report
                </th>
                {machines.map((machine) => (
                  <td key={machine.slug} className={cell}>
                    {!machine.available ? (
                      "—"
                    ) : machine.report ? (
                      <Link to={`/reports/${machine.report.id}`} className="font-semibold text-ink-900 underline underline-offset-2">
                        {machine.report.grade === "incomplete" ? "Incomplete" : `Grade ${machine.report.grade}`}, measured {formatDate(machine.report.measuredOn)}
                      </Link>
                    ) : (
                      <span className="text-ink-500">Not yet verified</span>
                    )}
                  </td>
                ))}
              </tr>
              {figures.map((row) => {
                const values = machines.map((machine) => (machine.available ? (machine.report?.keyFigures[row.key] ?? null) : null));
                const best = bestDeviations(values);
                return (
                  <tr key={row.key}>
                    <th scope="row" className={head}>
                      {row.label}
                    </th>
                    {machines.map((machine, index) => {
                      const value = values[index];
                      return (
                        <td key={machine.slug} className={`${cell} tabular`} data-best={best.has(index) || undefined}>
                          {value === null || value === undefined || !machine.available || !machine.report ? (
                            <span className="text-ink-400">{machine.available && machine.report ? "not measured" : "—"}</span>
                          ) : (
                            <>
                              <span className={best.has(index) ? "font-extrabold text-within" : "text-ink-900"}>{formatDeviation(Math.abs(value), units)}</span>
                              {best.has(index) ? <span className="ml-2 rounded-full bg-within-soft px-2 py-0.5 text-xs font-bold text-within">✓ Best of these</span> : null}
                              <span className="block text-xs text-ink-500">report of {formatDate(machine.report.measuredOn)}</span>
                            </>
                          )}
                        </td>
                      );
                    })}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ) : null}
      {machines.length && !figures.length ? <p className="mt-4 text-sm text-ink-600">None of these machines has a verified figure yet.</p> : null}
    </div>
  );
}
