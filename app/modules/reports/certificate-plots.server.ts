// Plots for the PDF certificate, drawn as vector paths with pdfkit from what the geometry engine returned:
// the straightness band about the reference line where the engine placed it, mandrel readings at 0° and 180°,
// run-out around a revolution, a surface's heights above its reference plane as a colour map, and an axis's
// positioning deviations (mean ± 2s per direction). One maker per measurement kind: a new kind adds its
// maker to PLOT_MAKERS and the certificate draws it, nothing else changes.
import { positioningAccuracy, straightnessReferenceLine, type MeasurementKind, type PositioningEvaluation, type TestMeasurement, type TestResult } from "~/geometry";
import { MILLIMETRES_PER_INCH, type DisplayUnits } from "~/modules/units/format";
import type { ReportContent } from "./content";

const ink = "#17212b";
const muted = "#4b5d6c";
const grid = "#e3e7ea";
const axis = "#9aa7b2";
const brass = "#9a6512";
const withinSoft = "#d8eedf";
const beyond = "#b3261e";
const forwardColour = "#1f5f99";
const reverseColour = "#9a6512";

const MICROMETRES_PER_INCH = 25_400;

/** A plot ready to draw: its height is known before drawing, so the certificate can keep it on one page. */
export interface PdfPlot {
  code: string;
  title: string;
  /** Height of the drawing, pt (the title and caption lines come on top of it). */
  height: number;
  /** Half-width plots are set two to a row. */
  span: "full" | "half";
  caption: string;
  draw(doc: PDFKit.PDFDocument, box: { x: number; y: number; width: number }): void;
}

export interface PlotInput {
  code: string;
  title: string;
  measurement: TestMeasurement;
  result: TestResult | null;
  units: DisplayUnits;
}

type PlotMaker = (input: PlotInput) => PdfPlot | null;

// ---------------------------------------------------------------------------------------------
// Units and axes
// ---------------------------------------------------------------------------------------------

/** A reading (µm) in the reader's units: µm, or inches; tilts (µm/m) stay as they are. */
function readingIn(units: DisplayUnits, unit: "µm" | "µm/m" = "µm") {
  if (unit === "µm/m") return { value: (micrometres: number) => micrometres, label: "µm/m" };
  return units === "inch" ? { value: (micrometres: number) => micrometres / MICROMETRES_PER_INCH, label: "in" } : { value: (micrometres: number) => micrometres, label: "µm" };
}

function stationIn(units: DisplayUnits) {
  return units === "inch" ? { value: (mm: number) => mm / MILLIMETRES_PER_INCH, label: "in" } : { value: (mm: number) => mm, label: "mm" };
}

function niceStep(span: number, count: number) {
  const raw = span / Math.max(count, 1);
  const power = 10 ** Math.floor(Math.log10(raw || 1));
  const step = [1, 2, 2.5, 5, 10].map((factor) => factor * power).find((candidate) => candidate >= raw * (1 - 1e-9));
  return step ?? 10 * power;
}

/** Round tick values over [min, max] and the decimals that print them without noise. */
export function ticks(min: number, max: number, count = 5): { values: number[]; decimals: number } {
  const step = niceStep(max - min || Math.abs(max) || 1, count);
  const values: number[] = [];
  for (let value = Math.ceil(min / step - 1e-9) * step; value <= max + step * 1e-9; value += step) values.push(Number(value.toPrecision(12)));
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9) + (String(Number((step / 10 ** Math.floor(Math.log10(step))).toFixed(6))).includes(".") ? 1 : 0));
  return { values, decimals };
}

/** Text that suits the PDF's Latin font: a true minus sign for negative numbers. */
export function tickLabel(value: number, decimals: number) {
  const text = Math.abs(value).toFixed(decimals);
  return Number(text) === 0 ? Number(0).toFixed(decimals) : value < 0 ? `\u2212${text}` : text;
}

function linear(domain: [number, number], range: [number, number]) {
  const span = domain[1] - domain[0] || 1;
  return (value: number) => range[0] + ((value - domain[0]) / span) * (range[1] - range[0]);
}

