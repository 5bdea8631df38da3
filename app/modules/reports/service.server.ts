// Accuracy reports: drafts saved as the inspector types, submission scored by the server alone, signing that
// seals the content for good, corrections as new revisions, and the reads behind the public pages and API.
import { randomUUID } from "node:crypto";
import { and, desc, eq, inArray, sql } from "drizzle-orm";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import { env } from "~/env.server";
import {
  fieldErrors,
  findProfile,
  GeometryInputError,
  inchesToMicrometres,
  KINDS_FOR_METHOD,
  newestVersions,
  scoreReport,
  suggestProfile,
  type KeyFigures,
  type ReportMeasurements,
  type TestMeasurement,
  type ToleranceProfile,
} from "~/geometry";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { sha256Hex } from "~/modules/files/images.server";
import { readObject, StorageUnavailableError } from "~/modules/files/storage.server";
import { recordReportFiled } from "~/modules/inspections/bookings.server";
import type { Executor } from "~/modules/inspections/profiles.server";
import { dayAtMachine } from "~/modules/inspections/local-time";
import { getBookingForReport, type BookingForReport } from "~/modules/inspections/report-queries.server";
import { countryName, labelOf, machineCategories } from "~/modules/listings/catalogue";
import { profilesForNewReports, scorableProfile } from "~/modules/profiles/service.server";
import { queueListingIndexUpdate } from "~/modules/search/indexing.server";
import { REPORT_FORMAT, engineCategory, setupPhotoUrl, type ReportContent } from "./content";

export { setupPhotoUrl };
import {
  checkConditions,
  checkTestEntry,
  formLimitErrors,
  INSTRUMENT_KINDS,
  instrumentReads,
  measuredOnCheck,
  metricMeasurements,
  newReportForm,
  reportFormSchema,
  type ReportForm,
} from "./form";
import { formFromContent } from "./form-from-content";
import { columnMappingOf } from "./column-mappings.server";
import { sendReportSignedNotices } from "./notices.server";
import { SAFETY_CAUTIONS } from "./safety";
import { reportDrafts, reportPhotos, reports, type ReportDraftRow, type ReportRow } from "./schema";
import { reportUrl, verificationUrl } from "./links.server";
import { HASH_PATTERN, canonicalJson, sealContent, sealHolds } from "./seal.server";
import { unrenderableNotice, unrenderableReason } from "./unrenderable";
import { buildReportCredential, credentialUrl, didWebOf } from "./credential";
import { readSealedReport, signingKeysAre } from "./sealed-read.server";
import { currentKeyFragment, reportSigningKey, signCredential, SigningKeyError } from "./signing.server";

/** An expected refusal: the route answers with `status` and shows `errors` at their fields. */
export class ReportRuleError extends Error {
  override name = "ReportRuleError";
  constructor(
    message: string,
    readonly status: 400 | 403 | 404 | 409 | 422 = 422,
    readonly errors: Record<string, string[]> = {},
  ) {
    super(message);
  }
}

type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

// ————— Who may write what —————

async function bookingOfInspector(db: Executor, inspector: Pick<SessionUser, "id">, bookingId: string): Promise<BookingForReport> {
  const found = await getBookingForReport(db, bookingId);
  if (!found || found.booking.inspectorId !== inspector.id) throw new ReportRuleError("There is no booking of yours at this address.", 404);
  return found;
}

async function signedReportOfBooking(db: Executor, bookingId: string): Promise<ReportRow | undefined> {
  const [row] = await db
    .select()
    .from(reports)
    .where(and(eq(reports.bookingId, bookingId), eq(reports.status, "signed")))
    .orderBy(desc(reports.signedAt))
    .limit(1);
  return row;
}

export type EntryMode =
  | { kind: "first" }
  | { kind: "correction"; corrects: ReportRow }
  | { kind: "locked"; reason: string; signed: ReportRow | null };

/** Whether the inspector may enter readings for this booking now: a first report, a correction, or neither. */
async function entryMode(db: Executor, found: BookingForReport, draft: ReportDraftRow | undefined): Promise<EntryMode> {
  const signed = (await signedReportOfBooking(db, found.booking.id)) ?? null;
  if (draft?.correctsReportId) {
    if (signed && signed.id === draft.correctsReportId) return { kind: "correction", corrects: signed };
    return { kind: "locked", reason: "The report this draft corrects has been corrected already.", signed };
  }
  if (signed) {
    return { kind: "locked", reason: "This booking's report is signed and cannot be changed. Start a correction to file a new revision.", signed };
  }
  if (found.booking.status !== "accepted") {
    return { kind: "locked", reason: `A report can only be filed for an accepted booking; this one is ${found.booking.status.replace("_", " ")}.`, signed: null };
  }
  if (found.listing.sellerId === found.booking.inspectorId) {
    return { kind: "locked", reason: "An inspector may not inspect their own listing.", signed: null };
  }
  return { kind: "first" };
}

async function draftOf(db: Executor, bookingId: string, lock = false): Promise<ReportDraftRow | undefined> {
  const query = db.select().from(reportDrafts).where(eq(reportDrafts.bookingId, bookingId));
  const [row] = lock ? await query.for("update") : await query;
  return row;
}

// ————— Profile suggestion —————

export type ProfileSuggestion = {
  profile: { key: string; version: number; title: string; makersChart: string | null } | null;
  reason: string;
  /** True when no profile covers the machine at all: staff can add one. */
  uncovered: boolean;
};

const NO_PROFILE_YET = "No profile covers this machine yet; staff can add one. Until then, choose the nearest profile and say why.";

const briefOf = (profile: ToleranceProfile) => ({ key: profile.key, version: profile.version, title: profile.title, makersChart: profile.scope.maker?.chart ?? null });

const DIMENSION_WORDS = { swingOverBedMm: "swing", distanceBetweenCentresMm: "between centres", tableLengthMm: "table length" } as const;

function scopeText(profile: ToleranceProfile) {
  const limits = profile.scope.limits.map((limit) => `${DIMENSION_WORDS[limit.dimension]} up to ${limit.maxMm} mm`);
  return limits.length ? limits.join(", ") : "any size";
}

