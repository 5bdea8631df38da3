// The listings domain: a seller's machines from draft to sale, their photos and documents, and what
// buyers do with them (browse, ask, watch). Every function that changes a listing checks its owner.
import { randomBytes, randomUUID } from "node:crypto";
import { and, asc, count, desc, eq, inArray, lt, max, sql } from "drizzle-orm";
import { data } from "react-router";
import type { Database } from "~/db/client.server";
import { env } from "~/env.server";
import { hasRole, requireOwnership, type SessionUser } from "~/modules/accounts/guards.server";
import { user } from "~/modules/accounts/schema";
import { acceptUploadedDocument, acceptUploadedPhoto, RejectedFileError } from "~/modules/files/images.server";
import {
  DOCUMENT_MAX_BYTES,
  DOCUMENT_TYPES,
  DOCUMENTS_PER_LISTING,
  OUTSTANDING_UPLOADS_PER_LISTING,
  formatBytes,
  PHOTO_MAX_BYTES,
  PHOTO_TYPES,
  PHOTOS_PER_LISTING,
  UPLOAD_URL_SECONDS,
} from "~/modules/files/limits";
import { fileUrl } from "~/modules/files/serve.server";
import { deleteObjects, presignUpload } from "~/modules/files/storage.server";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { queueListingIndexUpdate } from "~/modules/search/indexing.server";
import { lengthToMillimetres, toMinorUnits } from "~/modules/units/format";
import { powerToKilowatts, weightToKilograms } from "~/modules/units/weight-power";
import { isLathe, labelOf, machineCategories } from "./catalogue";
import type { ListingStatus } from "./statuses";
import { InquiryEmail } from "./emails/inquiry";
import { listingDailyViews, listingDocuments, sellerPages, listingInquiries, listingPhotos, listings, listingWatches, uploadTickets, type Listing } from "./schema";
import type { ListingFormValues } from "./validation";
import { WATCHES_PER_USER } from "./watchlist.server";

export { RejectedFileError };

/** A rule of the listing's life that the request broke; its message is shown to the seller. */
export class ListingRuleError extends Error {
  override name = "ListingRuleError";
}

export function machineTitle(listing: Pick<Listing, "make" | "model">) {
  return `${listing.make} ${listing.model}`;
}

function slugPart(text: string) {
  return text
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "");
}

/** "/machines/halvorsen-ml-280-centre-lathe-1987-k3f9q2": readable, and unique by its tail. */
export function makeSlug(listing: Pick<Listing, "make" | "model" | "category" | "year">) {
  const words = [listing.make, listing.model, labelOf(machineCategories, listing.category), listing.year ? String(listing.year) : ""];
  const readable = words.map(slugPart).filter(Boolean).join("-").slice(0, 80).replace(/-+$/, "");
  const tail = randomBytes(4).readUInt32BE().toString(36).padStart(6, "0").slice(0, 6);
  return `${readable || "machine"}-${tail}`;
}

