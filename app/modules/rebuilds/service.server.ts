// Rebuild records: the seller's readings as found and as rebuilt, scored by the report engine, and what a buyer
// reads of them on the listing. A record is never shown as verified unless a signed report confirms it.
import { and, asc, eq, inArray } from "drizzle-orm";
import { fileUrl } from "~/modules/files/serve.server";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import type { ToleranceProfile } from "~/geometry";
import { findProfile } from "~/geometry";
import { hasRole, type SessionUser } from "~/modules/accounts/guards.server";
import type { Executor } from "~/modules/inspections/profiles.server";
import { labelOf, machineCategories } from "~/modules/listings/catalogue";
import { listingPhotos, listings } from "~/modules/listings/schema";
import { profilesForNewReports, scorableProfile } from "~/modules/profiles/service.server";
import { currentReportForListing, getPublicReport, suggestionFor } from "~/modules/reports/service.server";
import { confirmsRebuild, emptyRebuildForm, pairResults, previewRebuild, rebuildFormSchema, WORK_ITEMS, type RebuildForm, type StoredResult } from "./record";
import { rebuildRecords } from "./schema";

export class RebuildRuleError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
  }
}

async function ownedListing(db: Executor, user: SessionUser, listingId: string) {
  if (!z.uuid().safeParse(listingId).success) throw new RebuildRuleError("There is no such listing.", 404);
  const [listing] = await db.select().from(listings).where(eq(listings.id, listingId));
  if (!listing) throw new RebuildRuleError("There is no such listing.", 404);
  if (listing.sellerId !== user.id && !hasRole(user, "admin")) throw new RebuildRuleError("Only the listing's seller can record its rebuild.", 403);
  return listing;
}

export async function getRebuildEditor(db: Database, user: SessionUser, listingId: string) {
  const listing = await ownedListing(db, user, listingId);
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
  };
}

export type SaveOutcome = { ok: true; published: boolean } | { ok: false; errors: Record<string, string[]> };

/** Saves the record (and publishes it when asked); the server scores both sets with the engine. */
export async function saveRebuild(db: Database, user: SessionUser, listingId: string, body: unknown, publish: boolean): Promise<SaveOutcome> {
  const listing = await ownedListing(db, user, listingId);
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
    forms: { asFound: form.asFound, asRebuilt: form.asRebuilt },
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
