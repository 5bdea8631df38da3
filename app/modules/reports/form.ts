// The report entry form as the inspector types it: strings, partial, in mm or inch. Pure and shared by the
// browser (live preview, local copy) and the server (draft checks, authoritative scoring on submit).
import { z } from "zod";
import {
  beyondLimit,
  conditionsSchema,
  numbersOf,
  evaluateTest,
  findProfile,
  GeometryInputError,
  keyedByTestCode,
  KINDS_FOR_METHOD,
  scoreReport,
  testMeasurementSchema,
  toMetric,
  type MeasurementKind,
  type ProfileTest,
  type Quantity,
  type ReportMeasurements,
  type ReportScore,
  type StraightnessReference,
  type TestMeasurement,
  type TestResult,
  type ToleranceProfile,
} from "~/geometry";
import { safeText } from "~/modules/validation/text";
import { checkGrid, emptyGridEntry, gridEntrySchema, gridNumbers, type GridCheck } from "./grid-entry";

export type EntryUnits = "mm" | "inch";

export const INSTRUMENT_KINDS = [
  { value: "dial-indicator", label: "Dial indicator", reads: "deviation" },
  { value: "lever-indicator", label: "Lever (test) indicator", reads: "deviation" },
  { value: "electronic-probe", label: "Electronic probe / indicator", reads: "deviation" },
  { value: "precision-level", label: "Precision spirit level", reads: "tilt" },
  { value: "electronic-level", label: "Electronic level", reads: "tilt" },
  { value: "micrometer", label: "Micrometer", reads: "deviation" },
  { value: "wire-microscope", label: "Taut wire and microscope", reads: "deviation" },
  { value: "laser-interferometer", label: "Laser interferometer", reads: "deviation" },
  { value: "test-mandrel", label: "Test mandrel", reads: "none" },
  { value: "other", label: "Other", reads: "deviation" },
] as const;

export type InstrumentKind = (typeof INSTRUMENT_KINDS)[number]["value"];

export function instrumentReads(kind: string): "deviation" | "tilt" | "none" {
  return INSTRUMENT_KINDS.find((entry) => entry.value === kind)?.reads ?? "deviation";
}

const MAX_TEXT = 2000;
const MAX_NUMBER_TEXT = 32;
const MAX_STATIONS = 200;
const MAX_READINGS = 72;

const numberText = safeText({ label: "number", max: MAX_NUMBER_TEXT, messages: { tooLong: "Too long for a number." } }).default("");
const note = safeText({ label: "notes", max: MAX_TEXT, multiline: true, messages: { tooLong: `Keep notes under ${MAX_TEXT} characters.` } }).default("");

export const instrumentEntrySchema = z.object({
  id: safeText({ label: "instrument id", max: 40, min: 1 }),
  kind: z.enum(INSTRUMENT_KINDS.map((entry) => entry.value) as [InstrumentKind, ...InstrumentKind[]], {
    error: "Choose the kind of instrument.",
  }),
  description: safeText({ label: "description", max: 200, messages: { tooLong: "Keep the description under 200 characters." } }).default(""),
  resolution: numberText,
  calibrationDue: z.union([z.literal(""), z.iso.date({ error: "Give the calibration due date as YYYY-MM-DD." })]).default(""),
});

const kinds = ["sweep", "extremes", "profile", "level", "mandrel", "near-far", "centre-height", "surface", "positioning", "circular"] as const;
export type EntryKind = (typeof kinds)[number];
export const isEntryKind = (kind: MeasurementKind): kind is EntryKind => (kinds as readonly string[]).includes(kind);

/** Runs imported into one positioning test: the form caps them below the engine's limits, since a draft carries them whole. */
export const POSITIONING_ENTRY_LIMITS = { targets: 200, runsPerDirection: 20 } as const;

const deviationRow = z
  .array(z.number({ error: "Each deviation must be a finite number." }), { error: "Give each run as a list of deviations." })
  .max(POSITIONING_ENTRY_LIMITS.targets, `At most ${POSITIONING_ENTRY_LIMITS.targets} targets per axis in a report.`);
const importedRuns = (direction: string) =>
  z
    .array(deviationRow, { error: `Give the runs ${direction} as a list of runs.` })
    .max(POSITIONING_ENTRY_LIMITS.runsPerDirection, `At most ${POSITIONING_ENTRY_LIMITS.runsPerDirection} runs ${direction}.`);

