// A rebuild record as the seller types it and as a buyer reads it. Pure: shared by the entry page (live preview)
// and the server (the authoritative scoring on save). The readings are report forms, scored by the report engine.
import { z } from "zod";
import type { TestResult, ToleranceProfile } from "~/geometry";
import { instrumentEntrySchema, previewReport, reportFormSchema, testEntrySchema, type ReportForm } from "~/modules/reports/form";
import { keyedByTestCode } from "~/geometry";
import { safeText } from "~/modules/validation/text";

export const WORK_ITEMS = [
  { value: "bearings-adjusted", label: "Spindle bearings adjusted (preload and running clearance)" },
  { value: "bearings-replaced", label: "Spindle bearings replaced" },
  { value: "headstock-shimmed", label: "Headstock shimmed or realigned" },
  { value: "tailstock-aligned", label: "Tailstock realigned (set-over or height)" },
  { value: "ways-scraped", label: "Ways scraped" },
  { value: "ways-reground", label: "Ways reground" },
  { value: "gibs-adjusted", label: "Gibs adjusted or replaced" },
  { value: "levelled", label: "Machine levelled on its feet" },
  { value: "leadscrew-nut", label: "Leadscrew or cross-slide nut renewed" },
] as const;
export type WorkItem = (typeof WORK_ITEMS)[number]["value"];

export const REBUILD_PHOTOS = 12;

const readingSet = z.object({
  measuredOn: z.union([z.literal(""), z.iso.date({ error: "Give the date as YYYY-MM-DD." })]).default(""),
  tests: keyedByTestCode(testEntrySchema).default({}),
});

export const rebuildFormSchema = z.object({
  units: z.enum(["mm", "inch"], { error: 'Choose "mm" or "inch" for the readings.' }),
  profile: z.object({ key: safeText({ label: "profile", max: 80, min: 1 }), version: z.number().int().positive() }),
  /** The instruments the readings were taken with (both sets choose from the same list, as on the report form). */
  instruments: z.array(instrumentEntrySchema).max(30, "At most 30 instruments.").default([]),
  asFound: readingSet,
  asRebuilt: readingSet,
  workDone: z
    .array(z.enum(WORK_ITEMS.map((item) => item.value) as [WorkItem, ...WorkItem[]], { error: "Choose work from the list." }))
    .max(WORK_ITEMS.length)
    .default([]),
  notes: safeText({ label: "notes", max: 4000, multiline: true, messages: { tooLong: "Keep the notes under 4000 characters." } }).default(""),
  /** Listing photos that show the work, in the order chosen. */
  photoIds: z.array(z.uuid({ error: "Choose photos from the listing's own." })).max(REBUILD_PHOTOS, `At most ${REBUILD_PHOTOS} photos.`).default([]),
});

export type RebuildForm = z.output<typeof rebuildFormSchema>;
export type ReadingSetName = "asFound" | "asRebuilt";

/** One reading set as a report form, so the report form's checks and the engine score it unchanged. */
export function asReportForm(form: RebuildForm, set: ReadingSetName): ReportForm {
  return reportFormSchema.parse({
    units: form.units,
    profile: { ...form.profile, reason: "" },
    measuredOn: form[set].measuredOn,
    instruments: form.instruments,
    tests: form[set].tests,
  });
}

export function previewRebuild(form: RebuildForm, profile: ToleranceProfile | undefined) {
  return { asFound: previewReport(asReportForm(form, "asFound"), profile), asRebuilt: previewReport(asReportForm(form, "asRebuilt"), profile) };
}

export function emptyRebuildForm(options: { profileKey: string; profileVersion: number; units: "mm" | "inch" }): RebuildForm {
  return rebuildFormSchema.parse({
    units: options.units,
    profile: { key: options.profileKey, version: options.profileVersion },
    asFound: {},
    asRebuilt: {},
  });
}

// ————— As a buyer reads it —————

export type StoredResult = Pick<TestResult, "code" | "title" | "unit" | "value" | "tolerance" | "pass" | "ratio">;

export interface TestPair {
  code: string;
  title: string;
  unit: "µm" | "µm/m";
  tolerance: number;
  before: number | null;
  after: number | null;
  /** after − before in size (|after| − |before|): negative when the rebuild made the test read closer to true. */
  change: number | null;
  afterPass: boolean | null;
  /** The signed report's value for this test, when one confirms the record. */
  signed: number | null;
}

export function pairResults(asFound: readonly StoredResult[], asRebuilt: readonly StoredResult[]): TestPair[] {
  const codes = [...new Set([...asFound.map((r) => r.code), ...asRebuilt.map((r) => r.code)])];
  return codes.map((code) => {
    const before = asFound.find((r) => r.code === code) ?? null;
    const after = asRebuilt.find((r) => r.code === code) ?? null;
    const either = (after ?? before)!;
    return {
      code,
      title: either.title,
      unit: either.unit,
      tolerance: either.tolerance,
      before: before?.value ?? null,
      after: after?.value ?? null,
      change: before && after ? Math.abs(after.value) - Math.abs(before.value) : null,
      afterPass: after?.pass ?? null,
      signed: null,
    };
  });
}

/**
 * How much worse than declared a signed figure may read and still confirm it: a quarter of the test's tolerance,
 * because a second set-up on another day never reads exactly the same (our own rule; see
 * docs/decisions/rebuild-records.md).
 */
export const CONFIRMATION_SLACK = 0.25;

/**
 * Whether a signed report confirms the as-rebuilt figures: it was measured on or after the rebuild's date, holds
 * every as-rebuilt test, and each of its figures reads no worse than declared by more than the slack. Anything
 * else leaves the record declared by the seller.
 */
export function confirmsRebuild(
  asRebuilt: readonly StoredResult[],
  asRebuiltOn: string | null,
  signed: { measuredOn: string; results: readonly StoredResult[] } | null,
): boolean {
  if (!signed || !asRebuiltOn || asRebuilt.length === 0) return false;
  if (signed.measuredOn < asRebuiltOn) return false;
  return asRebuilt.every((declared) => {
    const found = signed.results.find((result) => result.code === declared.code);
    if (!found) return false;
    return Math.abs(found.value) <= Math.abs(declared.value) + CONFIRMATION_SLACK * declared.tolerance;
  });
}
