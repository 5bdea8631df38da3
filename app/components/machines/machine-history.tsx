// On a listing: the machine's earlier listings with their signed reports and rebuild records, and a trend of the key
// figures over the signed reports' dates.
import { Link } from "react-router";
import type { MachineHistory } from "~/modules/machines/service.server";
import { KEY_FIGURE_LABELS, type KeyFigureKey } from "~/modules/reports/content";
import { formatReportDate } from "~/modules/reports/format";
import type { DisplayUnits } from "~/modules/units/format";
import { formatFigure } from "~/components/rebuilds/rebuild-panel";

function Trend({ points, figure, units }: { points: { measuredOn: string; value: number }[]; figure: KeyFigureKey; units: DisplayUnits }) {
  const top = Math.max(...points.map((point) => Math.abs(point.value)), 1e-9) * 1.2;
  const x = (i: number) => 24 + (points.length === 1 ? 0 : (i / (points.length - 1)) * 232);
  const y = (value: number) => 62 - (Math.abs(value) / top) * 50;
  const label = `${KEY_FIGURE_LABELS[figure]}: ${points.map((point) => `${formatReportDate(point.measuredOn)} ${formatFigure(point.value, "µm", units)}`).join(", ")}`;
  return (
    <figure className="rounded-control border border-ink-200 bg-white p-3">
      <figcaption className="text-sm font-semibold text-ink-800">{KEY_FIGURE_LABELS[figure]}</figcaption>
      <svg viewBox="0 0 280 84" role="img" aria-label={label} className="mt-1 h-auto w-full max-w-80" data-testid="history-trend">
        <title>{label}</title>
        <line x1="24" y1="62" x2="256" y2="62" stroke="#c9c4b8" />
        <polyline points={points.map((point, i) => `${x(i)},${y(point.value)}`).join(" ")} fill="none" stroke="#845710" strokeWidth="2" />
        {points.map((point, i) => (
          <g key={i}>
            <circle cx={x(i)} cy={y(point.value)} r="3.5" fill="#2b2a27" />
            <text x={x(i)} y="78" fontSize="9" textAnchor="middle" fill="#57534a">
              {point.measuredOn.slice(0, 7)}
            </text>
            <text x={x(i)} y={y(point.value) - 6} fontSize="9" textAnchor="middle" fill="#2b2a27">
              {formatFigure(point.value, "µm", units)}
            </text>
          </g>
        ))}
      </svg>
    </figure>
  );
}

export function MachineHistorySection({ history, units }: { history: MachineHistory; units: DisplayUnits }) {
  if (!history) return null;
  const figures = (Object.keys(KEY_FIGURE_LABELS) as KeyFigureKey[])
    .map((figure) => ({
      figure,
      points: history.trend.flatMap((point) => {
        const value = (point.keyFigures as Record<string, number | null>)[figure];
        return typeof value === "number" ? [{ measuredOn: point.measuredOn, value }] : [];
      }),
    }))
    .filter((entry) => entry.points.length >= 2);
  return (
    <section id="history" aria-labelledby="history-heading" className="space-y-4">
      <h2 id="history-heading" className="text-xl font-bold text-ink-900">
        This machine's history
      </h2>
      <p className="text-sm text-ink-600">The seller confirmed that these earlier listings are this same machine (same make, model and serial number).</p>
      <ul className="space-y-3">
        {history.entries.map((entry, i) => (
          <li key={i} className="rounded-panel border border-ink-200 bg-white px-4 py-3 text-sm" data-testid="history-entry">
            <p className="font-semibold text-ink-900">
              {entry.slug ? (
                <Link to={`/machines/${entry.slug}`} className="underline underline-offset-2">
                  {entry.title}
                </Link>
              ) : (
                entry.title
              )}
              {entry.listedOn ? <span className="font-normal text-ink-500"> · listed {formatReportDate(entry.listedOn)}</span> : null}
            </p>
            {entry.report ? (
              <p className="mt-1 text-ink-700">
                Signed report by {entry.report.inspectorName}, measured {formatReportDate(entry.report.measuredOn)}: grade {entry.report.grade}.{" "}
                <Link to={`/reports/${entry.report.id}`} className="font-semibold underline underline-offset-2">
                  Read the report
                </Link>
              </p>
            ) : (
              <p className="mt-1 text-ink-500">No signed report.</p>
            )}
            {entry.rebuild ? (
              <p className="mt-1 text-ink-700">
                Rebuild record: as found {entry.rebuild.asFoundOn ? formatReportDate(entry.rebuild.asFoundOn) : "undated"}, as rebuilt {entry.rebuild.asRebuiltOn ? formatReportDate(entry.rebuild.asRebuiltOn) : "undated"} —{" "}
                {entry.rebuild.confirmed ? "confirmed by a signed report" : "declared by that seller"}.
              </p>
            ) : null}
          </li>
        ))}
      </ul>
      {figures.length ? (
        <div>
          <h3 className="font-bold text-ink-900">Key figures over the years (signed reports)</h3>
          <div className="mt-2 grid gap-3 sm:grid-cols-2">
            {figures.map((entry) => (
              <Trend key={entry.figure} figure={entry.figure} points={entry.points} units={units} />
            ))}
          </div>
        </div>
      ) : null}
    </section>
  );
}