/** Form values in the reader's units to the stored columns (mm, kg, kW, minor units). */
function columnsFrom(values: ListingFormValues) {
  const { units } = values;
  const length = (value: number | undefined) => (value === undefined ? null : lengthToMillimetres(value, units));
  // A lathe's own figures (tailstock, cross-slide, screw-cutting) are kept for lathes only: the form hides them
  // for other kinds, and a listing moved to another kind must not keep figures it no longer shows.
  const lathe = isLathe(values.category);
  const latheOnly = <T,>(value: T | undefined) => (lathe && value !== undefined ? value : null);
  return {
    category: values.category as Listing["category"],
    make: values.make,
    model: values.model,
    year: values.year ?? null,
    serialNumber: values.serialNumber || null,
    swingOverBedMm: length(values.swingOverBed),
    distanceBetweenCentresMm: length(values.distanceBetweenCentres),
    spindleBoreMm: length(values.spindleBore),
    tableLengthMm: length(values.tableLength),
    tableWidthMm: length(values.tableWidth),
    spindleNose: values.spindleNose || null,
    supplyVoltage: values.supplyVoltage ?? null,
    supplyPhases: values.supplyPhases === undefined ? null : Number(values.supplyPhases),
    supplyFrequencyHz: values.supplyFrequency === undefined ? null : Number(values.supplyFrequency),
    spindleSpeedMinRpm: values.spindleSpeedMin ?? null,
    spindleSpeedMaxRpm: values.spindleSpeedMax ?? null,
    tailstockTaper: latheOnly(values.tailstockTaper || undefined),
    threadPitchMinMm: latheOnly(values.threadPitchMin),
    threadPitchMaxMm: latheOnly(values.threadPitchMax),
    threadTpiMin: latheOnly(values.threadTpiMin),
    threadTpiMax: latheOnly(values.threadTpiMax),
    swingOverCrossSlideMm: latheOnly(length(values.swingOverCrossSlide) ?? undefined),
    footprintLengthMm: length(values.footprintLength),
    footprintWidthMm: length(values.footprintWidth),
    motorPowerKw: values.motorPower === undefined ? null : powerToKilowatts(values.motorPower, units),
    weightKg: values.weight === undefined ? null : weightToKilograms(values.weight, units),
    city: values.city,
    region: values.region || null,
    country: values.country,
    priceMinor: toMinorUnits(values.price),
    currency: values.currency,
    condition: values.condition as Listing["condition"],
    toolingIncluded: values.toolingIncluded || null,
    description: values.description,
  };
}

function notFound(): never {
  throw data("There is no such listing. It may have been deleted.", { status: 404 });
}

/** The listing, if `actor` may change it (its seller, or an admin); 404 or 403 otherwise. */
async function managedListing(db: Database, actor: SessionUser, listingId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(listingId)) notFound();
  const [listing] = await db.select().from(listings).where(eq(listings.id, listingId));
  if (!listing) notFound();
  requireOwnership(actor, listing.sellerId, "this listing");
  return listing;
}

function requireSeller(actor: SessionUser) {
  if (!hasRole(actor, "seller") && !hasRole(actor, "admin")) {
    throw data("Only seller accounts can list machines. Add the seller role to your account first.", { status: 403 });
  }
}

// ————— Listing lifecycle —————

export async function createListing(db: Database, seller: SessionUser, values: ListingFormValues) {
  requireSeller(seller);
  const columns = columnsFrom(values);
  await db.insert(sellerPages).values({ userId: seller.id }).onConflictDoNothing();
  const [created] = await db
    .insert(listings)
    .values({ ...columns, sellerId: seller.id, slug: makeSlug(columns) })
    .returning({ id: listings.id, slug: listings.slug });
  return created;
}

export async function updateListing(db: Database, actor: SessionUser, listingId: string, values: ListingFormValues) {
  const listing = await managedListing(db, actor, listingId);
  const columns = columnsFrom(values);
  // A published address stays valid; a draft's follows its make and model.
  const slug = listing.status === "draft" ? makeSlug(columns) : listing.slug;
  await db.update(listings).set({ ...columns, slug, updatedAt: new Date() }).where(eq(listings.id, listing.id));
  await queueListingIndexUpdate(listing.id);
  return { id: listing.id, slug };
}

export type StatusChange = "publish" | "mark-sold" | "withdraw";

const transitions: Record<StatusChange, { from: ListingStatus[]; to: ListingStatus; refusal: string }> = {
  publish: { from: ["draft", "withdrawn"], to: "published", refusal: "Only a draft or a withdrawn listing can be published." },
  "mark-sold": { from: ["published"], to: "sold", refusal: "Only a published listing can be marked sold." },
  withdraw: { from: ["published"], to: "withdrawn", refusal: "Only a published listing can be withdrawn." },
};

