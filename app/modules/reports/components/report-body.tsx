// The body of a scored report: grade with key figures, conditions, instruments, results with plots.
// Shared by the inspector's review and the public report page.
import { Link } from "react-router";
import { Badge, Card, CardBody, CardHeader, Table, Td, Th, Tr, cx } from "~/components/ui";
import type { TestResult } from "~/geometry";
import type { DisplayUnits } from "~/modules/units/format";
import { lengthsInText } from "~/modules/units/format";
import { reportAge, type ReportContent } from "../content";
import { DIRECTION_LABELS, formatDeviation, formatRatio, formatReportDate, isSignedValue, observedLabel } from "../format";
import { fromMemoryNotice, HOW_SCORING_WORKS_SOURCES, makersChartLine, resultSources, type SourceLine } from "../sources";
import { GradeMark, gradeMeaning, KeyFigureList, RatioBar, VerdictBadge } from "./grade";
import { TestPlot } from "./plots";

export function GradeCard({ content, units, now }: { content: ReportContent; units: DisplayUnits; now: Date }) {
  const age = reportAge(content.measuredOn, now);
  const { score } = content;
  return (
    <Card>
      <CardBody className="flex flex-col gap-5 sm:flex-row sm:items-start">
        <div className="flex items-center gap-4 sm:w-64 sm:shrink-0">
          <GradeMark grade={score.grade} size="lg" />
          <div>
            {/* The card's heading, so that "Key figures" below it sits one level down from the page's title. */}
            <h2 className="text-lg font-extrabold text-ink-900">Grade {score.grade}</h2>
            <p className="text-sm text-ink-600">{gradeMeaning(score.grade)}</p>
            <p className={cx("mt-1 text-sm", age.expired ? "font-semibold text-beyond" : "text-ink-500")}>
              Measured {formatReportDate(content.measuredOn)} · {age.label}
            </p>
            {age.expired ? <Badge tone="caution" className="mt-1">Older than 12 months</Badge> : null}
          </div>
        </div>
        <div className="min-w-0 flex-1">
          <h3 className="mb-1 text-sm font-bold uppercase tracking-wide text-ink-500">Key figures</h3>
          <KeyFigureList figures={score.keyFigures} units={units} category={content.machine.category} />
          {score.missing.length ? (
            <p className="mt-3 text-sm text-beyond">Required tests without a reading: {score.missing.join(", ")}.</p>
          ) : null}
          {score.outOfTolerance.length ? <p className="mt-2 text-sm text-ink-700">Out of tolerance or leaning the wrong way: {score.outOfTolerance.join(", ")}.</p> : null}
          <ScoringSourcesNote content={content} />
        </div>
      </CardBody>
    </Card>
  );
}

/** The maker's chart the report was scored against, and the one-line warning when any value was recalled. */
export function ScoringSourcesNote({ content }: { content: ReportContent }) {
  const chart = makersChartLine(content.profile);
  const notice = fromMemoryNotice(content.score);
  if (!chart && !notice) return null;
  return (
    <div className="mt-3 space-y-1 text-sm">
      {chart ? <p className="font-semibold text-ink-800" data-testid="makers-chart">{chart}</p> : null}
      {notice ? (
        <p className="text-ink-700" data-testid="from-memory-notice">
          {notice}{" "}
          <Link to={HOW_SCORING_WORKS_SOURCES} className="font-semibold underline underline-offset-2">
            How scoring works
          </Link>
        </p>
      ) : null}
    </div>
  );
}

const CONFIDENCE_TONES = { published: "within", manufacturer: "within", "common-practice": "neutral", "from-memory": "caution" } as const;

function SourceText({ source, prefix }: { source: SourceLine; prefix?: string }) {
  return (
    <span className="block text-xs text-ink-500" data-confidence={source.confidence}>
      {prefix ? `${prefix}: ` : ""}
      {source.label}{" "}
      <Badge tone={CONFIDENCE_TONES[source.confidence]} className="align-middle">
        {source.confidenceLabel}
      </Badge>
    </span>
  );
}

function ResultSources({ result }: { result: TestResult }) {
  const sources = resultSources(result);
  return (
    <>
      <SourceText source={sources.tolerance} prefix="Tolerance" />
      {sources.local ? <SourceText source={sources.local} prefix="Local" /> : null}
      <SourceText source={sources.direction} prefix="Direction" />
    </>
  );
}

