// What every inline SVG plot shares: the frame and its ticks in the reader's units, the colour tokens, and the
// table of a plot's figures for anyone who cannot see it.
import { micrometresToInches } from "~/geometry/units";
import type { DisplayUnits } from "~/modules/units/format";

export const W = 640;
export const H = 240;
export const PAD = { left: 64, right: 16, top: 16, bottom: 40 };

// The tokens of app/app.css, whose pairs are checked for contrast there.
export const colours = {
  ink: "var(--color-ink-900)",
  muted: "var(--color-ink-500)",
  axis: "var(--color-ink-300)",
  grid: "var(--color-ink-100)",
  brass: "var(--color-brass-500)",
  within: "var(--color-within)",
  withinSoft: "var(--color-within-soft)",
  beyond: "var(--color-beyond)",
};

export function niceStep(span: number, count: number) {
  const raw = span / Math.max(count, 1);
  const power = 10 ** Math.floor(Math.log10(raw || 1));
  const [step] = [1, 2, 2.5, 5, 10].map((factor) => factor * power).filter((candidate) => candidate >= raw);
  return step ?? 10 * power;
}

export function ticks(min: number, max: number, count = 5) {
  const step = niceStep(max - min || 1, count);
  const first = Math.ceil(min / step) * step;
  const values: number[] = [];
  for (let value = first; value <= max + step * 1e-9; value += step) values.push(Number(value.toFixed(10)));
  return values;
}

/** Ticks at round values of the unit the reader sees; `scale` turns a stored value into that unit. */
export function ticksIn(min: number, max: number, count: number, scale: number) {
  return ticks(min * scale, max * scale, count).map((value) => value / scale);
}

/** A stored reading (µm) or tilt (µm/m) times this is what the reader's axis shows. */
export const readingScale = (units: DisplayUnits, unit: "µm" | "µm/m" = "µm") => (unit === "µm" && units === "inch" ? micrometresToInches(1) : 1);
/** A station (mm) times this is what the reader's axis shows. */
export const stationScale = (units: DisplayUnits) => (units === "inch" ? 1 / 25.4 : 1);

export function readingLabel(micrometres: number, units: DisplayUnits, unit: "µm" | "µm/m" = "µm") {
  if (unit === "µm/m") return `${Number(micrometres.toFixed(1))}`;
  if (units === "inch") return micrometresToInches(micrometres).toFixed(5).replace(/^(-?)0\./, "$1.");
  return `${Number(micrometres.toFixed(1))}`;
}

export function axisUnit(units: DisplayUnits, unit: "µm" | "µm/m" = "µm") {
  return unit === "µm/m" ? "µm/m" : units === "inch" ? "in" : "µm";
}

export type Scale = (value: number) => number;

/** The figures a plot draws, as a table: the plot's text alternative for anyone who cannot see it. */
export function PlotFigures({ title, columns, rows }: { title: string; columns: string[]; rows: (string | number)[][] }) {
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

export function Frame({ x, y, xTicks, yTicks, xLabel, yLabel, xFormat, yFormat }: { x: Scale; y: Scale; xTicks: number[]; yTicks: number[]; xLabel: string; yLabel: string; xFormat: (v: number) => string; yFormat: (v: number) => string }) {
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

export function linear(domain: [number, number], range: [number, number]): Scale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0 || 1;
  return (value) => r0 + ((value - d0) / span) * (r1 - r0);
}