export async function changeListingStatus(db: Database, actor: SessionUser, listingId: string, change: StatusChange) {
  const listing = await managedListing(db, actor, listingId);
  const rule = transitions[change];
  if (!rule.from.includes(listing.status)) throw new ListingRuleError(rule.refusal);
  if (change === "publish") {
    const [{ photos }] = await db.select({ photos: count() }).from(listingPhotos).where(eq(listingPhotos.listingId, listing.id));
    if (photos === 0) throw new ListingRuleError("Add at least one photo before publishing: buyers skip listings without one.");
  }
  const now = new Date();
  const stamps =
    change === "publish"
      ? { publishedAt: listing.publishedAt ?? now, withdrawnAt: null }
      : change === "mark-sold"
        ? { soldAt: now }
        : { withdrawnAt: now };
  // The status in the WHERE makes a double click (or two tabs) change it once.
  const updated = await db
    .update(listings)
    .set({ status: rule.to, ...stamps, updatedAt: now })
    .where(and(eq(listings.id, listing.id), inArray(listings.status, rule.from)))
    .returning({ id: listings.id, slug: listings.slug, status: listings.status });
  if (!updated.length) throw new ListingRuleError(rule.refusal);
  await queueListingIndexUpdate(listing.id);
  return updated[0];
}

/** Deletes a draft with its photos and documents; published listings are withdrawn instead, to keep their history. */
export async function deleteDraftListing(db: Database, actor: SessionUser, listingId: string) {
  const listing = await managedListing(db, actor, listingId);
  if (listing.status !== "draft") throw new ListingRuleError("Only a draft can be deleted. Withdraw a published listing instead.");
  const keys = await db.transaction(async (tx) => {
    const photos = await tx.select().from(listingPhotos).where(eq(listingPhotos.listingId, listing.id));
    const documents = await tx.select().from(listingDocuments).where(eq(listingDocuments.listingId, listing.id));
    await tx.delete(listings).where(and(eq(listings.id, listing.id), eq(listings.status, "draft")));
    return [...photos.flatMap((photo) => [photo.thumbnailKey, photo.largeKey]), ...documents.map((document) => document.storageKey)];
  });
  await queueListingIndexUpdate(listing.id);
  await deleteObjects(keys);
}

// ————— Reading for the seller —————

export function photoView(photo: typeof listingPhotos.$inferSelect) {
  return {
    id: photo.id,
    position: photo.position,
    thumbnailUrl: fileUrl(photo.thumbnailKey),
    largeUrl: fileUrl(photo.largeKey),
    width: photo.width,
    height: photo.height,
    originalName: photo.originalName,
    caption: photo.caption,
  };
}

function documentView(document: typeof listingDocuments.$inferSelect) {
  return { id: document.id, title: document.title, url: fileUrl(document.storageKey), size: formatBytes(document.bytes) };
}

async function photosOf(db: Database, listingId: string) {
  const rows = await db
    .select()
    .from(listingPhotos)
    .where(eq(listingPhotos.listingId, listingId))
    .orderBy(asc(listingPhotos.position), asc(listingPhotos.createdAt));
  return rows.map(photoView);
}

async function documentsOf(db: Database, listingId: string) {
  const rows = await db.select().from(listingDocuments).where(eq(listingDocuments.listingId, listingId)).orderBy(asc(listingDocuments.createdAt));
  return rows.map(documentView);
}

export async function getListingForEditing(db: Database, actor: SessionUser, listingId: string) {
  const listing = await managedListing(db, actor, listingId);
  return { listing, photos: await photosOf(db, listing.id), documents: await documentsOf(db, listing.id) };
}

/** Each listing's cover (its first photo in the seller's order), as a subquery to join on `listingId`. */
function coverPhotos(db: Database) {
  return db
    .selectDistinctOn([listingPhotos.listingId], { listingId: listingPhotos.listingId, thumbnailKey: listingPhotos.thumbnailKey })
    .from(listingPhotos)
    .orderBy(listingPhotos.listingId, asc(listingPhotos.position), asc(listingPhotos.createdAt))
    .as("cover");
}

