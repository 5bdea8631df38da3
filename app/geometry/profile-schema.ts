// The one schema of a tolerance profile: the stored rows are read through it, the built-in data is checked
// with it, and the staff editor validates every field with it (browser and server). Every bound is here.
import { z } from "zod";
import { safeName, safeText } from "../modules/validation/text";
import type {
  AllowedDirection,
  EvaluationMethod,
  KeyFigureName,
  MachineCategory,
  MachineDimension,
  ProfileTest,
  SourceConfidence,
  ToleranceProfile,
} from "./types";

export const MACHINE_CATEGORIES = ["centre-lathe", "toolroom-lathe", "milling-machine", "surface-grinder", "cnc-lathe", "machining-centre"] as const satisfies readonly MachineCategory[];
export const MACHINE_DIMENSIONS = ["swingOverBedMm", "distanceBetweenCentresMm", "tableLengthMm"] as const satisfies readonly MachineDimension[];
export const EVALUATION_METHODS = [
  "run-out",
  "straightness",
  "range-along",
  "squareness",
  "level-range",
  "mandrel-inclination",
  "near-far",
  "centre-height",
  "flatness",
  "positioning-accuracy",
  "positioning-repeatability",
  "positioning-reversal",
  "circular-deviation",
] as const satisfies readonly EvaluationMethod[];
export const ALLOWED_DIRECTIONS = ["any", "either", "positive", "convex", "concave"] as const satisfies readonly AllowedDirection[];
export const KEY_FIGURE_NAMES = [
  "spindleRunOut",
  "axialSlip",
  "spindleParallelismVertical",
  "spindleParallelismHorizontal",
  "centreHeight",
  "bedStraightness",
  "tableFlatness",
  "travelSquareness",
  "xPositioningAccuracy",
  "xRepeatability",
  "yPositioningAccuracy",
  "yRepeatability",
  "zPositioningAccuracy",
  "zRepeatability",
] as const satisfies readonly KeyFigureName[];
const CONFIDENCES = ["published", "manufacturer", "common-practice", "from-memory"] as const satisfies readonly SourceConfidence[];

export const PROFILE_LIMITS = { tests: 80, steps: 12, limits: 4, tolerance: 10_000, length: 20_000 } as const;

/** A positive, finite number with a message that names the field. */
function amount(what: string, unit: string, max: number) {
  return z
    .number({ error: (issue) => (issue.input === undefined ? `Give ${what} (${unit}).` : `${what[0]!.toUpperCase()}${what.slice(1)} must be a number (${unit}).`) })
    .refine(Number.isFinite, { error: `${what[0]!.toUpperCase()}${what.slice(1)} must be a finite number (${unit}).`, abort: true })
    .positive(`${what[0]!.toUpperCase()}${what.slice(1)} must be greater than 0 (${unit}).`)
    .max(max, `${what[0]!.toUpperCase()}${what.slice(1)} looks wrong: at most ${max} ${unit}.`);
}

const optionalText = (label: string, max: number) =>
  safeText({ label, max })
    .optional()
    .transform((value) => (value ? value : undefined));

export const valueSourceSchema = z
  .object({
    confidence: z.enum(CONFIDENCES, { error: "Say where the value comes from: published, maker's chart, common practice or from memory." }),
    document: optionalText("document", 200),
    edition: optionalText("edition", 40),
    clause: optionalText("clause or test number", 80),
    note: optionalText("note", 300),
  })
  .superRefine((source, ctx) => {
    if (source.confidence === "published") {
      if (!source.document) ctx.addIssue({ code: "custom", path: ["document"], message: "Name the standard, e.g. IS 6040." });
      if (!source.edition) ctx.addIssue({ code: "custom", path: ["edition"], message: "Give the standard's edition, e.g. 1993." });
      if (!source.clause) ctx.addIssue({ code: "custom", path: ["clause"], message: "Give the clause or test number, e.g. clause 3.5." });
    }
    if (source.confidence === "manufacturer" && !source.document) {
      ctx.addIssue({ code: "custom", path: ["document"], message: "Give the title of the maker's chart." });
    }
  });

