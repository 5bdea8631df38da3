import { Link } from "react-router";
import { Badge } from "~/components/ui/badge";
import { Card } from "~/components/ui/card";
import { cx } from "~/components/ui/cx";
import { countryName, labelOf, machineConditions } from "~/modules/listings/catalogue";
import { formatLength, formatMoney, type DisplayUnits } from "~/modules/units/format";
import { formatDeviation } from "../figures";
import type { ListingHit } from "../service.server";

// A report older than this is shown as aged (PRODUCT.md: grades expire visibly after 12 months).
const FRESH_DAYS = 365;

const gradeTones: Record<string, string> = {
  A: "bg-within text-white",
  B: "bg-within-soft text-within ring-1 ring-inset ring-within/30",
  C: "bg-caution-soft text-caution ring-1 ring-inset ring-caution/30",
  D: "bg-beyond-soft text-beyond ring-1 ring-inset ring-beyond/30",
  incomplete: "bg-ink-100 text-ink-600 ring-1 ring-inset ring-ink-200",
};

export function GradeChip({ grade, className }: { grade: string; className?: string }) {
  return (
    <span
      className={cx("inline-flex size-10 shrink-0 items-center justify-center rounded-control text-xl font-extrabold", gradeTones[grade] ?? gradeTones.incomplete, className)}
      role="img"
      aria-label={grade === "incomplete" ? "Report incomplete" : `Grade ${grade}`}
      data-grade={grade}
    >
      {grade === "incomplete" ? "–" : grade}
    </span>
  );
}

function worst(...values: (number | null)[]) {
  const known = values.filter((value): value is number => value !== null);
  return known.length ? Math.max(...known) : null;
}

export function ResultCard({ hit, units, now }: { hit: ListingHit; units: DisplayUnits; now: number }) {
  const sizes = [
    hit.swingMm ? `${formatLength(hit.swingMm, units)} swing` : null,
    hit.betweenCentresMm ? `${formatLength(hit.betweenCentresMm, units)} between centres` : null,
  ].filter(Boolean);
  const figures = hit.report?.keyFigures;
  // A mill's or grinder's worth is its table and travels; a lathe's its spindle and centres.
  const tableMachine = hit.category === "milling_machine" || hit.category === "surface_grinder";
  // A CNC machine graded on its axes: how accurately and repeatably each axis positions (the axes it has).
  const positioned = figures && (figures.xPositioningAccuracyUm !== null || figures.zPositioningAccuracyUm !== null);
  const shown = !figures
    ? []
    : positioned
      ? [
          { label: "X axis, positioning accuracy", value: figures.xPositioningAccuracyUm },
          { label: "X axis, repeatability", value: figures.xRepeatabilityUm },
          { label: "Y axis, positioning accuracy", value: figures.yPositioningAccuracyUm },
          { label: "Z axis, positioning accuracy", value: figures.zPositioningAccuracyUm },
        ].filter((figure) => figure.value !== null)
      : tableMachine
      ? [
          { label: "Table flatness", value: figures.tableFlatnessUm },
          { label: "Squareness of travels", value: figures.travelSquarenessUm },
          { label: "Spindle run-out", value: figures.spindleRunoutUm },
        ]
      : [
        { label: "Spindle run-out", value: figures.spindleRunoutUm },
        { label: "Axial slip", value: figures.axialSlipUm },
        { label: "Spindle-axis parallelism", value: worst(figures.spindleParallelismVerticalUm, figures.spindleParallelismHorizontalUm) },
        { label: "Centre height", value: figures.centreHeightUm },
      ];
  const ageDays = hit.report ? Math.floor((now - Date.parse(`${hit.report.measuredOn}T00:00:00Z`)) / 86_400_000) : null;
  return (
    // The title is the card's link, stretched over the card by its ::after, so that the link is named by the
    // title alone while grade, figures, price and badges stay text that is read in order (not hidden behind a name).
    <Card className="group relative flex h-full flex-col overflow-hidden" data-listing-id={hit.id}>
      <div className="flex flex-1 flex-col">
        {hit.photoUrl ? (
          <img src={hit.photoUrl} alt="" className="aspect-[4/3] w-full object-cover" width={480} height={360} loading="lazy" />
        ) : (
          <div className="flex aspect-[4/3] w-full items-center justify-center bg-ink-100 text-sm text-ink-500">No photo yet</div>
        )}
        <div className="flex flex-1 flex-col gap-3 p-4">
          <div className="flex items-start justify-between gap-3">
            <div className="min-w-0">
              <p className="text-xs font-bold uppercase tracking-wide text-brass-600">
                {hit.categoryLabel}
                {hit.year ? ` · ${hit.year}` : ""}
              </p>
              <h3 className="mt-1 text-lg font-bold leading-snug text-ink-900 group-hover:underline">
                <Link to={hit.url} className="after:absolute after:inset-0">
                  {hit.title}
                </Link>
              </h3>
            </div>
            {hit.grade ? <GradeChip grade={hit.grade} /> : null}
          </div>
          {sizes.length ? <p className="text-sm text-ink-600 tabular">{sizes.join(" · ")}</p> : null}
          {shown.length ? (
            <dl className="grid grid-cols-2 gap-x-3 gap-y-1 rounded-control bg-ink-50 px-3 py-2 text-xs" aria-label="Key figures of the current report">
              {shown.map((figure) => (
                <div key={figure.label} className="flex flex-col">
                  <dt className="text-ink-500">{figure.label}</dt>
                  <dd className="font-semibold text-ink-900 tabular">{figure.value === null ? "not measured" : formatDeviation(figure.value, units)}</dd>
                </div>
              ))}
            </dl>
          ) : null}
          <p className="text-sm text-ink-500">
            {[hit.location.city, countryName(hit.location.country)].filter(Boolean).join(", ")}
          </p>
          {/* Ticked cards go to /compare by the page's plain GET form (no script): above the card's stretched link. */}
          <label className="relative z-10 flex w-fit items-center gap-2 text-sm font-semibold text-ink-700">
            <input type="checkbox" name="m" value={hit.slug} form="compare-form" className="size-4 accent-ink-900" />
            Compare<span className="sr-only"> {hit.title}</span>
          </label>
          <div className="mt-auto flex flex-wrap items-end justify-between gap-2 pt-1">
            <p className="text-lg font-extrabold text-ink-900 tabular">{hit.price ? formatMoney(hit.price.minor, hit.price.currency) : "Price on request"}</p>
            <div className="flex flex-wrap justify-end gap-1">
              <Badge>{labelOf(machineConditions, hit.condition)}</Badge>
              {hit.verified ? (
                <Badge tone={ageDays !== null && ageDays > FRESH_DAYS ? "caution" : "within"}>
                  {ageDays !== null && ageDays > FRESH_DAYS ? "Report over 12 months old" : "Verified"}
                </Badge>
              ) : hit.grade === "incomplete" ? (
                <Badge tone="caution">Report incomplete</Badge>
              ) : (
                <Badge tone="caution">Not yet verified</Badge>
              )}
            </div>
          </div>
        </div>
      </div>
      {hit.report ? (
        <Link to={`/reports/${hit.report.id}`} className="relative z-10 border-t border-ink-200 px-4 py-2.5 text-sm font-semibold text-ink-700 hover:bg-ink-50">
          Accuracy report of {hit.report.measuredOnText} →
        </Link>
      ) : null}
    </Card>
  );
}
