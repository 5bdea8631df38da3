import { z } from "zod";
import { KINDS_FOR_METHOD } from "./acceptance-tests";
import { MEASUREMENT_LIMITS, measurementLimitIssues } from "./limits";
import { findProfile } from "./profiles";
import { STRAIGHTNESS_REFERENCES } from "./straightness";
import { FLATNESS_LIMITS, FLATNESS_REFERENCES } from "./flatness";
import { POSITIONING_LIMITS } from "./positioning";
import { CIRCULAR_LIMITS } from "./circular";
import type { ReportMeasurements, TestMeasurement, ToleranceProfile } from "./types";

// One schema per measurement kind, shared by the API and the forms. Values are in the request's units:
// "mm" → stations and lengths in mm, readings and resolution in µm; "inch" → all in inches.
// Level tilts are ratios and always in µm/m (the same number as µin/in).

function numberField(what: string, unit = "") {
  const suffix = unit ? ` (${unit})` : "";
  return z.number({
    error: (issue) => (issue.input === undefined ? `${what} is required${suffix}.` : `${what} must be a number${suffix}.`),
  });
}

const READING_UNIT = "µm, or inches in inch mode";
const thousands = (count: number) => count.toLocaleString("en-GB").replace(/,/g, " ");
const STATIONS_TEXT = thousands(MEASUREMENT_LIMITS.stationsPerTest);
const LENGTH_UNIT = "mm, or inches in inch mode";

const resolution = numberField("The instrument resolution", READING_UNIT)
  .positive("The instrument resolution must be greater than 0: give the smallest step the instrument reads.")
  .optional();

const length = numberField("The distance between the near and far readings", LENGTH_UNIT)
  .positive("The distance between the near and far readings must be greater than 0.")
  .optional();

function pointsSchema(readingWhat: string, readingUnit: string) {
  return z
    .array(
      z.object({
        station: numberField("The station", LENGTH_UNIT),
        reading: numberField(readingWhat, readingUnit),
      }),
      { error: "Give the readings as a list of { station, reading } points." },
    )
    .min(2, "Give readings at two stations at least (a straightness needs three to mean anything).")
    .max(
      MEASUREMENT_LIMITS.stationsPerTest,
      `At most ${STATIONS_TEXT} stations per test; read fewer stations or split the travel into parts.`,
    )
    .superRefine((points, ctx) => {
      const seen = new Map<number, number>();
      points.forEach((point, i) => {
        const first = seen.get(point.station);
        if (first !== undefined) {
          ctx.addIssue({
            code: "custom",
            path: [i, "station"],
            message:
              `Station ${point.station} is given twice (points ${first + 1} and ${i + 1}); ` +
              `read each station once, or average the repeated readings.`,
          });
        } else {
          seen.set(point.station, i);
        }
      });
    });
}

export const sweepMeasurementSchema = z.object({
  kind: z.literal("sweep"),
  readings: z
    .array(numberField("Each indicator reading", READING_UNIT), { error: "Give the indicator readings as a list of numbers." })
    .min(2, 'Give at least two indicator readings over a full revolution, or the highest and lowest as kind "extremes".')
    .max(
      MEASUREMENT_LIMITS.readingsPerSweep,
      `At most ${thousands(MEASUREMENT_LIMITS.readingsPerSweep)} readings per sweep; give the highest and lowest as kind "extremes" instead.`,
    ),
  resolution,
});

export const extremesMeasurementSchema = z
  .object({
    kind: z.literal("extremes"),
    max: numberField("The highest reading over a revolution", READING_UNIT),
    min: numberField("The lowest reading over a revolution", READING_UNIT),
    resolution,
  })
  .refine((m) => m.max >= m.min, {
    path: ["max"],
    message: "The highest reading is below the lowest; swap them.",
  });

export const profileMeasurementSchema = z.object({
  kind: z.literal("profile"),
  points: pointsSchema("The reading", READING_UNIT),
  reference: z
    .enum(STRAIGHTNESS_REFERENCES as ["end-points", "least-squares", "minimum-zone"], {
      error: `The reference line must be one of ${STRAIGHTNESS_REFERENCES.join(", ")}.`,
    })
    .optional(),
  resolution,
});