function padded(values: number[], fraction = 0.12): [number, number] {
  const min = Math.min(...values);
  const max = Math.max(...values);
  const pad = (max - min) * fraction || Math.abs(max) * 0.5 || 1;
  return [min - pad, max + pad];
}

const PAD = { left: 46, right: 10, top: 8, bottom: 26 };

interface Frame {
  x: (value: number) => number;
  y: (value: number) => number;
  left: number;
  right: number;
  top: number;
  bottom: number;
}

/** Grid, ticks and axis titles; returns the scales of the plotting area. */
function frame(
  doc: PDFKit.PDFDocument,
  box: { x: number; y: number; width: number; height: number },
  options: { xDomain: [number, number]; yDomain: [number, number]; xTitle: string; yTitle: string; xTicks?: boolean },
): Frame {
  const left = box.x + PAD.left;
  const right = box.x + box.width - PAD.right;
  const top = box.y + PAD.top;
  const bottom = box.y + box.height - PAD.bottom;
  const x = linear(options.xDomain, [left, right]);
  const y = linear(options.yDomain, [bottom, top]);
  doc.save();
  doc.font("regular").fontSize(6.5).fillColor(muted);
  const yTicks = ticks(options.yDomain[0], options.yDomain[1], 4);
  for (const value of yTicks.values) {
    doc.moveTo(left, y(value)).lineTo(right, y(value)).lineWidth(value === 0 ? 0.8 : 0.4).strokeColor(value === 0 ? axis : grid).stroke();
    doc.text(tickLabel(value, yTicks.decimals), box.x, y(value) - 3, { width: PAD.left - 4, align: "right", lineBreak: false });
  }
  if (options.xTicks !== false) {
    const xTicks = ticks(options.xDomain[0], options.xDomain[1], 6);
    for (const value of xTicks.values) {
      doc.moveTo(x(value), bottom).lineTo(x(value), bottom + 3).lineWidth(0.5).strokeColor(axis).stroke();
      doc.text(tickLabel(value, xTicks.decimals), x(value) - 20, bottom + 5, { width: 40, align: "center", lineBreak: false });
    }
  }
  doc.moveTo(left, top).lineTo(left, bottom).lineTo(right, bottom).lineWidth(0.6).strokeColor(axis).stroke();
  doc.text(options.xTitle, left, bottom + 15, { width: right - left, align: "center", lineBreak: false });
  doc.rotate(-90, { origin: [box.x + 5, (top + bottom) / 2] });
  doc.text(options.yTitle, box.x + 5 - 60, (top + bottom) / 2 - 3, { width: 120, align: "center", lineBreak: false });
  doc.restore();
  return { x, y, left, right, top, bottom };
}

function marker(doc: PDFKit.PDFDocument, x: number, y: number, filled: boolean, colour = ink, radius = 2.2) {
  doc.circle(x, y, radius).lineWidth(0.9);
  if (filled) doc.fillAndStroke(colour, colour);
  else doc.fillAndStroke("#ffffff", colour);
}

const REFERENCE_NAMES: Record<string, string> = { "end-points": "end points", "least-squares": "least squares", "minimum-zone": "minimum zone" };

// ---------------------------------------------------------------------------------------------
// Straightness and other readings along a travel
// ---------------------------------------------------------------------------------------------

