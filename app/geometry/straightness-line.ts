// Where a straightness reference line lies, apart from the evaluation itself: the report page draws a signed
// report's line from its sealed slope with this alone, without the rest of the engine.
import type { ProfilePoint, ReferenceLine, StraightnessReference } from "./straightness";

/** A run of consecutive stations of a sorted profile, first and last index included. */
export interface Run {
  from: number;
  to: number;
}

export const whole = (sorted: readonly ProfilePoint[]): Run => ({ from: 0, to: sorted.length - 1 });

export function bandAround(sorted: readonly ProfilePoint[], run: Run, slope: number): { top: number; bottom: number } {
  let top = -Infinity;
  let bottom = Infinity;
  for (let i = run.from; i <= run.to; i++) {
    const r = sorted[i]!.y - slope * sorted[i]!.x;
    if (r > top) top = r;
    if (r < bottom) bottom = r;
  }
  return { top, bottom };
}

/**
 * The reference line itself, where each method puts it (ISO 230-1 §3.4 on reference lines, from memory):
 * end points, the line through the first and last station; least squares, the regression line, through the
 * mean station and mean reading; minimum zone, the centre line of the narrowest band. `slope` is the
 * evaluation's (a signed report's sealed slope), so a plot drawn from it sits where the score was computed.
 */
export function straightnessReferenceLine(
  points: readonly ProfilePoint[],
  reference: StraightnessReference,
  slope: number,
): ReferenceLine {
  const sorted = [...points].sort((a, b) => a.x - b.x);
  switch (reference) {
    case "end-points":
      return { slope, intercept: sorted[0]!.y - slope * sorted[0]!.x };
    case "least-squares": {
      const meanX = sorted.reduce((sum, point) => sum + point.x, 0) / sorted.length;
      const meanY = sorted.reduce((sum, point) => sum + point.y, 0) / sorted.length;
      return { slope, intercept: meanY - slope * meanX };
    }
    default: {
      const { top, bottom } = bandAround(sorted, whole(sorted), slope);
      return { slope, intercept: (top + bottom) / 2 };
    }
  }
}