export function ConditionsAndInstruments({ content, units }: { content: ReportContent; units: DisplayUnits }) {
  const { conditions } = content;
  const rows: Array<[string, string | null]> = [
    ["Ambient temperature", conditions.ambientTemperatureC === null ? null : `${conditions.ambientTemperatureC} °C`],
    ["Warm-up run", conditions.warmUpMinutes === null ? null : `${conditions.warmUpMinutes} min`],
    ["Levelled before the tests", conditions.levelled === null ? null : conditions.levelled ? "yes" : "no"],
  ];
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <Card>
        <CardHeader title="Conditions" description="The reference temperature for measurement is 20 °C (ISO 1:2016)." />
        <CardBody>
          <dl className="divide-y divide-ink-100 text-sm">
            {rows.map(([term, value]) => (
              <div key={term} className="flex justify-between gap-4 py-1.5">
                <dt className="text-ink-600">{term}</dt>
                <dd className={value ? "font-semibold text-ink-900 tabular" : "text-ink-400"}>{value ?? "not recorded"}</dd>
              </div>
            ))}
          </dl>
          {conditions.notes ? <p className="mt-3 whitespace-pre-line text-sm text-ink-700">{conditions.notes}</p> : null}
        </CardBody>
      </Card>
      <Card>
        <CardHeader title="Instruments" />
        <ul className="divide-y divide-ink-100 text-sm">
          {content.instruments.map((instrument) => (
            <li key={instrument.id} className="flex flex-wrap items-baseline justify-between gap-2 px-5 py-2.5">
              <div>
                <p className="font-semibold text-ink-900">{instrument.kindLabel}</p>
                {instrument.description ? <p className="text-ink-600">{instrument.description}</p> : null}
              </div>
              <div className="text-right text-ink-700">
                <p className="tabular">{instrument.resolution === null ? "—" : `reads ${formatDeviation(instrument.resolution, units, { unit: instrument.resolutionUnit ?? "µm" })}`}</p>
                <p className={cx("text-xs", instrument.calibrationOverdue ? "font-semibold text-beyond" : "text-ink-500")}>
                  {instrument.calibrationDue ? `calibration due ${formatReportDate(instrument.calibrationDue)}${instrument.calibrationOverdue ? " — overdue" : ""}` : "calibration date not given"}
                </p>
              </div>
            </li>
          ))}
        </ul>
      </Card>
    </div>
  );
}

function directionText(result: TestResult, units: DisplayUnits) {
  const allowed = DIRECTION_LABELS[result.direction.allowed] ?? result.direction.allowed;
  const observed = observedLabel(result.direction.observed);
  if (result.direction.allowed === "any" || !observed) return allowed;
  if (result.direction.pass) return `${allowed}; read ${observed}`;
  return `${allowed}; read ${observed}, ${formatDeviation(result.direction.against, units)} the wrong way`;
}

export function ResultsTable({ content, units }: { content: ReportContent; units: DisplayUnits }) {
  return (
    <>
      <ResultsList content={content} units={units} />
      <div className="hidden lg:block">
        <ResultsGrid content={content} units={units} />
      </div>
    </>
  );
}

/** On a phone or tablet: one block per test instead of a table too wide to read (its sources column was cut off). */
function ResultsList({ content, units }: { content: ReportContent; units: DisplayUnits }) {
  return (
    <ul className="divide-y divide-ink-100 rounded-panel border border-ink-200 bg-white lg:hidden">
      {content.score.results.map((result) => (
        <li key={result.code} className="space-y-2 px-4 py-3" data-result-item={result.code}>
          <div className="flex items-start justify-between gap-3">
            <div>
              <p className="font-semibold text-ink-900">{lengthsInText(result.title, units)}</p>
              <p className="text-xs text-ink-500">
                {result.code}
                {result.required ? "" : " · optional"}
              </p>
            </div>
            <VerdictBadge result={result} />
          </div>
          <p className="text-sm text-ink-800 tabular">
            <span className="font-semibold">{formatDeviation(result.value, units, { signed: isSignedValue(result.method), unit: result.unit })}</span>
            <span className="text-ink-500"> of </span>
            {formatDeviation(result.tolerance, units, { unit: result.unit })}
            {result.measuringLength ? <span className="text-ink-500"> over {units === "inch" ? `${(result.measuringLength / 25.4).toFixed(1)} in` : `${Math.round(result.measuringLength)} mm`}</span> : null}
            <span className="text-ink-500"> · ratio {formatRatio(result.ratio)}</span>
          </p>
          <RatioBar ratio={result.ratio} pass={result.pass} />
          <p className={cx("text-sm", result.direction.pass ? "text-ink-600" : "font-semibold text-beyond")}>{directionText(result, units)}</p>
          <div className="space-y-0.5">
            <ResultSources result={result} />
          </div>
        </li>
      ))}
    </ul>
  );
}

