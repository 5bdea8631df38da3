// Plots as inline SVG: a straightness profile with its reference line and tolerance band, mandrel readings
// near and far at 0° and 180°, and indicator readings around a revolution. No chart library needed.
import { lazy, Suspense } from "react";
import type { TestMeasurement, TestResult } from "~/geometry";
import { straightnessReferenceLine } from "~/geometry/straightness-line";
import type { DisplayUnits } from "~/modules/units/format";
import { lengthsInText } from "~/modules/units/format";
import { axisUnit, colours, Frame, H, linear, PAD, PlotFigures, readingLabel, readingScale, stationScale, ticksIn, W } from "./plot-parts";

// Only a surface test (a mill's or grinder's table) draws a colour map, so a lathe's report never downloads it.
const SurfacePlot = lazy(() => import("./surface-plot").then((module) => ({ default: module.SurfacePlot })));
// Only a CNC machine's axes draw positioning runs.
const PositioningPlot = lazy(() => import("./positioning-plot").then((module) => ({ default: module.PositioningPlot })));

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
      return result?.positioning ? (
        <Suspense fallback={null}>
          <PositioningPlot figures={result.positioning} units={units} title={title} />
        </Suspense>
      ) : null;
    default:
      return null;
  }
}
