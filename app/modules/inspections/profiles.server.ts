// Inspector profiles, their fees and their bookable slots; who is shown to buyers for which listing.
import { randomUUID } from "node:crypto";
import { addMinutes, addWeeks } from "date-fns";
import { and, asc, eq, gt, inArray, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { inspectorApplication, user, userRole } from "~/modules/accounts/schema";
import { isPdf } from "~/modules/files/images.server";
import { DOCUMENT_MAX_BYTES, formatBytes } from "~/modules/files/limits";
import { openObject, writeObject } from "~/modules/files/storage.server";
import { countryName } from "~/modules/listings/catalogue";
import { listings } from "~/modules/listings/schema";
import { BookingRuleError, isExclusionViolation } from "./errors";
import { activeStatuses } from "./rules";
import { bookings, inspectorFees, inspectorProfiles, inspectorSlots } from "./schema";
import type { ProfileInput, SlotInput } from "./validation";
import { answerInspectorRequests } from "~/modules/demand/service.server";

export type Executor = Database | Parameters<Parameters<Database["transaction"]>[0]>[0];

export type PublicInspector = {
  /** The profile's public id (never the account id): links, the booking form and public JSON use it. */
  id: string;
  name: string;
  headline: string;
  bio: string;
  qualifications: string;
  baseCity: string;
  regions: string[];
  categories: string[];
  currency: string;
  fees: Array<{ category: string; amountMinor: number }>;
  hasCertificate: boolean;
};

export type FreeSlot = { id: string; startsAt: Date; endsAt: Date };

/** Certified means holding the "inspector" role, which only an admin grants. */
const isCertified = sql<boolean>`exists (select 1 from ${userRole} where ${userRole.userId} = ${inspectorProfiles.userId} and ${userRole.role} = 'inspector')`;

async function feesOf(db: Executor, inspectorIds: string[]) {
  if (!inspectorIds.length) return new Map<string, Array<{ category: string; amountMinor: number }>>();
  const rows = await db.select().from(inspectorFees).where(inArray(inspectorFees.inspectorId, inspectorIds)).orderBy(asc(inspectorFees.category));
  const byInspector = new Map<string, Array<{ category: string; amountMinor: number }>>();
  for (const row of rows) {
    const list = byInspector.get(row.inspectorId) ?? [];
    list.push({ category: row.category, amountMinor: row.amountMinor });
    byInspector.set(row.inspectorId, list);
  }
  return byInspector;
}

/** An inspector serves a place when one of their regions names its region, its country (code or name) or its city. */
export function regionMatches(regions: string[], place: { region: string | null; country: string; city: string }) {
  const served = regions.map((region) => region.trim().toLocaleLowerCase());
  const names = [place.region, place.country, place.country ? countryName(place.country) : null, place.city];
  return names.some((name) => name && served.includes(name.toLocaleLowerCase()));
}

/** Certified inspectors with a profile, optionally only those serving a category and a region. */
/** A certified inspector with the account id behind the public profile, for server code only. */
export type CertifiedInspector = PublicInspector & { userId: string };

/** Certified inspectors as public pages show them: no account ids. */
export async function listPublicInspectors(db: Executor, filter: { category?: string; region?: string } = {}): Promise<PublicInspector[]> {
  return (await listCertifiedInspectors(db, filter)).map(publicView);
}

function publicView({ userId: _userId, ...inspector }: CertifiedInspector): PublicInspector {
  return inspector;
}

/** Certified inspectors with their account ids, for bookings and slots; never returned to a page as they are. */
export async function listCertifiedInspectors(
  db: Executor,
  filter: { category?: string; region?: string } = {},
): Promise<CertifiedInspector[]> {
  const rows = await db
    .select({ profile: inspectorProfiles, name: user.name })
    .from(inspectorProfiles)
    .innerJoin(user, eq(user.id, inspectorProfiles.userId))
    .where(and(isCertified, filter.category ? sql`${filter.category} = any(${inspectorProfiles.categories})` : undefined))
    .orderBy(asc(user.name));
  const fees = await feesOf(
    db,
    rows.map((row) => row.profile.userId),
  );
  return rows
    .filter((row) => !filter.region || regionMatches(row.profile.regions, { region: filter.region, country: "", city: "" }))
    .map(({ profile, name }) => ({
      id: profile.publicId,
      userId: profile.userId,
      name,
      headline: profile.headline,
      bio: profile.bio,
      qualifications: profile.qualifications,
      baseCity: profile.baseCity,
      regions: profile.regions,
      categories: profile.categories,
      currency: profile.currency,
      fees: fees.get(profile.userId) ?? [],
      hasCertificate: Boolean(profile.certificateFileKey),
    }));
}

/** Upcoming slots of an inspector that no active booking holds. */
export async function freeSlots(db: Executor, inspectorId: string, now = new Date()): Promise<FreeSlot[]> {
  return db
    .select({ id: inspectorSlots.id, startsAt: inspectorSlots.startsAt, endsAt: inspectorSlots.endsAt })
    .from(inspectorSlots)
    .where(
      and(
        eq(inspectorSlots.inspectorId, inspectorId),
        gt(inspectorSlots.startsAt, now),
        sql`not exists (select 1 from ${bookings} where ${bookings.inspectorId} = ${inspectorSlots.inspectorId}
          and ${bookings.status} in ${activeStatuses}
          and ${bookings.period} && tstzrange(${inspectorSlots.startsAt}, ${inspectorSlots.endsAt}, '[)'))`,
      ),
    )
    .orderBy(asc(inspectorSlots.startsAt))
    .limit(60);
}

/** A certified inspector's public page by the profile's public id; null when there is no such certified inspector. */
export async function getPublicInspector(db: Executor, publicId: string) {
  const [inspector] = (await listCertifiedInspectors(db)).filter((candidate) => candidate.id === publicId);
  if (!inspector) return null;
  return { inspector: publicView(inspector), slots: await freeSlots(db, inspector.userId) };
}

/** The account behind a certified inspector's public id (what the booking form sends); null if none. */
export async function inspectorUserIdFor(db: Executor, publicId: string): Promise<string | null> {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(publicId)) return null;
  const [profile] = await db.select({ userId: inspectorProfiles.userId }).from(inspectorProfiles).where(and(eq(inspectorProfiles.publicId, publicId), isCertified));
  return profile?.userId ?? null;
}