/** Interferometer runs as imported, in the form's units (targets in mm or in, deviations in µm or in). */
export const positioningRunsSchema = z.object({
  targets: z
    .array(z.number({ error: "Each target must be a finite number." }), { error: "Give the targets as a list." })
    .max(POSITIONING_ENTRY_LIMITS.targets, `At most ${POSITIONING_ENTRY_LIMITS.targets} targets per axis in a report.`),
  forward: importedRuns("approaching in the positive direction"),
  reverse: importedRuns("approaching in the negative direction"),
});
export type PositioningRuns = z.output<typeof positioningRunsSchema>;

/** Radial deviations of a circular test as imported, in the form's reading unit; at most one every half degree. */
export const CIRCULAR_ENTRY_LIMITS = { readingsPerDirection: 720 } as const;
const radialReadings = (direction: string) =>
  z
    .array(z.object({ angle: z.number({ error: "Each angle must be a finite number." }), deviation: z.number({ error: "Each deviation must be a finite number." }) }), {
      error: `Give the readings ${direction} as a list.`,
    })
    .max(CIRCULAR_ENTRY_LIMITS.readingsPerDirection, `At most ${CIRCULAR_ENTRY_LIMITS.readingsPerDirection} readings ${direction} in a report.`);
export const radialEntrySchema = z.object({ clockwise: radialReadings("clockwise"), counterClockwise: radialReadings("counter-clockwise") });
export type RadialEntry = z.output<typeof radialEntrySchema>;

export const testEntrySchema = z.object({
  kind: z.enum(kinds, { error: "Choose how the readings were taken." }),
  readings: z.array(numberText).max(MAX_READINGS, `At most ${MAX_READINGS} readings.`).default([]),
  max: numberText,
  min: numberText,
  points: z
    .array(z.object({ station: numberText, reading: numberText }))
    .max(MAX_STATIONS, `At most ${MAX_STATIONS} stations.`)
    .default([]),
  reference: z.union([z.literal(""), z.enum(["end-points", "least-squares", "minimum-zone"])]).default(""),
  near0: numberText,
  near180: numberText,
  far0: numberText,
  far180: numberText,
  near: numberText,
  far: numberText,
  headstockEnd: numberText,
  tailstockEnd: numberText,
  length: numberText,
  /** Heights over a surface: a grid of heights, or level tilts along its lines (grid-entry.ts). */
  grid: gridEntrySchema.default(emptyGridEntry),
  /** Interferometer runs of an axis, imported from the instrument's table (positioning-import.ts). */
  runs: positioningRunsSchema.nullable().default(null),
  /** A circular test's radial deviations, imported from the instrument's table. */
  radial: radialEntrySchema.nullable().default(null),
  instrumentId: safeText({ label: "instrument", max: 40 }).default(""),
  /** Overrides the instrument's resolution for this test, in reading units. */
  resolution: numberText,
  notes: note,
  photoId: z.uuid().nullable().default(null),
});

export const reportFormSchema = z.object({
  units: z.enum(["mm", "inch"], { error: 'Choose "mm" or "inch" for the readings.' }),
  profile: z.object({
    key: safeText({ label: "profile", max: 80, min: 1 }),
    version: z.number().int().positive(),
    /** Why the inspector chose another profile than the one suggested; empty when they kept it. */
    reason: safeText({ label: "reason", max: 500, multiline: true, messages: { tooLong: "Keep the reason under 500 characters." } }).default(""),
  }),
  measuredOn: z.union([z.literal(""), z.iso.date({ error: "Give the date of the tests as YYYY-MM-DD." })]).default(""),
  conditions: z
    .object({
      ambientTemperatureC: numberText,
      warmUpMinutes: numberText,
      levelled: z.enum(["", "yes", "no"]).default(""),
      notes: note,
    })
    .default({ ambientTemperatureC: "", warmUpMinutes: "", levelled: "", notes: "" }),
  instruments: z.array(instrumentEntrySchema).max(30, "At most 30 instruments.").default([]),
  tests: keyedByTestCode(testEntrySchema).default({}),
  notes: note,
  safetyAcknowledged: z.boolean().default(false),
});

