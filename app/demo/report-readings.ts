// Invented readings for the demo reports: for each test of a profile, indicator readings that give a chosen
// ratio of value to tolerance, quantised to the instrument's resolution, with a seeded jitter so that no two
// machines read alike. Pure: the seed and the unit tests both use it, and both check the grade it scores to.
import {
  BUILT_IN_PROFILES,
  flatnessDeviation,
  newestVersions,
  KINDS_FOR_METHOD,
  scoreReport,
  toleranceAt,
  toMetric,
  type Grade,
  type ProfileTest,
  type ReportMeasurements,
  type ReportScore,
  type TestMeasurement,
  type ToleranceProfile,
} from "~/geometry";
import type { EntryUnits, TestEntry } from "~/modules/reports/form";
import { gridFromPoints } from "~/modules/reports/grid-entry";
import { demoAxisRuns } from "./positioning-runs";
import { seededRandom } from "./random";

const MICROMETRES_PER_INCH = 25_400;
const MILLIMETRES_PER_INCH = 25.4;

export { seededRandom };

export type DemoMachine = {
  profileKey: string;
  units: EntryUnits;
  /** Carriage travel read for the bed and carriage tests, in the entry's length unit (mm or in). */
  travel: number;
  /** Cross-slide travel read for squareness, in the entry's length unit. */
  crossTravel: number;
  /** A mill's or grinder's table (or chuck), length × width in the entry's length unit, read as a grid for flatness. */
  table?: { length: number; width: number };
  /** The indicator's smallest step, in the entry's reading unit (µm or in). */
  indicatorResolution: number;
  /** The level's smallest step, µm/m. */
  levelResolution: number;
  /** The step of the bed's height profile, when finer than the indicator's (worked out from the level). */
  bedResolution?: number;
  /** Ratios (value / tolerance) for the rest of the tests are drawn from this band. */
  band: [number, number];
  /**
   * Chosen ratios per test code. Negative means the wrong way: a mandrel or sleeve leaning against its allowed
   * direction, a centre low, a cross-slide convex, a bed dipped (concave) where it may only be convex.
   */
  ratios?: Record<string, number>;
  /** Required tests that could not be read (the report is then incomplete). */
  omit?: string[];
  /** Optional tests that were read as well. */
  optional?: string[];
  /** A CNC machine's axes by their tests' prefix (C-X, V-Y…): travel read (mm) and targets over it. */
  axes?: Record<string, { travel: number; targets: number }>;
  seed: number;
};

export type DemoReadings = {
  profile: ToleranceProfile;
  /** In the entry's units, as the inspector typed them (the engine's types). */
  measurements: Record<string, TestMeasurement>;
};

type Scale = { reading: number; station: number };

function scaleOf(units: EntryUnits): Scale {
  // µm per reading unit and mm per station unit.
  return units === "inch" ? { reading: MICROMETRES_PER_INCH, station: MILLIMETRES_PER_INCH } : { reading: 1, station: 1 };
}