export type BookableListing = {
  id: string;
  slug: string;
  sellerId: string;
  category: string;
  make: string;
  model: string;
  city: string;
  region: string | null;
  country: string;
  status: string;
};

export async function findListingBySlug(db: Executor, slug: string): Promise<BookableListing | null> {
  const [listing] = await db
    .select({
      id: listings.id,
      slug: listings.slug,
      sellerId: listings.sellerId,
      category: listings.category,
      make: listings.make,
      model: listings.model,
      city: listings.city,
      region: listings.region,
      country: listings.country,
      status: listings.status,
    })
    .from(listings)
    .where(eq(listings.slug, slug));
  return listing ?? null;
}

/**
 * Inspectors a person may book for this listing: certified, serving its category and place, with a fee for
 * its category, and never the listing's own seller (nor the person booking).
 */
export async function eligibleInspectors(db: Executor, listing: BookableListing, bookerId: string | null) {
  const candidates = await listCertifiedInspectors(db, { category: listing.category });
  const eligible = candidates.filter(
    (inspector) =>
      inspector.userId !== listing.sellerId &&
      inspector.userId !== bookerId &&
      regionMatches(inspector.regions, listing) &&
      inspector.fees.some((fee) => fee.category === listing.category),
  );
  return Promise.all(
    eligible.map(async (inspector) => ({
      ...publicView(inspector),
      feeMinor: inspector.fees.find((fee) => fee.category === listing.category)!.amountMinor,
      slots: await freeSlots(db, inspector.userId),
    })),
  );
}