export const levelMeasurementSchema = z.object({
  kind: z.literal("level"),
  points: pointsSchema("The level tilt", "µm/m in both unit modes"),
  resolution: numberField("The level's resolution", "µm/m")
    .positive("The level's resolution must be greater than 0 (µm/m).")
    .optional(),
});

const atBothAngles = (end: string) =>
  z.object(
    {
      at0: numberField(`The ${end} reading with the spindle at 0°`, READING_UNIT),
      at180: numberField(`The ${end} reading with the spindle turned 180°`, READING_UNIT),
    },
    { error: `Give the ${end} readings as { at0, at180 }.` },
  );

export const mandrelMeasurementSchema = z.object({
  kind: z.literal("mandrel"),
  near: atBothAngles("near-end"),
  far: atBothAngles("far-end"),
  length,
  resolution,
});

export const nearFarMeasurementSchema = z.object({
  kind: z.literal("near-far"),
  near: numberField("The near reading", READING_UNIT),
  far: numberField("The far reading", READING_UNIT),
  length,
  resolution,
});

export const centreHeightMeasurementSchema = z.object({
  kind: z.literal("centre-height"),
  headstockEnd: numberField("The reading at the headstock end", READING_UNIT),
  tailstockEnd: numberField("The reading at the tailstock end", READING_UNIT),
  resolution,
});

export const surfaceMeasurementSchema = z.object({
  kind: z.literal("surface"),
  points: z
    .array(
      z.object({
        x: numberField("The x of a point", LENGTH_UNIT),
        y: numberField("The y of a point", LENGTH_UNIT),
        z: numberField("The height", READING_UNIT),
      }),
      { error: "Give the heights as a list of { x, y, z } points." },
    )
    .min(3, "Give heights at three places at least, not all on one line.")
    .max(
      FLATNESS_LIMITS.pointsPerSurface,
      `At most ${thousands(FLATNESS_LIMITS.pointsPerSurface)} points per surface (a 50 × 50 grid); read a coarser grid.`,
    )
    .superRefine((points, ctx) => {
      const seen = new Map<string, number>();
      points.forEach((point, i) => {
        const key = `${point.x}|${point.y}`;
        const first = seen.get(key);
        if (first !== undefined) {
          ctx.addIssue({
            code: "custom",
            path: [i, "x"],
            message: `The place x ${point.x}, y ${point.y} is given twice (points ${first + 1} and ${i + 1}); read each place once.`,
          });
        } else seen.set(key, i);
      });
    }),
  reference: z
    .enum(FLATNESS_REFERENCES as unknown as ["least-squares", "minimum-zone"], {
      error: `The reference plane must be one of ${FLATNESS_REFERENCES.join(", ")}.`,
    })
    .optional(),
  resolution,
});

const deviationRun = (direction: string) =>
  z
    .array(numberField(`Each deviation ${direction}`, READING_UNIT), { error: `Give each run ${direction} as a list of deviations, one per target.` })
    .min(2, "Give a deviation at every target of the run.")
    .max(POSITIONING_LIMITS.targets, `At most ${thousands(POSITIONING_LIMITS.targets)} targets per axis.`);

const runsOf = (direction: string) =>
  z
    .array(deviationRun(direction), { error: `Give the runs ${direction} as a list of runs.` })
    .min(2, `Give at least 2 runs ${direction} (ISO 230-2 asks for 5).`)
    .max(POSITIONING_LIMITS.runsPerDirection, `At most ${POSITIONING_LIMITS.runsPerDirection} runs per direction.`);