/** Every listing of one seller, newest first (by when it was made), for the dashboard table. */
export async function listSellerListings(db: Database, seller: SessionUser) {
  requireSeller(seller);
  const cover = coverPhotos(db);
  const rows = await db
    .select({
      listing: listings,
      coverKey: cover.thumbnailKey,
      inquiries: sql<number>`(select count(*)::int from ${listingInquiries} where ${listingInquiries.listingId} = ${listings.id})`,
      watchers: sql<number>`(select count(*)::int from ${listingWatches} where ${listingWatches.listingId} = ${listings.id})`,
      views: sql<number>`(select coalesce(sum(${listingDailyViews.views}), 0)::int from ${listingDailyViews} where ${listingDailyViews.listingId} = ${listings.id})`,
    })
    .from(listings)
    .leftJoin(cover, eq(cover.listingId, listings.id))
    .where(eq(listings.sellerId, seller.id))
    .orderBy(desc(listings.createdAt), desc(listings.id));
  return rows.map(({ listing, coverKey, inquiries, watchers, views }) => ({
    id: listing.id,
    slug: listing.slug,
    title: machineTitle(listing),
    category: listing.category,
    status: listing.status,
    priceMinor: listing.priceMinor,
    currency: listing.currency,
    city: listing.city,
    country: listing.country,
    coverUrl: coverKey ? fileUrl(coverKey) : null,
    inquiries,
    watchers,
    views,
    createdAt: listing.createdAt.toISOString(),
    updatedAt: listing.updatedAt.toISOString(),
  }));
}

// ————— Photos and documents —————

const uploadKeyPattern = (listingId: string) => new RegExp(`^uploads/${listingId}/[0-9a-f-]{36}$`);

/** Refuses a file whose declared size is over the limit, before any upload address is handed out. */
function refuseOversized(file: UploadRequest, maxBytes: number) {
  if (file.size > maxBytes) throw new RejectedFileError(`${file.fileName} is ${formatBytes(file.size)}, over the ${formatBytes(maxBytes)} limit.`);
}

/** A fresh upload key of the shape `uploadKeyPattern` accepts, and its presigned PUT address. */
async function presignListingUpload(db: Database, listingId: string, file: UploadRequest, { reservePosition = false } = {}, now = new Date()) {
  const uploadKey = `uploads/${listingId}/${randomUUID()}`;
  // Each address handed out is a ticket; a listing holds only so many at once, so presigning in a loop cannot
  // hand out storage without end.
  await db.transaction(async (tx) => {
    await tx.execute(sql`select id from ${listings} where ${listings.id} = ${listingId} for update`);
    await tx.delete(uploadTickets).where(and(eq(uploadTickets.listingId, listingId), lt(uploadTickets.expiresAt, now)));
    const [{ outstanding }] = await tx.select({ outstanding: count() }).from(uploadTickets).where(eq(uploadTickets.listingId, listingId));
    if (outstanding >= OUTSTANDING_UPLOADS_PER_LISTING) {
      throw new RejectedFileError(`${OUTSTANDING_UPLOADS_PER_LISTING} uploads to this listing are already under way; finish them, or wait ${UPLOAD_URL_SECONDS / 60} minutes.`);
    }
    // A photo takes its gallery place now, in the order the seller chose the files, not when its upload ends.
    const position = reservePosition ? await nextPhotoPosition(tx, listingId) : null;
    await tx.insert(uploadTickets).values({ uploadKey, listingId, position, expiresAt: new Date(now.getTime() + UPLOAD_URL_SECONDS * 1000) });
  });
  const uploadUrl = await presignUpload({ key: uploadKey, contentType: file.contentType, contentLength: file.size, expiresInSeconds: UPLOAD_URL_SECONDS });
  return { uploadKey, uploadUrl, contentType: file.contentType };
}

type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

/** After every photo kept and every place reserved by an upload under way; call with the listing row locked. */
async function nextPhotoPosition(tx: Transaction, listingId: string) {
  const [{ kept }] = await tx.select({ kept: max(listingPhotos.position) }).from(listingPhotos).where(eq(listingPhotos.listingId, listingId));
  const [{ reserved }] = await tx.select({ reserved: max(uploadTickets.position) }).from(uploadTickets).where(eq(uploadTickets.listingId, listingId));
  return Math.max(kept ?? -1, reserved ?? -1) + 1;
}

