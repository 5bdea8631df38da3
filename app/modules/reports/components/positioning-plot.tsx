// An axis's positioning along its travel (ISO 230-2): loaded only where a positioning test is drawn.
import type { TestResult } from "~/geometry";
import type { DisplayUnits } from "~/modules/units/format";
import { formatDeviation } from "../format";
import { axisUnit, colours, Frame, H, linear, PAD, PlotFigures, readingLabel, readingScale, stationScale, ticksIn, W } from "./plot-parts";

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