const alongTravel: PlotMaker = ({ code, title, measurement, result, units }) => {
  if (measurement.kind !== "profile" && measurement.kind !== "level") return null;
  if (measurement.points.length < 2) return null;
  const points = [...measurement.points].sort((a, b) => a.station - b.station);
  const unit = measurement.kind === "level" ? "µm/m" : "µm";
  const reading = readingIn(units, unit);
  const station = stationIn(units);
  const straightness = measurement.kind === "profile" ? result?.straightness : undefined;
  const tolerance = result?.tolerance ?? 0;
  const height = 130;
  const caption = straightness
    ? `Reference line by ${REFERENCE_NAMES[straightness.reference] ?? straightness.reference} (solid); dashed: the band holding the readings, its width the value; shaded: the tolerance band about the middle of the zone; shape ${straightness.shape}.`
    : unit === "µm/m"
      ? "Level tilts at each station."
      : "Readings at each station.";
  return {
    code,
    title,
    height,
    span: "full",
    caption,
    draw(doc, box) {
      const xs = points.map((point) => station.value(point.station));
      const ys = points.map((point) => reading.value(point.reading));
      const mid = straightness?.line;
      const placed = straightness ? straightnessReferenceLine(points.map((point) => ({ x: point.station, y: point.reading })), straightness.reference, straightness.line.slope) : undefined;
      const along = (line: { slope: number; intercept: number }, mm: number, offset = 0) => reading.value(line.slope * mm + line.intercept + offset);
      const first = points[0]!.station;
      const last = points.at(-1)!.station;
      if (mid && placed) for (const mm of [first, last]) ys.push(along(mid, mm, tolerance / 2), along(mid, mm, -tolerance / 2), along(placed, mm));
      const f = frame(doc, { ...box, height }, {
        xDomain: [Math.min(...xs), Math.max(...xs)],
        yDomain: padded(ys),
        xTitle: `Station (${station.label})`,
        yTitle: `Reading (${reading.label})`,
      });
      doc.save();
      doc.rect(f.left, f.top, f.right - f.left, f.bottom - f.top).clip();
      const px = (mm: number) => f.x(station.value(mm));
      if (mid && placed && result) {
        doc
          .polygon([px(first), f.y(along(mid, first, tolerance / 2))], [px(last), f.y(along(mid, last, tolerance / 2))], [px(last), f.y(along(mid, last, -tolerance / 2))], [px(first), f.y(along(mid, first, -tolerance / 2))])
          .fill(withinSoft);
        for (const offset of [result.value / 2, -result.value / 2]) {
          doc
            .moveTo(px(first), f.y(along(mid, first, offset)))
            .lineTo(px(last), f.y(along(mid, last, offset)))
            .dash(3, { space: 2 })
            .lineWidth(0.8)
            .strokeColor(result.pass ? ink : beyond)
            .stroke()
            .undash();
        }
        doc.moveTo(px(first), f.y(along(placed, first))).lineTo(px(last), f.y(along(placed, last))).lineWidth(1.3).strokeColor(brass).stroke();
      }
      points.forEach((point, i) => {
        const at: [number, number] = [px(point.station), f.y(reading.value(point.reading))];
        if (i === 0) doc.moveTo(...at);
        else doc.lineTo(...at);
      });
      doc.lineWidth(1).strokeColor(ink).stroke();
      for (const point of points) marker(doc, px(point.station), f.y(reading.value(point.reading)), false);
      doc.restore();
    },
  };
};

// ---------------------------------------------------------------------------------------------
// Mandrel at 0° and 180°
// ---------------------------------------------------------------------------------------------

const mandrel: PlotMaker = ({ code, title, measurement, result, units }) => {
  if (measurement.kind !== "mandrel") return null;
  const reading = readingIn(units);
  const near = [measurement.near.at0, measurement.near.at180].map(reading.value);
  const far = [measurement.far.at0, measurement.far.at180].map(reading.value);
  const meanNear = (near[0]! + near[1]!) / 2;
  const meanFar = (far[0]! + far[1]!) / 2;
  const height = 130;
  return {
    code,
    title,
    height,
    span: "half",
    caption: "Filled: spindle at 0°; open: turned through 180°. The line joins the means near the nose and at the far end; its rise is the value.",
    draw(doc, box) {
      const f = frame(doc, { ...box, height }, { xDomain: [0, 1], yDomain: padded([...near, ...far, 0], 0.25), xTitle: "Along the mandrel", yTitle: `Reading (${reading.label})`, xTicks: false });
      const xNear = f.x(0.18);
      const xFar = f.x(0.82);
      doc.save();
      doc.font("regular").fontSize(6.5).fillColor(muted);
      doc.text("near the nose", xNear - 40, f.bottom + 5, { width: 80, align: "center", lineBreak: false });
      doc.text("far end", xFar - 40, f.bottom + 5, { width: 80, align: "center", lineBreak: false });
      doc.moveTo(xNear, f.y(meanNear)).lineTo(xFar, f.y(meanFar)).lineWidth(1.4).strokeColor(result && !result.direction.pass ? beyond : brass).stroke();
      for (const [x, values] of [
        [xNear, near],
        [xFar, far],
      ] as const) {
        doc.moveTo(x, f.y(values[0]!)).lineTo(x, f.y(values[1]!)).dash(1.5, { space: 2 }).lineWidth(0.6).strokeColor(muted).stroke().undash();
        marker(doc, x - 5, f.y(values[0]!), true, ink, 2.6);
        marker(doc, x + 5, f.y(values[1]!), false, ink, 2.6);
        doc.fillColor(muted).text("0°", x - 30, f.y(values[0]!) - 3, { width: 20, align: "right", lineBreak: false });
        doc.fillColor(muted).text("180°", x + 10, f.y(values[1]!) - 3, { width: 24, lineBreak: false });
      }
      doc.restore();
    },
  };
};

