// The staff editor's pure part, shared by the browser and the server: the forms' typed strings turned into
// the values the one profile schema checks (so every message lands at its field), the text each value is shown
// as, and the side-by-side difference of two versions.
import { z } from "zod";
import { safeText } from "~/modules/validation/text";
import {
  CONFIDENCE_LABELS,
  profileSettingsSchema,
  profileTestSchema,
  sourceLabel,
  type ProfileTest,
  type ToleranceProfile,
  type ToleranceSpec,
  type ValueSource,
} from "~/geometry";

export const STEP_ROWS = 6;

// ————— Typed strings → values —————

type Loose = Record<string, unknown>;

const isObject = (value: unknown): value is Loose => typeof value === "object" && value !== null && !Array.isArray(value);
const blank = (value: unknown) => value === undefined || value === null || (typeof value === "string" && value.trim() === "");

/** A typed number: "" → undefined (so "required" messages show), "12,5" → 12.5, anything else left for the schema to refuse. */
function typedNumber(value: unknown): unknown {
  if (blank(value)) return undefined;
  if (typeof value !== "string") return value;
  const normal = value.trim().replace(",", ".");
  return /^[+-]?(\d+\.?\d*|\.\d+)$/.test(normal) ? Number(normal) : value;
}

function source(value: unknown): unknown {
  if (!isObject(value)) return value;
  const text = (field: unknown) => (blank(field) ? undefined : field);
  return { confidence: value.confidence, document: text(value.document), edition: text(value.edition), clause: text(value.clause), note: text(value.note) };
}

/** The test form's values (strings, as Conform reads them) in the shape of a ProfileTest. */
export function testFromForm(value: unknown): unknown {
  if (!isObject(value)) return value;
  const tolerance = isObject(value.tolerance) ? value.tolerance : {};
  let spec: unknown;
  switch (tolerance.type) {
    case "fixed":
      spec = { type: "fixed", tolerance: typedNumber(tolerance.tolerance), source: source(tolerance.source) };
      break;
    case "proportional":
      spec = {
        type: "proportional",
        tolerance: typedNumber(tolerance.tolerance),
        over: typedNumber(tolerance.over),
        minimum: typedNumber(tolerance.minimum),
        maximum: typedNumber(tolerance.maximum),
        source: source(tolerance.source),
      };
      break;
    case "stepped": {
      const rows = Array.isArray(tolerance.steps) ? tolerance.steps.map((row) => (isObject(row) ? row : {})) : [];
      // Trailing empty rows are the form's spare ones; an empty row in between is an error at its place.
      let last = rows.length;
      while (last > 0 && blank(rows[last - 1]!.upTo) && blank(rows[last - 1]!.tolerance)) last -= 1;
      spec = { type: "stepped", steps: rows.slice(0, last).map((row) => ({ upTo: typedNumber(row.upTo), tolerance: typedNumber(row.tolerance) })), source: source(tolerance.source) };
      break;
    }
    default:
      spec = { type: tolerance.type };
  }
  const local = isObject(value.local) ? value.local : {};
  const hasLocal = value.hasLocal === "on" || value.hasLocal === true;
  const length = isObject(value.measuringLength) ? value.measuringLength : {};
  const direction = isObject(value.direction) ? value.direction : {};
  return {
    code: value.code ?? "",
    title: value.title ?? "",
    measures: value.measures ?? "",
    instrument: value.instrument ?? "",
    measuringLength: { nominal: blank(length.nominal) ? null : typedNumber(length.nominal), description: length.description ?? "" },
    tolerance: spec,
    ...(hasLocal ? { local: { tolerance: typedNumber(local.tolerance), window: typedNumber(local.window), source: source(local.source) } } : {}),
    method: value.method,
    ...(blank(value.reference) ? {} : { reference: value.reference }),
    ...(blank(value.overAnyWindow) ? {} : { overAnyWindow: typedNumber(value.overAnyWindow) }),
    direction: { allowed: direction.allowed, positive: direction.positive ?? "", source: source(direction.source) },
    unit: value.unit,
    required: value.required === "on" || value.required === true,
  };
}