export type ReportForm = z.output<typeof reportFormSchema>;
export type TestEntry = z.output<typeof testEntrySchema>;
export type InstrumentEntry = z.output<typeof instrumentEntrySchema>;

export function emptyTestEntry(kind: EntryKind): TestEntry {
  return testEntrySchema.parse({ kind });
}

/** The readings' units in this entry mode, as labels. */
export function unitLabels(units: EntryUnits) {
  return units === "inch" ? { reading: "in", station: "in", resolution: "in" } : { reading: "µm", station: "mm", resolution: "µm" };
}

// ————— Numbers as typed —————

/** A number as an inspector types it: "-2", "−2", "0,0004" (decimal comma), "+3". Empty → undefined. */
export function parseTypedNumber(text: string): number | undefined | "invalid" {
  const value = typedValue(text);
  return value === undefined || value === "invalid" || Number.isFinite(value) ? value : "invalid";
}

/** As `parseTypedNumber`, but a number too large for a double (e.g. "1e999") comes back as ±Infinity. */
function typedValue(text: string): number | undefined | "invalid" {
  const trimmed = text.trim().replace(/\u2212/g, "-").replace(/^\+/, "");
  if (trimmed === "") return undefined;
  const normalised = /^-?\d*,\d+$/.test(trimmed) ? trimmed.replace(",", ".") : trimmed;
  if (!/^-?(\d+\.?\d*|\.\d+)(e-?\d+)?$/i.test(normalised)) return "invalid";
  return Number(normalised);
}

const READING_FIELDS = ["max", "min", "near0", "near180", "far0", "far180", "near", "far", "headstockEnd", "tailstockEnd"] as const;

/** Every typed number of an entry that reads as one, with its field path and quantity. */
function* typedNumbersOf(entry: TestEntry): Generator<[string, number, Quantity]> {
  const readingIs: Quantity = entry.kind === "level" ? "tilt" : "reading";
  const typed = function* (path: string, text: string, quantity: Quantity): Generator<[string, number, Quantity]> {
    const value = typedValue(text);
    if (typeof value === "number") yield [path, value, quantity];
  };
  for (const [i, text] of entry.readings.entries()) yield* typed(`readings.${i}`, text, "reading");
  for (const field of READING_FIELDS) yield* typed(field, entry[field], "reading");
  for (const [i, row] of entry.points.entries()) {
    yield* typed(`points.${i}.station`, row.station, "station");
    yield* typed(`points.${i}.reading`, row.reading, readingIs);
  }
  yield* typed("length", entry.length, "station");
  yield* typed("resolution", entry.resolution, readingIs);
  if (entry.kind === "surface") for (const [path, text, quantity] of gridNumbers(entry.grid)) yield* typed(`grid.${path}`, text, quantity);
  if (entry.kind === "circular" && entry.radial) {
    for (const [, value, quantity] of numbersOf({ kind: "circular", ...entry.radial })) {
      if (typeof value === "number") yield ["radial", value, quantity];
    }
  }
  if (entry.kind === "positioning" && entry.runs) {
    // One message for the whole table: its readings are imported, not typed, so there is no field to point at.
    for (const [, value, quantity] of numbersOf({ kind: "positioning", ...entry.runs })) {
      if (typeof value === "number") yield ["runs", value, quantity];
    }
  }
}

/**
 * Typed numbers beyond what these tests can read (or too large for a number at all), at their fields.
 * Checked as typed, half-typed entries included, so that such a number is never stored or scored.
 */
export function entryLimitErrors(entry: TestEntry, units: EntryUnits): Record<string, string[]> {
  const errors: Record<string, string[]> = {};
  for (const [path, value, quantity] of typedNumbersOf(entry)) {
    const message = beyondLimit(value, quantity, units);
    if (message) errors[path] = [message];
  }
  return errors;
}

