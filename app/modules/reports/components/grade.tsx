// Grade, key figures, verdicts and the ratio bar: shared by the entry preview, the review, the report page
// and the listing's accuracy panel.
import type { KeyFigures, TestResult } from "~/geometry";
import { Badge } from "~/components/ui/badge";
import { cx } from "~/components/ui/cx";
import type { DisplayUnits } from "~/modules/units/format";
import { KEY_FIGURE_LABELS, keyFigureNamesFor, SIGNED_KEY_FIGURES } from "../content";
import { formatDeviation, GRADE_MEANING } from "../format";


const gradeTones: Record<string, string> = {
  A: "bg-within text-white",
  B: "bg-within-soft text-within ring-1 ring-inset ring-within/30",
  C: "bg-caution-soft text-caution ring-1 ring-inset ring-caution/30",
  D: "bg-beyond-soft text-beyond ring-1 ring-inset ring-beyond/30",
  incomplete: "bg-ink-100 text-ink-600 ring-1 ring-inset ring-ink-200",
};

export function GradeMark({ grade, size = "md", className }: { grade: string; size?: "sm" | "md" | "lg"; className?: string }) {
  const sizes = { sm: "size-8 text-base", md: "size-12 text-2xl", lg: "size-16 text-4xl" };
  return (
    <span
      className={cx("inline-flex shrink-0 items-center justify-center rounded-panel font-extrabold", sizes[size], gradeTones[grade] ?? gradeTones.incomplete, className)}
      role="img"
      aria-label={grade === "incomplete" ? "Grade incomplete" : `Grade ${grade}`}
      data-grade={grade}
    >
      {grade === "incomplete" ? "–" : grade}
    </span>
  );
}

export function gradeMeaning(grade: string) {
  return GRADE_MEANING[grade] ?? "";
}

/** The key figures of a machine's category (all of them when the category is not given). */
export function KeyFigureList({ figures, units, columns = 2, className, category }: { figures: KeyFigures; units: DisplayUnits; columns?: 1 | 2; className?: string; category?: string | null }) {
  return (
    <dl className={cx("grid grid-cols-1 gap-x-6 gap-y-1.5 text-sm", columns === 2 && "sm:grid-cols-2", className)} data-testid="key-figures">
      {keyFigureNamesFor(category).map((name) => {
        const value = figures[name] ?? null;
        return (
          <div key={name} className="flex items-baseline justify-between gap-3 border-b border-ink-100 py-1">
            <dt className="text-ink-600">{KEY_FIGURE_LABELS[name]}</dt>
            <dd className={cx("whitespace-nowrap font-semibold tabular", value === null ? "text-ink-400" : "text-ink-900")}>
              {value === null ? "not measured" : formatDeviation(value, units, { signed: SIGNED_KEY_FIGURES.has(name) })}
            </dd>
          </div>
        );
      })}
    </dl>
  );
}

export function VerdictBadge({ result }: { result: Pick<TestResult, "pass" | "direction"> }) {
  if (result.pass) return <Badge tone="within">Within</Badge>;
  return <Badge tone="beyond">{result.direction.pass ? "Beyond" : "Wrong way"}</Badge>;
}

/**
 * How much of its tolerance a test uses: marks at half (grade A) and at the limit; the bar turns red
 * beyond the limit, or at once when the reading leans the disallowed way.
 */
export function RatioBar({ ratio, pass, className }: { ratio: number; pass: boolean; className?: string }) {
  const scale = 1.5;
  const filled = Math.min(ratio, scale) / scale;
  const tone = !pass ? "bg-beyond" : ratio <= 0.5 ? "bg-within" : "bg-caution";
  return (
    <div className={cx("relative h-2.5 w-full rounded-full bg-ink-100", className)} role="meter" aria-valuemin={0} aria-valuemax={scale} aria-valuenow={Number(ratio.toFixed(3))} aria-label="Share of the tolerance used">
      <div className={cx("absolute inset-y-0 left-0 rounded-full", tone)} style={{ width: `${Math.max(filled * 100, ratio > 0 ? 2 : 0)}%` }} />
      <span className="absolute inset-y-[-3px] w-px bg-ink-400" style={{ left: `${(0.5 / scale) * 100}%` }} aria-hidden="true" />
      <span className="absolute inset-y-[-4px] w-0.5 bg-ink-800" style={{ left: `${(1 / scale) * 100}%` }} aria-hidden="true" />
    </div>
  );
}