/** The inspector's own profile for editing, pre-filled from their approved application when they have none yet. */
export async function getOwnProfile(db: Executor, userId: string) {
  const [profile] = await db.select().from(inspectorProfiles).where(eq(inspectorProfiles.userId, userId));
  const fees = (await feesOf(db, [userId])).get(userId) ?? [];
  const slots = await db
    .select({
      id: inspectorSlots.id,
      startsAt: inspectorSlots.startsAt,
      endsAt: inspectorSlots.endsAt,
      // Drizzle leaves a one-table select's own columns unqualified, which inside the subquery would name the booking's: qualify them.
      booked: sql<boolean>`exists (select 1 from ${bookings} where ${bookings.inspectorId} = ${inspectorSlots}.${sql.identifier(inspectorSlots.inspectorId.name)}
        and ${bookings.status} in ${activeStatuses}
        and ${bookings.period} && tstzrange(${inspectorSlots}.${sql.identifier(inspectorSlots.startsAt.name)}, ${inspectorSlots}.${sql.identifier(inspectorSlots.endsAt.name)}, '[)'))`,
    })
    .from(inspectorSlots)
    .where(and(eq(inspectorSlots.inspectorId, userId), gt(inspectorSlots.endsAt, new Date())))
    .orderBy(asc(inspectorSlots.startsAt));
  if (profile) return { profile, fees, slots, fromApplication: false };
  const [application] = await db
    .select()
    .from(inspectorApplication)
    .where(eq(inspectorApplication.userId, userId))
    .orderBy(sql`${inspectorApplication.createdAt} desc`)
    .limit(1);
  return {
    profile: application
      ? { qualifications: application.qualifications, regions: application.regions, categories: application.categories }
      : null,
    fees,
    slots,
    fromApplication: Boolean(application),
  };
}

export async function saveProfile(db: Database, userId: string, input: ProfileInput) {
  await db.transaction(async (tx) => {
    const values = {
      headline: input.headline,
      bio: input.bio,
      qualifications: input.qualifications,
      baseCity: input.baseCity,
      regions: input.regions,
      categories: input.categories,
      currency: input.currency,
      updatedAt: new Date(),
    };
    await tx
      .insert(inspectorProfiles)
      .values({ userId, ...values })
      .onConflictDoUpdate({ target: inspectorProfiles.userId, set: values });
    await tx.delete(inspectorFees).where(eq(inspectorFees.inspectorId, userId));
    const fees = Object.entries(input.feeMinorByCategory).map(([category, amountMinor]) => ({ inspectorId: userId, category, amountMinor: amountMinor! }));
    if (fees.length) await tx.insert(inspectorFees).values(fees);
  });
  // The regions may have changed: people who asked for an inspector in one of them hear of it now. The
  // profile is saved whatever happens here; a request left open is answered on the next save.
  try {
    await answerInspectorRequests(db, userId);
  } catch (error) {
    console.warn(`[demand] open inspector requests could not be answered: ${error instanceof Error ? error.message : String(error)}`);
  }
}

async function requireProfile(db: Executor, userId: string) {
  const [profile] = await db.select({ userId: inspectorProfiles.userId }).from(inspectorProfiles).where(eq(inspectorProfiles.userId, userId));
  if (!profile) throw new BookingRuleError("Save your profile before adding slots or a certificate.", 409);
}

/** Adds one slot, or the same slot on each of the next weeks; all or none (an overlap refuses the lot). */
export async function addSlots(db: Database, userId: string, input: SlotInput, now = new Date()) {
  await requireProfile(db, userId);
  // "08:30" on the form is the inspector's wall clock; the offset from their browser turns it into UTC.
  const firstStart = new Date(Date.parse(`${input.date}T${input.startTime}:00Z`) + input.timezoneOffset * 60_000);
  if (firstStart <= now) throw new BookingRuleError("Choose a start in the future.", 422, "date");
  const slots = Array.from({ length: input.repeatWeeks }, (_, week) => {
    const startsAt = addWeeks(firstStart, week);
    return { inspectorId: userId, startsAt, endsAt: addMinutes(startsAt, input.durationMinutes) };
  });
  try {
    await db.transaction(async (tx) => {
      await tx.insert(inspectorSlots).values(slots);
    });
  } catch (error) {
    if (isExclusionViolation(error)) throw new BookingRuleError("That time overlaps one of your slots.", 409, "startTime");
    throw error;
  }
  return slots.length;
}

