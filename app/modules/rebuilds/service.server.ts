// Rebuild records: the seller's readings as found and as rebuilt, scored by the report engine, and what a buyer
// reads of them on the listing. A record is never shown as verified unless a signed report confirms it.
import { and, asc, eq, inArray } from "drizzle-orm";
import { fileUrl } from "~/modules/files/serve.server";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import type { ToleranceProfile } from "~/geometry";
import { findProfile } from "~/geometry";
import { hasRole, type SessionUser } from "~/modules/accounts/guards.server";
import { hasVisitToListing } from "~/modules/inspections/bookings.server";
import type { Executor } from "~/modules/inspections/profiles.server";
import { user as users } from "~/modules/accounts/schema";
import { labelOf, machineCategories } from "~/modules/listings/catalogue";
import { listingPhotos, listings } from "~/modules/listings/schema";
import { profilesForNewReports, scorableProfile } from "~/modules/profiles/service.server";
import { currentReportForListing, getPublicReport, suggestionFor } from "~/modules/reports/service.server";
import { formLimitErrors, parseTypedNumber } from "~/modules/reports/form";
import { asReportForm, confirmsRebuild, emptyRebuildForm, pairResults, previewRebuild, rebuildFormSchema, WORK_ITEMS, type RebuildForm, type StoredResult } from "./record";
import { rebuildRecords } from "./schema";

export class RebuildRuleError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
  }
}

export type RebuildEditorRole = "seller" | "staff" | "inspector";

/**
 * The listing whose rebuild this person may record, and as whom: its seller, staff, or a certified inspector with an
 * accepted or completed booking on it (the seller still owns the listing; the record names who entered it).
 */
async function editableListing(db: Executor, user: SessionUser, listingId: string): Promise<{ listing: typeof listings.$inferSelect; as: RebuildEditorRole }> {
  if (!z.uuid().safeParse(listingId).success) throw new RebuildRuleError("There is no such listing.", 404);
  const [listing] = await db.select().from(listings).where(eq(listings.id, listingId));
  if (!listing) throw new RebuildRuleError("There is no such listing.", 404);
  // The owner records it while they are a seller (a seller whose role was withdrawn keeps no write access).
  if (listing.sellerId === user.id && hasRole(user, "seller")) return { listing, as: "seller" };
  if (hasRole(user, "admin")) return { listing, as: "staff" };
  if (hasRole(user, "inspector") && (await hasVisitToListing(db, user.id, listing.id))) return { listing, as: "inspector" };
  throw new RebuildRuleError("Only the listing's seller, or an inspector booked to visit the machine, can record its rebuild.", 403);
}

export async function getRebuildEditor(db: Database, user: SessionUser, listingId: string) {
  const { listing, as } = await editableListing(db, user, listingId);
  const profiles = await profilesForNewReports(db);
  const [record] = await db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id));
  const suggestion = suggestionFor(listing as Parameters<typeof suggestionFor>[0], profiles);
  const fallback = suggestion.profile ?? profiles[0]!;
  const form: RebuildForm = record
    ? rebuildFormSchema.parse({ ...(record.forms as object), units: record.units, profile: { key: record.profileKey, version: record.profileVersion }, workDone: record.workDone, notes: record.notes, photoIds: record.photoIds })
    : emptyRebuildForm({ profileKey: fallback.key, profileVersion: fallback.version, units: user.displayUnits });
  const photos = (await db.select({ id: listingPhotos.id, thumbnailKey: listingPhotos.thumbnailKey }).from(listingPhotos).where(eq(listingPhotos.listingId, listing.id)).orderBy(asc(listingPhotos.position))).map((photo) => ({
    id: photo.id,
    thumbnailUrl: fileUrl(photo.thumbnailKey),
  }));
  return {
    photos,
    listing: { id: listing.id, slug: listing.slug, title: `${listing.make} ${listing.model}`, categoryLabel: labelOf(machineCategories, listing.category), status: listing.status },
    profiles,
    form,
    status: (record?.status ?? "new") as "new" | "draft" | "published",
    as,
  };
}

export type SaveOutcome = { ok: true; published: boolean } | { ok: false; errors: Record<string, string[]> };