/**
 * The profile to score this machine with, among the versions offered for new reports: the maker's own chart
 * for its make and model first, then the class for its category and size; and why, in a line.
 */
export function suggestionFor(listing: BookingForReport["listing"], offered: readonly ToleranceProfile[]): ProfileSuggestion {
  const categoryName = labelOf(machineCategories, listing.category).toLowerCase();
  const category = engineCategory(listing.category);
  if (!category) {
    return { profile: null, reason: `No tolerance profile covers a ${categoryName} yet; staff can add one. Until then, choose the nearest one and say why.`, uncovered: true };
  }
  if (category === "milling-machine" || category === "surface-grinder") {
    // Chosen by category and the table's length; without a length the inspector checks the size on site.
    const tableLength = listing.tableLengthMm ?? null;
    const profile = suggestProfile(offered, { category, dimensions: { tableLengthMm: tableLength }, make: listing.make, model: listing.model, serialNumber: listing.serialNumber });
    if (!profile) {
      return { profile: null, reason: `No ${categoryName} profile ${tableLength ? `covers a ${tableLength} mm table` : "yet"}. ${NO_PROFILE_YET}`, uncovered: true };
    }
    return {
      profile: briefOf(profile),
      reason: tableLength
        ? `A ${categoryName} with a ${tableLength} mm table is within this profile (${scopeText(profile)}).`
        : `The listing gives no table length, so the size could not be checked; measure the table and confirm the profile fits (${scopeText(profile)}).`,
      uncovered: false,
    };
  }
  if (category === "cnc-lathe" || category === "machining-centre") {
    // Positioning tolerances go by the travel the targets span, so no listing size is needed to choose.
    const profile = suggestProfile(offered, { category, dimensions: {}, make: listing.make, model: listing.model, serialNumber: listing.serialNumber });
    if (!profile) return { profile: null, reason: `No ${categoryName} profile yet. ${NO_PROFILE_YET}`, uncovered: true };
    const maker = profile.scope.maker;
    return {
      profile: briefOf(profile),
      reason: maker
        ? `The maker's positioning specification for the ${maker.make} ${maker.model}: “${maker.chart}”.`
        : `The ${categoryName} class; its positioning tolerances follow the travel your targets span, so read each axis over its full travel.`,
      uncovered: false,
    };
  }
  const swing = listing.swingOverBedMm;
  const centres = listing.distanceBetweenCentresMm;
  const machine = {
    category,
    dimensions: { swingOverBedMm: swing, distanceBetweenCentresMm: centres },
    make: listing.make,
    model: listing.model,
    serialNumber: listing.serialNumber,
  };
  const profile = suggestProfile(offered, machine);
  if (!profile) {
    const sizes = [swing ? `${swing} mm swing` : null, centres ? `${centres} mm between centres` : null].filter(Boolean).join(" and ");
    return { profile: null, reason: `No ${categoryName} profile covers ${sizes || "this machine"}. ${NO_PROFILE_YET}`, uncovered: true };
  }
  if (profile.scope.maker) {
    return {
      profile: briefOf(profile),
      reason: `The maker's chart for the ${profile.scope.maker.make} ${profile.scope.maker.model}${profile.scope.maker.serialFrom || profile.scope.maker.serialTo ? ` (serial numbers ${profile.scope.maker.serialFrom ?? "…"} to ${profile.scope.maker.serialTo ?? "…"})` : ""}: “${profile.scope.maker.chart}”.`,
      uncovered: false,
    };
  }
  if (!swing || !centres) {
    return {
      profile: briefOf(profile),
      reason: `The listing gives no ${!swing ? "swing over the bed" : "distance between centres"}, so the size could not be checked; measure it and confirm the profile fits (${scopeText(profile)}).`,
      uncovered: false,
    };
  }
  return {
    profile: briefOf(profile),
    reason: `A ${categoryName} with ${swing} mm swing and ${centres} mm between centres is within this profile (${scopeText(profile)}).`,
    uncovered: false,
  };
}

/** The profile a form names, if it may still be scored: offered for new reports, or (for a draft in progress) retired. */
async function profileOfForm(db: Executor, form: Pick<ReportForm, "profile">) {
  return scorableProfile(db, form.profile.key, form.profile.version);
}

/**
 * The test codes of the profile this booking's report is filed with: the draft's profile, or (before the first
 * save) the one the entry page opens on. Set-up photos are kept only under these codes.
 */
export async function testCodesOfReport(db: Executor, bookingId: string, listing: BookingForReport["listing"]): Promise<Set<string>> {
  const draft = await draftOf(db, bookingId);
  const form = draft ? reportFormSchema.safeParse(draft.form) : null;
  let profile: ToleranceProfile | undefined = form?.success ? (await profileOfForm(db, form.data))?.profile : undefined;
  if (!profile) {
    const offered = await profilesForNewReports(db);
    const suggested = suggestionFor(listing, offered).profile;
    profile = (suggested && findProfile(offered, suggested.key, suggested.version)) || newestVersions(offered).find((candidate) => !candidate.scope.maker) || offered[0];
  }
  return new Set(profile?.tests.map((test) => test.code) ?? []);
}

// ————— The entry page —————

/** Today and the booked visit's day, as calendar days where the machine stands. */
function entryDays(found: BookingForReport, now: Date) {
  return { today: dayAtMachine(now, found.listing), visitDay: dayAtMachine(found.booking.startsAt, found.listing) };
}

export function machineTitle(listing: Pick<BookingForReport["listing"], "make" | "model">) {
  return `${listing.make} ${listing.model}`;
}