export async function removeSlot(db: Database, userId: string, slotId: string) {
  const [slot] = await db.select().from(inspectorSlots).where(and(eq(inspectorSlots.id, slotId), eq(inspectorSlots.inspectorId, userId)));
  if (!slot) throw new BookingRuleError("No such slot of yours.", 404);
  const held = (await getOwnProfile(db, userId)).slots.find((candidate) => candidate.id === slotId)?.booked;
  if (held) throw new BookingRuleError("This slot is booked; decline or finish the booking instead.", 409);
  await db.delete(inspectorSlots).where(eq(inspectorSlots.id, slotId));
}

export async function setCertificate(db: Database, userId: string, certificate: { fileKey: string; fileName: string }) {
  await requireProfile(db, userId);
  await db
    .update(inspectorProfiles)
    .set({ certificateFileKey: certificate.fileKey, certificateFileName: certificate.fileName, certificateUploadedAt: new Date(), updatedAt: new Date() })
    .where(eq(inspectorProfiles.userId, userId));
}

/** A certified inspector's certificate by the profile's public id. */
export async function getCertificate(db: Executor, publicId: string) {
  const userId = await inspectorUserIdFor(db, publicId);
  if (!userId) return null;
  const [profile] = await db
    .select({ fileKey: inspectorProfiles.certificateFileKey, fileName: inspectorProfiles.certificateFileName })
    .from(inspectorProfiles)
    .where(and(eq(inspectorProfiles.userId, userId), isCertified));
  return profile?.fileKey ? { fileKey: profile.fileKey, fileName: profile.fileName ?? "certificate.pdf" } : null;
}

/** What the booking page of a listing offers this person: the machine, and the inspectors they may book with free slots. */
export async function bookingPageFor(db: Executor, slug: string, viewerId: string | null) {
  const listing = await findListingBySlug(db, slug);
  if (!listing || (listing.status !== "published" && listing.sellerId !== viewerId)) return null;
  const inspectors = await eligibleInspectors(db, listing, viewerId);
  // The page is public: the machine by its slug, and whether the viewer is its seller, but no account or row ids.
  const { id: _listingId, sellerId, status: _status, ...machine } = listing;
  return { listing: machine, inspectors, viewerIsSeller: viewerId !== null && viewerId === sellerId };
}

/** Checks an uploaded certificate (a PDF within the document limit, by its first bytes) and stores it on the profile. */
export async function storeCertificate(db: Database, userId: string, file: File) {
  await requireProfile(db, userId);
  if (file.size === 0) throw new BookingRuleError("Choose a PDF file to upload.", 422, "certificate");
  if (file.size > DOCUMENT_MAX_BYTES) throw new BookingRuleError(`This file is ${formatBytes(file.size)}; the limit is ${formatBytes(DOCUMENT_MAX_BYTES)}.`, 422, "certificate");
  const bytes = Buffer.from(await file.arrayBuffer());
  if (!(await isPdf(bytes))) throw new BookingRuleError("This file is not a PDF. Upload your certificate as PDF.", 422, "certificate");
  const fileKey = `inspectors/${userId}/certificate-${randomUUID()}.pdf`;
  await writeObject({ key: fileKey, body: bytes, contentType: "application/pdf" });
  const fileName = file.name.replace(/[^\w .()-]/g, "_").slice(0, 120) || "certificate.pdf";
  await setCertificate(db, userId, { fileKey, fileName });
}

/** The certificate of a certified inspector as a stream, or null. */
export async function openCertificate(db: Executor, publicId: string) {
  const certificate = await getCertificate(db, publicId);
  if (!certificate) return null;
  const object = await openObject(certificate.fileKey);
  return object ? { ...object, fileName: certificate.fileName } : null;
}
