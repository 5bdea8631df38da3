// Plots as inline SVG: a straightness profile with its reference line and tolerance band, mandrel readings
// near and far at 0° and 180°, and indicator readings around a revolution. No chart library needed.
import { lazy, Suspense } from "react";
import type { TestMeasurement, TestResult } from "~/geometry";
import { straightnessReferenceLine } from "~/geometry/straightness-line";
import { micrometresToInches } from "~/geometry/units";
import { formatDeviation } from "../format";
import type { DisplayUnits } from "~/modules/units/format";
import { lengthsInText } from "~/modules/units/format";

// Only a surface test (a mill's or grinder's table) draws a colour map, so a lathe's report never downloads it.
const SurfacePlot = lazy(() => import("./surface-plot").then((module) => ({ default: module.SurfacePlot })));

const W = 640;
const H = 240;
const PAD = { left: 64, right: 16, top: 16, bottom: 40 };

// The tokens of app/app.css, whose pairs are checked for contrast there.
const colours = {
  ink: "var(--color-ink-900)",
  muted: "var(--color-ink-500)",
  axis: "var(--color-ink-300)",
  grid: "var(--color-ink-100)",
  brass: "var(--color-brass-500)",
  within: "var(--color-within)",
  withinSoft: "var(--color-within-soft)",
  beyond: "var(--color-beyond)",
};

function niceStep(span: number, count: number) {
  const raw = span / Math.max(count, 1);
  const power = 10 ** Math.floor(Math.log10(raw || 1));
  const [step] = [1, 2, 2.5, 5, 10].map((factor) => factor * power).filter((candidate) => candidate >= raw);
  return step ?? 10 * power;
}

function ticks(min: number, max: number, count = 5) {
  const step = niceStep(max - min || 1, count);
  const first = Math.ceil(min / step) * step;
  const values: number[] = [];
  for (let value = first; value <= max + step * 1e-9; value += step) values.push(Number(value.toFixed(10)));
  return values;
}

/** Ticks at round values of the unit the reader sees; `scale` turns a stored value into that unit. */
function ticksIn(min: number, max: number, count: number, scale: number) {
  return ticks(min * scale, max * scale, count).map((value) => value / scale);
}

/** A stored reading (µm) or tilt (µm/m) times this is what the reader's axis shows. */
const readingScale = (units: DisplayUnits, unit: "µm" | "µm/m" = "µm") => (unit === "µm" && units === "inch" ? micrometresToInches(1) : 1);
/** A station (mm) times this is what the reader's axis shows. */
const stationScale = (units: DisplayUnits) => (units === "inch" ? 1 / 25.4 : 1);

function readingLabel(micrometres: number, units: DisplayUnits, unit: "µm" | "µm/m" = "µm") {
  if (unit === "µm/m") return `${Number(micrometres.toFixed(1))}`;
  if (units === "inch") return micrometresToInches(micrometres).toFixed(5).replace(/^(-?)0\./, "$1.");
  return `${Number(micrometres.toFixed(1))}`;
}

function axisUnit(units: DisplayUnits, unit: "µm" | "µm/m" = "µm") {
  return unit === "µm/m" ? "µm/m" : units === "inch" ? "in" : "µm";
}

type Scale = (value: number) => number;

