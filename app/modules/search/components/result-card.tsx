import { Link } from "react-router";
import { Badge } from "~/components/ui/badge";
import { Card } from "~/components/ui/card";
import { cx } from "~/components/ui/cx";
import type { ListingHit } from "../service.server";

// The chip's tones are in app/app.css (`grade-chip-…`).
const chipGrades = ["A", "B", "C", "D"];

export function GradeChip({ grade, className }: { grade: string; className?: string }) {
  return (
    <span
      className={cx("grade-chip", `grade-chip-${chipGrades.includes(grade) ? grade : "incomplete"}`, className)}
      role="img"
      aria-label={grade === "incomplete" ? "Report incomplete" : `Grade ${grade}`}
      data-grade={grade}
    >
      {grade === "incomplete" ? "–" : grade}
    </span>
  );
}

/** One result; its words come made from the server (`hit.display`), in the reader's units. */
export function ResultCard({ hit }: { hit: ListingHit }) {
  const { display } = hit;
  return (
    // The title is the card's link, stretched over the card by its ::after, so that the link is named by the
    // title alone while grade, figures, price and badges stay text that is read in order (not hidden behind a name).
    <Card className="result-card group" data-listing-id={hit.id}>
      <div className="flex flex-1 flex-col">
        {hit.photoUrl ? (
          <img src={hit.photoUrl} alt="" className="aspect-[4/3] w-full object-cover" width={480} height={360} loading="lazy" />
        ) : (
          <div className="result-no-photo">No photo yet</div>
        )}
        <div className="flex flex-1 flex-col gap-3 p-4">
          <div className="flex items-start justify-between gap-3">
            <div className="min-w-0">
              <p className="result-kind">
                {hit.categoryLabel}
                {hit.year ? ` · ${hit.year}` : ""}
              </p>
              <h3 className="result-title">
                <Link to={hit.url} className="after:absolute after:inset-0">
                  {hit.title}
                </Link>
              </h3>
            </div>
            {hit.grade ? <GradeChip grade={hit.grade} /> : null}
          </div>
          {display.sizes ? <p className="text-sm text-ink-600 tabular">{display.sizes}</p> : null}
          {display.figures.length ? (
            <dl className="result-figures" aria-label="Key figures of the current report">
              {display.figures.map((figure) => (
                <div key={figure.label} className="flex flex-col">
                  <dt className="text-ink-500">{figure.label}</dt>
                  <dd className="font-semibold text-ink-900 tabular">{figure.value}</dd>
                </div>
              ))}
            </dl>
          ) : null}
          <p className="text-sm text-ink-500">{display.place}</p>
          {/* Ticked cards go to /compare by the page's plain GET form (no script): above the card's stretched link. */}
          <label className="result-compare">
            <input type="checkbox" name="m" value={hit.slug} form="compare-form" className="search-box" />
            Compare<span className="sr-only"> {hit.title}</span>
          </label>
          <div className="result-foot">
            <p className="text-lg font-extrabold text-ink-900 tabular">{display.price}</p>
            <div className="flex flex-wrap justify-end gap-1">
              <Badge>{display.condition}</Badge>
              <Badge tone={display.badge.caution ? "caution" : "within"}>{display.badge.text}</Badge>
            </div>
          </div>
        </div>
      </div>
      {hit.report ? (
        <Link to={`/reports/${hit.report.id}`} className="result-report-link">
          Accuracy report of {hit.report.measuredOnText} →
        </Link>
      ) : null}
    </Card>
  );
}