/** The same for the whole form: every test's entry and every instrument's resolution, keyed as the entry page shows them. */
export function formLimitErrors(form: Pick<ReportForm, "tests" | "instruments" | "units">): Record<string, string[]> {
  const errors: Record<string, string[]> = {};
  for (const [code, entry] of Object.entries(form.tests)) {
    for (const [path, messages] of Object.entries(entryLimitErrors(entry, form.units))) errors[`tests.${code}.${path}`] = messages;
  }
  form.instruments.forEach((instrument, i) => {
    const value = typedValue(instrument.resolution);
    if (typeof value !== "number") return;
    const message = beyondLimit(value, instrumentReads(instrument.kind) === "tilt" ? "tilt" : "reading", form.units);
    if (message) errors[`instruments.${i}.resolution`] = [message];
  });
  return errors;
}

/**
 * Rows pasted from a spreadsheet or a CSV file: two columns, station and reading. Tabs and semicolons
 * separate columns (then a decimal comma is allowed); otherwise commas or spaces do. Lines that are not
 * two numbers (a header, a blank line) are skipped and counted.
 */
export function parseStationTable(text: string): { points: { station: string; reading: string }[]; skipped: number } {
  const points: { station: string; reading: string }[] = [];
  let skipped = 0;
  for (const line of text.split(/\r?\n/)) {
    if (!line.trim()) continue;
    const cells = (/[\t;]/.test(line) ? line.split(/[\t;]/) : line.split(/[,\s]+/)).map((cell) => cell.trim()).filter(Boolean);
    const [station, reading] = cells;
    const s = station === undefined ? "invalid" : parseTypedNumber(station);
    const r = reading === undefined ? "invalid" : parseTypedNumber(reading);
    if (typeof s === "number" && typeof r === "number") points.push({ station: station!, reading: reading! });
    else skipped += 1;
  }
  return { points, skipped };
}

// ————— From the form to the engine's measurements —————

export type EntryState = "empty" | "incomplete" | "complete" | "invalid";

export interface TestEntryCheck {
  state: EntryState;
  /** Field path within the entry (e.g. "far0", "points.2.reading") → messages. */
  errors: Record<string, string[]>;
  /** In the entry's units, as the engine's schemas take it; present when state is "complete". */
  measurement?: TestMeasurement;
  /** Level readings over a surface: how far the lines that meet disagree (µm), shown beside the grid. */
  closure?: GridCheck["closure"];
}

type Numbers = Record<string, number | undefined>;

function readFields(entry: TestEntry, fields: readonly (keyof TestEntry)[], errors: Record<string, string[]>): Numbers {
  const values: Numbers = {};
  for (const field of fields) {
    const parsed = parseTypedNumber(String(entry[field] ?? ""));
    if (parsed === "invalid") errors[field] = ["Not a number."];
    else values[field] = parsed;
  }
  return values;
}

function effectiveResolution(entry: TestEntry, instruments: readonly InstrumentEntry[], errors: Record<string, string[]>): number | undefined {
  const own = parseTypedNumber(entry.resolution);
  if (own === "invalid") {
    errors.resolution = ["Not a number."];
    return undefined;
  }
  if (own !== undefined) return own;
  const instrument = instruments.find((candidate) => candidate.id === entry.instrumentId);
  if (!instrument) return undefined;
  const reads = instrumentReads(instrument.kind);
  // A level's resolution is a tilt (µm/m); it only applies to tilt readings, and an indicator's only to deviations.
  if (reads === "none" || (reads === "tilt") !== (entry.kind === "level")) return undefined;
  const value = parseTypedNumber(instrument.resolution);
  return typeof value === "number" ? value : undefined;
}