/** The settings form's values in the shape the settings schema checks. */
export function settingsFromForm(value: unknown): unknown {
  if (!isObject(value)) return value;
  const scope = isObject(value.scope) ? value.scope : {};
  const rules = isObject(value.rules) ? value.rules : {};
  const maker = isObject(scope.maker) ? scope.maker : {};
  const limits = (["swingOverBedMm", "distanceBetweenCentresMm", "tableLengthMm"] as const).flatMap((dimension) => {
    const typed = isObject(scope.limits) ? scope.limits[dimension] : undefined;
    return blank(typed) ? [] : [{ dimension, maxMm: typedNumber(typed) }];
  });
  const minimum = isObject(rules.minimumTolerance) ? rules.minimumTolerance : {};
  const rounding = isObject(rules.rounding) ? rules.rounding : {};
  const leastCount = isObject(rules.leastCount) ? rules.leastCount : {};
  const hasMaker = value.hasMaker === "on" || value.hasMaker === true;
  return {
    title: value.title ?? "",
    category: value.category,
    accuracyClass: value.accuracyClass,
    scope: {
      limits,
      ...(hasMaker
        ? {
            maker: {
              make: maker.make ?? "",
              model: maker.model ?? "",
              ...(blank(maker.serialFrom) ? {} : { serialFrom: maker.serialFrom }),
              ...(blank(maker.serialTo) ? {} : { serialTo: maker.serialTo }),
              chart: maker.chart ?? "",
            },
          }
        : {}),
      source: source(scope.source),
    },
    rules: {
      minimumTolerance: { value: typedNumber(minimum.value), source: source(minimum.source) },
      ...(blank(rounding.step) ? {} : { rounding: { step: typedNumber(rounding.step), source: source(rounding.source) } }),
      ...(blank(leastCount.value) ? {} : { leastCount: { value: typedNumber(leastCount.value), source: source(leastCount.source) } }),
    },
  };
}

/** The editor's schemas: the shared profile schemas behind the conversion of typed strings. */
export const testFormSchema = z.preprocess(testFromForm, profileTestSchema);
export const settingsFormSchema = z.preprocess(settingsFromForm, profileSettingsSchema);

// ————— Values → the form's strings —————

const text = (value: number | undefined | null) => (value === undefined || value === null ? "" : String(value));
const sourceForm = (value: ValueSource | undefined) => ({
  confidence: value?.confidence ?? "from-memory",
  document: value?.document ?? "",
  edition: value?.edition ?? "",
  clause: value?.clause ?? "",
  note: value?.note ?? "",
});

/** A test as the form's default values. */
export function testToForm(test: ProfileTest) {
  const spec = test.tolerance;
  const steps = spec.type === "stepped" ? spec.steps.map((step) => ({ upTo: text(step.upTo), tolerance: text(step.tolerance) })) : [];
  while (steps.length < STEP_ROWS) steps.push({ upTo: "", tolerance: "" });
  return {
    code: test.code,
    title: test.title,
    measures: test.measures,
    instrument: test.instrument,
    measuringLength: { nominal: text(test.measuringLength.nominal), description: test.measuringLength.description },
    tolerance: {
      type: spec.type,
      tolerance: spec.type === "stepped" ? "" : text(spec.tolerance),
      over: spec.type === "proportional" ? text(spec.over) : "",
      minimum: spec.type === "proportional" ? text(spec.minimum) : "",
      maximum: spec.type === "proportional" ? text(spec.maximum) : "",
      steps,
      source: sourceForm(spec.source),
    },
    hasLocal: test.local ? "on" : "",
    local: { tolerance: text(test.local?.tolerance), window: text(test.local?.window), source: sourceForm(test.local?.source) },
    method: test.method,
    reference: test.reference ?? "",
    overAnyWindow: text(test.overAnyWindow),
    direction: { allowed: test.direction.allowed, positive: test.direction.positive, source: sourceForm(test.direction.source) },
    unit: test.unit,
    required: test.required ? "on" : "",
  };
}