/** Everything the entry page needs: booking, machine, suggestion, saved draft (or a new form), photos, and whether it is editable. */
export async function getReportEntry(db: Database, inspector: SessionUser, bookingId: string, today = new Date(), wanted?: { key: string; version: number }) {
  const found = await bookingOfInspector(db, inspector, bookingId);
  const draft = await draftOf(db, bookingId);
  const mode = await entryMode(db, found, draft);
  const offered = await profilesForNewReports(db);
  const suggestion = suggestionFor(found.listing, offered);
  // With no profile for the machine the form still opens on one (the inspector says why it is the nearest).
  const start = suggestion.profile ?? newestVersions(offered).find((profile) => !profile.scope.maker) ?? offered[0];
  if (!start) throw new ReportRuleError("No tolerance profile is published yet; staff must publish one before reports can be filed.", 409);
  const form: ReportForm = draft
    ? reportFormSchema.parse(draft.form)
    : newReportForm({
        profileKey: start.key,
        profileVersion: start.version,
        units: inspector.displayUnits,
        measuredOn: dayAtMachine(today, found.listing),
      });
  const [submitted] = await db
    .select({ id: reports.id, draftVersion: reports.draftVersion })
    .from(reports)
    .where(and(eq(reports.bookingId, bookingId), eq(reports.status, "draft")));
  return {
    booking: { id: found.booking.id, reference: found.booking.reference, status: found.booking.status, startsAt: found.booking.startsAt.toISOString(), days: entryDays(found, today) },
    machine: {
      title: machineTitle(found.listing),
      slug: found.listing.slug,
      category: found.listing.category,
      categoryLabel: labelOf(machineCategories, found.listing.category),
      year: found.listing.year,
      swingOverBedMm: found.listing.swingOverBedMm,
      distanceBetweenCentresMm: found.listing.distanceBetweenCentresMm,
      location: [found.listing.city, countryName(found.listing.country)].join(", "),
    },
    suggestion,
    ...(await entryProfiles(db, offered, form, wanted)),
    form,
    draft: draft ? { version: draft.version, updatedAt: draft.updatedAt.toISOString(), correctsReportId: draft.correctsReportId } : null,
    mode: mode.kind === "locked" ? { kind: "locked" as const, reason: mode.reason, signedReportId: mode.signed?.id ?? null } : { kind: mode.kind },
    submitted: submitted && draft && submitted.draftVersion === draft.version ? { reportId: submitted.id } : null,
    photos: await photosOfBooking(db, bookingId),
    columnMapping: await columnMappingOf(db, inspector),
  };
}

/**
 * Every version the form may choose, by name, and the whole of one only: the form's own, or the one the
 * inspector has just chosen (`wanted`, if it may be chosen). Sending every profile's tests and tolerances
 * made most of the entry page's HTML, and a tablet parsed it all before the form answered.
 */
async function entryProfiles(db: Executor, offered: ToleranceProfile[], form: ReportForm, wanted?: { key: string; version: number }) {
  const choices = await profilesForEntry(db, offered, form);
  const named = (key: string, version: number) => choices.find(({ profile }) => profile.key === key && profile.version === version);
  const scoring = (wanted && named(wanted.key, wanted.version)) ?? named(form.profile.key, form.profile.version);
  return {
    profiles: choices.map(({ profile, retired }) => ({ key: profile.key, version: profile.version, title: profile.title, makersChart: Boolean(profile.scope.maker), retired })),
    profile: scoring?.profile ?? null,
  };
}

/**
 * The profiles the entry page may score with in the browser: those offered for new reports, and the draft's
 * own when it has since been retired (shown, so the readings still preview, but refused on submit).
 */
async function profilesForEntry(db: Executor, offered: ToleranceProfile[], form: ReportForm) {
  const list = offered.map((profile) => ({ profile, retired: false }));
  if (!findProfile(offered, form.profile.key, form.profile.version)) {
    const own = await profileOfForm(db, form);
    if (own) list.push({ profile: own.profile, retired: own.status === "retired" });
  }
  return list;
}

export async function photosOfBooking(db: Executor, bookingId: string) {
  const rows = await db.select().from(reportPhotos).where(eq(reportPhotos.bookingId, bookingId));
  return rows.map((row) => ({ id: row.id, testCode: row.testCode, width: row.width, height: row.height, largeSha256: row.largeSha256, thumbnailUrl: setupPhotoUrl(row.id, "thumb") }));
}

// ————— Drafts —————

const draftBodySchema = z.object({ form: reportFormSchema });

function prefixed(errors: Record<string, string[]>, prefix: string) {
  return Object.fromEntries(Object.entries(errors).map(([key, messages]) => [key === "request" ? prefix : `${prefix}.${key}`, messages]));
}

/** The shape checks a draft must pass to be stored: a known profile, its test codes, kinds those tests take. */
async function parseDraftBody(db: Executor, body: unknown): Promise<{ form: ReportForm; profile: ToleranceProfile; retired: boolean }> {
  const parsed = draftBodySchema.safeParse(body);
  if (!parsed.success) throw new ReportRuleError("The draft could not be read; nothing was saved.", 422, fieldErrors(parsed.error));
  const form = parsed.data.form;
  const found = await profileOfForm(db, form);
  if (!found) throw new ReportRuleError("Unknown tolerance profile; nothing was saved.", 422, { "form.profile.key": [`No published tolerance profile ${form.profile.key} v${form.profile.version}.`] });
  const { profile } = found;
  const errors: Record<string, string[]> = {};
  for (const [code, entry] of Object.entries(form.tests)) {
    const test = profile.tests.find((candidate) => candidate.code === code);
    if (!test) errors[`form.tests.${code}`] = [`"${code}" is not a test of ${profile.key} v${profile.version}.`];
    else if (!KINDS_FOR_METHOD[test.method].includes(entry.kind)) errors[`form.tests.${code}.kind`] = [`${code} takes ${KINDS_FOR_METHOD[test.method].join(" or ")} readings, not ${entry.kind}.`];
  }
  if (Object.keys(errors).length) throw new ReportRuleError("The draft names tests its profile does not have; nothing was saved.", 422, errors);
  // Half-typed readings are kept, but never a number beyond what the tests can read: it could not be scored or shown.
  const beyond = formLimitErrors(form);
  if (Object.keys(beyond).length) {
    throw new ReportRuleError("A number is beyond what these tests can read (see the field); nothing was saved.", 422, beyond);
  }
  return { form, profile, retired: found.status === "retired" };
}