/** Readings for every test the machine's plan names, in the entry's units. */
export function demoReadings(machine: DemoMachine): DemoReadings {
  // The newest built-in version: the one the seeded database offers for new reports.
  const profile = newestVersions(BUILT_IN_PROFILES).find((candidate) => candidate.key === machine.profileKey);
  if (!profile) throw new Error(`demo readings: no profile ${machine.profileKey}`);
  const random = seededRandom(machine.seed);
  const between = (low: number, high: number) => low + (high - low) * random();
  const whole = (low: number, high: number) => Math.floor(between(low, high + 1));
  const scale = scaleOf(machine.units);
  const step = machine.indicatorResolution;
  const stepUm = step * scale.reading;
  // Readings are whole counts of the indicator's step, written in the entry's unit.
  const reading = (counts: number) => round(counts * step);
  const countsFor = (micrometres: number) => Math.round(micrometres / stepUm);
  const stations = (travel: number, intervals: number) => Array.from({ length: intervals + 1 }, (_, i) => round((travel * i) / intervals));

  const measurements: Record<string, TestMeasurement> = {};
  // The tests of one axis share one set of runs, drawn once per axis.
  const axisRuns = new Map<string, Extract<TestMeasurement, { kind: "positioning" }>>();
  const positioningOf = (test: ProfileTest, ratio: number) => {
    const prefix = test.code.replace(/-[^-]*$/, "");
    const cached = axisRuns.get(prefix);
    if (cached) return cached;
    const axis = machine.axes?.[prefix];
    if (!axis) throw new Error(`demo readings: no travel for the axis ${prefix}`);
    const toleranceOf = (method: ProfileTest["method"]) => {
      const sibling = profile.tests.find((candidate) => candidate.code.startsWith(`${prefix}-`) && candidate.method === method)!;
      return toleranceAt(sibling.tolerance, axis.travel, null, profile.rules);
    };
    const runs = demoAxisRuns({
      ...axis,
      runs: 5,
      seed: machine.seed + prefix.charCodeAt(prefix.length - 1),
      ratio: machine.ratios?.[prefix] ?? Math.abs(ratio),
      tolerances: { accuracy: toleranceOf("positioning-accuracy"), repeatability: toleranceOf("positioning-repeatability"), reversal: toleranceOf("positioning-reversal") },
    });
    const inEntryUnits: Extract<TestMeasurement, { kind: "positioning" }> =
      machine.units === "inch"
        ? {
            kind: "positioning",
            targets: runs.targets.map((target) => round(target / MILLIMETRES_PER_INCH)),
            forward: runs.forward.map((run) => run.map((value) => round(value / MICROMETRES_PER_INCH))),
            reverse: runs.reverse.map((run) => run.map((value) => round(value / MICROMETRES_PER_INCH))),
          }
        : { kind: "positioning", ...runs };
    axisRuns.set(prefix, inEntryUnits);
    return inEntryUnits;
  };
  const wanted = profile.tests.filter((test) => (test.required ? !machine.omit?.includes(test.code) : machine.optional?.includes(test.code)));
  for (const test of wanted) {
    const ratio = machine.ratios?.[test.code] ?? between(...machine.band);
    const kind = KINDS_FOR_METHOD[test.method];
    const lengthMm = (travel: number) => travel * scale.station;
    switch (test.method) {
      case "positioning-accuracy":
      case "positioning-repeatability":
      case "positioning-reversal":
        measurements[test.code] = positioningOf(test, ratio);
        break;
      case "run-out": {
        const tolerance = toleranceAt(test.tolerance, null, test.measuringLength.nominal, profile.rules);
        const value = Math.max(1, countsFor(Math.abs(ratio) * tolerance));
        const zero = -whole(0, Math.ceil(value / 2));
        if (kind.includes("sweep") && (test.code === "L-SP-NOSE" || test.code === "L-P-ROUND" || test.code === "L-FP-CAM")) {
          // Eight positions round one revolution: a once-per-turn wave, its high and low point read exactly.
          const phase = whole(0, 7);
          const readings = Array.from({ length: 8 }, (_, i) => {
            const at = (i - phase + 8) % 8;
            if (at === 0) return value;
            if (at === 4) return 0;
            return Math.min(value, Math.max(0, Math.round((value / 2) * (1 + Math.cos((Math.PI * at) / 4)) + between(-0.4, 0.4))));
          });
          measurements[test.code] = { kind: "sweep", readings: readings.map((counts) => reading(counts + zero)) };
        } else {
          measurements[test.code] = { kind: "extremes", max: reading(value + zero), min: reading(zero) };
        }
        break;
      }
      case "straightness": {
        const travel = machine.travel;
        const bedStep = machine.bedResolution ?? step;
        const bedStepUm = bedStep * scale.reading;
        const tolerance = toleranceAt(test.tolerance, lengthMm(travel), null, profile.rules);
        const xs = stations(travel, 10);
        // A straight line the level would show anyway (the bed is never set dead level), plus the shape.
        const tiltUmPerMm = between(-0.012, 0.012);
        const height = Math.max(1, Math.round((Math.abs(ratio) * tolerance) / bedStepUm) - 1);
        const sign = test.direction.allowed === "convex" ? Math.sign(ratio) || 1 : random() < 0.5 ? -1 : 1;
        const points = xs.map((x, i) => {
          const s = i / (xs.length - 1);
          // Convex: a crown in the middle. A negative ratio: a dip worn in the first third, near the chuck.
          const shape = sign > 0 ? 4 * s * (1 - s) : -Math.exp(-(((s - 0.3) / 0.16) ** 2));
          const jitter = i === 0 || i === xs.length - 1 ? 0 : sign > 0 ? whole(0, 1) : -whole(0, 1);
          const tiltCounts = (tiltUmPerMm * x * scale.station) / bedStepUm;
          return { station: x, reading: round((Math.round(tiltCounts) + Math.round(height * shape) + jitter) * bedStep) };
        });
        measurements[test.code] = { kind: "profile", points };
        break;
      }
      case "range-along": {
        // The top slide is read over its own short travel (about 100 mm, 4 in).
        const travel = test.code === "L-TOP-PAR" ? (machine.units === "inch" ? 4 : 100) : machine.travel;
        const tolerance = toleranceAt(test.tolerance, lengthMm(travel), test.measuringLength.nominal, profile.rules);
        const value = Math.max(1, countsFor(Math.abs(ratio) * tolerance));
        const xs = stations(travel, 4);
        const points = xs.map((x, i) => ({ station: x, reading: reading(i === xs.length - 1 ? value : Math.round((value * i) / (xs.length - 1))) }));
        measurements[test.code] = { kind: "profile", points };
        break;
      }
      case "squareness": {
        const travel = machine.crossTravel;
        const tolerance = toleranceAt(test.tolerance, lengthMm(travel), test.measuringLength.nominal, profile.rules);
        const value = Math.sign(ratio || 1) * Math.max(1, countsFor(Math.abs(ratio) * tolerance));
        const xs = stations(travel, 6);
        // A straight travel, off square by `value` over its length; the least-squares slope reads it back.
        const points = xs.map((x, i) => ({ station: x, reading: reading(Math.round((value * i) / (xs.length - 1))) }));
        measurements[test.code] = { kind: "profile", points };
        break;
      }
      case "level-range": {
        const tolerance = toleranceAt(test.tolerance, null, test.measuringLength.nominal, profile.rules);
        const levelStep = machine.levelResolution;
        const value = Math.max(1, Math.round((Math.abs(ratio) * tolerance) / levelStep));
        const xs = stations(machine.travel, 4);
        const base = whole(-8, 8);
        const order = [0, Math.round(value * 0.4), value, Math.round(value * 0.7), Math.round(value * 0.2)];
        const points = xs.map((x, i) => ({ station: x, reading: round((base + order[i]!) * levelStep) }));
        measurements[test.code] = { kind: "level", points };
        break;
      }
      case "mandrel-inclination": {
        const tolerance = toleranceAt(test.tolerance, null, test.measuringLength.nominal, profile.rules);
        const lean = Math.sign(ratio || 1) * Math.max(1, countsFor(Math.abs(ratio) * tolerance));
        // The mandrel's own run-out shows at 0° and 180° and cancels in the mean (GEOMETRY.md).
        const nearRunOut = whole(1, 2);
        const farRunOut = nearRunOut + whole(0, 2);
        const zero = whole(-3, 3);
        measurements[test.code] = {
          kind: "mandrel",
          near: { at0: reading(zero + nearRunOut), at180: reading(zero - nearRunOut) },
          far: { at0: reading(zero + lean + farRunOut), at180: reading(zero + lean - farRunOut) },
        };
        break;
      }
      case "near-far": {
        const tolerance = toleranceAt(test.tolerance, null, test.measuringLength.nominal, profile.rules);
        const lean = Math.sign(ratio || 1) * Math.max(1, countsFor(Math.abs(ratio) * tolerance));
        const zero = whole(-2, 2);
        measurements[test.code] = { kind: "near-far", near: reading(zero), far: reading(zero + lean) };
        break;
      }
      case "centre-height": {
        const tolerance = toleranceAt(test.tolerance, null, test.measuringLength.nominal, profile.rules);
        const rise = Math.sign(ratio || 1) * Math.max(1, countsFor(Math.abs(ratio) * tolerance));
        const zero = whole(-2, 2);
        measurements[test.code] = { kind: "centre-height", headstockEnd: reading(zero), tailstockEnd: reading(zero + rise) };
        break;
      }
      case "flatness": {
        // A table worn hollow in the middle of its length (where the vice sits), with a little twist: read on a
        // grid of 4 rows × 7 columns, scaled so the minimum-zone width is the chosen share of the tolerance.
        const table = machine.table ?? { length: machine.travel, width: machine.crossTravel };
        const tolerance = toleranceAt(test.tolerance, lengthMm(table.length), test.measuringLength.nominal, profile.rules);
        const rows = 4;
        const columns = 7;
        const twist = between(-0.3, 0.3);
        const places = Array.from({ length: rows * columns }, (_, k) => {
          const s = (k % columns) / (columns - 1);
          const t = Math.floor(k / columns) / (rows - 1);
          return { s, t, x: round((table.length * (k % columns)) / (columns - 1)), y: round((table.width * Math.floor(k / columns)) / (rows - 1)) };
        });
        const shape = places.map(({ s, t }) => -4 * s * (1 - s) + twist * (s - 0.5) * (t - 0.5) + between(-0.05, 0.05));
        const unit = flatnessDeviation(places.map((p, k) => ({ x: p.x * scale.station, y: p.y * scale.station, z: shape[k]! })), "minimum-zone");
        const counts = (Math.abs(ratio) * tolerance) / stepUm / (unit || 1);
        measurements[test.code] = { kind: "surface", points: places.map((p, k) => ({ x: p.x, y: p.y, z: reading(Math.round(shape[k]! * counts)) })) };
        break;
      }
    }
  }
  return { profile, measurements };
}

