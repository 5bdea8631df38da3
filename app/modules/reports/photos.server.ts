// Set-up photos per test: presigned upload from the tablet, checked and re-encoded by the files pipeline,
// served through the app (published reports: anyone; drafts: the booking's inspector and staff).
import { randomUUID } from "node:crypto";
import { and, count, eq, isNotNull, sql } from "drizzle-orm";
import { z } from "zod";
import { fileSize, safeName, safeText } from "~/modules/validation/text";
import type { Database } from "~/db/client.server";
import { hasRole, type SessionUser } from "~/modules/accounts/guards.server";
import { acceptUploadedPhoto, RejectedFileError } from "~/modules/files/images.server";
import { formatBytes, PHOTO_MAX_BYTES, PHOTO_TYPES } from "~/modules/files/limits";
import { deleteObjects, openObject, presignUpload } from "~/modules/files/storage.server";
import { getBookingForReport } from "~/modules/inspections/report-queries.server";
import { reportDrafts, reportPhotos, reports } from "./schema";
import { ReportRuleError, setupPhotoUrl, testCodesOfReport } from "./service.server";

const PHOTOS_PER_TEST = 4;

export const photoStepSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("presign"),
    testCode: safeText({ label: "test code", max: 40, min: 1 }),
    fileName: safeName({ label: "file name", max: 255 }),
    size: fileSize(),
    contentType: safeText({ label: "file type", max: 100 }),
  }),
  z.object({ intent: z.literal("confirm"), testCode: safeText({ label: "test code", max: 40, min: 1 }), uploadKey: safeText({ label: "upload key", max: 200 }) }),
]);

async function requireWritable(db: Database, inspector: SessionUser, bookingId: string) {
  const found = await getBookingForReport(db, bookingId);
  if (!found || found.booking.inspectorId !== inspector.id) throw new ReportRuleError("There is no booking of yours at this address.", 404);
  const [signed] = await db.select({ id: reports.id }).from(reports).where(and(eq(reports.bookingId, bookingId), eq(reports.status, "signed")));
  const [{ corrections }] = await db
    .select({ corrections: count() })
    .from(reportDrafts)
    .where(and(eq(reportDrafts.bookingId, bookingId), isNotNull(reportDrafts.correctsReportId)));
  if (signed && !corrections) throw new ReportRuleError("This booking's report is signed and cannot be changed. Start a correction to add photos.", 409);
  if (!signed && found.booking.status !== "accepted") throw new ReportRuleError("Photos can only be added while the report is being filed.", 409);
  return found;
}

const uploadKeyPattern = (bookingId: string) => new RegExp(`^uploads/reports/${bookingId.replace(/[^A-Za-z0-9-]/g, "")}/[0-9a-f-]{36}$`);

/** A photo is kept under a test of the report's profile only (not under any code a client makes up). */
async function requireTestOfReport(db: Database, found: Awaited<ReturnType<typeof requireWritable>>, bookingId: string, testCode: string) {
  const codes = await testCodesOfReport(db, bookingId, found.listing);
  if (!codes.has(testCode)) throw new RejectedFileError(`"${testCode}" is not a test of this report's profile; add the photo under one of its tests.`);
}

export async function startSetupPhotoUpload(db: Database, inspector: SessionUser, bookingId: string, file: { testCode: string; fileName: string; size: number; contentType: string }) {
  const found = await requireWritable(db, inspector, bookingId);
  await requireTestOfReport(db, found, bookingId, file.testCode);
  if (!(PHOTO_TYPES as readonly string[]).includes(file.contentType)) throw new RejectedFileError(`${file.fileName} is not a JPEG, PNG or WebP photo.`);
  if (file.size > PHOTO_MAX_BYTES) throw new RejectedFileError(`${file.fileName} is ${formatBytes(file.size)}, over the ${formatBytes(PHOTO_MAX_BYTES)} limit.`);
  const uploadKey = `uploads/reports/${bookingId.replace(/[^A-Za-z0-9-]/g, "")}/${randomUUID()}`;
  return { uploadKey, uploadUrl: await presignUpload({ key: uploadKey, contentType: file.contentType, contentLength: file.size }), contentType: file.contentType };
}

export async function confirmSetupPhotoUpload(db: Database, inspector: SessionUser, bookingId: string, upload: { testCode: string; uploadKey: string }) {
  const found = await requireWritable(db, inspector, bookingId);
  if (!uploadKeyPattern(bookingId).test(upload.uploadKey)) throw new RejectedFileError("This upload does not belong to this report.");
  await requireTestOfReport(db, found, bookingId, upload.testCode);
  const [{ photos }] = await db
    .select({ photos: count() })
    .from(reportPhotos)
    .where(and(eq(reportPhotos.bookingId, bookingId), eq(reportPhotos.testCode, upload.testCode)));
  if (photos >= PHOTOS_PER_TEST) throw new RejectedFileError(`A test keeps up to ${PHOTOS_PER_TEST} set-up photos.`);
  const photoId = randomUUID();
  const accepted = await acceptUploadedPhoto({ uploadKey: upload.uploadKey, destinationPrefix: `reports/${bookingId}/photos/${photoId}` });
  try {
    await db.insert(reportPhotos).values({
      id: photoId,
      bookingId,
      testCode: upload.testCode,
      thumbnailKey: accepted.thumbnailKey,
      largeKey: accepted.largeKey,
      width: accepted.width,
      height: accepted.height,
      largeSha256: accepted.largeSha256,
    });
  } catch (error) {
    await deleteObjects([accepted.thumbnailKey, accepted.largeKey]);
    throw error;
  }
  return { id: photoId, testCode: upload.testCode, width: accepted.width, height: accepted.height, thumbnailUrl: setupPhotoUrl(photoId, "thumb") };
}

/** A set-up photo, if the viewer may see it: in a published report, or to the booking's inspector and staff. */
export async function serveSetupPhoto(db: Database, photoId: string, variant: "thumb" | "large", viewer: SessionUser | null, request: Request) {
  if (!z.uuid().safeParse(photoId).success) return new Response("Not found", { status: 404 });
  const [photo] = await db.select().from(reportPhotos).where(eq(reportPhotos.id, photoId));
  if (!photo) return new Response("Not found", { status: 404 });
  const published = await db.execute<{ id: string }>(
    sql`select id from reports where booking_id = ${photo.bookingId} and status in ('signed', 'superseded') and content -> 'tests' @? ${`$.*.photo ? (@.id == "${photoId}")`}::jsonpath limit 1`,
  );
  if (!published.rows.length) {
    const found = await getBookingForReport(db, photo.bookingId);
    const allowed = viewer && (found?.booking.inspectorId === viewer.id || hasRole(viewer, "admin"));
    if (!allowed) return new Response("Not found", { status: 404 });
  }
  const object = await openObject(variant === "thumb" ? photo.thumbnailKey : photo.largeKey);
  if (!object) return new Response("Not found", { status: 404 });
  if (object.etag && request.headers.get("if-none-match") === object.etag) {
    await object.body.cancel();
    return new Response(null, { status: 304, headers: { etag: object.etag } });
  }
  const headers = new Headers({
    "content-type": object.contentType,
    "cache-control": published.rows.length ? "public, max-age=31536000, immutable" : "private, no-store",
    "x-content-type-options": "nosniff",
  });
  if (object.etag) headers.set("etag", object.etag);
  return new Response(object.body as ReadableStream, { headers });
}