export const positioningMeasurementSchema = z
  .object({
    kind: z.literal("positioning"),
    targets: z
      .array(numberField("Each target", LENGTH_UNIT), { error: "Give the targets as a list of positions along the axis." })
      .min(2, "Give at least 2 targets (ISO 230-2 asks for 5 per metre and at least 5).")
      .max(POSITIONING_LIMITS.targets, `At most ${thousands(POSITIONING_LIMITS.targets)} targets per axis.`),
    forward: runsOf("approaching in the positive direction"),
    reverse: runsOf("approaching in the negative direction"),
    resolution,
  })
  .superRefine((m, ctx) => {
    m.targets.forEach((target, i) => {
      if (i > 0 && !(target > m.targets[i - 1]!)) ctx.addIssue({ code: "custom", path: ["targets", i], message: "Targets must be strictly increasing." });
    });
    for (const direction of ["forward", "reverse"] as const) {
      m[direction].forEach((run, j) => {
        if (run.length !== m.targets.length) {
          ctx.addIssue({ code: "custom", path: [direction, j], message: `Run ${j + 1} has ${run.length} deviations for ${m.targets.length} targets.` });
        }
      });
    }
  });

const radialReadings = (direction: string) =>
  z
    .array(
      z.object({
        angle: numberField("The angle", "degrees").min(0, "Angles run from 0 up to 360 degrees.").lt(360, "Angles run from 0 up to (not including) 360 degrees."),
        deviation: numberField("The radial deviation", READING_UNIT),
      }),
      { error: `Give the ${direction} readings as a list of { angle, deviation }.` },
    )
    .min(CIRCULAR_LIMITS.fewestReadings, `Give at least ${CIRCULAR_LIMITS.fewestReadings} readings ${direction} around the circle.`)
    .max(CIRCULAR_LIMITS.readingsPerDirection, `At most ${thousands(CIRCULAR_LIMITS.readingsPerDirection)} readings per direction.`);

export const circularMeasurementSchema = z.object({
  kind: z.literal("circular"),
  clockwise: radialReadings("clockwise"),
  counterClockwise: radialReadings("counter-clockwise"),
  resolution,
});

const MEASUREMENT_KINDS = ["sweep", "extremes", "profile", "level", "mandrel", "near-far", "centre-height", "surface", "positioning", "circular"] as const;

export const testMeasurementSchema = z.discriminatedUnion(
  "kind",
  [
    sweepMeasurementSchema,
    extremesMeasurementSchema,
    profileMeasurementSchema,
    levelMeasurementSchema,
    mandrelMeasurementSchema,
    nearFarMeasurementSchema,
    centreHeightMeasurementSchema,
    surfaceMeasurementSchema,
    positioningMeasurementSchema,
    circularMeasurementSchema,
  ],
  { error: `Say which kind of readings these are: one of ${MEASUREMENT_KINDS.join(", ")}.` },
);

const WEEK_MINUTES = 7 * 24 * 60;

export const conditionsSchema = z.object({
  ambientTemperatureC: numberField("The ambient temperature", "°C")
    .min(-40, "The ambient temperature looks wrong; give it in °C.")
    .max(60, "The ambient temperature looks wrong; give it in °C.")
    .optional(),
  warmUpMinutes: numberField("The warm-up run", "minutes")
    .min(0, "The warm-up run cannot be negative.")
    .max(WEEK_MINUTES, `A warm-up run longer than a week (${thousands(WEEK_MINUTES)} minutes) looks wrong; give it in minutes.`)
    .optional(),
  levelled: z.boolean({ error: "Say whether the machine was levelled: true or false." }).optional(),
});

/**
 * Entries keyed by test code. zod drops a "__proto__" key without a word (it would replace the prototype of
 * the object it builds), so that key is refused here, like any code a profile lacks.
 */
export function keyedByTestCode<T extends z.ZodType>(entry: T, error?: string) {
  return z.preprocess(
    (input, context) => {
      if (input !== null && typeof input === "object" && Object.hasOwn(input, "__proto__")) {
        context.addIssue({ code: "custom", path: ["__proto__"], message: '"__proto__" is not a test code.', input });
      }
      return input;
    },
    z.record(z.string().max(80, "A test code is a short code such as L-SP-NOSE."), entry, error ? { error } : undefined),
  );
}

