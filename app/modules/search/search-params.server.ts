// The buyer's search as URL parameters: the search page's address, GET /api/v1/listings and a saved search
// all use these names. Accuracy limits are in µm and sizes in mm; the `…In` twins take inches (what an
// inch user's form sends without JavaScript) and are converted with the geometry engine's exact 25.4.
import { z } from "zod";
import { safeText } from "~/modules/validation/text";
import { inchesToMicrometres, inchesToMillimetres } from "~/geometry/units";
import { machineCategories } from "~/modules/listings/catalogue";
import { currencies, toMinorUnits } from "~/modules/units/format";
import { listingSorts, supplyClasses, type ListingSearchQuery } from "../../../search/query.ts";
import { decodeListingCursor, MAX_CURSOR_LENGTH } from "./cursor.server";
import type { ListingCursorKey } from "./search.server";

export const MAX_HITS_PER_PAGE = 48;
export const DEFAULT_HITS_PER_PAGE = 12;

const categoryValues = machineCategories.map((category) => category.value) as [string, ...string[]];
const gradeValues = ["A", "B", "C", "D", "incomplete"] as const;
const supplyValues = supplyClasses.map((supply) => supply.value) as [(typeof supplyClasses)[number]["value"], ...(typeof supplyClasses)[number]["value"][]];

// An empty form field means "no limit", not zero.
const blankAsMissing = (value: unknown) => (value === "" || value === null ? undefined : value);
const number = (what: string, min: number, max: number, options: { exclusiveMin?: boolean } = {}) =>
  z.preprocess(
    blankAsMissing,
    z.coerce
      .number({ error: `${what} must be a number.` })
      .refine((value) => Number.isFinite(value), { error: `${what} must be a number.` })
      .refine((value) => (options.exclusiveMin ? value > min : value >= min), {
        error: options.exclusiveMin ? `${what} must be more than ${min}.` : `${what} must be at least ${min}.`,
      })
      .refine((value) => value <= max, { error: `${what} must be at most ${max}.` })
      .optional(),
  );
const whole = (what: string, min: number, max: number) =>
  z.preprocess(
    blankAsMissing,
    z.coerce
      .number({ error: `${what} must be a whole number.` })
      .int({ error: `${what} must be a whole number.` })
      .min(min, { error: `${what} must be at least ${min}.` })
      .max(max, { error: `${what} must be at most ${max}.` })
      .optional(),
  );
const list = <T extends z.ZodType>(item: T, max: number) =>
  z.array(item).max(max, { error: `Give at most ${max} values.` }).optional();

const micrometres = (what: string) => number(`${what} (µm)`, 0, 10_000, { exclusiveMin: true });
const inches = (what: string) => number(`${what} (in)`, 0, 0.5, { exclusiveMin: true });
const millimetres = (what: string) => number(`${what} (mm)`, 0, 20_000);
const lengthInches = (what: string) => number(`${what} (in)`, 0, 800);