/** Turns one test's typed entry into a measurement, saying whether it is empty, incomplete, complete or invalid. */
export function checkTestEntry(entry: TestEntry, instruments: readonly InstrumentEntry[] = [], units: EntryUnits = "mm"): TestEntryCheck {
  const errors: Record<string, string[]> = {};
  const resolution = effectiveResolution(entry, instruments, errors);
  const withResolution = resolution === undefined ? {} : { resolution };
  let candidate: Record<string, unknown> | null = null;
  let filled = 0;
  let needed = 0;
  let closure: GridCheck["closure"];

  const count = (values: Numbers) => {
    const present = Object.values(values).filter((value) => value !== undefined).length;
    filled += present;
    return present;
  };

  switch (entry.kind) {
    case "sweep": {
      const readings: number[] = [];
      entry.readings.forEach((text, i) => {
        const parsed = parseTypedNumber(text);
        if (parsed === "invalid") errors[`readings.${i}`] = ["Not a number."];
        else if (parsed !== undefined) readings.push(parsed);
      });
      filled += readings.length;
      needed = 2;
      if (readings.length >= 2) candidate = { kind: "sweep", readings };
      break;
    }
    case "extremes": {
      const values = readFields(entry, ["max", "min"], errors);
      needed = 2;
      if (count(values) === 2) candidate = { kind: "extremes", max: values.max, min: values.min };
      break;
    }
    case "profile":
    case "level": {
      const points: { station: number; reading: number }[] = [];
      entry.points.forEach((row, i) => {
        const station = parseTypedNumber(row.station);
        const reading = parseTypedNumber(row.reading);
        if (station === "invalid") errors[`points.${i}.station`] = ["Not a number."];
        if (reading === "invalid") errors[`points.${i}.reading`] = ["Not a number."];
        if (typeof station === "number" && typeof reading === "number") points.push({ station, reading });
        else if ((station === undefined) !== (reading === undefined) && station !== "invalid" && reading !== "invalid") {
          errors[`points.${i}.${station === undefined ? "station" : "reading"}`] = ["Give both the station and the reading, or clear the row."];
        }
        if (station !== undefined || reading !== undefined) filled += 1;
      });
      needed = 2;
      if (points.length >= 2) {
        candidate = { kind: entry.kind, points, ...(entry.kind === "profile" && entry.reference ? { reference: entry.reference } : {}) };
      }
      break;
    }
    case "mandrel": {
      const values = readFields(entry, ["near0", "near180", "far0", "far180", "length"], errors);
      const present = count({ near0: values.near0, near180: values.near180, far0: values.far0, far180: values.far180 });
      needed = 4;
      if (present === 4) {
        candidate = {
          kind: "mandrel",
          near: { at0: values.near0, at180: values.near180 },
          far: { at0: values.far0, at180: values.far180 },
          ...(values.length !== undefined ? { length: values.length } : {}),
        };
      }
      break;
    }
    case "near-far": {
      const values = readFields(entry, ["near", "far", "length"], errors);
      const present = count({ near: values.near, far: values.far });
      needed = 2;
      if (present === 2) candidate = { kind: "near-far", near: values.near, far: values.far, ...(values.length !== undefined ? { length: values.length } : {}) };
      break;
    }
    case "centre-height": {
      const values = readFields(entry, ["headstockEnd", "tailstockEnd"], errors);
      needed = 2;
      if (count(values) === 2) candidate = { kind: "centre-height", headstockEnd: values.headstockEnd, tailstockEnd: values.tailstockEnd };
      break;
    }
    case "surface": {
      const grid = checkGrid(entry.grid, units);
      for (const [path, messages] of Object.entries(grid.errors)) errors[`grid.${path}`] = messages;
      filled += grid.filled;
      needed = 1;
      if (grid.points) {
        candidate = { kind: "surface", points: grid.points, ...(entry.grid.reference ? { reference: entry.grid.reference } : {}) };
        closure = grid.closure;
      } else if (grid.missing && !Object.keys(errors).length && grid.filled > 0) {
        return { state: "incomplete", errors: { entry: [grid.missing] } };
      }
      break;
    }
    case "circular": {
      needed = 1;
      if (entry.radial) {
        filled += 1;
        candidate = { kind: "circular", clockwise: entry.radial.clockwise, counterClockwise: entry.radial.counterClockwise };
      }
      break;
    }
    case "positioning": {
      needed = 1;
      if (entry.runs) {
        filled += 1;
        candidate = { kind: "positioning", targets: entry.runs.targets, forward: entry.runs.forward, reverse: entry.runs.reverse };
      }
      break;
    }
  }

  // A number beyond what the tests can read says so at its field, instead of "Not a number.".
  Object.assign(errors, entryLimitErrors(entry, units));
  if (Object.keys(errors).length > 0) return { state: "invalid", errors };
  if (!candidate) return { state: filled === 0 ? "empty" : "incomplete", errors: filled === 0 || needed === 0 ? {} : incompleteMessage(entry) };

  // The engine's schema has the last word on shape and messages (e.g. a station given twice).
  const parsed = testMeasurementSchema.safeParse({ ...candidate, ...withResolution });
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = entryPath(entry.kind, issue.path.map(String));
      (errors[key] ??= []).push(issue.message);
    }
    return { state: "invalid", errors };
  }
  return { state: "complete", errors, measurement: parsed.data, ...(closure ? { closure } : {}) };
}