/** A profile's settings as the form's default values. */
export function settingsToForm(profile: ToleranceProfile) {
  const limit = (dimension: string) => text(profile.scope.limits.find((entry) => entry.dimension === dimension)?.maxMm);
  return {
    title: profile.title,
    category: profile.category,
    accuracyClass: profile.accuracyClass,
    scope: {
      limits: { swingOverBedMm: limit("swingOverBedMm"), distanceBetweenCentresMm: limit("distanceBetweenCentresMm"), tableLengthMm: limit("tableLengthMm") },
      maker: {
        make: profile.scope.maker?.make ?? "",
        model: profile.scope.maker?.model ?? "",
        serialFrom: profile.scope.maker?.serialFrom ?? "",
        serialTo: profile.scope.maker?.serialTo ?? "",
        chart: profile.scope.maker?.chart ?? "",
      },
      source: sourceForm(profile.scope.source),
    },
    hasMaker: profile.scope.maker ? "on" : "",
    rules: {
      minimumTolerance: { value: text(profile.rules.minimumTolerance.value), source: sourceForm(profile.rules.minimumTolerance.source) },
      rounding: { step: text(profile.rules.rounding?.step), source: sourceForm(profile.rules.rounding?.source) },
      leastCount: { value: text(profile.rules.leastCount?.value), source: sourceForm(profile.rules.leastCount?.source) },
    },
  };
}

/** A blank test to start from (the editor's "add a test"). */
export function blankTest(code: string): ProfileTest {
  return {
    code,
    title: "New test",
    measures: "What is measured",
    instrument: "Instrument and set-up",
    measuringLength: { nominal: null, description: "One revolution or more" },
    tolerance: { type: "fixed", tolerance: 10, source: { confidence: "from-memory" } },
    method: "run-out",
    direction: { allowed: "any", positive: "no sign: max − min of the readings", source: { confidence: "common-practice" } },
    unit: "µm",
    required: false,
  };
}

// ————— Values → text, and the difference of two versions —————

const µm = (value: number, unit = "µm") => `${value} ${unit}`;

export function describeTolerance(spec: ToleranceSpec, unit = "µm"): string {
  switch (spec.type) {
    case "fixed":
      return µm(spec.tolerance, unit);
    case "proportional":
      return `${µm(spec.tolerance, unit)} per ${spec.over} mm, at least ${µm(spec.minimum, unit)}${spec.maximum !== undefined ? `, at most ${µm(spec.maximum, unit)}` : ""}`;
    case "stepped":
      return spec.steps.map((step) => `up to ${step.upTo} mm: ${µm(step.tolerance, unit)}`).join("; ");
  }
}

export const describeSource = (value: ValueSource) => `${sourceLabel(value)} [${CONFIDENCE_LABELS[value.confidence]}]`;

export const DIRECTION_NAMES: Record<ProfileTest["direction"]["allowed"], string> = {
  any: "no sign",
  either: "either way",
  positive: "positive only",
  convex: "convex only",
  concave: "concave only",
};

/** The rows a test is compared on, each as shown to staff. */
export function testRows(test: ProfileTest): Array<[string, string]> {
  return [
    ["Title", test.title],
    ["What is measured", test.measures],
    ["Instrument", test.instrument],
    ["Measuring length", `${test.measuringLength.nominal === null ? "" : `${test.measuringLength.nominal} mm — `}${test.measuringLength.description}`],
    ["Tolerance", describeTolerance(test.tolerance, test.unit)],
    ["Tolerance source", describeSource(test.tolerance.source)],
    ["Local tolerance", test.local ? `${µm(test.local.tolerance, test.unit)} over any ${test.local.window} mm` : "none"],
    ["Local tolerance source", test.local ? describeSource(test.local.source) : "—"],
    ["Evaluation", `${test.method}${test.reference ? ` (${test.reference})` : ""}${test.overAnyWindow ? `, worst ${test.overAnyWindow} mm` : ""}`],
    ["Allowed direction", `${DIRECTION_NAMES[test.direction.allowed]}; ${test.direction.positive}`],
    ["Direction source", describeSource(test.direction.source)],
    ["Unit", test.unit],
    ["Required", test.required ? "yes" : "no"],
  ];
}