/** Per-test problems of a draft, reported but not blocking the save: a draft may be half typed. */
export function draftIssues(form: ReportForm): Record<string, string[]> {
  const issues: Record<string, string[]> = {};
  for (const [code, entry] of Object.entries(form.tests)) {
    const check = checkTestEntry(entry, form.instruments, form.units);
    if (check.state === "invalid") Object.assign(issues, prefixed(check.errors, `tests.${code}`));
  }
  Object.assign(issues, prefixed(checkConditions(form).errors, "conditions"));
  return issues;
}

async function upsertDraft(tx: Transaction, inspectorId: string, bookingId: string, form: ReportForm) {
  const [row] = await tx
    .insert(reportDrafts)
    .values({ bookingId, inspectorId, form })
    .onConflictDoUpdate({
      target: reportDrafts.bookingId,
      set: { form, version: sql`${reportDrafts.version} + 1`, updatedAt: new Date() },
    })
    .returning({ version: reportDrafts.version, updatedAt: reportDrafts.updatedAt });
  return row!;
}

/**
 * Stores the inspector's form as typed. The shape must be right (profile, test codes, kinds, field sizes);
 * half-typed readings are kept and their problems returned as `issues`. Refused once the report is signed.
 */
/** Locks the booking's draft, refuses a locked entry (signed, or not the inspector's to file), and stores the form. */
async function storeOpenDraft(tx: Transaction, inspector: SessionUser, bookingId: string, form: ReportForm) {
  const draft = await draftOf(tx, bookingId, true);
  const found = await bookingOfInspector(tx, inspector, bookingId);
  const mode = await entryMode(tx, found, draft);
  if (mode.kind === "locked") throw new ReportRuleError(mode.reason, 409);
  const saved = await upsertDraft(tx, inspector.id, bookingId, form);
  return { found, mode, saved };
}

export async function saveDraft(db: Database, inspector: SessionUser, bookingId: string, body: unknown) {
  const { form } = await parseDraftBody(db, body);
  return db.transaction(async (tx) => {
    const { saved } = await storeOpenDraft(tx, inspector, bookingId, form);
    return { version: saved.version, savedAt: saved.updatedAt.toISOString(), issues: draftIssues(form) };
  });
}

// ————— Submission: the server's own check and score —————

function buildContent(
  found: BookingForReport,
  form: ReportForm,
  mode: Extract<EntryMode, { kind: "first" | "correction" }>,
  photos: Awaited<ReturnType<typeof photosOfBooking>>,
  reportId: string,
  now: Date,
  scoring: { profile: ToleranceProfile; retired: boolean; suggestion: ProfileSuggestion },
): { content: ReportContent; errors: Record<string, string[]> } | { content: null; errors: Record<string, string[]> } {
  const errors: Record<string, string[]> = {};
  const { profile, suggestion } = scoring;
  if (scoring.retired) errors["profile.key"] = [`${profile.title} (v${profile.version}) has been retired by staff; choose a current profile. Your readings are kept.`];
  if (!form.safetyAcknowledged) errors.safetyAcknowledged = ["Read the safety cautions and tick the box before submitting."];
  const dated = measuredOnCheck(form.measuredOn, entryDays(found, now));
  if (dated.error) errors.measuredOn = [dated.error];
  const differs = !suggestion.profile || suggestion.profile.key !== profile.key || suggestion.profile.version !== profile.version;
  if (differs && !form.profile.reason.trim()) {
    errors["profile.reason"] = [suggestion.profile ? "Say why you chose another profile than the one suggested." : "Say why this profile fits the machine."];
  }
  const conditions = checkConditions(form);
  Object.assign(errors, prefixed(conditions.errors, "conditions"));

  const entered: Record<string, TestMeasurement> = {};
  const testMeta: ReportContent["tests"] = {};
  for (const test of profile.tests) {
    const entry = form.tests[test.code];
    if (!entry) continue;
    const check = checkTestEntry(entry, form.instruments, form.units);
    if (check.state === "empty") continue;
    if (check.state !== "complete" || !check.measurement) {
      Object.assign(errors, prefixed(check.errors, `tests.${test.code}`));
      continue;
    }
    if (entry.instrumentId && !form.instruments.some((instrument) => instrument.id === entry.instrumentId)) {
      errors[`tests.${test.code}.instrumentId`] = ["This instrument is no longer in the list; choose another."];
    }
    let photo: ReportContent["tests"][string]["photo"] = null;
    if (entry.photoId) {
      const stored = photos.find((candidate) => candidate.id === entry.photoId && candidate.testCode === test.code);
      if (!stored) errors[`tests.${test.code}.photoId`] = ["The set-up photo is missing; upload it again or remove it."];
      else photo = { id: stored.id, width: stored.width, height: stored.height, ...(stored.largeSha256 ? { sha256: stored.largeSha256 } : {}) };
    }
    entered[test.code] = check.measurement;
    testMeta[test.code] = { instrumentId: entry.instrumentId || null, notes: entry.notes.trim(), photo };
  }
  if (Object.keys(entered).length === 0 && !errors.tests) errors.tests = ["Enter the readings of at least one test."];
  if (Object.keys(errors).length) return { content: null, errors };

  const measurementsAsEntered: ReportMeasurements = { measuredOn: form.measuredOn, conditions: conditions.values, tests: entered };
  let measurements: ReportMeasurements;
  let score;
  try {
    measurements = metricMeasurements(form, entered, conditions.values);
    // Authoritative: the server scores the readings itself; nothing the browser computed is read.
    score = scoreReport(profile, measurements);
  } catch (error) {
    if (error instanceof GeometryInputError) {
      const key = error.path.length ? error.path.map(String).join(".") : "tests";
      return { content: null, errors: { [key]: [error.message] } };
    }
    throw error;
  }

  const instruments: ReportContent["instruments"] = form.instruments.map((instrument) => {
    const reads = instrumentReads(instrument.kind);
    const typed = instrument.resolution.trim() === "" ? null : Number(instrument.resolution.replace(",", "."));
    const resolution =
      typed === null || !Number.isFinite(typed) || reads === "none" ? null : reads === "tilt" || form.units === "mm" ? typed : inchesToMicrometres(typed);
    return {
      id: instrument.id,
      kind: instrument.kind,
      kindLabel: INSTRUMENT_KINDS.find((entry) => entry.value === instrument.kind)?.label ?? instrument.kind,
      description: instrument.description.trim(),
      resolution,
      resolutionUnit: resolution === null ? null : reads === "tilt" ? "µm/m" : "µm",
      calibrationDue: instrument.calibrationDue || null,
      calibrationOverdue: Boolean(instrument.calibrationDue && instrument.calibrationDue < form.measuredOn),
    };
  });

  const content: ReportContent = {
    format: REPORT_FORMAT,
    reportId,
    revision: mode.kind === "correction" ? mode.corrects.revision + 1 : 1,
    supersedes: mode.kind === "correction" ? { reportId: mode.corrects.id, contentHash: mode.corrects.contentHash! } : null,
    booking: { id: found.booking.id, reference: found.booking.reference },
    machine: {
      listingId: found.listing.id,
      slug: found.listing.slug,
      title: machineTitle(found.listing),
      category: found.listing.category,
      make: found.listing.make,
      model: found.listing.model,
      year: found.listing.year,
      serialNumber: found.listing.serialNumber,
      swingOverBedMm: found.listing.swingOverBedMm,
      distanceBetweenCentresMm: found.listing.distanceBetweenCentresMm,
      location: [found.listing.city, found.listing.region, countryName(found.listing.country)].filter(Boolean).join(", "),
    },
    // The profile's public id: a signed report is public and carries no account id.
    inspector: { id: found.inspector.publicId, name: found.inspector.name },
    measuredOn: form.measuredOn,
    profile: {
      key: profile.key,
      version: profile.version,
      title: profile.title,
      ...(profile.scope.maker ? { makersChart: profile.scope.maker.chart } : {}),
      suggested: suggestion.profile ? { key: suggestion.profile.key, version: suggestion.profile.version } : null,
      reason: form.profile.reason.trim() || suggestion.reason,
    },
    entryUnits: form.units,
    conditions: {
      ambientTemperatureC: conditions.values.ambientTemperatureC ?? null,
      warmUpMinutes: conditions.values.warmUpMinutes ?? null,
      levelled: conditions.values.levelled ?? null,
      notes: form.conditions.notes.trim(),
    },
    instruments,
    tests: testMeta,
    measurementsAsEntered,
    measurements,
    score,
    notes: form.notes.trim(),
    safety: { acknowledged: true, cautions: SAFETY_CAUTIONS },
    submittedAt: now.toISOString(),
    signedAt: null,
  };
  return { content, errors: {} };
}