function round(value: number) {
  // Clear of float noise (0.00002 × 3 = 0.00006000000000000001), to the tenth decimal.
  return Math.round(value * 1e10) / 1e10;
}

/** What the server will score: the readings in the engine's units, with each instrument's resolution. */
export function scoreDemoReadings(
  readings: DemoReadings,
  machine: Pick<DemoMachine, "units" | "indicatorResolution" | "levelResolution" | "bedResolution">,
  conditions: ReportMeasurements["conditions"],
): ReportScore {
  const tests: Record<string, TestMeasurement> = {};
  for (const [code, measurement] of Object.entries(readings.measurements)) {
    // The interferometer's table is to 0.1 µm, whatever indicator read the rest.
    const interferometer = machine.units === "inch" ? 0.000004 : 0.1;
    const resolution =
      measurement.kind === "positioning"
        ? interferometer
        : measurement.kind === "level"
          ? machine.levelResolution
          : code === "L-BED-V"
            ? (machine.bedResolution ?? machine.indicatorResolution)
            : machine.indicatorResolution;
    tests[code] = { ...measurement, resolution };
  }
  return scoreReport(readings.profile, toMetric({ tests, conditions }, machine.units));
}

/** Throws unless the readings score to the grade the demo says they do. */
export function expectDemoGrade(label: string, score: ReportScore, grade: Grade) {
  if (score.grade !== grade) {
    const worst = score.results.map((result) => `${result.code} ${result.ratio.toFixed(2)}${result.pass ? "" : " out"}`).join(", ");
    throw new Error(`demo report ${label} scores ${score.grade}, not ${grade} (${worst}; missing ${score.missing.join(", ") || "none"})`);
  }
}