/** The figures a plot draws, as a table: the plot's text alternative for anyone who cannot see it. */
function PlotFigures({ title, columns, rows }: { title: string; columns: string[]; rows: (string | number)[][] }) {
  return (
    <details className="text-xs text-ink-600" data-testid="plot-figures">
      <summary className="cursor-pointer font-semibold text-ink-700">Figures in this plot</summary>
      <table className="mt-1 w-full text-left tabular">
        <caption className="sr-only">Figures of the plot {title}</caption>
        <thead>
          <tr>
            {columns.map((column) => (
              <th key={column} scope="col" className="py-1 pr-3 font-semibold text-ink-700">
                {column}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map(([head, ...cells], i) => (
            <tr key={i} className="border-t border-ink-100">
              <th scope="row" className="py-1 pr-3 font-normal">
                {head}
              </th>
              {cells.map((cell, j) => (
                <td key={j} className="py-1 pr-3">
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </details>
  );
}

function Frame({ x, y, xTicks, yTicks, xLabel, yLabel, xFormat, yFormat }: { x: Scale; y: Scale; xTicks: number[]; yTicks: number[]; xLabel: string; yLabel: string; xFormat: (v: number) => string; yFormat: (v: number) => string }) {
  return (
    <g fontSize="11" fill={colours.muted}>
      {yTicks.map((value) => (
        <g key={`y${value}`}>
          <line x1={PAD.left} x2={W - PAD.right} y1={y(value)} y2={y(value)} stroke={value === 0 ? colours.axis : colours.grid} />
          <text data-plot="y-tick" x={PAD.left - 6} y={y(value) + 4} textAnchor="end">
            {yFormat(value)}
          </text>
        </g>
      ))}
      {xTicks.map((value) => (
        <text key={`x${value}`} data-plot="x-tick" x={x(value)} y={H - PAD.bottom + 16} textAnchor="middle">
          {xFormat(value)}
        </text>
      ))}
      <text x={(PAD.left + W - PAD.right) / 2} y={H - 6} textAnchor="middle">
        {xLabel}
      </text>
      <text x={14} y={(PAD.top + H - PAD.bottom) / 2} textAnchor="middle" transform={`rotate(-90 14 ${(PAD.top + H - PAD.bottom) / 2})`}>
        {yLabel}
      </text>
    </g>
  );
}

function linear(domain: [number, number], range: [number, number]): Scale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0 || 1;
  return (value) => r0 + ((value - d0) / span) * (r1 - r0);
}

/** Readings along a travel; with the reference line, the band holding the points and the tolerance band when scored as a straightness. */
export function ProfilePlot({
  points,
  result,
  units,
  title,
  readingUnit = result?.unit,
}: {
  points: { station: number; reading: number }[];
  result: TestResult | null;
  units: DisplayUnits;
  title: string;
  /** A level's tilts are µm/m whatever the reader's units; only its stations follow them. */
  readingUnit?: "µm" | "µm/m";
}) {
  if (points.length < 2) return null;
  const sorted = [...points].sort((a, b) => a.station - b.station);
  // The engine's line is the middle of the band holding the readings; the reference itself sits where its
  // method puts it (through the end points, through the mean, or the minimum zone's centre line).
  const line = result?.straightness?.line;
  const reference =
    line && result?.straightness
      ? straightnessReferenceLine(sorted.map((point) => ({ x: point.station, y: point.reading })), result.straightness.reference, line.slope)
      : null;
  const tolerance = result?.tolerance ?? 0;
  const xs = sorted.map((point) => point.station);
  const [xMin, xMax] = [Math.min(...xs), Math.max(...xs)];
  const ys = sorted.map((point) => point.reading);
  if (line) {
    for (const x of [xMin, xMax]) {
      const mid = line.slope * x + line.intercept;
      ys.push(mid + tolerance / 2, mid - tolerance / 2);
    }
  }
  const yPad = (Math.max(...ys) - Math.min(...ys)) * 0.12 || 1;
  const yDomain: [number, number] = [Math.min(...ys) - yPad, Math.max(...ys) + yPad];
  const x = linear([xMin, xMax], [PAD.left, W - PAD.right]);
  const y = linear(yDomain, [H - PAD.bottom, PAD.top]);
  const at = (station: number, offset: number) => `${x(station)},${y(line!.slope * station + line!.intercept + offset)}`;
  // Ticks fall on round values of what the reader sees (2 in, 0.0001 in), not on converted millimetres.
  const stationFormat = (value: number) => String(Number((value * stationScale(units)).toFixed(3)));
  const stationUnit = units === "inch" ? "in" : "mm";
  return (
    <>
      <figure className="w-full">
        <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-label={title}>
          <Frame
            x={x}
            y={y}
            xTicks={ticksIn(xMin, xMax, 6, stationScale(units))}
            yTicks={ticksIn(yDomain[0], yDomain[1], 5, readingScale(units, readingUnit))}
            xLabel={`Station (${stationUnit})`}
            yLabel={`Reading (${axisUnit(units, readingUnit)})`}
            xFormat={stationFormat}
            yFormat={(value) => readingLabel(value, units, readingUnit)}
          />
          {line ? (
            <>
              <polygon points={[at(xMin, tolerance / 2), at(xMax, tolerance / 2), at(xMax, -tolerance / 2), at(xMin, -tolerance / 2)].join(" ")} fill={colours.withinSoft} opacity="0.9" />
              {[result!.value / 2, -result!.value / 2].map((offset) => (
                <line key={offset} data-plot="band-edge" x1={x(xMin)} x2={x(xMax)} y1={y(line.slope * xMin + line.intercept + offset)} y2={y(line.slope * xMax + line.intercept + offset)} stroke={result!.pass ? colours.ink : colours.beyond} strokeDasharray="4 3" strokeWidth="1" />
              ))}
            </>
          ) : null}
          {reference ? (
            <line data-plot="reference-line" x1={x(xMin)} x2={x(xMax)} y1={y(reference.slope * xMin + reference.intercept)} y2={y(reference.slope * xMax + reference.intercept)} stroke={colours.brass} strokeWidth="1.5" />
          ) : null}
          <polyline points={sorted.map((point) => `${x(point.station)},${y(point.reading)}`).join(" ")} fill="none" stroke={colours.ink} strokeWidth="1.5" />
          {sorted.map((point) => (
            <circle key={point.station} data-plot="reading" cx={x(point.station)} cy={y(point.reading)} r="3.5" fill="white" stroke={colours.ink} strokeWidth="1.5" />
          ))}
        </svg>
        {line ? (
          <figcaption className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-500">
            <span>
              <span className="mr-1 inline-block h-0.5 w-4 align-middle" style={{ background: colours.brass }} />
              reference line ({result!.straightness!.reference.replace("-", " ")})
            </span>
            <span>
              <span className="mr-1 inline-block h-0.5 w-4 border-t border-dashed align-middle" style={{ borderColor: colours.ink }} />
              band holding the readings
            </span>
            <span>
              <span className="mr-1 inline-block h-2.5 w-4 align-middle" style={{ background: colours.withinSoft }} />
              tolerance band
            </span>
            <span>shape: {result!.straightness!.shape}</span>
          </figcaption>
        ) : null}
      </figure>
      <PlotFigures
        title={title}
        columns={[`Station (${stationUnit})`, `Reading (${axisUnit(units, readingUnit)})`]}
        rows={sorted.map((point) => [units === "inch" ? (point.station / 25.4).toFixed(2) : String(point.station), readingLabel(point.reading, units, readingUnit)])}
      />
    </>
  );
}

/** Near and far readings at 0° and 180°, their means, and the inclination between them. */
export function MandrelPlot({ measurement, result, units, title }: { measurement: Extract<TestMeasurement, { kind: "mandrel" }>; result: TestResult | null; units: DisplayUnits; title: string }) {
  const near = [measurement.near.at0, measurement.near.at180];
  const far = [measurement.far.at0, measurement.far.at180];
  const meanNear = (near[0]! + near[1]!) / 2;
  const meanFar = (far[0]! + far[1]!) / 2;
  const all = [...near, ...far, 0];
  const pad = (Math.max(...all) - Math.min(...all)) * 0.2 || 2;
  const yDomain: [number, number] = [Math.min(...all) - pad, Math.max(...all) + pad];
  const y = linear(yDomain, [H - PAD.bottom, PAD.top]);
  const xNear = PAD.left + 90;
  const xFar = W - PAD.right - 90;
  const wrong = result ? !result.direction.pass : false;
  const unit = axisUnit(units);
  return (
    <>
      <figure className="w-full">
        <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-label={title}>
          <Frame x={(v) => v} y={y} xTicks={[]} yTicks={ticksIn(yDomain[0], yDomain[1], 5, readingScale(units))} xLabel="Along the mandrel" yLabel={`Reading (${axisUnit(units)})`} xFormat={String} yFormat={(value) => readingLabel(value, units)} />
          <text x={xNear} y={H - PAD.bottom + 16} textAnchor="middle" fontSize="11" fill={colours.muted}>
            near the nose
          </text>
          <text x={xFar} y={H - PAD.bottom + 16} textAnchor="middle" fontSize="11" fill={colours.muted}>
            far end{measurement.length ? ` (${units === "inch" ? `${(measurement.length / 25.4).toFixed(1)} in` : `${measurement.length} mm`})` : ""}
          </text>
          <line x1={xNear} x2={xFar} y1={y(meanNear)} y2={y(meanFar)} stroke={wrong ? colours.beyond : colours.brass} strokeWidth="2" />
          {[
            [xNear, near],
            [xFar, far],
          ].map(([xPos, values]) => (
            <g key={String(xPos)}>
              <line x1={xPos as number} x2={xPos as number} y1={y((values as number[])[0]!)} y2={y((values as number[])[1]!)} stroke={colours.muted} strokeDasharray="2 3" />
              <circle cx={(xPos as number) - 8} cy={y((values as number[])[0]!)} r="4" fill={colours.ink} />
              <text x={(xPos as number) - 16} y={y((values as number[])[0]!) + 4} textAnchor="end" fontSize="10" fill={colours.muted}>
                0°
              </text>
              <circle cx={(xPos as number) + 8} cy={y((values as number[])[1]!)} r="4" fill="white" stroke={colours.ink} strokeWidth="1.5" />
              <text x={(xPos as number) + 16} y={y((values as number[])[1]!) + 4} fontSize="10" fill={colours.muted}>
                180°
              </text>
            </g>
          ))}
        </svg>
        <figcaption className="mt-1 text-xs text-ink-500">
          Filled: spindle at 0°; open: turned 180°. The line joins the means; its rise is the inclination{result ? ` (${readingLabel(result.value, units)} ${axisUnit(units)})` : ""}.
        </figcaption>
      </figure>
      <PlotFigures
        title={title}
        columns={["Along the mandrel", `At 0° (${unit})`, `At 180° (${unit})`, `Mean (${unit})`]}
        rows={[
          ["Near the nose", readingLabel(near[0]!, units), readingLabel(near[1]!, units), readingLabel(meanNear, units)],
          ["Far end", readingLabel(far[0]!, units), readingLabel(far[1]!, units), readingLabel(meanFar, units)],
        ]}
      />
    </>
  );
}

/** Indicator readings around one revolution, drawn around a circle; the spread between the rings is the run-out. */
export function RunOutPlot({ measurement, units, title }: { measurement: Extract<TestMeasurement, { kind: "sweep" | "extremes" }>; units: DisplayUnits; title: string }) {
  const size = 220;
  const centre = size / 2;
  const readings = measurement.kind === "sweep" ? measurement.readings : [measurement.max, measurement.min];
  const min = Math.min(...readings);
  const max = Math.max(...readings);
  const span = max - min || 1;
  const inner = 52;
  const outer = 96;
  const radius = (value: number) => inner + ((value - min) / span) * (outer - inner);
  const points =
    measurement.kind === "sweep"
      ? readings.map((value, i) => {
          const angle = (i / readings.length) * 2 * Math.PI - Math.PI / 2;
          return [centre + radius(value) * Math.cos(angle), centre + radius(value) * Math.sin(angle)] as const;
        })
      : [];
  return (
    <>
      <figure className="flex flex-wrap items-center gap-4">
        <svg viewBox={`0 0 ${size} ${size}`} className="h-auto w-44" role="img" aria-label={title}>
          <circle cx={centre} cy={centre} r={inner} fill="none" stroke={colours.grid} strokeWidth="1.5" />
          <circle cx={centre} cy={centre} r={outer} fill="none" stroke={colours.grid} strokeWidth="1.5" />
          {points.length ? (
            <>
              <polygon points={points.map(([px, py]) => `${px},${py}`).join(" ")} fill={colours.withinSoft} stroke={colours.ink} strokeWidth="1.5" />
              {points.map(([px, py], i) => (
                <circle key={i} cx={px} cy={py} r="3" fill="white" stroke={colours.ink} strokeWidth="1.2" />
              ))}
            </>
          ) : (
            <line x1={centre} x2={centre} y1={centre - outer} y2={centre - inner} stroke={colours.ink} strokeWidth="6" strokeLinecap="round" />
          )}
          <text x={centre} y={centre + 4} textAnchor="middle" fontSize="12" fill={colours.ink} fontWeight="700">
            {readingLabel(max - min, units)} {axisUnit(units)}
          </text>
        </svg>
        <figcaption className="max-w-xs text-xs text-ink-500">
          {measurement.kind === "sweep" ? `${readings.length} readings over a revolution, ` : "Highest and lowest reading, "}
          inner ring the lowest ({readingLabel(min, units)}), outer the highest ({readingLabel(max, units)} {axisUnit(units)}).
        </figcaption>
      </figure>
      <PlotFigures
        title={title}
        columns={measurement.kind === "sweep" ? ["Angle", `Reading (${axisUnit(units)})`] : ["", `Reading (${axisUnit(units)})`]}
        rows={
          measurement.kind === "sweep"
            ? readings.map((value, i) => [`${Math.round((i / readings.length) * 360)}°`, readingLabel(value, units)])
            : [
                ["Highest", readingLabel(max, units)],
                ["Lowest", readingLabel(min, units)],
              ]
        }
      />
    </>
  );
}

type PositioningFigures = NonNullable<TestResult["positioning"]>;

/**
 * Positioning of one axis along its travel: the mean deviation of each direction of approach with its band
 * of ± 2s, and the axis's accuracy A, repeatability R, reversal value B and systematic deviation E.
 */
export function PositioningPlot({ figures, units, title }: { figures: PositioningFigures; units: DisplayUnits; title: string }) {
  const rows = figures.perTarget;
  if (rows.length < 2) return null;
  const xs = rows.map((row) => row.target);
  const [xMin, xMax] = [Math.min(...xs), Math.max(...xs)];
  const ys = rows.flatMap((row) => [row.meanForward + 2 * row.sForward, row.meanForward - 2 * row.sForward, row.meanReverse + 2 * row.sReverse, row.meanReverse - 2 * row.sReverse]);
  const yPad = (Math.max(...ys) - Math.min(...ys)) * 0.12 || 1;
  const yDomain: [number, number] = [Math.min(...ys, 0) - yPad, Math.max(...ys, 0) + yPad];
  const x = linear([xMin, xMax], [PAD.left, W - PAD.right]);
  const y = linear(yDomain, [H - PAD.bottom, PAD.top]);
  const stationUnit = units === "inch" ? "in" : "mm";
  const targetText = (value: number) => String(Number((value * stationScale(units)).toFixed(3)));
  const directions = [
    { key: "forward", label: "approaching in +", mean: (row: (typeof rows)[number]) => row.meanForward, s: (row: (typeof rows)[number]) => row.sForward, colour: colours.ink, dash: undefined },
    { key: "reverse", label: "approaching in −", mean: (row: (typeof rows)[number]) => row.meanReverse, s: (row: (typeof rows)[number]) => row.sReverse, colour: colours.brass, dash: "5 3" },
  ] as const;
  const figureList: [string, number][] = [
    ["Accuracy A", figures.accuracy],
    ["Repeatability R", figures.repeatability],
    ["Reversal value B", figures.reversalValue],
    ["Systematic deviation E", figures.systematicDeviation],
  ];
  return (
    <>
      <figure className="w-full">
        <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-label={`${title}: mean deviation ± 2s in each direction along the travel`}>
          <Frame
            x={x}
            y={y}
            xTicks={ticksIn(xMin, xMax, 6, stationScale(units))}
            yTicks={ticksIn(yDomain[0], yDomain[1], 5, readingScale(units))}
            xLabel={`Target (${stationUnit})`}
            yLabel={`Deviation (${axisUnit(units)})`}
            xFormat={targetText}
            yFormat={(value) => readingLabel(value, units)}
          />
          {directions.map((direction) => (
            <g key={direction.key} data-plot={`positioning-${direction.key}`}>
              <polygon
                points={[...rows.map((row) => `${x(row.target)},${y(direction.mean(row) + 2 * direction.s(row))}`), ...[...rows].reverse().map((row) => `${x(row.target)},${y(direction.mean(row) - 2 * direction.s(row))}`)].join(" ")}
                fill={direction.colour}
                opacity="0.12"
              />
              <polyline points={rows.map((row) => `${x(row.target)},${y(direction.mean(row))}`).join(" ")} fill="none" stroke={direction.colour} strokeWidth="1.75" strokeDasharray={direction.dash} />
              {rows.map((row) => (
                <line key={row.target} x1={x(row.target)} x2={x(row.target)} y1={y(direction.mean(row) - 2 * direction.s(row))} y2={y(direction.mean(row) + 2 * direction.s(row))} stroke={direction.colour} strokeWidth="1" />
              ))}
              {rows.map((row) =>
                direction.key === "forward" ? (
                  <circle key={row.target} data-plot="mean" cx={x(row.target)} cy={y(direction.mean(row))} r="3" fill="white" stroke={direction.colour} strokeWidth="1.5" />
                ) : (
                  <rect key={row.target} data-plot="mean" x={x(row.target) - 3} y={y(direction.mean(row)) - 3} width="6" height="6" fill="white" stroke={direction.colour} strokeWidth="1.5" />
                ),
              )}
            </g>
          ))}
        </svg>
        <figcaption className="mt-1 space-y-1 text-xs text-ink-500">
          <span className="flex flex-wrap gap-x-4 gap-y-1">
            {directions.map((direction) => (
              <span key={direction.key}>
                <span className="mr-1 inline-block h-0.5 w-4 align-middle" style={{ background: direction.colour }} />
                mean {direction.label}, bar and band ± 2s ({direction.key === "forward" ? figures.runsForward : figures.runsReverse} runs)
              </span>
            ))}
          </span>
          <span className="flex flex-wrap gap-x-4 gap-y-1 text-ink-700" data-testid="positioning-figures">
            {figureList.map(([label, value]) => (
              <span key={label}>
                {label} <span className="font-semibold tabular">{formatDeviation(value, units)}</span>
              </span>
            ))}
          </span>
        </figcaption>
      </figure>
      <PlotFigures
        title={title}
        columns={[`Target (${stationUnit})`, `Mean + (${axisUnit(units)})`, `2s + (${axisUnit(units)})`, `Mean − (${axisUnit(units)})`, `2s − (${axisUnit(units)})`]}
        rows={rows.map((row) => [targetText(row.target), readingLabel(row.meanForward, units), readingLabel(2 * row.sForward, units), readingLabel(row.meanReverse, units), readingLabel(2 * row.sReverse, units)])}
      />
    </>
  );
}

/** The plot that suits a test's readings, or nothing for a single pair of numbers. */
export function TestPlot({ measurement, result, units }: { measurement: TestMeasurement; result: TestResult | null; units: DisplayUnits }) {
  const title = result ? `${result.code} ${lengthsInText(result.title, units)}` : "Readings";
  switch (measurement.kind) {
    case "profile":
    case "level":
      return (
        <ProfilePlot
          points={measurement.points}
          result={measurement.kind === "profile" ? result : result ? { ...result, straightness: undefined } : null}
          units={units}
          readingUnit={measurement.kind === "level" ? "µm/m" : result?.unit}
          title={title}
        />
      );
    case "mandrel":
      return <MandrelPlot measurement={measurement} result={result} units={units} title={title} />;
    case "sweep":
    case "extremes":
      return <RunOutPlot measurement={measurement} units={units} title={title} />;
    case "surface":
      return (
        <Suspense fallback={null}>
          <SurfacePlot measurement={measurement} result={result} units={units} title={title} />
        </Suspense>
      );
    case "positioning":
      return result?.positioning ? <PositioningPlot figures={result.positioning} units={units} title={title} /> : null;
    default:
      return null;
  }
}