/**
 * Saves the form, then checks and scores it on the server. The score comes from the readings alone: any
 * grade or result the browser sends is not part of the form's schema and is dropped unread. The scored
 * report waits for the inspector's signature (status draft).
 */
export async function submitReport(db: Database, inspector: SessionUser, bookingId: string, body: unknown, now = new Date()) {
  const { form, profile, retired } = await parseDraftBody(db, body);
  return db.transaction(async (tx) => {
    const { found, mode, saved } = await storeOpenDraft(tx, inspector, bookingId, form);
    const [existing] = await tx
      .select({ id: reports.id })
      .from(reports)
      .where(and(eq(reports.bookingId, bookingId), eq(reports.status, "draft")))
      .for("update");
    const reportId = existing?.id ?? randomUUID();
    const suggestion = suggestionFor(found.listing, await profilesForNewReports(tx));
    const built = buildContent(found, form, mode, await photosOfBooking(tx, bookingId), reportId, now, { profile, retired, suggestion });
    if (!built.content) {
      // The typed form is kept (saved above); only the scored submission is refused.
      return { ok: false as const, errors: built.errors, version: saved.version };
    }
    const { content } = built;
    const row = {
      bookingId,
      listingId: found.listing.id,
      inspectorId: inspector.id,
      supersedesId: content.supersedes?.reportId ?? null,
      revision: content.revision,
      profileKey: content.profile.key,
      profileVersion: content.profile.version,
      grade: content.score.grade,
      keyFigures: content.score.keyFigures,
      measuredOn: content.measuredOn,
      draftVersion: saved.version,
      content,
      updatedAt: now,
    };
    if (existing) await tx.update(reports).set(row).where(eq(reports.id, existing.id));
    else await tx.insert(reports).values({ id: reportId, ...row });
    return { ok: true as const, reportId, version: saved.version };
  });
}

/** The scored, unsigned report of a booking for its inspector to review. */
export async function getReviewReport(db: Database, inspector: SessionUser, bookingId: string) {
  const found = await bookingOfInspector(db, inspector, bookingId);
  const [report] = await db.select().from(reports).where(and(eq(reports.bookingId, bookingId), eq(reports.status, "draft")));
  const draft = await draftOf(db, bookingId);
  if (!report || !draft) {
    const signed = await signedReportOfBooking(db, bookingId);
    if (signed) return { kind: "signed" as const, reportId: signed.id };
    return { kind: "none" as const };
  }
  return {
    kind: "review" as const,
    reportId: report.id,
    content: report.content as ReportContent,
    notice: unrenderableNotice(report.content as ReportContent),
    stale: draft.version !== report.draftVersion,
    booking: { id: found.booking.id, reference: found.booking.reference },
    photos: await photosOfBooking(db, bookingId),
  };
}

// ————— Signing —————

/**
 * Seals the reviewed report: adds the signing time, writes its RFC 8785 canonical JSON and SHA-256 hash,
 * and marks the revision it corrects as superseded, all in one transaction. From then on nothing about
 * it can change (the database refuses). The booking moves on and buyer and seller are e-mailed.
 */