/** A confirmed (or refused) upload gives its ticket back. */
async function returnTicket(db: Database, uploadKey: string) {
  await db.delete(uploadTickets).where(eq(uploadTickets.uploadKey, uploadKey));
}

export type UploadRequest = { fileName: string; size: number; contentType: string };

/** A presigned URL for one photo; the browser PUTs the file there, then calls `confirmPhotoUpload`. */
export async function startPhotoUpload(db: Database, actor: SessionUser, listingId: string, file: UploadRequest) {
  const listing = await managedListing(db, actor, listingId);
  if (!(PHOTO_TYPES as readonly string[]).includes(file.contentType)) {
    throw new RejectedFileError(`${file.fileName} is not a JPEG, PNG or WebP photo.`);
  }
  refuseOversized(file, PHOTO_MAX_BYTES);
  const [{ photos }] = await db.select({ photos: count() }).from(listingPhotos).where(eq(listingPhotos.listingId, listing.id));
  if (photos >= PHOTOS_PER_LISTING) throw new RejectedFileError(`A listing holds up to ${PHOTOS_PER_LISTING} photos; delete one first.`);
  return presignListingUpload(db, listing.id, file, { reservePosition: true });
}

/** Checks the uploaded object by its content and keeps its variants; a rejected file leaves nothing behind. */
export async function confirmPhotoUpload(db: Database, actor: SessionUser, listingId: string, upload: { uploadKey: string; fileName: string }) {
  const listing = await managedListing(db, actor, listingId);
  if (!uploadKeyPattern(listing.id).test(upload.uploadKey)) throw new RejectedFileError("This upload does not belong to this listing.");
  // The ticket, and with it the reserved place, is given back only when the photo row holds the place.
  const [ticket] = await db.select({ position: uploadTickets.position }).from(uploadTickets).where(eq(uploadTickets.uploadKey, upload.uploadKey));
  const reservedPosition = ticket?.position ?? null;
  const photoId = randomUUID();
  const accepted = await acceptUploadedPhoto({ uploadKey: upload.uploadKey, destinationPrefix: `listings/${listing.id}/photos/${photoId}` }).catch(async (error) => {
    await returnTicket(db, upload.uploadKey);
    throw error;
  });
  try {
    const [photo] = await db.transaction(async (tx) => {
      // Serialises concurrent confirmations of one listing, so positions and the limit hold.
      await tx.execute(sql`select id from ${listings} where ${listings.id} = ${listing.id} for update`);
      await tx.delete(uploadTickets).where(eq(uploadTickets.uploadKey, upload.uploadKey));
      const [{ photos }] = await tx.select({ photos: count() }).from(listingPhotos).where(eq(listingPhotos.listingId, listing.id));
      if (photos >= PHOTOS_PER_LISTING) throw new RejectedFileError(`A listing holds up to ${PHOTOS_PER_LISTING} photos; delete one first.`);
      // A ticket that expired before its confirmation reserved nothing any more: such a photo goes last.
      const position = reservedPosition ?? (await nextPhotoPosition(tx, listing.id));
      return tx
        .insert(listingPhotos)
        .values({
          id: photoId,
          listingId: listing.id,
          position,
          thumbnailKey: accepted.thumbnailKey,
          largeKey: accepted.largeKey,
          width: accepted.width,
          height: accepted.height,
          originalName: upload.fileName.slice(0, 200),
          originalBytes: accepted.bytes,
        })
        .returning();
    });
    await reindexIfListed(listing);
    return photoView(photo);
  } catch (error) {
    await returnTicket(db, upload.uploadKey);
    await deleteObjects([accepted.thumbnailKey, accepted.largeKey]);
    throw error;
  }
}