// ---------------------------------------------------------------------------------------------
// Run-out around a revolution
// ---------------------------------------------------------------------------------------------

const runOut: PlotMaker = ({ code, title, measurement, units }) => {
  if (measurement.kind !== "sweep" && measurement.kind !== "extremes") return null;
  const reading = readingIn(units);
  const readings = measurement.kind === "sweep" ? measurement.readings : [measurement.max, measurement.min];
  const min = Math.min(...readings);
  const max = Math.max(...readings);
  const height = 110;
  const decimals = units === "inch" ? 5 : 1;
  return {
    code,
    title,
    height,
    span: "half",
    caption:
      measurement.kind === "sweep"
        ? `${readings.length} readings over a revolution; inner ring the lowest (${tickLabel(reading.value(min), decimals)} ${reading.label}), outer ring the highest (${tickLabel(reading.value(max), decimals)} ${reading.label}); the spread between them is the run-out.`
        : `Highest and lowest reading over a revolution (${tickLabel(reading.value(max), decimals)} and ${tickLabel(reading.value(min), decimals)} ${reading.label}); the spread between them is the run-out.`,
    draw(doc, box) {
      const cx = box.x + 60;
      const cy = box.y + height / 2;
      const inner = 24;
      const outer = 48;
      const span = max - min || 1;
      const radius = (value: number) => inner + ((value - min) / span) * (outer - inner);
      doc.save();
      doc.circle(cx, cy, inner).lineWidth(0.8).strokeColor(grid).stroke();
      doc.circle(cx, cy, outer).lineWidth(0.8).strokeColor(grid).stroke();
      if (measurement.kind === "sweep") {
        const points = readings.map((value, i) => {
          const angle = (i / readings.length) * 2 * Math.PI - Math.PI / 2;
          return [cx + radius(value) * Math.cos(angle), cy + radius(value) * Math.sin(angle)] as [number, number];
        });
        doc.polygon(...points).lineWidth(1).fillAndStroke(withinSoft, ink);
        for (const [x, y] of points) marker(doc, x, y, false, ink, 1.8);
      } else {
        doc.moveTo(cx, cy - inner).lineTo(cx, cy - outer).lineWidth(4).lineCap("round").strokeColor(ink).stroke();
      }
      doc.font("bold").fontSize(7).fillColor(ink).text(`${tickLabel(reading.value(max - min), decimals)} ${reading.label}`, cx - 30, cy - 3, { width: 60, align: "center", lineBreak: false });
      doc.restore();
    },
  };
};

// ---------------------------------------------------------------------------------------------
// Flatness: heights above the reference plane as a colour map
// ---------------------------------------------------------------------------------------------

const BELOW = [61, 111, 168] as const;
const LEVEL = [244, 241, 234] as const;
const ABOVE = [184, 116, 26] as const;

/** A diverging colour for a height: blue below the plane, pale at it, brass above. */
export function heightColour(value: number, limit: number): string {
  const t = limit > 0 ? Math.max(-1, Math.min(1, value / limit)) : 0;
  const [from, to, k] = t < 0 ? [LEVEL, BELOW, -t] : [LEVEL, ABOVE, t];
  const mix = from.map((channel, i) => Math.round(channel + (to[i]! - channel) * k));
  return `#${mix.map((channel) => channel.toString(16).padStart(2, "0")).join("")}`;
}