function incompleteMessage(entry: TestEntry): Record<string, string[]> {
  const message: Record<EntryKind, string> = {
    sweep: "Give at least two readings over a full revolution.",
    extremes: "Give both the highest and the lowest reading.",
    profile: "Give readings at two stations at least.",
    level: "Give level readings at two stations at least.",
    mandrel: "Give all four readings: near and far, at 0° and at 180°.",
    "near-far": "Give both the near and the far reading.",
    "centre-height": "Give the readings at both ends.",
    surface: "Give the heights or level readings over the whole grid.",
    positioning: "Import the interferometer's table of runs for this axis.",
    circular: "Import the instrument's table of radial deviations, both directions.",
  };
  return { entry: [message[entry.kind]] };
}

/** Maps a path of the engine's measurement (e.g. far.at0) to the form's field (far0). */
function entryPath(kind: MeasurementKind, path: string[]): string {
  if (kind === "mandrel" && path.length === 2) return `${path[0]}${path[1] === "at0" ? "0" : "180"}`;
  if (kind === "surface") return path[0] === "points" ? "grid" : (path[0] ?? "entry");
  if (kind === "positioning") return path[0] === "resolution" ? "resolution" : "runs";
  if (kind === "circular") return path[0] === "resolution" ? "resolution" : "radial";
  if (path[0] === "readings" || path[0] === "points") return path.join(".");
  return path[0] ?? "entry";
}

// ————— The whole report —————

export interface ConditionsCheck {
  values: NonNullable<ReportMeasurements["conditions"]>;
  errors: Record<string, string[]>;
}

export function checkConditions(form: Pick<ReportForm, "conditions">): ConditionsCheck {
  const errors: Record<string, string[]> = {};
  const temperature = parseTypedNumber(form.conditions.ambientTemperatureC);
  const warmUp = parseTypedNumber(form.conditions.warmUpMinutes);
  if (temperature === "invalid") errors.ambientTemperatureC = ["Not a number."];
  if (warmUp === "invalid") errors.warmUpMinutes = ["Not a number."];
  const candidate = {
    ...(typeof temperature === "number" ? { ambientTemperatureC: temperature } : {}),
    ...(typeof warmUp === "number" ? { warmUpMinutes: warmUp } : {}),
    ...(form.conditions.levelled ? { levelled: form.conditions.levelled === "yes" } : {}),
  };
  const parsed = conditionsSchema.safeParse(candidate);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) (errors[String(issue.path[0] ?? "conditions")] ??= []).push(issue.message);
    return { values: {}, errors };
  }
  return { values: parsed.data, errors };
}

/**
 * The date of the tests against the calendar at the machine's place: a date after today there is refused
 * (nobody has measured tomorrow); one before the booked visit is allowed (a visit may be brought forward by
 * agreement) but said aloud, since it is more often a slip of the date picker.
 */
export function measuredOnCheck(measuredOn: string, days: { today: string; visitDay: string }): { error: string | null; warning: string | null } {
  if (!measuredOn) return { error: "Give the date of the tests.", warning: null };
  if (measuredOn > days.today) return { error: `The date of the tests is in the future (today is ${days.today} where the machine stands).`, warning: null };
  if (measuredOn < days.visitDay) {
    return { error: null, warning: `${measuredOn} is before the booked visit (${days.visitDay}). Check the date; if the visit was brought forward, say so in the notes.` };
  }
  return { error: null, warning: null };
}

/**
 * Why a test has no resolution when the inspector chose an instrument: a level reads tilt (µm/m), which is
 * not a step of heights entered as a profile, so its resolution cannot be used for them. Null otherwise.
 */
export function resolutionNote(entry: TestEntry, instruments: readonly InstrumentEntry[], units: EntryUnits): string | null {
  if (parseTypedNumber(entry.resolution) !== undefined) return null;
  const instrument = instruments.find((candidate) => candidate.id === entry.instrumentId);
  if (!instrument || instrumentReads(instrument.kind) !== "tilt" || entry.kind === "level") return null;
  const heights = unitLabels(units).reading;
  return (
    `The level reads tilt (µm/m), not steps of the heights entered here (${heights}), so its resolution does not apply as it is. ` +
    `Give this test's resolution in ${heights}: the level's step times the station spacing (20 µm/m over 100 mm steps is 2 µm), ` +
    `or enter the tilts themselves as "Level readings along the travel".`
  );
}