export const listingSearchParamsSchema = z
  .object({
    q: z.preprocess(blankAsMissing, safeText({ label: "search words", max: 200, messages: { tooLong: "Keep the search words under 200 characters." } }).optional()),
    category: list(z.enum(categoryValues, { error: `Category must be one of ${categoryValues.join(", ")}.` }), categoryValues.length),
    grade: list(z.enum(gradeValues, { error: "Grade must be A, B, C, D or incomplete." }), gradeValues.length),
    verified: z.preprocess(blankAsMissing, z.enum(["1", "true", "0", "false"], { error: "Verified must be 1 or 0." }).optional()),
    country: list(z.string().regex(/^[A-Za-z]{2}$/, { error: "Country must be a two-letter code, e.g. DE." }).transform((code) => code.toUpperCase()), 40),
    region: z.preprocess(blankAsMissing, safeText({ label: "region", max: 100 }).optional()),
    currency: z.preprocess(blankAsMissing, z.enum(currencies, { error: `Currency must be one of ${currencies.join(", ")}.` }).optional()),
    priceMin: number("Lowest price", 0, 100_000_000),
    priceMax: number("Highest price", 0, 100_000_000),
    swingMin: millimetres("Smallest swing"),
    swingMax: millimetres("Largest swing"),
    swingMinIn: lengthInches("Smallest swing"),
    swingMaxIn: lengthInches("Largest swing"),
    centresMin: millimetres("Shortest distance between centres"),
    centresMax: millimetres("Longest distance between centres"),
    centresMinIn: lengthInches("Shortest distance between centres"),
    centresMaxIn: lengthInches("Longest distance between centres"),
    runoutMax: micrometres("Spindle run-out"),
    runoutMaxIn: inches("Spindle run-out"),
    axialSlipMax: micrometres("Axial slip"),
    axialSlipMaxIn: inches("Axial slip"),
    parallelismMax: micrometres("Spindle-axis parallelism"),
    parallelismMaxIn: inches("Spindle-axis parallelism"),
    centreHeightMax: micrometres("Centre height difference"),
    centreHeightMaxIn: inches("Centre height difference"),
    flatnessMax: micrometres("Table flatness"),
    flatnessMaxIn: inches("Table flatness"),
    squarenessMax: micrometres("Squareness of travels"),
    squarenessMaxIn: inches("Squareness of travels"),
    xAccuracyMax: micrometres("X axis, positioning accuracy"),
    xAccuracyMaxIn: inches("X axis, positioning accuracy"),
    xRepeatabilityMax: micrometres("X axis, repeatability"),
    xRepeatabilityMaxIn: inches("X axis, repeatability"),
    yAccuracyMax: micrometres("Y axis, positioning accuracy"),
    yAccuracyMaxIn: inches("Y axis, positioning accuracy"),
    yRepeatabilityMax: micrometres("Y axis, repeatability"),
    yRepeatabilityMaxIn: inches("Y axis, repeatability"),
    zAccuracyMax: micrometres("Z axis, positioning accuracy"),
    zAccuracyMaxIn: inches("Z axis, positioning accuracy"),
    zRepeatabilityMax: micrometres("Z axis, repeatability"),
    zRepeatabilityMaxIn: inches("Z axis, repeatability"),
    reportAgeMax: whole("Report age (days)", 1, 3650),
    supply: z.preprocess(blankAsMissing, z.enum(supplyValues, { error: `Supply must be one of ${supplyValues.join(", ")}.` }).optional()),
    sort: z.preprocess(blankAsMissing, z.enum(listingSorts, { error: `Sort must be one of ${listingSorts.join(", ")}.` }).optional()),
    page: whole("Page", 1, 1000),
    // The continuation cursor of a previous answer (`nextCursor`): checked against this search below.
    after: z.preprocess(
      blankAsMissing,
      z.string().max(MAX_CURSOR_LENGTH, { error: "This page link is not valid (it is too long); start the search again from its first page." }).optional(),
    ),
    perPage: whole("Results per page", 1, MAX_HITS_PER_PAGE),
    // Only the words of suggestions and summaries; numbers in parameters and answers stay µm and mm.
    units: z.preprocess(blankAsMissing, z.enum(["mm", "inch"], { error: "Units must be mm or inch." }).optional()),
  });

type FieldErrors = Record<string, string[]>;

// Checks across fields, on the fields that parsed (each field is parsed on its own, so that one bad
// field does not hide the others' messages).
function crossFieldErrors(params: Partial<ListingSearchParams>): FieldErrors {
  const errors: FieldErrors = {};
  const ordered = (low: number | undefined, high: number | undefined, key: string, what: string) => {
    if (low !== undefined && high !== undefined && low > high) (errors[key] ??= []).push(`${what}: the upper limit is below the lower one.`);
  };
  ordered(params.priceMin, params.priceMax, "priceMax", "Price");
  ordered(params.swingMin, params.swingMax, "swingMax", "Swing");
  ordered(params.swingMinIn, params.swingMaxIn, "swingMaxIn", "Swing");
  ordered(params.centresMin, params.centresMax, "centresMax", "Distance between centres");
  ordered(params.centresMinIn, params.centresMaxIn, "centresMaxIn", "Distance between centres");
  if ((params.priceMin !== undefined || params.priceMax !== undefined) && !params.currency) {
    (errors.currency ??= []).push("Say which currency the price range is in (listings are not converted).");
  }
  return errors;
}