const surface: PlotMaker = ({ code, title, measurement, result, units }) => {
  if (measurement.kind !== "surface" || !result?.flatness || measurement.points.length < 3) return null;
  const { plane, reference } = result.flatness;
  const heights = measurement.points.map((point) => ({ x: point.x, y: point.y, h: point.z - (plane.slopeX * point.x + plane.slopeY * point.y + plane.offset) }));
  const reading = readingIn(units);
  const station = stationIn(units);
  const limit = Math.max(...heights.map((point) => Math.abs(point.h)), 1e-9);
  const xs = [...new Set(heights.map((point) => point.x))].sort((a, b) => a - b);
  const ys = [...new Set(heights.map((point) => point.y))].sort((a, b) => a - b);
  const regular = xs.length * ys.length === heights.length && xs.length > 1 && ys.length > 1;
  const height = 170;
  const decimals = units === "inch" ? 5 : 1;
  const width = `${tickLabel(reading.value(result.value), decimals)} ${reading.label}`;
  return {
    code,
    title,
    height,
    span: "full",
    caption: `Heights above the ${reference === "minimum-zone" ? "middle plane of the minimum zone" : "least-squares plane"}: brass above, blue below, pale at the plane. ${reference === "minimum-zone" ? "Minimum-zone" : "Least-squares zone"} width ${width}.`,
    draw(doc, box) {
      const mapWidth = Math.min(box.width - 120, 330);
      const mapHeight = height - 24;
      const spanX = xs.at(-1)! - xs[0]! || 1;
      const spanY = ys.at(-1)! - ys[0]! || 1;
      const scale = Math.min(mapWidth / spanX, mapHeight / spanY);
      const ox = box.x + 30;
      const oy = box.y + 4;
      const at = (x: number, y: number): [number, number] => [ox + (x - xs[0]!) * scale, oy + (ys.at(-1)! - y) * scale];
      doc.save();
      if (regular) {
        // Each reading colours the cell around it, half-way to its neighbours.
        const edges = (values: number[]) => values.map((value, i) => [i === 0 ? value : (values[i - 1]! + value) / 2, i === values.length - 1 ? value : (value + values[i + 1]!) / 2] as const);
        const xEdges = new Map(xs.map((value, i) => [value, edges(xs)[i]!]));
        const yEdges = new Map(ys.map((value, i) => [value, edges(ys)[i]!]));
        for (const point of heights) {
          const [x0, x1] = xEdges.get(point.x)!;
          const [y0, y1] = yEdges.get(point.y)!;
          const [left, top] = at(x0, y1);
          const [right, bottom] = at(x1, y0);
          doc.rect(left, top, Math.max(right - left, 0.5), Math.max(bottom - top, 0.5)).fill(heightColour(point.h, limit));
        }
      }
      const [frameLeft, frameTop] = at(xs[0]!, ys.at(-1)!);
      const [frameRight, frameBottom] = at(xs.at(-1)!, ys[0]!);
      doc.rect(frameLeft, frameTop, frameRight - frameLeft, frameBottom - frameTop).lineWidth(0.6).strokeColor(axis).stroke();
      for (const point of heights) {
        const [x, y] = at(point.x, point.y);
        doc.circle(x, y, regular ? 1.1 : 3.2).lineWidth(0.5).fillAndStroke(heightColour(point.h, limit), muted);
      }
      doc.font("regular").fontSize(6.5).fillColor(muted);
      doc.text(`${tickLabel(station.value(xs[0]!), units === "inch" ? 1 : 0)}`, frameLeft - 10, frameBottom + 3, { width: 20, align: "center", lineBreak: false });
      doc.text(`${tickLabel(station.value(xs.at(-1)!), units === "inch" ? 1 : 0)} ${station.label}`, frameRight - 30, frameBottom + 3, { width: 60, align: "center", lineBreak: false });
      doc.text(`${tickLabel(station.value(ys.at(-1)!), units === "inch" ? 1 : 0)}`, frameLeft - 30, frameTop - 3, { width: 26, align: "right", lineBreak: false });
      doc.text(`${tickLabel(station.value(ys[0]!), units === "inch" ? 1 : 0)}`, frameLeft - 30, frameBottom - 3, { width: 26, align: "right", lineBreak: false });
      // The colour key: the full scale, ends labelled with the highest and lowest height.
      const keyX = Math.max(frameRight + 24, box.x + mapWidth + 50);
      const keyTop = oy;
      const keyHeight = mapHeight;
      const steps = 24;
      for (let i = 0; i < steps; i += 1) {
        const value = limit - ((i + 0.5) / steps) * 2 * limit;
        doc.rect(keyX, keyTop + (i * keyHeight) / steps, 10, keyHeight / steps + 0.3).fill(heightColour(value, limit));
      }
      doc.rect(keyX, keyTop, 10, keyHeight).lineWidth(0.5).strokeColor(axis).stroke();
      const highest = Math.max(...heights.map((point) => point.h));
      const lowest = Math.min(...heights.map((point) => point.h));
      doc.fillColor(muted);
      doc.text(`+${tickLabel(reading.value(limit), decimals)}`, keyX + 14, keyTop - 3, { width: 60, lineBreak: false });
      doc.text("0 (plane)", keyX + 14, keyTop + keyHeight / 2 - 3, { width: 60, lineBreak: false });
      doc.text(`\u2212${tickLabel(reading.value(limit), decimals)} ${reading.label}`, keyX + 14, keyTop + keyHeight - 3, { width: 70, lineBreak: false });
      doc.font("bold").fontSize(7).fillColor(ink).text(`Zone width ${width}`, keyX - 4, keyTop + keyHeight + 6, { width: 110, lineBreak: false });
      doc.font("regular").fontSize(6.5).fillColor(muted).text(`highest ${tickLabel(reading.value(highest), decimals)}, lowest ${tickLabel(reading.value(lowest), decimals)}`, keyX - 4, keyTop + keyHeight + 15, { width: 130, lineBreak: false });
      doc.restore();
    },
  };
};

