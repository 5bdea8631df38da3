// One zod schema per listing form, used by Conform in the browser (live errors) and on the server (the truth).
import { z } from "zod";
import { currencies, lengthUnitLabel, MILLIMETRES_PER_INCH, type DisplayUnits } from "~/modules/units/format";
import { KILOGRAMS_PER_POUND, KILOWATTS_PER_HORSEPOWER, powerUnitLabel, weightUnitLabel } from "~/modules/units/weight-power";
import { decimalAmount, safeName, safeText } from "~/modules/validation/text";
import { countryCodes, isLathe, machineCategories, machineConditions } from "./catalogue";

const categoryValues = machineCategories.map((c) => c.value) as [string, ...string[]];
const conditionValues = machineConditions.map((c) => c.value) as [string, ...string[]];

// Plausible ranges in the stored units; the form states them in the reader's.
const ranges = {
  swingOverBed: { min: 50, max: 5_000 },
  distanceBetweenCentres: { min: 100, max: 25_000 },
  spindleBore: { min: 5, max: 1_000 },
  tableLength: { min: 100, max: 10_000 },
  tableWidth: { min: 50, max: 3_000 },
  motorPower: { min: 0.05, max: 500 },
  swingOverCrossSlide: { min: 20, max: 4_000 },
  footprintLength: { min: 200, max: 40_000 },
  footprintWidth: { min: 200, max: 10_000 },
  weight: { min: 10, max: 250_000 },
};

function rangeIn(units: DisplayUnits, range: { min: number; max: number }, kind: "length" | "power" | "weight") {
  if (units === "mm") return range;
  const factor = kind === "length" ? 1 / MILLIMETRES_PER_INCH : kind === "weight" ? 1 / KILOGRAMS_PER_POUND : 1 / KILOWATTS_PER_HORSEPOWER;
  const digits = kind === "length" ? 1 : 0;
  const round = (value: number) => Number(value.toFixed(digits));
  return { min: Math.max(round(range.min * factor), 0.1), max: round(range.max * factor) };
}

const formatted = (value: number) => new Intl.NumberFormat("en").format(value);

/** An optional positive quantity in the reader's units, typed in decimal digits, with the messages a seller reads at the field. */
function quantity(label: string, unit: string, range: { min: number; max: number }) {
  return decimalAmount({ label, decimals: 3, messages: { invalid: `Enter the ${label} as a number in ${unit}.` } })
    .pipe(
      z
        .number()
        .min(range.min, { error: `The ${label} must be at least ${formatted(range.min)} ${unit}.` })
        .max(range.max, { error: `The ${label} must be at most ${formatted(range.max)} ${unit}.` }),
    )
    .optional();
}

// Quantities the trade writes in one unit whatever the reader's: volts, revolutions per minute, thread pitches
// in millimetres and inch threads per inch (a gearbox plate gives both, and nobody converts one to the other).
const supply = { voltage: { min: 24, max: 1_000 } };
const spindleSpeed = { min: 1, max: 100_000 };
const threadPitchMm = { min: 0.05, max: 200 };
const threadsPerInch = { min: 0.5, max: 400 };

/** A choice from a native select; an empty choice arrives as undefined (Conform's coercion). */
function choice<const T extends readonly [string, ...string[]]>(values: T, message: string) {
  return z.enum(values, { error: message }).optional();
}

/** A range typed as two fields: both or neither, the first at most the second. */
function pairRule(
  context: z.RefinementCtx,
  low: number | undefined,
  high: number | undefined,
  paths: [string, string],
  words: { both: string; order?: string },
) {
  if ((low === undefined) !== (high === undefined)) {
    context.addIssue({ code: "custom", path: [low === undefined ? paths[0] : paths[1]], message: words.both });
  } else if (words.order && low !== undefined && high !== undefined && low > high) {
    context.addIssue({ code: "custom", path: [paths[1]], message: words.order });
  }
}

function text(label: string, max: number, multiline = false) {
  return safeText({ label, max, multiline });
}

/** A text a listing cannot do without; an empty field arrives as undefined (Conform's coercion). */
function requiredText(label: string, max: number, missing: string) {
  return safeName({ label, max, messages: { missing, tooShort: missing } });
}