export async function signReport(db: Database, inspector: SessionUser, bookingId: string, reportId: string, now = new Date()) {
  const sealed = await db.transaction(async (tx) => {
    const [report] = await tx.select().from(reports).where(eq(reports.id, reportId)).for("update");
    if (!report || report.bookingId !== bookingId || report.inspectorId !== inspector.id) throw new ReportRuleError("There is no report of yours at this address.", 404);
    if (report.status !== "draft") throw new ReportRuleError("This report is signed and cannot be changed. Start a correction to file a new revision.", 409);
    const draft = await draftOf(tx, bookingId, true);
    if (!draft || draft.version !== report.draftVersion) {
      throw new ReportRuleError("The readings changed after you submitted them. Submit them again and review the new result before signing.", 409);
    }
    const found = await bookingOfInspector(tx, inspector, bookingId);
    const mode = await entryMode(tx, found, draft);
    if (mode.kind === "locked") throw new ReportRuleError(mode.reason, 409);
    const content: ReportContent = { ...(report.content as ReportContent), signedAt: now.toISOString() };
    // A result scored before readings were bounded may hold a number no page can draw: never seal one.
    const unrenderable = unrenderableReason(content);
    if (unrenderable) {
      throw new ReportRuleError(`This result cannot be signed: ${unrenderable} Go back to the readings and submit them again.`, 422);
    }
    const { canonical, hash } = sealContent(content);
    const credential = await issueCredential(tx, content, hash);
    // The successor is signed first: the database lets a report become superseded only by a signed successor.
    await tx
      .update(reports)
      .set({ status: "signed", canonicalJson: canonical, contentHash: hash, signedAt: now, content: JSON.parse(canonical), credential, updatedAt: now })
      .where(eq(reports.id, report.id));
    if (mode.kind === "correction") {
      await tx.update(reports).set({ status: "superseded", updatedAt: now }).where(and(eq(reports.id, mode.corrects.id), eq(reports.status, "signed")));
    }
    await tx.delete(reportDrafts).where(eq(reportDrafts.bookingId, bookingId));
    return { found, content, hash, correction: mode.kind === "correction" };
  });
  // After the commit: the booking's own transaction moves it on and queues the payout once.
  if (!sealed.correction) await recordReportFiled(db, { bookingId, reportId, inspectorId: inspector.id });
  await queueListingIndexUpdate(sealed.found.listing.id);
  const mailed = await sendReportSignedNotices(sealed.found, sealed.content, sealed.hash);
  return { reportId, contentHash: sealed.hash, mailed };
}

/**
 * The signed content as a W3C Verifiable Credential with an eddsa-jcs-2022 proof made at the signing time,
 * by the key in REPORT_SIGNING_KEY, which must be the registered current key (see `npm run signing-key`).
 */
async function issueCredential(tx: Executor, content: ReportContent, contentHash: string): Promise<string> {
  const origin = env().APP_ORIGIN;
  const key = reportSigningKey();
  const fragment = await currentKeyFragment(tx, key.publicKeyMultibase);
  if (!fragment) {
    throw new SigningKeyError("The report signing key is not registered as the current key: run `npm run signing-key -- register` with the owner's database URL.");
  }
  const signed = await signCredential(buildReportCredential(content, contentHash, origin), key, `${didWebOf(origin)}#${fragment}`, content.signedAt!);
  return canonicalJson(signed);
}

/** Opens a correction of a signed report: a new draft prefilled from the signed readings. */
export async function startCorrection(db: Database, inspector: SessionUser, reportId: string) {
  return db.transaction(async (tx) => {
    const [report] = await tx.select().from(reports).where(eq(reports.id, reportId));
    if (!report || report.inspectorId !== inspector.id) throw new ReportRuleError("There is no report of yours at this address.", 404);
    if (report.status !== "signed") throw new ReportRuleError("Only the current signed revision can be corrected.", 409);
    const draft = await draftOf(tx, report.bookingId, true);
    if (draft) {
      if (draft.correctsReportId === report.id) return { bookingId: report.bookingId };
      throw new ReportRuleError("This booking already has a draft in progress.", 409);
    }
    const form = formFromContent(report.content as ReportContent);
    await tx.insert(reportDrafts).values({ bookingId: report.bookingId, inspectorId: inspector.id, correctsReportId: report.id, form });
    return { bookingId: report.bookingId };
  });
}

// ————— Public reads —————

/**
 * What a signed report's page and API answer depend on, read in one query on every request: the row's
 * digest (any change of any column, a correction superseding it, a change behind the app's back), its
 * booking's other signed and superseded revisions (a later correction, which lists it as superseded), and
 * the signing keys' rows (a key withdrawn or its dates changed). `version` changes when any of them does.
 */
export async function publicReportStamp(db: Database, reportId: string) {
  if (!z.uuid().safeParse(reportId).success) return null;
  const [stamp] = await db
    .select({
      row: sql<string>`md5(${reports}::text)`,
      // Written out: Drizzle leaves a column of the only table unqualified, which inside this subquery would
      // name the subquery's own row.
      family: sql<string>`(select md5(coalesce(string_agg(other.id::text || ':' || other.status || ':' || coalesce(other.supersedes_id::text, ''), ',' order by other.revision, other.id), ''))
        from reports other where other.booking_id = reports.booking_id and other.id <> reports.id and other.status in ('signed', 'superseded'))`,
      keys: sql<string>`(select md5(coalesce(string_agg(signing_key::text, ',' order by signing_key.id), '')) from report_signing_keys signing_key)`,
      status: reports.status,
      inspectorId: reports.inspectorId,
      bookingId: reports.bookingId,
    })
    .from(reports)
    .where(eq(reports.id, reportId));
  if (!stamp) return null;
  return { version: `${stamp.row}.${stamp.family}.${stamp.keys}`, keys: stamp.keys, status: stamp.status, inspectorId: stamp.inspectorId, bookingId: stamp.bookingId };
}

const pageAddresses = new Map([["", ""], ["?units=mm", "mm"], ["?units=inch", "inch"]]);

/**
 * The report page as a visitor without a session sees it, for the page cache: one page per report and units
 * choice (none, `mm` or `inch`; any other parameter is rendered each time), valid while the report's stamp
 * and the day (the report's age is shown) are the same. Null for a draft, a missing report or another address.
 */
export async function publicReportPageIdentity(db: Database, reportId: string | undefined, url: URL, now = new Date()) {
  // Exactly these addresses: one spelling each, so the kept page's tag is the one its address would get.
  const units = pageAddresses.get(url.search);
  if (units === undefined) return null;
  const stamp = reportId ? await publicReportStamp(db, reportId) : null;
  if (!stamp || stamp.status === "draft") return null;
  return { key: `report ${reportId} ${units}`, version: `${stamp.version} ${now.toISOString().slice(0, 10)}` };
}

