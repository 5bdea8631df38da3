// Invented interferometer runs of one numerically controlled axis for the demo and the tests: a ball screw's
// pitch error growing along the travel, a slow wave from its thread, lost motion between the two directions
// of approach, a little warming from run to run and the scatter of each reading. Seeded, so it reads the same
// every time; scaled so the axis's worst figure (A, R or B against its tolerance) is a chosen share of it.
import { positioningAccuracy } from "~/geometry";
import { seededRandom } from "./random";

export type DemoAxisRuns = { targets: number[]; forward: number[][]; reverse: number[][] };

export type DemoAxis = {
  /** First to last target, mm. */
  travel: number;
  /** Targets over the travel (ISO 230-2 asks for at least 5; acceptance tests often take 11 or more). */
  targets: number;
  /** Runs each way (the standard's usual 5). */
  runs: number;
  seed: number;
  /** The largest of A/tolerance, R/tolerance and B/tolerance the runs come out at (before rounding to 0.1 µm). */
  ratio: number;
  tolerances: { accuracy: number; repeatability: number; reversal: number };
};

const tenth = (value: number) => Math.round(value * 10) / 10;

/** Runs in mm (targets) and µm (deviations), each deviation to 0.1 µm as an interferometer's table gives it. */
export function demoAxisRuns(axis: DemoAxis): DemoAxisRuns {
  const random = seededRandom(axis.seed);
  const between = (low: number, high: number) => low + (high - low) * random();
  // Targets at irregular spacing, as the standard advises, so that a periodic error is not sampled in step.
  const spacing = axis.travel / (axis.targets - 1);
  const targets = Array.from({ length: axis.targets }, (_, i) => (i === 0 || i === axis.targets - 1 ? (axis.travel * i) / (axis.targets - 1) : Math.round(spacing * i + between(-0.15, 0.15) * spacing) + Math.round(between(0, 9)) / 10));
  const pitch = between(-0.012, 0.012); // µm per mm
  const wave = between(0.8, 2.2);
  const period = axis.travel / between(2.5, 4.5);
  const phase = between(0, 2 * Math.PI);
  const lostMotion = between(1.5, 4);
  const scatter = between(0.3, 0.7);
  const warming = between(0, 0.25); // µm per run, growing with the distance from the start
  const gauss = () => {
    const u = Math.max(random(), 1e-12);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
  };
  const run = (j: number, sign: 1 | -1) =>
    targets.map((target) => pitch * target + wave * Math.sin((2 * Math.PI * target) / period + phase) + (sign * lostMotion) / 2 + warming * j * (target / axis.travel) + scatter * gauss());
  const raw = {
    targets,
    forward: Array.from({ length: axis.runs }, (_, j) => run(j, 1)),
    reverse: Array.from({ length: axis.runs }, (_, j) => run(j, -1)),
  };
  const figures = positioningAccuracy(raw);
  const worst = Math.max(figures.accuracy / axis.tolerances.accuracy, figures.repeatability / axis.tolerances.repeatability, figures.reversalValue / axis.tolerances.reversal);
  const scale = axis.ratio / worst;
  return {
    targets,
    forward: raw.forward.map((values) => values.map((value) => tenth(value * scale))),
    reverse: raw.reverse.map((values) => values.map((value) => tenth(value * scale))),
  };
}

/** The runs as an instrument's export might write them: one line per reading, run, direction, target, deviation. */
export function deviationTable(runs: DemoAxisRuns, options: { decimalComma?: boolean; header?: boolean } = {}): string {
  const separator = options.decimalComma ? ";" : ",";
  const number = (value: number) => (options.decimalComma ? String(value).replace(".", ",") : String(value));
  const lines = options.header === false ? [] : [["run", "direction", "target_mm", "deviation_um"].join(separator)];
  for (const [direction, sign] of [
    ["forward", "+"],
    ["reverse", "-"],
  ] as const) {
    runs[direction].forEach((values, j) => {
      // A reverse run is read from the far end back, as the machine moves.
      const order = runs.targets.map((_, i) => i);
      if (direction === "reverse") order.reverse();
      for (const i of order) lines.push([String(j + 1), sign, number(runs.targets[i]!), number(values[i]!)].join(separator));
    });
  }
  return lines.join("\n");
}