// ---------------------------------------------------------------------------------------------
// Positioning (ISO 230-2's figures)
// ---------------------------------------------------------------------------------------------

/** Mean deviation ± 2s along the travel for both directions of approach, with A, R, B and E stated. */
export function positioningPlot(code: string, title: string, evaluation: PositioningEvaluation, units: DisplayUnits): PdfPlot {
  const reading = readingIn(units);
  const station = stationIn(units);
  const decimals = units === "inch" ? 5 : 1;
  const figure = (micrometres: number) => `${tickLabel(reading.value(micrometres), decimals)} ${reading.label}`;
  const height = 160;
  return {
    code,
    title,
    height,
    span: "full",
    caption: `Blue: approaching in the positive direction; brass: in the negative direction. Solid: mean deviation at each target; dashed: mean ± 2s. Accuracy A ${figure(evaluation.accuracy)}, repeatability R ${figure(evaluation.repeatability)}, reversal value B ${figure(evaluation.reversalValue)}, systematic deviation E ${figure(evaluation.systematicDeviation)} (ISO 230-2's figures).`,
    draw(doc, box) {
      const targets = evaluation.perTarget;
      const xs = targets.map((target) => station.value(target.target));
      const ys = targets.flatMap((target) => [target.meanForward + 2 * target.sForward, target.meanForward - 2 * target.sForward, target.meanReverse + 2 * target.sReverse, target.meanReverse - 2 * target.sReverse]).map(reading.value);
      const f = frame(doc, { ...box, width: box.width - 110, height }, { xDomain: [Math.min(...xs), Math.max(...xs)], yDomain: padded([...ys, 0]), xTitle: `Target position (${station.label})`, yTitle: `Deviation (${reading.label})` });
      const line = (values: number[], colour: string, dashed: boolean) => {
        values.forEach((value, i) => {
          const at: [number, number] = [f.x(xs[i]!), f.y(reading.value(value))];
          if (i === 0) doc.moveTo(...at);
          else doc.lineTo(...at);
        });
        if (dashed) doc.dash(2.5, { space: 2 });
        doc.lineWidth(dashed ? 0.7 : 1.2).strokeColor(colour).stroke();
        if (dashed) doc.undash();
      };
      doc.save();
      for (const [mean, s, colour] of [
        ["meanForward", "sForward", forwardColour],
        ["meanReverse", "sReverse", reverseColour],
      ] as const) {
        line(
          targets.map((target) => target[mean]),
          colour,
          false,
        );
        line(
          targets.map((target) => target[mean] + 2 * target[s]),
          colour,
          true,
        );
        line(
          targets.map((target) => target[mean] - 2 * target[s]),
          colour,
          true,
        );
        targets.forEach((target, i) => marker(doc, f.x(xs[i]!), f.y(reading.value(target[mean])), colour === forwardColour, colour, 1.8));
      }
      const keyX = box.x + box.width - 100;
      let keyY = box.y + 10;
      for (const [label, value] of [
        ["A accuracy", evaluation.accuracy],
        ["R repeatability", evaluation.repeatability],
        ["B reversal value", evaluation.reversalValue],
        ["E systematic dev.", evaluation.systematicDeviation],
      ] as const) {
        doc.font("regular").fontSize(6.5).fillColor(muted).text(label, keyX, keyY, { width: 100, lineBreak: false });
        doc.font("bold").fontSize(8).fillColor(ink).text(figure(value), keyX, keyY + 8, { width: 100, lineBreak: false });
        keyY += 26;
      }
      doc.restore();
    },
  };
}