/** Moves a photo one place, or to the front, where it becomes the cover. */
export async function movePhoto(db: Database, actor: SessionUser, listingId: string, photoId: string, move: "earlier" | "later" | "cover") {
  const listing = await managedListing(db, actor, listingId);
  await db.transaction(async (tx) => {
    const photos = await tx
      .select({ id: listingPhotos.id })
      .from(listingPhotos)
      .where(eq(listingPhotos.listingId, listing.id))
      .orderBy(asc(listingPhotos.position), asc(listingPhotos.createdAt))
      .for("update");
    const order = photos.map((photo) => photo.id);
    const from = order.indexOf(photoId);
    if (from < 0) notFound();
    const to = move === "cover" ? 0 : move === "earlier" ? Math.max(0, from - 1) : Math.min(order.length - 1, from + 1);
    order.splice(to, 0, ...order.splice(from, 1));
    // An upload under way that reserved a place now taken arrives after the photo there (ties go by arrival).
    for (const [position, id] of order.entries()) {
      await tx.update(listingPhotos).set({ position }).where(eq(listingPhotos.id, id));
    }
  });
  await reindexIfListed(listing);
}

/** The seller's caption for one photo; an empty one clears it. */
export async function setPhotoCaption(db: Database, actor: SessionUser, listingId: string, photoId: string, caption: string) {
  const listing = await managedListing(db, actor, listingId);
  const updated = await db
    .update(listingPhotos)
    .set({ caption: caption || null })
    .where(and(eq(listingPhotos.id, photoId), eq(listingPhotos.listingId, listing.id)))
    .returning({ id: listingPhotos.id });
  if (!updated.length) notFound();
}

export async function deletePhoto(db: Database, actor: SessionUser, listingId: string, photoId: string) {
  const listing = await managedListing(db, actor, listingId);
  const [photo] = await db
    .delete(listingPhotos)
    .where(and(eq(listingPhotos.id, photoId), eq(listingPhotos.listingId, listing.id)))
    .returning();
  if (!photo) notFound();
  await deleteObjects([photo.thumbnailKey, photo.largeKey]);
  await reindexIfListed(listing);
}

/** Search results show a listed machine's cover photo: a change to its photos is a change to its index entry. */
async function reindexIfListed(listing: { id: string; status: string }) {
  if (listing.status !== "draft") await queueListingIndexUpdate(listing.id);
}

export async function startDocumentUpload(db: Database, actor: SessionUser, listingId: string, file: UploadRequest) {
  const listing = await managedListing(db, actor, listingId);
  if (!(DOCUMENT_TYPES as readonly string[]).includes(file.contentType)) throw new RejectedFileError(`${file.fileName} is not a PDF.`);
  refuseOversized(file, DOCUMENT_MAX_BYTES);
  const [{ documents }] = await db.select({ documents: count() }).from(listingDocuments).where(eq(listingDocuments.listingId, listing.id));
  if (documents >= DOCUMENTS_PER_LISTING) throw new RejectedFileError(`A listing holds up to ${DOCUMENTS_PER_LISTING} documents; delete one first.`);
  return presignListingUpload(db, listing.id, file);
}

export async function confirmDocumentUpload(db: Database, actor: SessionUser, listingId: string, upload: { uploadKey: string; fileName: string }) {
  const listing = await managedListing(db, actor, listingId);
  if (!uploadKeyPattern(listing.id).test(upload.uploadKey)) throw new RejectedFileError("This upload does not belong to this listing.");
  await returnTicket(db, upload.uploadKey);
  const documentId = randomUUID();
  const accepted = await acceptUploadedDocument({ uploadKey: upload.uploadKey, destinationKey: `listings/${listing.id}/documents/${documentId}.pdf` });
  const title = upload.fileName.replace(/\.pdf$/i, "").trim().slice(0, 120) || "Document";
  try {
    const [document] = await db
      .insert(listingDocuments)
      .values({ id: documentId, listingId: listing.id, title, storageKey: accepted.key, bytes: accepted.bytes })
      .returning();
    return documentView(document);
  } catch (error) {
    await deleteObjects([accepted.key]);
    throw error;
  }
}