/** Saves the record (and publishes it when asked); the server scores both sets with the engine. */
export async function saveRebuild(db: Database, user: SessionUser, listingId: string, body: unknown, publish: boolean): Promise<SaveOutcome> {
  const { listing } = await editableListing(db, user, listingId);
  const parsed = rebuildFormSchema.safeParse(body);
  if (!parsed.success) {
    const errors: Record<string, string[]> = {};
    for (const issue of parsed.error.issues) (errors[issue.path.join(".") || "form"] ??= []).push(issue.message);
    return { ok: false, errors };
  }
  const form = parsed.data;
  const scorable = await scorableProfile(db, form.profile.key, form.profile.version);
  if (!scorable) return { ok: false, errors: { profile: ["Choose one of the offered profiles."] } };
  const { asFound, asRebuilt } = previewRebuild(form, scorable.profile);
  const errors: Record<string, string[]> = {};
  for (const [set, preview] of [["asFound", asFound], ["asRebuilt", asRebuilt]] as const) {
    for (const test of preview?.tests ?? []) {
      if (test.check.state === "invalid") errors[`${set}.tests.${test.test.code}`] = Object.values(test.check.errors).flat();
      if (test.engineError) errors[`${set}.tests.${test.test.code}`] = [test.engineError];
    }
  }
  form.instruments.forEach((instrument, i) => {
    if (parseTypedNumber(instrument.resolution) === "invalid") errors[`instruments.${i}.resolution`] = ["Not a number."];
  });
  for (const set of ["asFound", "asRebuilt"] as const) {
    // A number beyond what the tests can read is never stored or scored (the report form's own limits).
    for (const [path, messages] of Object.entries(formLimitErrors(asReportForm(form, set)))) errors[path.startsWith("tests.") ? `${set}.${path}` : path] ??= messages;
    for (const [code, entry] of Object.entries(form[set].tests)) {
      if (entry.instrumentId && !form.instruments.some((instrument) => instrument.id === entry.instrumentId)) {
        errors[`${set}.tests.${code}.instrumentId`] = ["This instrument is no longer in the list; choose another."];
      }
    }
  }
  const resultsOf = (preview: typeof asFound): StoredResult[] =>
    (preview?.tests ?? []).flatMap((test) => (test.result ? [{ code: test.result.code, title: test.result.title, unit: test.result.unit, value: test.result.value, tolerance: test.result.tolerance, pass: test.result.pass, ratio: test.result.ratio }] : []));
  const results = { asFound: resultsOf(asFound), asRebuilt: resultsOf(asRebuilt) };
  if (publish) {
    if (!results.asFound.length) errors["asFound"] = ["Give the readings as found for at least one test."];
    if (!results.asRebuilt.length) errors["asRebuilt"] = ["Give the readings as rebuilt for at least one test."];
    if (!form.asFound.measuredOn) errors["asFound.measuredOn"] = ["Give the date the machine was measured as found."];
    if (!form.asRebuilt.measuredOn) errors["asRebuilt.measuredOn"] = ["Give the date the machine was measured as rebuilt."];
    else if (form.asFound.measuredOn && form.asRebuilt.measuredOn < form.asFound.measuredOn) errors["asRebuilt.measuredOn"] = ["The rebuild cannot be measured before the machine was found."];
  }
  if (form.photoIds.length) {
    const owned = await db.select({ id: listingPhotos.id }).from(listingPhotos).where(and(eq(listingPhotos.listingId, listing.id), inArray(listingPhotos.id, form.photoIds)));
    if (owned.length !== new Set(form.photoIds).size) errors.photoIds = ["Choose photos from this listing's own."];
  }
  if (Object.keys(errors).length) return { ok: false, errors };
  const values = {
    listingId: listing.id,
    authorId: user.id,
    profileKey: form.profile.key,
    profileVersion: form.profile.version,
    units: form.units,
    forms: { asFound: form.asFound, asRebuilt: form.asRebuilt, instruments: form.instruments },
    results,
    asFoundOn: form.asFound.measuredOn || null,
    asRebuiltOn: form.asRebuilt.measuredOn || null,
    workDone: form.workDone,
    notes: form.notes,
    photoIds: [...new Set(form.photoIds)],
    updatedAt: new Date(),
  };
  const [existing] = await db.select({ id: rebuildRecords.id, status: rebuildRecords.status }).from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id));
  const status = publish || existing?.status === "published" ? "published" : "draft";
  const publishedAt = publish ? new Date() : undefined;
  if (existing) {
    await db.update(rebuildRecords).set({ ...values, status, ...(publishedAt ? { publishedAt } : {}) }).where(eq(rebuildRecords.id, existing.id));
  } else {
    await db.insert(rebuildRecords).values({ ...values, status, publishedAt: publishedAt ?? null });
  }
  return { ok: true, published: status === "published" };
}