/** Repeated runs of an axis: `{ targets, forward, reverse }` as positioning.ts reads them. */
function positioningRuns(measurement: unknown): { targets: number[]; forward: number[][]; reverse: number[][] } | null {
  if (!measurement || typeof measurement !== "object") return null;
  const { targets, forward, reverse } = measurement as Record<string, unknown>;
  return Array.isArray(targets) && Array.isArray(forward) && Array.isArray(reverse) ? { targets, forward, reverse } as never : null;
}

const positioning: PlotMaker = ({ code, title, measurement, units }) => {
  const runs = positioningRuns(measurement);
  if (!runs) return null;
  try {
    return positioningPlot(code, title, positioningAccuracy(runs), units);
  } catch {
    return null;
  }
};

// ---------------------------------------------------------------------------------------------
// The registry
// ---------------------------------------------------------------------------------------------

/**
 * The maker for each measurement kind that has a plot. Keyed by name rather than by the engine's type so a
 * kind the report form learns later (positioning runs of a numerically controlled axis) is drawn as soon as
 * reports carry it.
 */
export const PLOT_MAKERS: Readonly<Partial<Record<MeasurementKind | "positioning", PlotMaker>>> = {
  profile: alongTravel,
  level: alongTravel,
  mandrel,
  sweep: runOut,
  extremes: runOut,
  surface,
  positioning,
};

/** Every plot a report's signed content has, in the order of its results. */
export function plotsOfReport(content: Pick<ReportContent, "measurements" | "score">, units: DisplayUnits): PdfPlot[] {
  const results = new Map(content.score.results.map((result) => [result.code, result]));
  const plots: PdfPlot[] = [];
  const codes = [...content.score.results.map((result) => result.code), ...Object.keys(content.measurements.tests).filter((code) => !results.has(code))];
  // An axis's A, R and B come from one set of runs: its plot is drawn once, for the first of its tests.
  const axesDrawn = new Set<string>();
  for (const code of codes) {
    const measurement = content.measurements.tests[code];
    if (!measurement) continue;
    if (measurement.kind === "positioning") {
      const axis = code.replace(/-[^-]*$/, "");
      if (axesDrawn.has(axis)) continue;
      axesDrawn.add(axis);
    }
    const make = PLOT_MAKERS[measurement.kind as MeasurementKind | "positioning"];
    const result = results.get(code) ?? null;
    const plot = make?.({ code, title: result?.title ?? code, measurement, result, units });
    if (plot) plots.push(plot);
  }
  return plots;
}