/** A signed or superseded report as anyone may read it; a draft only tells its own inspector where to review it. */
export async function getPublicReport(db: Database, reportId: string, viewer: Pick<SessionUser, "id"> | null) {
  // A signed report does not change, so what was read and checked is kept per report (publicReportCache) as
  // long as its stamp is the same: the row to the byte, its booking's revisions and the signing keys.
  const stamp = await publicReportStamp(db, reportId);
  if (!stamp) return null;
  if (stamp.status === "draft") {
    return viewer?.id === stamp.inspectorId ? { kind: "draft" as const, bookingId: stamp.bookingId } : null;
  }
  // Keys changed since the last read: every proof is checked again against the keys as they are now.
  signingKeysAre(stamp.keys);
  const known = publicReportCache.get(reportId, stamp.version);
  const published = known ?? (await readPublicReport(db, reportId));
  if (!published) return null;
  if (!known) publicReportCache.set(reportId, stamp.version, published);
  return published.kind === "published" ? { ...published, isInspector: viewer?.id === stamp.inspectorId } : published;
}

/** A signed or superseded report read and checked against its seal (no viewer in it: the cache shares it). */
async function readPublicReport(db: Database, reportId: string) {
  const [report] = await db.select().from(reports).where(eq(reports.id, reportId));
  if (!report || report.status === "draft") return null;
  // Shown only as signed: the credential's proof, the content hash it seals and every copied column must agree.
  const seal = await readSealedReport(db, report, { checkContent: true });
  if (!seal.ok) return { kind: "unsealed" as const, id: report.id, reason: seal.reason, mismatched: seal.mismatched };
  const content = JSON.parse(report.canonicalJson!) as ReportContent;
  const revisions = await db
    .select({ id: reports.id, revision: reports.revision, status: reports.status, signedAt: reports.signedAt, grade: reports.grade, supersedesId: reports.supersedesId })
    .from(reports)
    .where(and(eq(reports.bookingId, report.bookingId), inArray(reports.status, ["signed", "superseded"])))
    .orderBy(reports.revision);
  const supersededBy = revisions.find((revision) => revision.supersedesId === report.id) ?? null;
  return {
    kind: "published" as const,
    id: report.id,
    status: report.status as "signed" | "superseded",
    content,
    contentHash: report.contentHash!,
    intact: sealHolds(report.canonicalJson!, report.contentHash!),
    signedAt: seal.subject.signedAt,
    keyId: seal.keyId,
    /** Set when the credential was issued later, for a report signed before credentials existed. */
    reissuedOn: seal.subject.reissued?.on ?? null,
    supersededBy: supersededBy ? { id: supersededBy.id, revision: supersededBy.revision } : null,
    revisions: revisions.map((revision) => ({ ...revision, signedAt: revision.signedAt?.toISOString() ?? null })),
    isInspector: false,
    hasCredential: report.credential !== null,
    /** The signed credential's text, as stored (its proof checked above); embedded in the certificate. */
    credential: report.credential!,
    /** Set when the signed results cannot be scored or drawn: the readings are shown instead, with this notice. */
    notice: unrenderableNotice(content),
    photoUrls: Object.fromEntries(
      Object.entries(content.tests)
        .filter(([, meta]) => meta.photo)
        .map(([code, meta]) => [code, { thumb: setupPhotoUrl(meta.photo!.id, "thumb"), large: setupPhotoUrl(meta.photo!.id, "large") }]),
    ),
    verificationUrl: verificationUrl(report.contentHash!),
  };
}

/** What a page says instead of a report whose stored copy no longer matches what was signed. */
export function unsealedMessage(reason: string) {
  return `This report is not shown: what is stored no longer matches what its inspector signed. ${reason} The signed credential, if you have it, still tells what was signed.`;
}

export type PublicReport = Extract<NonNullable<Awaited<ReturnType<typeof getPublicReport>>>, { kind: "published" }>;

type CheckedReport = NonNullable<Awaited<ReturnType<typeof readPublicReport>>>;

/**
 * Reports read and checked, by id, each valid for the row digest it was read at and for ten minutes at most
 * (a signing key's validity is read with the seal). Least recently used first out, 500 at most.
 */
export const publicReportCache = (() => {
  const limit = 500;
  const lifetimeMs = 10 * 60_000;
  const entries = new Map<string, { version: string; report: CheckedReport; storedAt: number }>();
  return {
    get(id: string, version: string): CheckedReport | undefined {
      const entry = entries.get(id);
      if (!entry) return undefined;
      if (entry.version !== version || Date.now() - entry.storedAt > lifetimeMs) {
        entries.delete(id);
        return undefined;
      }
      // Most recently used last.
      entries.delete(id);
      entries.set(id, entry);
      return entry.report;
    },
    set(id: string, version: string, report: CheckedReport) {
      entries.delete(id);
      entries.set(id, { version, report, storedAt: Date.now() });
      if (entries.size > limit) entries.delete(entries.keys().next().value!);
    },
    clear: () => entries.clear(),
  };
})();

/** GET /api/v1/reports/:id: the signed content exactly as hashed, with its status and links. Null for drafts. */
export async function reportForApi(db: Database, reportId: string) {
  const report = await getPublicReport(db, reportId, null);
  if (!report || report.kind === "draft") return null;
  if (report.kind === "unsealed") return report;
  const origin = env().APP_ORIGIN;
  return {
    kind: "published" as const,
    id: report.id,
    status: report.status,
    revision: report.content.revision,
    supersedes: report.content.supersedes,
    supersededBy: report.supersededBy,
    signedAt: report.signedAt,
    contentHash: report.contentHash,
    hashAlgorithm: "SHA-256 of the RFC 8785 canonical JSON of `content`",
    signatureKey: report.keyId,
    intact: report.intact,
    /** Null, or why the signed results cannot be scored or drawn (then read the readings in `content`). */
    notice: report.notice,
    links: {
      page: `${origin}/reports/${report.id}`,
      certificate: `${origin}/reports/${report.id}/certificate.pdf`,
      verification: report.verificationUrl,
      credential: report.hasCredential ? credentialUrl(origin, report.id) : null,
      issuerKeys: `${origin}/.well-known/did.json`,
    },
    content: report.content,
  };
}

