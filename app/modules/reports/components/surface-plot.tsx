// Heights over a surface as a colour map: each place read, coloured by its height above the reference plane
// (minimum zone or least squares), with the width of the zone stated and a colour scale, and the figures as
// a table for anyone who cannot see the colours. Inline SVG; the colour ramp is our own (slate for hollows,
// paper at the plane, brass for crowns), chosen to keep the two ends apart for red-green colour blindness.
import { useId } from "react";
import type { SurfaceMeasurement, TestResult } from "~/geometry";
import { micrometresToInches } from "~/geometry/units";
import type { DisplayUnits } from "~/modules/units/format";

const RAMP: readonly [number, number, number][] = [
  [46, 74, 104], // hollow: deep slate
  [122, 150, 176],
  [244, 241, 234], // at the plane: paper
  [214, 170, 96],
  [132, 87, 16], // crown: brass
];

/** The colour for t in [0, 1] (0 the lowest place, 1 the highest). */
export function surfaceColour(t: number): string {
  const clamped = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0.5));
  const at = clamped * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(at));
  const f = at - i;
  const [a, b] = [RAMP[i]!, RAMP[i + 1]!];
  const mix = (k: number) => Math.round(a[k]! + (b[k]! - a[k]!) * f);
  return `rgb(${mix(0)} ${mix(1)} ${mix(2)})`;
}

function heightText(micrometres: number, units: DisplayUnits) {
  if (units === "inch") return micrometresToInches(micrometres).toFixed(5).replace(/^(-?)0\./, "$1.");
  return `${Number(micrometres.toFixed(1))}`;
}

function placeText(mm: number, units: DisplayUnits) {
  return units === "inch" ? `${Number((mm / 25.4).toFixed(2))}` : `${Number(mm.toFixed(1))}`;
}

const unitOf = (units: DisplayUnits) => (units === "inch" ? "in" : "µm");
const placeUnit = (units: DisplayUnits) => (units === "inch" ? "in" : "mm");

interface Place {
  x: number;
  y: number;
  /** Height above the reference plane, µm. */
  h: number;
}

/** The places' heights above the result's plane (or above the lowest place when there is no result). */
export function heightsAbovePlane(points: SurfaceMeasurement["points"], flatness: TestResult["flatness"] | undefined): Place[] {
  if (flatness) {
    const { slopeX, slopeY, offset } = flatness.plane;
    return points.map((p) => ({ x: p.x, y: p.y, h: p.z - (slopeX * p.x + slopeY * p.y + offset) }));
  }
  const lowest = Math.min(...points.map((p) => p.z));
  return points.map((p) => ({ x: p.x, y: p.y, h: p.z - lowest }));
}

/** A full rectangular grid's sorted x and y values, or null for places along lines (the diagonal layout). */
function gridAxes(places: readonly Place[]): { xs: number[]; ys: number[] } | null {
  const xs = [...new Set(places.map((p) => p.x))].sort((a, b) => a - b);
  const ys = [...new Set(places.map((p) => p.y))].sort((a, b) => a - b);
  return xs.length * ys.length === places.length && xs.length > 1 && ys.length > 1 ? { xs, ys } : null;
}

const W = 640;
const PAD = { left: 48, right: 96, top: 12, bottom: 36 };