/** The listing form in the reader's units (sizes in mm or in, weight in kg or lb, power in kW or hp). */
export function listingFormSchema(units: DisplayUnits) {
  const length = lengthUnitLabel(units);
  const thisYear = new Date().getFullYear();
  return z.object({
    units: z.literal(units, { error: "The form's units changed; reload the page and try again." }),
    category: z.enum(categoryValues, { error: "Choose the kind of machine." }),
    make: requiredText("make", 80, "Enter the make, e.g. the name cast on the headstock."),
    model: requiredText("model", 80, "Enter the model."),
    year: decimalAmount({ label: "year of manufacture", decimals: 0, messages: { invalid: "Enter the year of manufacture as four digits, e.g. 1987." } })
      .pipe(
        z
          .number()
          .int()
          .min(1850, { error: "The year of manufacture must be 1850 or later." })
          .max(thisYear, { error: `The year of manufacture cannot be later than ${thisYear}.` }),
      )
      .optional(),
    serialNumber: text("serial number", 60).optional(),
    swingOverBed: quantity("swing over bed", length, rangeIn(units, ranges.swingOverBed, "length")),
    distanceBetweenCentres: quantity("distance between centres", length, rangeIn(units, ranges.distanceBetweenCentres, "length")),
    spindleBore: quantity("spindle bore", length, rangeIn(units, ranges.spindleBore, "length")),
    tableLength: quantity("table length", length, rangeIn(units, ranges.tableLength, "length")),
    tableWidth: quantity("table width", length, rangeIn(units, ranges.tableWidth, "length")),
    spindleNose: text("spindle nose", 60).optional(),
    supplyVoltage: decimalAmount({ label: "supply voltage", decimals: 0, messages: { invalid: "Enter the supply voltage in whole volts, e.g. 400." } })
      .pipe(
        z
          .number()
          .int()
          .min(supply.voltage.min, { error: `The supply voltage must be at least ${supply.voltage.min} V.` })
          .max(supply.voltage.max, { error: `The supply voltage must be at most ${formatted(supply.voltage.max)} V.` }),
      )
      .optional(),
    supplyPhases: choice(["1", "3"], "Choose single-phase or three-phase."),
    supplyFrequency: choice(["50", "60"], "Choose 50 Hz or 60 Hz."),
    spindleSpeedMin: quantity("lowest spindle speed", "rpm", spindleSpeed),
    spindleSpeedMax: quantity("highest spindle speed", "rpm", spindleSpeed),
    tailstockTaper: text("tailstock taper", 40).optional(),
    threadPitchMin: quantity("finest metric pitch", "mm", threadPitchMm),
    threadPitchMax: quantity("coarsest metric pitch", "mm", threadPitchMm),
    threadTpiMin: quantity("coarsest inch thread", "threads per inch", threadsPerInch),
    threadTpiMax: quantity("finest inch thread", "threads per inch", threadsPerInch),
    swingOverCrossSlide: quantity("swing over the cross-slide", length, rangeIn(units, ranges.swingOverCrossSlide, "length")),
    footprintLength: quantity("footprint length", length, rangeIn(units, ranges.footprintLength, "length")),
    footprintWidth: quantity("footprint width", length, rangeIn(units, ranges.footprintWidth, "length")),
    motorPower: quantity("motor power", powerUnitLabel(units), rangeIn(units, ranges.motorPower, "power")),
    weight: quantity("weight", weightUnitLabel(units), rangeIn(units, ranges.weight, "weight")),
    city: requiredText("town or city", 80, "Enter the town or city where the machine stands."),
    region: text("region", 80).optional(),
    country: z.enum(countryCodes, { error: "Choose the country where the machine stands." }),
    // Decimal digits only: Number() would have read "0x10" as 16 and "1e4" as 10,000.
    price: decimalAmount({ label: "asking price", decimals: 6, messages: { missing: "Enter the asking price as a number, e.g. 18500.", invalid: "Enter the asking price in digits, e.g. 18500." } }).pipe(
      z
        .number()
        .positive({ error: "The asking price must be more than zero." })
        .max(50_000_000, { error: "The asking price must be at most 50,000,000." })
        .refine((value) => Math.abs(Math.round(value * 100) - value * 100) < 1e-6, { error: "Give the price to at most two decimals." }),
    ),
    currency: z.enum(currencies, { error: "Choose the currency of the price." }),
    condition: z.enum(conditionValues, { error: "Choose the condition." }),
    toolingIncluded: text("list of tooling", 2_000, true).optional(),
    description: safeText({
      label: "description",
      max: 10_000,
      min: 30,
      multiline: true,
      messages: {
        missing: "Describe the machine: its history, the work done on it, and what comes with it.",
        tooShort: "Describe the machine in at least 30 characters.",
        tooLong: "Keep the description to 10,000 characters.",
      },
    }),
  })
    .superRefine((listing, context) => {
      // A supply is read as voltage and phases together: "400 V" alone does not say what to wire.
      if ((listing.supplyVoltage === undefined) !== (listing.supplyPhases === undefined)) {
        const path = listing.supplyVoltage === undefined ? "supplyVoltage" : "supplyPhases";
        context.addIssue({ code: "custom", path: [path], message: "Give the supply's voltage and its phases together, e.g. 400 V three-phase." });
      }
      if (listing.supplyFrequency !== undefined && listing.supplyVoltage === undefined) {
        context.addIssue({ code: "custom", path: ["supplyVoltage"], message: "Give the supply's voltage and phases with its frequency." });
      }
      pairRule(context, listing.spindleSpeedMin, listing.spindleSpeedMax, ["spindleSpeedMin", "spindleSpeedMax"], {
        both: "Give the lowest and the highest spindle speed (the same twice for a single speed).",
        order: "The highest spindle speed must be at least the lowest.",
      });
      pairRule(context, listing.threadPitchMin, listing.threadPitchMax, ["threadPitchMin", "threadPitchMax"], {
        both: "Give the finest and the coarsest metric pitch.",
        order: "The coarsest metric pitch must be at least the finest.",
      });
      pairRule(context, listing.threadTpiMin, listing.threadTpiMax, ["threadTpiMin", "threadTpiMax"], {
        both: "Give the coarsest and the finest inch thread, in threads per inch.",
        order: "The finest inch thread must have at least as many threads per inch as the coarsest.",
      });
      pairRule(context, listing.footprintLength, listing.footprintWidth, ["footprintLength", "footprintWidth"], {
        both: "Give the footprint's length and width.",
      });
      if (listing.swingOverCrossSlide !== undefined && listing.swingOverBed !== undefined && listing.swingOverCrossSlide > listing.swingOverBed) {
        context.addIssue({ code: "custom", path: ["swingOverCrossSlide"], message: "The swing over the cross-slide is smaller than the swing over the bed; check both." });
      }
      // Buyers size a lathe by these two figures first; a lathe listing without them cannot be found by size.
      if (!isLathe(listing.category)) return;
      if (listing.swingOverBed === undefined) {
        context.addIssue({ code: "custom", path: ["swingOverBed"], message: `Enter the swing over bed in ${length}; buyers size a lathe by it.` });
      }
      if (listing.distanceBetweenCentres === undefined) {
        context.addIssue({ code: "custom", path: ["distanceBetweenCentres"], message: `Enter the distance between centres in ${length}.` });
      }
    });
}

export type ListingFormValues = z.output<ReturnType<typeof listingFormSchema>>;

export const inquiryFormSchema = z.object({
  message: safeText({
    label: "message",
    max: 4_000,
    min: 10,
    multiline: true,
    messages: {
      missing: "Write your question to the seller.",
      tooShort: "Write at least 10 characters, so the seller knows what you are asking.",
      tooLong: "Keep the message to 4,000 characters.",
    },
  }),
  phone: safeText({ label: "phone number", max: 40 }).optional(),
});

export const documentTitleSchema = safeName({ label: "document title", max: 120 });

export const PHOTO_CAPTION_MAX = 160;
/** What a photo shows; empty clears it. */
export const photoCaptionSchema = z.preprocess((value) => value ?? "", safeText({ label: "caption", max: PHOTO_CAPTION_MAX }));