export async function deleteDocument(db: Database, actor: SessionUser, listingId: string, documentId: string) {
  const listing = await managedListing(db, actor, listingId);
  const [document] = await db
    .delete(listingDocuments)
    .where(and(eq(listingDocuments.id, documentId), eq(listingDocuments.listingId, listing.id)))
    .returning();
  if (!document) notFound();
  await deleteObjects([document.storageKey]);
}

// ————— Public pages —————

/** One more view of a public listing today: a counter per listing and day (callers leave out bots and the seller). */
const publicStatuses: ListingStatus[] = ["published", "sold"];

/** A listing as buyers see it; drafts and withdrawn listings only for their seller (as a preview) or an admin. */
export async function getPublicListing(db: Database, slug: string, viewer: SessionUser | null) {
  const [row] = await db
    .select({ listing: listings, sellerName: user.name })
    .from(listings)
    .innerJoin(user, eq(user.id, listings.sellerId))
    .where(eq(listings.slug, slug));
  if (!row) return null;
  const { listing } = row;
  const isOwner = Boolean(viewer && viewer.id === listing.sellerId);
  const isManager = isOwner || Boolean(viewer && hasRole(viewer, "admin"));
  if (!publicStatuses.includes(listing.status) && !isManager) return null;
  const [[watch], photos, documents] = await Promise.all([
    viewer
      ? db
          .select({ userId: listingWatches.userId })
          .from(listingWatches)
          .where(and(eq(listingWatches.listingId, listing.id), eq(listingWatches.userId, viewer.id)))
      : [],
    photosOf(db, listing.id),
    documentsOf(db, listing.id),
  ]);
  const { sellerId: _sellerId, serialNumber, ...shown } = listing;
  return {
    listing: { ...shown, serialNumber, title: machineTitle(listing) },
    sellerName: row.sellerName,
    sellerPageId: await sellerPublicId(db, listing.sellerId),
    photos,
    documents,
    isManager,
    isOwner,
    isWatching: Boolean(watch),
  };
}

/** The seller's public page id (made with their first listing; reading a page writes nothing). */
async function sellerPublicId(db: Database, sellerId: string) {
  const [found] = await db.select({ publicId: sellerPages.publicId }).from(sellerPages).where(eq(sellerPages.userId, sellerId));
  return found?.publicId ?? null;
}

const SELLER_PAGE_LISTINGS = 60;

/** A seller's public page: their name, town (that of their latest public listing) and public listings, newest first. */
export async function getSellerPage(db: Database, publicId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(publicId)) return null;
  const [seller] = await db
    .select({ id: user.id, name: user.name })
    .from(sellerPages)
    .innerJoin(user, eq(user.id, sellerPages.userId))
    .where(eq(sellerPages.publicId, publicId));
  if (!seller) return null;
  const cover = coverPhotos(db);
  const rows = await db
    .select({ listing: listings, coverKey: cover.thumbnailKey })
    .from(listings)
    .leftJoin(cover, eq(cover.listingId, listings.id))
    .where(and(eq(listings.sellerId, seller.id), inArray(listings.status, publicStatuses)))
    .orderBy(desc(listings.publishedAt), desc(listings.id))
    .limit(SELLER_PAGE_LISTINGS);
  if (!rows.length) return null;
  const latest = rows[0].listing;
  return {
    name: seller.name,
    town: { city: latest.city, region: latest.region, country: latest.country },
    listings: rows.map(({ listing, coverKey }) => ({
      id: listing.id,
      slug: listing.slug,
      title: machineTitle(listing),
      category: listing.category,
      status: listing.status,
      year: listing.year,
      city: listing.city,
      country: listing.country,
      priceMinor: listing.priceMinor,
      currency: listing.currency,
      coverUrl: coverKey ? fileUrl(coverKey) : null,
    })),
  };
}

export const LISTINGS_PER_PAGE = 12;