export type ListingSearchParams = z.output<typeof listingSearchParamsSchema>;

const listKeys = new Set(["category", "grade", "country"]);

/** URLSearchParams to a plain object: list parameters repeat (or are comma-separated), others take their last value. */
function paramsObject(params: URLSearchParams): Record<string, unknown> {
  const shape = listingSearchParamsSchema.shape;
  const object: Record<string, unknown> = {};
  for (const key of Object.keys(shape)) {
    const values = params.getAll(key);
    if (!values.length) continue;
    object[key] = listKeys.has(key) ? values.flatMap((value) => value.split(",")).map((value) => value.trim()).filter(Boolean) : values.at(-1);
  }
  return object;
}

// To 0.001 µm and 0.01 mm: enough for any gauge, and free of float noise (0.0002 in is 5.08 µm, not 5.0799…).
const roundTo = (value: number, digits: number) => Math.round(value * 10 ** digits) / 10 ** digits;
const microns = (um: number | undefined, inch: number | undefined) => (inch !== undefined ? roundTo(inchesToMicrometres(inch), 3) : um);
const millis = (mm: number | undefined, inch: number | undefined) => (inch !== undefined ? roundTo(inchesToMillimetres(inch), 2) : mm);

export function queryFromParams(params: ListingSearchParams): ListingSearchQuery {
  const range = (min: number | undefined, max: number | undefined) => (min === undefined && max === undefined ? undefined : { min, max });
  return {
    text: params.q || undefined,
    categories: params.category?.length ? params.category : undefined,
    grades: params.grade?.length ? params.grade : undefined,
    verifiedOnly: params.verified === "1" || params.verified === "true" || undefined,
    countries: params.country?.length ? params.country : undefined,
    region: params.region,
    currency: params.currency,
    priceMinor: range(
      params.priceMin === undefined ? undefined : toMinorUnits(params.priceMin),
      params.priceMax === undefined ? undefined : toMinorUnits(params.priceMax),
    ),
    swingMm: range(millis(params.swingMin, params.swingMinIn), millis(params.swingMax, params.swingMaxIn)),
    betweenCentresMm: range(millis(params.centresMin, params.centresMinIn), millis(params.centresMax, params.centresMaxIn)),
    maxSpindleRunoutUm: microns(params.runoutMax, params.runoutMaxIn),
    maxAxialSlipUm: microns(params.axialSlipMax, params.axialSlipMaxIn),
    maxSpindleParallelismUm: microns(params.parallelismMax, params.parallelismMaxIn),
    maxCentreHeightUm: microns(params.centreHeightMax, params.centreHeightMaxIn),
    maxTableFlatnessUm: microns(params.flatnessMax, params.flatnessMaxIn),
    maxTravelSquarenessUm: microns(params.squarenessMax, params.squarenessMaxIn),
    maxXPositioningAccuracyUm: microns(params.xAccuracyMax, params.xAccuracyMaxIn),
    maxXRepeatabilityUm: microns(params.xRepeatabilityMax, params.xRepeatabilityMaxIn),
    maxYPositioningAccuracyUm: microns(params.yAccuracyMax, params.yAccuracyMaxIn),
    maxYRepeatabilityUm: microns(params.yRepeatabilityMax, params.yRepeatabilityMaxIn),
    maxZPositioningAccuracyUm: microns(params.zAccuracyMax, params.zAccuracyMaxIn),
    maxZRepeatabilityUm: microns(params.zRepeatabilityMax, params.zRepeatabilityMaxIn),
    maxReportAgeDays: params.reportAgeMax,
    supply: params.supply,
    sort: params.sort ?? (params.q ? "relevance" : "newest"),
    page: params.page ?? 1,
    hitsPerPage: params.perPage ?? DEFAULT_HITS_PER_PAGE,
  };
}

/**
 * The query written back as parameters in one fixed order, µm and mm only: what the page puts in its
 * address and what a saved search keeps. Page and page size are left out unless `withPage`.
 */