const toleranceSpecSchema = z.discriminatedUnion(
  "type",
  [
    z.object({ type: z.literal("fixed"), tolerance: amount("the tolerance", "µm", PROFILE_LIMITS.tolerance), source: valueSourceSchema }),
    z
      .object({
        type: z.literal("proportional"),
        tolerance: amount("the tolerance", "µm", PROFILE_LIMITS.tolerance),
        over: amount("the length the tolerance is given over", "mm", PROFILE_LIMITS.length),
        minimum: amount("the minimum tolerance", "µm", PROFILE_LIMITS.tolerance),
        maximum: amount("the maximum tolerance", "µm", PROFILE_LIMITS.tolerance).optional(),
        source: valueSourceSchema,
      })
      .refine((spec) => spec.maximum === undefined || spec.maximum >= spec.minimum, {
        path: ["maximum"],
        message: "The maximum tolerance is below the minimum; correct one of them.",
      }),
    z.object({
      type: z.literal("stepped"),
      steps: z
        .array(
          z.object({
            upTo: amount("the measuring length this step goes up to", "mm", PROFILE_LIMITS.length),
            tolerance: amount("the tolerance", "µm", PROFILE_LIMITS.tolerance),
          }),
        )
        .min(1, "Give at least one step: a length and its tolerance.")
        .max(PROFILE_LIMITS.steps, `At most ${PROFILE_LIMITS.steps} steps.`)
        .superRefine((steps, ctx) => {
          steps.forEach((step, i) => {
            if (i > 0 && step.upTo <= steps[i - 1]!.upTo) {
              ctx.addIssue({ code: "custom", path: [i, "upTo"], message: "Each step must go further than the one before." });
            }
          });
        }),
      source: valueSourceSchema,
    }),
  ],
  { error: "Choose the tolerance rule: fixed, proportional to length, or stepped by length." },
);

export const profileTestSchema = z
  .object({
    code: safeText({ label: "test code", max: 24, min: 2 }).regex(/^[A-Z0-9][A-Z0-9-]*$/, "Use capitals, digits and hyphens, e.g. L-SP-NOSE."),
    title: safeName({ label: "title", max: 120 }),
    measures: safeName({ label: "description of what is measured", max: 400 }),
    instrument: safeName({ label: "instrument", max: 400 }),
    measuringLength: z.object({
      nominal: amount("the measuring length", "mm", PROFILE_LIMITS.length).nullable(),
      description: safeName({ label: "measuring length description", max: 200 }),
    }),
    tolerance: toleranceSpecSchema,
    local: z
      .object({
        tolerance: amount("the local tolerance", "µm", PROFILE_LIMITS.tolerance),
        window: amount("the length the local tolerance holds over", "mm", PROFILE_LIMITS.length),
        source: valueSourceSchema,
      })
      .optional(),
    method: z.enum(EVALUATION_METHODS, { error: `Choose an evaluation method: ${EVALUATION_METHODS.join(", ")}.` }),
    reference: z.enum(["end-points", "least-squares", "minimum-zone"], { error: "Choose the reference line." }).optional(),
    overAnyWindow: amount("the window", "mm", PROFILE_LIMITS.length).optional(),
    direction: z.object({
      allowed: z.enum(ALLOWED_DIRECTIONS, { error: "Choose the allowed direction." }),
      positive: safeName({ label: "meaning of the positive direction", max: 200 }),
      source: valueSourceSchema,
    }),
    unit: z.enum(["µm", "µm/m"], { error: "Choose the unit: µm, or µm/m for level tilts." }),
    required: z.boolean({ error: "Say whether the test is required." }),
  })
  .superRefine((test, ctx) => {
    const signed = ["mandrel-inclination", "near-far", "centre-height", "squareness"].includes(test.method);
    const shaped = test.method === "straightness";
    const allowed = test.direction.allowed;
    if ((allowed === "convex" || allowed === "concave") && !shaped) {
      ctx.addIssue({ code: "custom", path: ["direction", "allowed"], message: "Convex or concave only applies to a straightness test." });
    }
    if (allowed === "positive" && !signed) {
      ctx.addIssue({ code: "custom", path: ["direction", "allowed"], message: "“Positive only” needs a signed method (mandrel, near–far, centre height, squareness)." });
    }
    if (test.reference && !shaped) {
      ctx.addIssue({ code: "custom", path: ["reference"], message: "A reference line only applies to a straightness test." });
    }
    if (test.method === "level-range" && test.unit !== "µm/m") {
      ctx.addIssue({ code: "custom", path: ["unit"], message: "Level tilts are in µm/m." });
    }
  });