export type PublicRebuild = NonNullable<Awaited<ReturnType<typeof publicRebuildForListing>>>;

/** What a buyer reads of a listing's published rebuild record; null when there is none. */
export async function publicRebuildForListing(db: Database, listingId: string) {
  const [record] = await db
    .select()
    .from(rebuildRecords)
    .where(and(eq(rebuildRecords.listingId, listingId), eq(rebuildRecords.status, "published")));
  if (!record) return null;
  return rebuildView(db, record);
}

/**
 * Who entered the record, as a buyer reads it: the seller (or staff on their behalf), or a certified inspector who had
 * a booking on the listing. Either way the figures stay declared until a signed report confirms them.
 */
async function enteredBy(db: Executor, record: typeof rebuildRecords.$inferSelect): Promise<{ kind: "seller" } | { kind: "inspector"; name: string }> {
  const [listing] = await db.select({ sellerId: listings.sellerId }).from(listings).where(eq(listings.id, record.listingId));
  if (!listing || listing.sellerId === record.authorId) return { kind: "seller" };
  const [author] = await db.select({ name: users.name }).from(users).where(eq(users.id, record.authorId));
  if (author && (await hasVisitToListing(db, record.authorId, record.listingId))) return { kind: "inspector", name: author.name };
  return { kind: "seller" };
}

export async function rebuildView(db: Database, record: typeof rebuildRecords.$inferSelect) {
  const results = record.results as { asFound: StoredResult[]; asRebuilt: StoredResult[] };
  const pairs = pairResults(results.asFound, results.asRebuilt);
  // The listing's signed report, read from its sealed content, is the only thing that can confirm the record.
  const current = await currentReportForListing(db, record.listingId);
  let confirmation: { reportId: string; inspectorName: string; measuredOn: string } | null = null;
  if (current) {
    const report = await getPublicReport(db, current.id, null);
    if (report?.kind === "published") {
      const signedResults = report.content.score.results;
      if (confirmsRebuild(results.asRebuilt, record.asRebuiltOn, { measuredOn: report.content.measuredOn, results: signedResults })) {
        confirmation = { reportId: report.id, inspectorName: report.content.inspector.name, measuredOn: report.content.measuredOn };
        for (const pair of pairs) pair.signed = signedResults.find((result) => result.code === pair.code)?.value ?? null;
      }
    }
  }
  const profile = await scorableProfile(db, record.profileKey, record.profileVersion);
  const stored = record.photoIds.length
    ? await db.select({ id: listingPhotos.id, thumbnailKey: listingPhotos.thumbnailKey, largeKey: listingPhotos.largeKey }).from(listingPhotos).where(and(eq(listingPhotos.listingId, record.listingId), inArray(listingPhotos.id, record.photoIds)))
    : [];
  const photos = record.photoIds.flatMap((id) => {
    const photo = stored.find((candidate) => candidate.id === id);
    return photo ? [{ thumbnailUrl: fileUrl(photo.thumbnailKey), largeUrl: fileUrl(photo.largeKey) }] : [];
  });
  return {
    enteredBy: await enteredBy(db, record),
    photos,
    asFoundOn: record.asFoundOn,
    asRebuiltOn: record.asRebuiltOn,
    publishedAt: record.publishedAt?.toISOString() ?? null,
    profileTitle: profile?.profile.title ?? record.profileKey,
    pairs,
    workDone: record.workDone.map((value) => WORK_ITEMS.find((item) => item.value === value)?.label ?? value),
    notes: record.notes,
    confirmation,
  };
}

export function profileFor(profiles: readonly ToleranceProfile[], form: RebuildForm) {
  return findProfile(profiles, form.profile.key, form.profile.version);
}