/** The rows the profile as a whole is compared on. */
export function settingsRows(profile: ToleranceProfile): Array<[string, string]> {
  const maker = profile.scope.maker;
  return [
    ["Title", profile.title],
    ["Category and class", `${profile.category}, ${profile.accuracyClass}`],
    ["Size covered", profile.scope.limits.map((limit) => `${limit.dimension === "swingOverBedMm" ? "swing" : limit.dimension === "tableLengthMm" ? "table length" : "between centres"} ≤ ${limit.maxMm} mm`).join(", ") || "any size"],
    ["Maker's chart", maker ? `${maker.make} ${maker.model}${maker.serialFrom || maker.serialTo ? `, serial ${maker.serialFrom ?? "…"} to ${maker.serialTo ?? "…"}` : ""}: ${maker.chart}` : "none (a general class)"],
    ["Scope source", describeSource(profile.scope.source)],
    ["Minimum tolerance", `${µm(profile.rules.minimumTolerance.value)} — ${describeSource(profile.rules.minimumTolerance.source)}`],
    ["Rounding", profile.rules.rounding ? `to the nearest ${µm(profile.rules.rounding.step)} — ${describeSource(profile.rules.rounding.source)}` : "none"],
    ["Instrument least count", profile.rules.leastCount ? `${µm(profile.rules.leastCount.value)} is fine enough — ${describeSource(profile.rules.leastCount.source)}` : "ten-to-one rule only"],
  ];
}

export type DiffRow = { label: string; before: string | null; after: string | null; changed: boolean };
export type TestDiff = { code: string; title: string; kind: "changed" | "added" | "removed"; rows: DiffRow[] };

function compareRows(before: Array<[string, string]> | null, after: Array<[string, string]> | null): DiffRow[] {
  const labels = (after ?? before ?? []).map(([label]) => label);
  return labels.map((label) => {
    const was = before?.find(([name]) => name === label)?.[1] ?? null;
    const now = after?.find(([name]) => name === label)?.[1] ?? null;
    return { label, before: was, after: now, changed: was !== now };
  });
}

/** The difference of a version against the one before it: the profile's own rows, and each test changed, added or removed. */
export function diffProfiles(before: ToleranceProfile | null, after: ToleranceProfile) {
  const settings = compareRows(before ? settingsRows(before) : null, settingsRows(after));
  const tests: TestDiff[] = [];
  const beforeTests = new Map((before?.tests ?? []).map((test) => [test.code, test]));
  for (const test of after.tests) {
    const was = beforeTests.get(test.code);
    const rows = compareRows(was ? testRows(was) : null, testRows(test));
    if (!was) tests.push({ code: test.code, title: test.title, kind: "added", rows });
    else if (rows.some((row) => row.changed)) tests.push({ code: test.code, title: test.title, kind: "changed", rows });
  }
  for (const test of before?.tests ?? []) {
    if (!after.tests.some((candidate) => candidate.code === test.code)) tests.push({ code: test.code, title: test.title, kind: "removed", rows: compareRows(testRows(test), null) });
  }
  const unchanged = after.tests.length - tests.filter((diff) => diff.kind !== "removed").length;
  return { settings, tests, unchanged, settingsChanged: settings.some((row) => row.changed) };
}

// ————— The editor's small forms —————

/** Draft the next version of a profile, or (with `newKey`) version 1 of a new profile copied from it. */
export const profileDraftRequestSchema = z.object({
  key: z.string({ error: "Choose the profile to start from." }).regex(/^[a-z0-9][a-z0-9-]{0,63}$/, "Choose the profile to start from."),
  fromVersion: z.coerce.number({ error: "Choose the version to start from." }).int().min(1).max(10_000),
  newKey: z
    .string()
    .trim()
    .max(64, "Keep the key to 64 characters.")
    .regex(/^[a-z0-9][a-z0-9-]{2,63}$/, "Use lower-case letters, digits and hyphens, at least three, e.g. maker-orvald-tl-360.")
    .optional(),
});

const revision = z.coerce.number({ error: "Reload the page: the draft's revision is missing." }).int().min(1).max(1_000_000);

/** The actions on one version's page. */
export const profileVersionActionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("publish"), revision }),
  z.object({ intent: z.literal("discard") }),
  z.object({
    intent: z.literal("retire"),
    reason: safeText({ label: "reason", max: 500, min: 3, multiline: true, messages: { missing: "Say why this version is retired (staff and inspectors read it).", tooShort: "Say why this version is retired (staff and inspectors read it)." } }),
  }),
  z.object({ intent: z.literal("remove-test"), code: z.string().max(24), revision }),
]);