/** The profile the form names, among those given (the entry page is sent the ones it may score with). */
export function profileOf(form: Pick<ReportForm, "profile">, profiles: readonly ToleranceProfile[]): ToleranceProfile | undefined {
  return findProfile(profiles, form.profile.key, form.profile.version);
}

export interface TestPreview {
  test: ProfileTest;
  check: TestEntryCheck;
  result: TestResult | null;
  /** The engine's message when it refused readings the schema accepted (e.g. a travel beyond the profile). */
  engineError: string | null;
}

export interface ReportPreview {
  tests: TestPreview[];
  conditions: ConditionsCheck;
  /** The score of the complete, valid tests; the grade stays "incomplete" while a required test is missing. */
  score: ReportScore | null;
  measuredCount: number;
  requiredCount: number;
  requiredMeasured: number;
}

/** In the engine's units, for the given complete measurements. */
export function metricMeasurements(form: ReportForm, tests: Record<string, TestMeasurement>, conditions: ConditionsCheck["values"]): ReportMeasurements {
  return toMetric({ tests, conditions, ...(form.measuredOn ? { measuredOn: form.measuredOn } : {}) }, form.units);
}

/** Live preview: every test checked and scored on its own, then the report scored on what is complete. */
export function previewReport(form: ReportForm, profile: ToleranceProfile | undefined): ReportPreview | null {
  if (!profile) return null;
  const conditions = checkConditions(form);
  const complete: Record<string, TestMeasurement> = {};
  const tests: TestPreview[] = profile.tests.map((test) => {
    const entry = form.tests[test.code];
    const check = entry ? checkTestEntry(entry, form.instruments, form.units) : ({ state: "empty", errors: {} } as TestEntryCheck);
    if (entry && check.state === "complete" && !KINDS_FOR_METHOD[test.method].includes(entry.kind)) {
      return { test, check: { state: "invalid", errors: { entry: ["This test takes other readings."] } }, result: null, engineError: null };
    }
    if (check.state !== "complete" || !check.measurement) return { test, check, result: null, engineError: null };
    try {
      const metric = toMetric({ tests: { [test.code]: check.measurement } }, form.units).tests[test.code]!;
      const scored = evaluateTest(test, metric, conditions.values, profile.rules);
      const note = entry ? resolutionNote(entry, form.instruments, form.units) : null;
      const result = note
        ? { ...scored, warnings: scored.warnings.map((warning) => (warning.code === "resolution-missing" ? { ...warning, message: note } : warning)) }
        : scored;
      complete[test.code] = check.measurement;
      return { test, check, result, engineError: null };
    } catch (error) {
      if (error instanceof GeometryInputError) return { test, check, result: null, engineError: error.message };
      throw error;
    }
  });
  const score = scoreReport(profile, metricMeasurements(form, complete, conditions.values));
  const required = profile.tests.filter((test) => test.required);
  return {
    tests,
    conditions,
    score,
    measuredCount: Object.keys(complete).length,
    requiredCount: required.length,
    requiredMeasured: required.filter((test) => complete[test.code]).length,
  };
}

/** A new form for a booking: the suggested profile, the entry units and today's date. */
export function newReportForm(options: { profileKey: string; profileVersion: number; units: EntryUnits; measuredOn: string }): ReportForm {
  return reportFormSchema.parse({
    units: options.units,
    profile: { key: options.profileKey, version: options.profileVersion, reason: "" },
    measuredOn: options.measuredOn,
    instruments: [
      { id: "i1", kind: "dial-indicator", description: "", resolution: options.units === "inch" ? "0.0001" : "1", calibrationDue: "" },
      { id: "i2", kind: "precision-level", description: "", resolution: "20", calibrationDue: "" },
    ],
  });
}

/** The default way of reading each test: the first kind its method accepts. */
export function defaultKind(test: ProfileTest): MeasurementKind {
  return KINDS_FOR_METHOD[test.method][0]!;
}


export type { StraightnessReference };
