import { describe, expect, it } from "vitest";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { linearRegression } from "simple-statistics";
import { straightnessEvaluation, type ProfilePoint, type StraightnessReference, type TestResult } from "~/geometry";
import { ProfilePlot } from "~/modules/reports/components/plots";

// Worked example, GEOMETRY.md: stations 0…500 mm, readings 0, −4, +2, +6, +3, +8 µm.
const WORKED: ProfilePoint[] = [0, 100, 200, 300, 400, 500].map((x, i) => ({ x, y: [0, -4, 2, 6, 3, 8][i]! }));

interface Segment {
  x1: number;
  y1: number;
  x2: number;
  y2: number;
}

const attribute = (tag: string, name: string) => Number(new RegExp(`\\s${name}="([^"]+)"`).exec(tag)![1]);
const segments = (svg: string, kind: string): Segment[] =>
  [...svg.matchAll(new RegExp(`<line[^>]*data-plot="${kind}"[^>]*>`, "g"))].map(([tag]) => ({
    x1: attribute(tag, "x1"),
    y1: attribute(tag, "y1"),
    x2: attribute(tag, "x2"),
    y2: attribute(tag, "y2"),
  }));
const readings = (svg: string) =>
  [...svg.matchAll(/<circle[^>]*data-plot="reading"[^>]*>/g)].map(([tag]) => ({ x: attribute(tag, "cx"), y: attribute(tag, "cy") }));
const yAt = (segment: Segment, x: number) => segment.y1 + ((x - segment.x1) / (segment.x2 - segment.x1)) * (segment.y2 - segment.y1);

function plotted(reference: StraightnessReference) {
  const evaluation = straightnessEvaluation(WORKED, reference);
  const result = {
    code: "G1",
    title: "Bed, straightness",
    value: evaluation.deviation,
    tolerance: 20,
    pass: true,
    straightness: { reference, line: evaluation.line, shape: "mixed", above: 0, below: 0 },
  } as unknown as TestResult;
  const svg = renderToStaticMarkup(
    createElement(ProfilePlot, { points: WORKED.map(({ x, y }) => ({ station: x, reading: y })), result, units: "mm", title: "G1" }),
  );
  const [line] = segments(svg, "reference-line");
  return { svg, line: line!, points: readings(svg), edges: segments(svg, "band-edge") };
}

describe("the straightness plot draws each reference where the engine puts it", () => {
  it("end points: the line runs through the first and last reading", () => {
    const { line, points, svg } = plotted("end-points");
    expect(svg).toContain("reference line (end points)");
    const [first, last] = [points[0]!, points[points.length - 1]!];
    expect(line.x1).toBeCloseTo(first.x, 6);
    expect(line.y1).toBeCloseTo(first.y, 6); // the line through the end points, by definition (ISO 230-1, from memory)
    expect(line.x2).toBeCloseTo(last.x, 6);
    expect(line.y2).toBeCloseTo(last.y, 6);
  });

  it("least squares: the line is the regression line of the plotted readings", () => {
    const { line, points } = plotted("least-squares");
    // Scaling each axis linearly keeps the regression line, so simple-statistics on the pixels must agree.
    const { m, b } = linearRegression(points.map((p) => [p.x, p.y])); // simple-statistics
    expect(line.y1).toBeCloseTo(m * line.x1 + b, 6);
    expect(line.y2).toBeCloseTo(m * line.x2 + b, 6);
  });

  it("minimum zone: the line is the centre of the narrowest band, which touches the readings", () => {
    const { line, points, edges } = plotted("minimum-zone");
    expect(edges).toHaveLength(2);
    for (const x of [line.x1, line.x2]) {
      expect(yAt(line, x)).toBeCloseTo((yAt(edges[0]!, x) + yAt(edges[1]!, x)) / 2, 6);
    }
    // Every reading lies within the band and each edge touches one (worked example, GEOMETRY.md: zone of 6 µm).
    for (const edge of edges) {
      const gaps = points.map((p) => Math.abs(p.y - yAt(edge, p.x)));
      expect(Math.min(...gaps)).toBeCloseTo(0, 6);
    }
  });

  it("end points and least squares are not drawn at the middle of the band", () => {
    for (const reference of ["end-points", "least-squares"] as const) {
      const { line, edges } = plotted(reference);
      const middle = (yAt(edges[0]!, line.x1) + yAt(edges[1]!, line.x1)) / 2;
      expect(Math.abs(line.y1 - middle)).toBeGreaterThan(1);
    }
  });
});