export const reportMeasurementsSchema = z.object({
  measuredOn: z.iso.date({ error: "Give the date of the tests as YYYY-MM-DD." }).optional(),
  conditions: conditionsSchema.optional(),
  tests: keyedByTestCode(testMeasurementSchema, "Give the readings as an object keyed by test code, e.g. { \"L-SP-NOSE\": { ... } }.").refine(
    (tests) => Object.keys(tests).length <= MEASUREMENT_LIMITS.testsPerRequest,
    { message: `At most ${MEASUREMENT_LIMITS.testsPerRequest} tests per request; a profile has fewer.`, abort: true },
  ),
});

export const unitsSchema = z.enum(["mm", "inch"], {
  error: 'Say which units the readings are in: "mm" (stations in mm, readings in µm) or "inch" (both in inches).',
});

const evaluationRequestShape = z.object({
    profile: z.object(
      {
        key: z.string({ error: "Give the tolerance profile's key." }).min(1, "Give the tolerance profile's key."),
        version: z
          .number({ error: "Give the tolerance profile's version, a whole number." })
          .int("The profile version is a whole number.")
          .positive("The profile version is a whole number from 1."),
      },
      { error: "Say which tolerance profile to score against: { key, version }." },
    ),
    units: unitsSchema,
    measurements: reportMeasurementsSchema,
  });

/** The request schema against the profiles that may be scored (passed in: the engine holds none). */
export function evaluationRequestSchemaFor(profiles: readonly ToleranceProfile[]) {
  return evaluationRequestShape.superRefine((request, ctx) => {
    const profile = findProfile(profiles, request.profile.key, request.profile.version);
    if (!profile) {
      const sameKey = profiles.filter((p) => p.key === request.profile.key);
      ctx.addIssue(
        sameKey.length > 0
          ? {
              code: "custom",
              path: ["profile", "version"],
              message: `${request.profile.key} has versions ${sameKey.map((p) => p.version).join(", ")}, not ${request.profile.version}.`,
            }
          : {
              code: "custom",
              path: ["profile", "key"],
              message: `No tolerance profile "${request.profile.key}"; known profiles: ${[...new Set(profiles.map((p) => p.key))].join(", ")}.`,
            },
      );
      return;
    }
    for (const [code, measurement] of Object.entries(request.measurements.tests)) {
      for (const issue of measurementLimitIssues(measurement, request.units)) {
        ctx.addIssue({ code: "custom", path: ["measurements", "tests", code, ...issue.path], message: issue.message });
      }
      const test = profile.tests.find((t) => t.code === code);
      if (!test) {
        ctx.addIssue({
          code: "custom",
          path: ["measurements", "tests", code],
          message: `"${code}" is not a test of ${profile.key} v${profile.version}; its tests are ${profile.tests.map((t) => t.code).join(", ")}.`,
        });
        continue;
      }
      const kinds = KINDS_FOR_METHOD[test.method];
      if (!kinds.includes(measurement.kind)) {
        ctx.addIssue({
          code: "custom",
          path: ["measurements", "tests", code, "kind"],
          message: `${code} (${test.title}) takes ${kinds.map((k) => `"${k}"`).join(" or ")} readings, not "${measurement.kind}".`,
        });
      }
    }
  });
}

export type EvaluationRequestInput = z.input<typeof evaluationRequestShape>;

/** Zod issues as { "path.to.field": ["message", …] }; issues on the whole value go under "request". */
export function fieldErrors(error: z.ZodError): Record<string, string[]> {
  const errors: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? issue.path.map(String).join(".") : "request";
    (errors[key] ??= []).push(issue.message);
  }
  return errors;
}

// The schemas' output must stay assignable to the engine's types.
type Assignable<T, U> = [T] extends [U] ? true : false;
const measurementTypesAgree: Assignable<z.output<typeof testMeasurementSchema>, TestMeasurement> = true;
const reportTypesAgree: Assignable<z.output<typeof reportMeasurementsSchema>, ReportMeasurements> = true;
void measurementTypesAgree;
void reportTypesAgree;