/** Published listings, newest first, one page at a time. */
export async function browseListings(db: Database, { page }: { page: number }) {
  const [{ total }] = await db.select({ total: count() }).from(listings).where(eq(listings.status, "published"));
  const pageCount = Math.max(1, Math.ceil(total / LISTINGS_PER_PAGE));
  const current = Math.min(Math.max(1, page), pageCount);
  const cover = coverPhotos(db);
  const rows = await db
    .select({ listing: listings, coverKey: cover.thumbnailKey })
    .from(listings)
    .leftJoin(cover, eq(cover.listingId, listings.id))
    .where(eq(listings.status, "published"))
    .orderBy(desc(listings.publishedAt), desc(listings.id))
    .limit(LISTINGS_PER_PAGE)
    .offset((current - 1) * LISTINGS_PER_PAGE);
  return {
    total,
    page: current,
    pageCount,
    listings: rows.map(({ listing, coverKey }) => ({
      id: listing.id,
      slug: listing.slug,
      title: machineTitle(listing),
      category: listing.category,
      condition: listing.condition,
      year: listing.year,
      swingOverBedMm: listing.swingOverBedMm,
      distanceBetweenCentresMm: listing.distanceBetweenCentresMm,
      city: listing.city,
      region: listing.region,
      country: listing.country,
      priceMinor: listing.priceMinor,
      currency: listing.currency,
      coverUrl: coverKey ? fileUrl(coverKey) : null,
      publishedAt: listing.publishedAt?.toISOString() ?? null,
    })),
  };
}

async function publishedListing(db: Database, listingId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(listingId)) notFound();
  const [row] = await db
    .select({ listing: listings, seller: { name: user.name, email: user.email } })
    .from(listings)
    .innerJoin(user, eq(user.id, listings.sellerId))
    .where(and(eq(listings.id, listingId), eq(listings.status, "published")));
  if (!row) throw data("This listing is not open for questions: it was sold, withdrawn or deleted.", { status: 404 });
  return row;
}

/** Stores a buyer's question and queues it to the seller by e-mail, with the buyer as reply-to. */
export async function sendInquiry(db: Database, sender: SessionUser, listingId: string, values: { message: string; phone?: string }) {
  const { listing, seller } = await publishedListing(db, listingId);
  if (listing.sellerId === sender.id) throw new ListingRuleError("This is your own listing.");
  const machine = machineTitle(listing);
  const email = await renderEmail(
    InquiryEmail({
      sellerName: seller.name,
      buyerName: sender.name,
      buyerEmail: sender.email,
      phone: values.phone || null,
      machine,
      message: values.message,
      listingUrl: `${env().APP_ORIGIN}/machines/${listing.slug}`,
    }),
  );
  await db.transaction(async (tx) => {
    await tx.insert(listingInquiries).values({ listingId: listing.id, senderId: sender.id, message: values.message, phone: values.phone || null });
    // Queued in the transaction: the inquiry is stored and its e-mail sent together, or neither.
    await queueEmail({ to: seller.email, subject: `Question about your ${machine}`, ...email, tag: "listing-inquiry", replyTo: sender.email }, { within: tx });
  });
}

export async function setWatch(db: Database, viewer: SessionUser, listingId: string, watching: boolean) {
  const { listing } = await publishedListing(db, listingId);
  if (watching) {
    const [{ watched }] = await db.select({ watched: count() }).from(listingWatches).where(eq(listingWatches.userId, viewer.id));
    if (watched >= WATCHES_PER_USER) throw new ListingRuleError(`You can watch up to ${WATCHES_PER_USER} machines; stop watching one under Watched machines first.`);
    // The digest reports changes from here on: the price and state the watcher sees now.
    await db
      .insert(listingWatches)
      .values({ listingId: listing.id, userId: viewer.id, seenPriceMinor: listing.priceMinor, seenStatus: listing.status })
      .onConflictDoNothing();
  } else {
    await db.delete(listingWatches).where(and(eq(listingWatches.listingId, listing.id), eq(listingWatches.userId, viewer.id)));
  }
}