export function paramsFromQuery(query: ListingSearchQuery, options: { withPage?: boolean } = {}): URLSearchParams {
  const params = new URLSearchParams();
  const put = (key: string, value: string | number | undefined | null) => {
    if (value !== undefined && value !== null && value !== "") params.append(key, String(value));
  };
  put("q", query.text);
  for (const category of query.categories ?? []) put("category", category);
  for (const grade of query.grades ?? []) put("grade", grade);
  if (query.verifiedOnly) put("verified", "1");
  for (const country of query.countries ?? []) put("country", country);
  put("region", query.region);
  if (query.priceMinor?.min != null || query.priceMinor?.max != null) put("currency", query.currency);
  put("priceMin", query.priceMinor?.min == null ? undefined : query.priceMinor.min / 100);
  put("priceMax", query.priceMinor?.max == null ? undefined : query.priceMinor.max / 100);
  put("swingMin", query.swingMm?.min);
  put("swingMax", query.swingMm?.max);
  put("centresMin", query.betweenCentresMm?.min);
  put("centresMax", query.betweenCentresMm?.max);
  put("runoutMax", query.maxSpindleRunoutUm);
  put("axialSlipMax", query.maxAxialSlipUm);
  put("parallelismMax", query.maxSpindleParallelismUm);
  put("centreHeightMax", query.maxCentreHeightUm);
  put("flatnessMax", query.maxTableFlatnessUm);
  put("squarenessMax", query.maxTravelSquarenessUm);
  put("xAccuracyMax", query.maxXPositioningAccuracyUm);
  put("xRepeatabilityMax", query.maxXRepeatabilityUm);
  put("yAccuracyMax", query.maxYPositioningAccuracyUm);
  put("yRepeatabilityMax", query.maxYRepeatabilityUm);
  put("zAccuracyMax", query.maxZPositioningAccuracyUm);
  put("zRepeatabilityMax", query.maxZRepeatabilityUm);
  put("reportAgeMax", query.maxReportAgeDays);
  put("supply", query.supply);
  const defaultSort = query.text ? "relevance" : "newest";
  if (query.sort && query.sort !== defaultSort) put("sort", query.sort);
  if (options.withPage) {
    if (query.page && query.page > 1) put("page", query.page);
    if (query.hitsPerPage && query.hitsPerPage !== DEFAULT_HITS_PER_PAGE) put("perPage", query.hitsPerPage);
  }
  return params;
}

export type ParsedSearchParams =
  | { success: true; query: ListingSearchQuery; units: "mm" | "inch" | undefined; after: ListingCursorKey | null }
  | { success: false; errors: Record<string, string[]> };

/** Validates the parameters; on failure, the messages per parameter name. */
export function parseListingSearchParams(params: URLSearchParams): ParsedSearchParams {
  const raw = paramsObject(params);
  const shape = listingSearchParamsSchema.shape;
  const values: Record<string, unknown> = {};
  const errors: FieldErrors = {};
  for (const key of Object.keys(shape) as (keyof typeof shape)[]) {
    const parsed = shape[key].safeParse(raw[key]);
    if (parsed.success) values[key] = parsed.data;
    else errors[key] = parsed.error.issues.map((issue) => issue.message);
  }
  for (const [key, messages] of Object.entries(crossFieldErrors(values as Partial<ListingSearchParams>))) (errors[key] ??= []).push(...messages);
  if (Object.keys(errors).length) return { success: false, errors };
  const parsed = listingSearchParamsSchema.parse(raw);
  const query = queryFromParams(parsed);
  // A page asked for by number (the page's numbered links) wins over a cursor left in the address.
  if (!parsed.after || parsed.page !== undefined) return { success: true, query, units: parsed.units, after: null };
  // A cursor names the page it continues to; it must have been made for this very search.
  const decoded = decodeListingCursor(parsed.after, query, paramsFromQuery(query).toString());
  if (!decoded.ok) return { success: false, errors: { after: [decoded.message] } };
  return { success: true, query: { ...query, page: decoded.cursor.page }, units: parsed.units, after: decoded.cursor.key };
}