const makerScopeSchema = z
  .object({
    make: safeName({ label: "make", max: 80 }),
    model: safeName({ label: "model", max: 80 }),
    serialFrom: optionalText("first serial number", 60),
    serialTo: optionalText("last serial number", 60),
    chart: safeName({ label: "title of the maker's chart", max: 200 }),
  })
  .refine((maker) => !maker.serialFrom || !maker.serialTo || compareSerials(maker.serialFrom, maker.serialTo) <= 0, {
    path: ["serialTo"],
    message: "The last serial number comes before the first; swap them.",
  });

export const profileScopeSchema = z.object({
  limits: z
    .array(
      z.object({
        dimension: z.enum(MACHINE_DIMENSIONS, { error: "Choose the size the limit applies to." }),
        maxMm: amount("the largest size covered", "mm", PROFILE_LIMITS.length),
      }),
    )
    .max(PROFILE_LIMITS.limits, `At most ${PROFILE_LIMITS.limits} size limits.`)
    .superRefine((limits, ctx) => {
      limits.forEach((limit, i) => {
        if (limits.findIndex((other) => other.dimension === limit.dimension) !== i) {
          ctx.addIssue({ code: "custom", path: [i, "dimension"], message: "This size is limited twice; keep one." });
        }
      });
    }),
  maker: makerScopeSchema.optional(),
  source: valueSourceSchema,
});

export const profileRulesSchema = z.object({
  minimumTolerance: z.object({ value: amount("the minimum tolerance", "µm", PROFILE_LIMITS.tolerance), source: valueSourceSchema }),
  rounding: z.object({ step: amount("the rounding step", "µm", 100), source: valueSourceSchema }).optional(),
  leastCount: z.object({ value: amount("the least count", "µm", 100), source: valueSourceSchema }).optional(),
});

/** What a profile says about itself, apart from its tests and identity: the part the editor's settings form edits. */
export const profileSettingsSchema = z.object({
  title: safeName({ label: "title", max: 200 }),
  category: z.enum(MACHINE_CATEGORIES, { error: `Choose the machine category: ${MACHINE_CATEGORIES.join(", ")}.` }),
  accuracyClass: z.enum(["normal", "precision"], { error: "Choose the accuracy class." }),
  scope: profileScopeSchema,
  rules: profileRulesSchema,
});

export const toleranceProfileSchema = z
  .object({
    key: safeText({ label: "profile key", max: 64, min: 3 }).regex(/^[a-z0-9][a-z0-9-]*$/, "Use lower-case letters, digits and hyphens, e.g. centre-lathe-normal."),
    version: z.number().int("The version is a whole number.").min(1, "Versions count from 1.").max(10_000),
    ...profileSettingsSchema.shape,
    keyFigures: z.partialRecord(z.enum(KEY_FIGURE_NAMES), safeText({ label: "test code", max: 24 })),
    tests: z.array(profileTestSchema).min(1, "A profile needs at least one test.").max(PROFILE_LIMITS.tests, `At most ${PROFILE_LIMITS.tests} tests.`),
  })
  .superRefine((profile, ctx) => {
    const codes = new Map<string, number>();
    profile.tests.forEach((test, i) => {
      if (codes.has(test.code)) ctx.addIssue({ code: "custom", path: ["tests", i, "code"], message: `Test code ${test.code} is used twice.` });
      else codes.set(test.code, i);
    });
    for (const [name, code] of Object.entries(profile.keyFigures)) {
      if (code && !codes.has(code)) ctx.addIssue({ code: "custom", path: ["keyFigures", name], message: `No test ${code} in this profile.` });
    }
  });

/** Serial numbers compare digit runs as numbers ("S-900" before "S-1200"). */
export function compareSerials(a: string, b: string): number {
  return a.localeCompare(b, "en", { numeric: true, sensitivity: "base" });
}

// The schema's output must stay assignable to the engine's types.
type Assignable<T, U> = [T] extends [U] ? true : false;
const profileTypesAgree: Assignable<z.output<typeof toleranceProfileSchema>, ToleranceProfile> = true;
const testTypesAgree: Assignable<z.output<typeof profileTestSchema>, ProfileTest> = true;
void profileTypesAgree;
void testTypesAgree;