export function SurfacePlot({ measurement, result, units, title }: { measurement: SurfaceMeasurement; result: TestResult | null; units: DisplayUnits; title: string }) {
  const id = useId();
  const places = heightsAbovePlane(measurement.points, result?.flatness);
  if (places.length < 3) return null;
  const low = Math.min(...places.map((p) => p.h));
  const high = Math.max(...places.map((p) => p.h));
  const span = high - low || 1;
  const minX = Math.min(...places.map((p) => p.x));
  const maxX = Math.max(...places.map((p) => p.x));
  const minY = Math.min(...places.map((p) => p.y));
  const maxY = Math.max(...places.map((p) => p.y));
  const plotW = W - PAD.left - PAD.right;
  // Keep the surface's proportions, within a band of heights that fits a page.
  const plotH = Math.round(Math.min(360, Math.max(120, (plotW * (maxY - minY || 1)) / (maxX - minX || 1))));
  const H = plotH + PAD.top + PAD.bottom;
  const sx = (x: number) => PAD.left + ((x - minX) / (maxX - minX || 1)) * plotW;
  // y grows away from the reader: the front edge (y = 0) at the bottom.
  const sy = (y: number) => PAD.top + plotH - ((y - minY) / (maxY - minY || 1)) * plotH;
  const axes = gridAxes(places);
  const byPlace = new Map(places.map((p) => [`${p.x}|${p.y}`, p]));
  const zone = result?.flatness ? result.value : high - low;
  const reference = result?.flatness?.reference === "least-squares" ? "least-squares plane" : "minimum-zone planes";
  const legendSteps = 24;
  const summary =
    `${places.length} places over ${placeText(maxX - minX, units)} × ${placeText(maxY - minY, units)} ${placeUnit(units)}; ` +
    `heights from ${heightText(low, units)} to ${heightText(high, units)} ${unitOf(units)} about the ${reference}, ` +
    `a zone ${heightText(zone, units)} ${unitOf(units)} wide.`;

  const cells = axes
    ? places.map((p, i) => {
        const xi = axes.xs.indexOf(p.x);
        const yi = axes.ys.indexOf(p.y);
        const half = (values: number[], k: number, side: -1 | 1) => {
          const neighbour = values[k + side];
          return neighbour === undefined ? 0 : (neighbour - values[k]!) / 2;
        };
        const x0 = sx(p.x + half(axes.xs, xi, -1));
        const x1 = sx(p.x + half(axes.xs, xi, 1));
        const y0 = sy(p.y + half(axes.ys, yi, 1));
        const y1 = sy(p.y + half(axes.ys, yi, -1));
        return <rect key={i} x={x0} y={y0} width={Math.max(0.5, x1 - x0)} height={Math.max(0.5, y1 - y0)} fill={surfaceColour((p.h - low) / span)} />;
      })
    : places.map((p, i) => <circle key={i} cx={sx(p.x)} cy={sy(p.y)} r={6} fill={surfaceColour((p.h - low) / span)} stroke="var(--color-ink-500)" strokeWidth="0.75" />);

  return (
    <>
      <figure className="space-y-1" data-testid="surface-plot">
        <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-labelledby={`${id}-t ${id}-d`}>
          <title id={`${id}-t`}>{`${title}: heights over the surface`}</title>
          <desc id={`${id}-d`}>{summary}</desc>
          <rect x={PAD.left} y={PAD.top} width={plotW} height={plotH} fill="var(--color-ink-50)" />
          {cells}
          <rect x={PAD.left} y={PAD.top} width={plotW} height={plotH} fill="none" stroke="var(--color-ink-300)" />
          <text x={PAD.left} y={H - 10} fontSize="11" fill="var(--color-ink-500)">
            x 0 → {placeText(maxX - minX, units)} {placeUnit(units)}
          </text>
          <text x={PAD.left - 8} y={PAD.top + plotH} fontSize="11" fill="var(--color-ink-500)" textAnchor="end">
            y 0
          </text>
          <text x={PAD.left - 8} y={PAD.top + 10} fontSize="11" fill="var(--color-ink-500)" textAnchor="end">
            {placeText(maxY - minY, units)}
          </text>
          {/* The colour scale: highest at the top. */}
          {Array.from({ length: legendSteps }, (_, k) => {
            const bandH = plotH / legendSteps;
            return <rect key={k} x={W - PAD.right + 16} y={PAD.top + k * bandH} width={14} height={bandH + 0.5} fill={surfaceColour(1 - k / (legendSteps - 1))} />;
          })}
          <rect x={W - PAD.right + 16} y={PAD.top} width={14} height={plotH} fill="none" stroke="var(--color-ink-300)" />
          <text x={W - PAD.right + 34} y={PAD.top + 10} fontSize="11" fill="var(--color-ink-900)">
            {heightText(high, units)}
          </text>
          <text x={W - PAD.right + 34} y={PAD.top + plotH} fontSize="11" fill="var(--color-ink-900)">
            {heightText(low, units)}
          </text>
          <text x={W - PAD.right + 34} y={PAD.top + plotH / 2 + 4} fontSize="11" fill="var(--color-ink-500)">
            {unitOf(units)}
          </text>
        </svg>
        <figcaption className="text-sm text-ink-700">
          <span className="font-semibold" data-testid="zone-width">
            Zone {heightText(zone, units)} {unitOf(units)} wide
          </span>{" "}
          <span className="text-ink-500">
            ({result?.flatness ? reference : "highest less lowest"}). Slate: below the plane; brass: above. Front edge (y = 0) at the bottom.
          </span>
        </figcaption>
      </figure>
      <details className="text-xs text-ink-600" data-testid="plot-figures">
        <summary className="cursor-pointer font-semibold text-ink-700">Heights as a table</summary>
        <div className="mt-1 max-h-80 overflow-auto">
          {axes ? (
            <table className="text-left tabular">
              <caption className="sr-only">
                Heights ({unitOf(units)}) above the {reference} of {title}, rows by y, columns by x ({placeUnit(units)})
              </caption>
              <thead>
                <tr>
                  <th scope="col" className="py-1 pr-3 font-semibold text-ink-700">
                    y \ x
                  </th>
                  {axes.xs.map((x) => (
                    <th key={x} scope="col" className="py-1 pr-3 font-semibold text-ink-700">
                      {placeText(x, units)}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {[...axes.ys].reverse().map((y) => (
                  <tr key={y} className="border-t border-ink-100">
                    <th scope="row" className="py-1 pr-3 font-normal">
                      {placeText(y, units)}
                    </th>
                    {axes.xs.map((x) => {
                      const place = byPlace.get(`${x}|${y}`);
                      return (
                        <td key={x} className="py-1 pr-3">
                          {place ? heightText(place.h, units) : ""}
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <table className="text-left tabular">
              <caption className="sr-only">Heights above the {reference} of {title}</caption>
              <thead>
                <tr>
                  <th scope="col" className="py-1 pr-3 font-semibold text-ink-700">
                    x ({placeUnit(units)})
                  </th>
                  <th scope="col" className="py-1 pr-3 font-semibold text-ink-700">
                    y ({placeUnit(units)})
                  </th>
                  <th scope="col" className="py-1 pr-3 font-semibold text-ink-700">
                    Height ({unitOf(units)})
                  </th>
                </tr>
              </thead>
              <tbody>
                {places.map((p, i) => (
                  <tr key={i} className="border-t border-ink-100">
                    <td className="py-1 pr-3">{placeText(p.x, units)}</td>
                    <td className="py-1 pr-3">{placeText(p.y, units)}</td>
                    <td className="py-1 pr-3">{heightText(p.h, units)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </div>
      </details>
    </>
  );
}