/** The stored credential text of a signed or superseded report; null for drafts, unknown ids and reports signed before credentials. */
export async function reportCredential(db: Database, reportId: string): Promise<string | null> {
  if (!z.uuid().safeParse(reportId).success) return null;
  const [row] = await db.select({ status: reports.status, credential: reports.credential }).from(reports).where(eq(reports.id, reportId));
  if (!row || row.status === "draft") return null;
  return row.credential;
}

/** Whether a hash is that of a signed report (current or superseded), and which; the stored seal is re-checked. */
export async function verifyReportHash(db: Database, hash: string) {
  if (!HASH_PATTERN.test(hash)) throw new ReportRuleError("Give the hash as 64 hexadecimal characters (SHA-256), lower case.", 400);
  const [report] = await db.select().from(reports).where(eq(reports.contentHash, hash));
  if (!report || report.status === "draft" || !report.canonicalJson) return { match: false as const, hash };
  const seal = await readSealedReport(db, report, { checkContent: true });
  if (!seal.ok) {
    // Nothing stored is shown as this report's: the copies disagree with what was signed.
    return { match: true as const, hash, intact: false as const, mismatched: seal.mismatched, reason: seal.reason, photos: null, report: null };
  }
  const content = JSON.parse(report.canonicalJson) as ReportContent;
  const [successor] = await db.select({ id: reports.id }).from(reports).where(eq(reports.supersedesId, report.id));
  const { subject } = seal;
  return {
    match: true as const,
    hash,
    intact: sealHolds(report.canonicalJson, hash),
    mismatched: [] as string[],
    reason: null,
    photos: await checkSealedPhotos(db, content),
    report: {
      id: report.id,
      status: report.status,
      revision: subject.revision,
      signedAt: subject.signedAt,
      measuredOn: subject.measuredOn,
      grade: subject.grade,
      machine: subject.machine.title,
      inspector: subject.inspector.name,
      supersededBy: successor?.id ?? null,
      url: reportUrl(report.id),
      credential: credentialUrl(env().APP_ORIGIN, report.id),
    },
  };
}

/**
 * The set-up photos sealed with a report, read back from storage and hashed again: `changed` lists those
 * whose bytes no longer match (or that are gone). Photos kept before their digest was recorded are not
 * counted. A storage outage leaves `checked` false rather than calling the photos changed.
 */
async function checkSealedPhotos(db: Database, content: ReportContent) {
  const sealed = Object.values(content.tests).flatMap((test) => (test.photo?.sha256 ? [{ id: test.photo.id, sha256: test.photo.sha256 }] : []));
  if (!sealed.length) return { sealed: 0, checked: true, changed: [] as string[] };
  const rows = await db.select({ id: reportPhotos.id, largeKey: reportPhotos.largeKey }).from(reportPhotos).where(inArray(reportPhotos.id, sealed.map((photo) => photo.id)));
  const keyOf = new Map(rows.map((row) => [row.id, row.largeKey]));
  const changed: string[] = [];
  for (const photo of sealed) {
    const key = keyOf.get(photo.id);
    let bytes: Buffer | null = null;
    try {
      if (key) bytes = await readObject(key);
    } catch (error) {
      if (error instanceof StorageUnavailableError) return { sealed: sealed.length, checked: false, changed: [] as string[] };
      // Any other refusal (no such object, above all) means the sealed photo is not there as signed.
    }
    if (!bytes || sha256Hex(bytes) !== photo.sha256) changed.push(photo.id);
  }
  return { sealed: sealed.length, checked: true, changed };
}

export type ListingReportSummary = {
  id: string;
  grade: string;
  keyFigures: KeyFigures;
  measuredOn: string;
  signedAt: string;
  profile: { key: string; version: number; makersChart: string | null };
  inspectorName: string;
};

/** The listing's current report: the latest signed revision that nothing supersedes; null when there is none. */
export async function currentReportForListing(db: Executor, listingId: string): Promise<ListingReportSummary | null> {
  return (await currentReportsForListings(db, [listingId])).get(listingId) ?? null;
}

/** The current report of each listing given, for lists and search documents. */
export async function currentReportsForListings(db: Executor, listingIds: string[]): Promise<Map<string, ListingReportSummary>> {
  const found = new Map<string, ListingReportSummary>();
  if (!listingIds.length) return found;
  const rows = await db
    .select({
      id: reports.id,
      listingId: reports.listingId,
      grade: reports.grade,
      keyFigures: reports.keyFigures,
      measuredOn: reports.measuredOn,
      signedAt: reports.signedAt,
      profileKey: reports.profileKey,
      profileVersion: reports.profileVersion,
      makersChart: sql<string | null>`${reports.content} -> 'profile' ->> 'makersChart'`,
      contentHash: reports.contentHash,
      credential: reports.credential,
    })
    .from(reports)
    .where(and(inArray(reports.listingId, listingIds), eq(reports.status, "signed")))
    .orderBy(desc(reports.signedAt));
  const seen = new Set<string>();
  for (const row of rows) {
    if (seen.has(row.listingId)) continue;
    seen.add(row.listingId);
    // The figures come from the signed credential; a row whose copies no longer match it is not shown.
    const { makersChart: _chart, ...stored } = row;
    const reading = await readSealedReport(db, { ...stored, canonicalJson: null });
    if (!reading.ok) continue;
    const { subject } = reading;
    found.set(row.listingId, {
      id: row.id,
      grade: subject.grade,
      keyFigures: subject.keyFigures as KeyFigures,
      measuredOn: subject.measuredOn,
      signedAt: subject.signedAt,
      profile: { key: subject.profile.key, version: subject.profile.version, makersChart: row.makersChart },
      inspectorName: subject.inspector.name,
    });
  }
  return found;
}