function ResultsGrid({ content, units }: { content: ReportContent; units: DisplayUnits }) {
  return (
    <Table caption="Results per test" data-testid="results-table">
      <thead>
        <tr>
          <Th>Test</Th>
          <Th className="text-right">Value</Th>
          <Th className="text-right">Tolerance</Th>
          <Th className="min-w-36">Ratio</Th>
          <Th>Direction</Th>
          <Th>Verdict</Th>
          <Th className="min-w-56">Sources</Th>
        </tr>
      </thead>
      <tbody>
        {content.score.results.map((result) => (
          <Tr key={result.code} data-code={result.code}>
            <Td>
              <p className="font-semibold text-ink-900">{lengthsInText(result.title, units)}</p>
              <p className="text-xs text-ink-500">
                {result.code}
                {result.required ? "" : " · optional"}
              </p>
            </Td>
            <Td className="text-right font-semibold whitespace-nowrap tabular">{formatDeviation(result.value, units, { signed: isSignedValue(result.method), unit: result.unit })}</Td>
            <Td className="text-right whitespace-nowrap tabular">
              {formatDeviation(result.tolerance, units, { unit: result.unit })}
              {result.measuringLength ? <span className="block text-xs text-ink-500">over {units === "inch" ? `${(result.measuringLength / 25.4).toFixed(1)} in` : `${Math.round(result.measuringLength)} mm`}</span> : null}
            </Td>
            <Td>
              <div className="flex items-center gap-2">
                <RatioBar ratio={result.ratio} pass={result.pass} className="w-20" />
                <span className="tabular text-ink-700">{formatRatio(result.ratio)}</span>
              </div>
            </Td>
            <Td className={cx("text-sm", result.direction.pass ? "text-ink-700" : "font-semibold text-beyond")}>{directionText(result, units)}</Td>
            <Td>
              <VerdictBadge result={result} />
            </Td>
            <Td className="space-y-0.5" data-sources={result.code}>
              <ResultSources result={result} />
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}

const PLOTTED = new Set(["profile", "level", "mandrel", "sweep", "surface", "positioning"]);

export function TestDetails({ content, units, photoUrls }: { content: ReportContent; units: DisplayUnits; photoUrls: Record<string, { thumb: string; large: string }> }) {
  const results = new Map(content.score.results.map((result) => [result.code, result]));
  // The sealed measurements are keyed in canonical (alphabetical) order; the plots follow the results table.
  const order = new Map(content.score.results.map((result, i) => [result.code, i]));
  const shown = Object.entries(content.measurements.tests)
    .sort(([a], [b]) => (order.get(a) ?? Infinity) - (order.get(b) ?? Infinity) || a.localeCompare(b))
    .filter(([code, measurement]) => PLOTTED.has(measurement.kind) || photoUrls[code] || content.tests[code]?.notes);
  // An axis's A, R and B come from one set of runs: its plot is drawn once, on the first of its tests.
  const axesDrawn = new Set<string>();
  const drawn = new Set<string>();
  for (const [code, measurement] of shown) {
    const axis = measurement.kind === "positioning" ? code.replace(/-[^-]*$/, "") : null;
    if (axis && axesDrawn.has(axis)) continue;
    if (axis) axesDrawn.add(axis);
    if (PLOTTED.has(measurement.kind)) drawn.add(code);
  }
  const kept = shown.filter(([code]) => drawn.has(code) || photoUrls[code] || content.tests[code]?.notes);
  if (!kept.length) return null;
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      {kept.map(([code, measurement]) => {
        const result = results.get(code) ?? null;
        const meta = content.tests[code];
        const instrument = content.instruments.find((candidate) => candidate.id === meta?.instrumentId);
        return (
          <Card key={code} data-plot={code}>
            <CardHeader title={result ? lengthsInText(result.title, units) : code} description={`${code}${instrument ? ` · ${instrument.kindLabel}` : ""}`} action={result ? <VerdictBadge result={result} /> : null} />
            <CardBody className="space-y-3">
              {drawn.has(code) ? <TestPlot measurement={measurement} result={result} units={units} /> : null}
              {meta?.notes ? <p className="whitespace-pre-line text-sm text-ink-700">{meta.notes}</p> : null}
              {photoUrls[code] ? (
                <a href={photoUrls[code].large} target="_blank" rel="noreferrer" className="block">
                  <img src={photoUrls[code].thumb} alt={`Set-up of ${code}`} className="h-36 w-auto rounded-control border border-ink-200 object-cover" loading="lazy" />
                </a>
              ) : null}
            </CardBody>
          </Card>
        );
      })}
    </div>
  );
}
