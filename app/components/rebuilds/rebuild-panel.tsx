// The rebuild record as a buyer reads it on the listing: per test, as found and as rebuilt with the change and a
// paired plot against the tolerance; plainly declared by the seller unless a signed report confirms it.
import { Link } from "react-router";
import type { PublicRebuild } from "~/modules/rebuilds/service.server";
import type { TestPair } from "~/modules/rebuilds/record";
import { formatDecimal, type DisplayUnits } from "~/modules/units/format";
import { formatReportDate as formatAbsoluteDate } from "~/modules/reports/format";

const UM_PER_INCH = 25_400;

/** A deviation in the reader's units; a level's tilt stays in µm/m. */
export function formatFigure(value: number, unit: "µm" | "µm/m", units: DisplayUnits, signed = false): string {
  const sign = signed && value > 0 ? "+" : "";
  if (unit === "µm/m") return `${sign}${formatDecimal(value, 1)} µm/m`;
  if (units === "inch") return `${sign}${formatDecimal(value / UM_PER_INCH, 5)} in`;
  return `${sign}${formatDecimal(value, 1)} µm`;
}

/** Two marks on one scale from 0 to past the tolerance: as found (hollow) and as rebuilt (filled), the tolerance dashed. */
function PairedPlot({ pair, units }: { pair: TestPair; units: DisplayUnits }) {
  const before = pair.before === null ? null : Math.abs(pair.before);
  const after = pair.after === null ? null : Math.abs(pair.after);
  const top = Math.max(pair.tolerance, before ?? 0, after ?? 0) * 1.15 || 1;
  const x = (value: number) => 8 + (value / top) * 224;
  const label = `As found ${before === null ? "not measured" : formatFigure(before, pair.unit, units)}, as rebuilt ${after === null ? "not measured" : formatFigure(after, pair.unit, units)}, tolerance ${formatFigure(pair.tolerance, pair.unit, units)}`;
  return (
    <svg viewBox="0 0 240 34" role="img" aria-label={label} className="h-9 w-full max-w-60" data-testid="paired-plot">
      <title>{label}</title>
      <line x1="8" y1="17" x2="232" y2="17" stroke="#c9c4b8" strokeWidth="2" />
      <line x1={x(pair.tolerance)} y1="4" x2={x(pair.tolerance)} y2="30" stroke="#b3261e" strokeDasharray="3 2" />
      {before !== null && after !== null ? <line x1={x(before)} y1="17" x2={x(after)} y2="17" stroke="#845710" strokeWidth="2" /> : null}
      {before !== null ? <circle cx={x(before)} cy="17" r="5" fill="white" stroke="#2b2a27" strokeWidth="2" /> : null}
      {after !== null ? <circle cx={x(after)} cy="17" r="5" fill="#2b2a27" /> : null}
    </svg>
  );
}