const text = (value: number) => String(value);

/** One measurement as the entry form holds it: strings, in the entry's units. */
export function entryOf(measurement: TestMeasurement, instrumentId: string, notes = ""): Partial<TestEntry> & Pick<TestEntry, "kind"> {
  const base = { instrumentId, notes };
  switch (measurement.kind) {
    case "surface":
      return { ...base, kind: "surface", grid: gridFromPoints(measurement.points)! };
    case "positioning":
      return { ...base, kind: "positioning", runs: { targets: measurement.targets, forward: measurement.forward, reverse: measurement.reverse } };
    case "circular":
      return { ...base, kind: "circular", radial: { clockwise: measurement.clockwise, counterClockwise: measurement.counterClockwise } };
    case "sweep":
      return { ...base, kind: "sweep", readings: measurement.readings.map(text) };
    case "extremes":
      return { ...base, kind: "extremes", max: text(measurement.max), min: text(measurement.min) };
    case "profile":
    case "level":
      return { ...base, kind: measurement.kind, points: measurement.points.map((point) => ({ station: text(point.station), reading: text(point.reading) })) };
    case "mandrel":
      return {
        ...base,
        kind: "mandrel",
        near0: text(measurement.near.at0),
        near180: text(measurement.near.at180),
        far0: text(measurement.far.at0),
        far180: text(measurement.far.at180),
      };
    case "near-far":
      return { ...base, kind: "near-far", near: text(measurement.near), far: text(measurement.far) };
    case "centre-height":
      return { ...base, kind: "centre-height", headstockEnd: text(measurement.headstockEnd), tailstockEnd: text(measurement.tailstockEnd) };
  }
}

export type { ProfileTest };