export function RebuildSection({ rebuild, units, manageUrl }: { rebuild: PublicRebuild | null; units: DisplayUnits; manageUrl: string | null }) {
  if (!rebuild) {
    return manageUrl ? (
      <section id="rebuild" aria-labelledby="rebuild-heading" className="rounded-panel border border-dashed border-ink-300 px-4 py-4">
        <h2 id="rebuild-heading" className="text-xl font-bold text-ink-900">
          Rebuild record
        </h2>
        <p className="mt-1 text-sm text-ink-600">Show the work you put into this machine: readings as found and as rebuilt, and what was done.</p>
        <Link to={manageUrl} className="mt-2 inline-block font-semibold text-ink-900 underline underline-offset-2">
          Record a rebuild
        </Link>
      </section>
    ) : null;
  }
  const confirmed = rebuild.confirmation;
  return (
    <section id="rebuild" aria-labelledby="rebuild-heading" className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="rebuild-heading" className="text-xl font-bold text-ink-900">
          Rebuild record
        </h2>
        {manageUrl ? (
          <Link to={manageUrl} className="text-sm font-semibold text-ink-700 underline underline-offset-2">
            Edit the rebuild record
          </Link>
        ) : null}
      </div>
      {confirmed ? (
        <p className="rounded-control border-l-4 border-within bg-white px-4 py-3 text-sm text-ink-800" data-testid="rebuild-standing">
          <strong>As-rebuilt figures confirmed</strong> by {confirmed.inspectorName}'s{" "}
          <Link to={`/reports/${confirmed.reportId}`} className="font-semibold underline underline-offset-2">
            signed report
          </Link>{" "}
          measured on {formatAbsoluteDate(confirmed.measuredOn)}.{" "}
          {rebuild.enteredBy.kind === "inspector" ? `The as-found figures were entered by inspector ${rebuild.enteredBy.name} and are not signed.` : "The as-found figures are declared by the seller."}
        </p>
      ) : rebuild.enteredBy.kind === "inspector" ? (
        <p className="rounded-control border-l-4 border-caution bg-white px-4 py-3 text-sm text-ink-800" data-testid="rebuild-standing">
          <strong>Entered by inspector {rebuild.enteredBy.name}.</strong> These readings were typed for the seller by an inspector booked to visit the machine and are not verified: no certified inspector's signed
          report confirms the as-rebuilt figures.
        </p>
      ) : (
        <p className="rounded-control border-l-4 border-caution bg-white px-4 py-3 text-sm text-ink-800" data-testid="rebuild-standing">
          <strong>Declared by the seller.</strong> These readings were entered by the seller and are not verified: no certified inspector's signed report confirms the as-rebuilt figures.
        </p>
      )}
      <p className="text-sm text-ink-600">
        As found {rebuild.asFoundOn ? formatAbsoluteDate(rebuild.asFoundOn) : "(undated)"} · as rebuilt {rebuild.asRebuiltOn ? formatAbsoluteDate(rebuild.asRebuiltOn) : "(undated)"} · scored against {rebuild.profileTitle}
      </p>
      {/* On a phone each test is a short card (a five-column table would scroll sideways and hide its plot). */}
      <ul className="space-y-3 sm:hidden" aria-label="Each test as found and as rebuilt" data-testid="rebuild-cards">
        {rebuild.pairs.map((pair) => (
          <li key={pair.code} className="rounded-panel border border-ink-200 bg-white px-3 py-3" data-test-code={pair.code}>
            <p className="font-semibold text-ink-900">{pair.title}</p>
            <p className="text-xs text-ink-500">tolerance {formatFigure(pair.tolerance, pair.unit, units)}</p>
            <dl className="mt-2 grid grid-cols-3 gap-2 text-sm">
              <div>
                <dt className="text-xs text-ink-500">As found</dt>
                <dd className="tabular text-ink-900">{pair.before === null ? "—" : formatFigure(pair.before, pair.unit, units)}</dd>
              </div>
              <div>
                <dt className="text-xs text-ink-500">As rebuilt</dt>
                <dd className="tabular text-ink-900">{pair.after === null ? "—" : formatFigure(pair.after, pair.unit, units)}</dd>
              </div>
              <div>
                <dt className="text-xs text-ink-500">Change</dt>
                <dd className="tabular text-ink-900">{pair.change === null ? "—" : formatFigure(pair.change, pair.unit, units, true)}</dd>
              </div>
              {confirmed ? (
                <div className="col-span-3">
                  <dt className="text-xs text-ink-500">Signed report</dt>
                  <dd className="tabular text-ink-900">{pair.signed === null ? "—" : formatFigure(pair.signed, pair.unit, units)}</dd>
                </div>
              ) : null}
            </dl>
            <div className="mt-1" aria-hidden="true">
              <PairedPlot pair={pair} units={units} />
            </div>
          </li>
        ))}
      </ul>
      <p className="text-xs text-ink-500 sm:hidden" aria-hidden="true">
        ○ found ● rebuilt ┆ tolerance
      </p>
      {/* Positioned, so the table's visually hidden captions are clipped by this scroll box instead of widening the page. */}
      <div className="relative hidden overflow-x-auto rounded-panel border border-ink-200 bg-white sm:block">
        <table className="w-full min-w-[36rem] text-sm">
          <caption className="sr-only">Each test as found and as rebuilt</caption>
          <thead className="bg-ink-50 text-left text-xs uppercase tracking-wide text-ink-500">
            <tr>
              <th scope="col" className="px-3 py-2">Test</th>
              <th scope="col" className="px-3 py-2 text-right">As found</th>
              <th scope="col" className="px-3 py-2 text-right">As rebuilt</th>
              <th scope="col" className="px-3 py-2 text-right">Change</th>
              {confirmed ? <th scope="col" className="px-3 py-2 text-right">Signed report</th> : null}
              <th scope="col" className="px-3 py-2">
                <span aria-hidden="true">○ found ● rebuilt ┆ tolerance</span>
                <span className="sr-only">Plot</span>
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {rebuild.pairs.map((pair) => (
              <tr key={pair.code} data-test-code={pair.code}>
                <th scope="row" className="px-3 py-2 text-left font-semibold text-ink-900">
                  {pair.title}
                  <span className="block text-xs font-normal text-ink-500">tolerance {formatFigure(pair.tolerance, pair.unit, units)}</span>
                </th>
                <td className="px-3 py-2 text-right tabular">{pair.before === null ? "—" : formatFigure(pair.before, pair.unit, units)}</td>
                <td className="px-3 py-2 text-right tabular">{pair.after === null ? "—" : formatFigure(pair.after, pair.unit, units)}</td>
                <td className="px-3 py-2 text-right tabular">{pair.change === null ? "—" : formatFigure(pair.change, pair.unit, units, true)}</td>
                {confirmed ? <td className="px-3 py-2 text-right tabular">{pair.signed === null ? "—" : formatFigure(pair.signed, pair.unit, units)}</td> : null}
                <td className="px-3 py-2">
                  <PairedPlot pair={pair} units={units} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-500">Change is the size as rebuilt minus the size as found: negative means the test reads closer to true.</p>
      {rebuild.workDone.length ? (
        <div>
          <h3 className="font-bold text-ink-900">Work done</h3>
          <ul className="mt-2 list-inside list-disc text-ink-700">
            {rebuild.workDone.map((item) => (
              <li key={item}>{item}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {rebuild.notes ? <p className="whitespace-pre-line text-ink-700">{rebuild.notes}</p> : null}
      {rebuild.photos.length ? (
        <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3" aria-label="Photos of the work">
          {rebuild.photos.map((photo, i) => (
            <li key={i}>
              <a href={photo.largeUrl} target="_blank" rel="noreferrer">
                <img src={photo.thumbnailUrl} alt={`The work, photo ${i + 1} of ${rebuild.photos.length}`} loading="lazy" className="aspect-[4/3] w-full rounded-control border border-ink-200 object-cover" />
              </a>
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
