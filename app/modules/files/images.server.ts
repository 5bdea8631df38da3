// Checks uploaded files by their content and turns photos into the variants pages show.
import { createHash } from "node:crypto";
import { PDFDocument } from "pdf-lib";
import sharp, { type Metadata } from "sharp";
import { DOCUMENT_MAX_BYTES, formatBytes, PHOTO_MAX_BYTES, PHOTO_MAX_PIXELS } from "./limits";
import { deleteObjects, readObject, statObject, writeObject } from "./storage.server";

/** A file we refuse; its message is shown to the person who sent it. */
export class RejectedFileError extends Error {
  override name = "RejectedFileError";
}

const acceptedPhotoFormats = new Set(["jpeg", "png", "webp"]);

export const PHOTO_VARIANTS = {
  thumbnail: { width: 480, height: 360, fit: "cover" as const },
  large: { width: 1600, height: 1600, fit: "inside" as const },
};

function openImage(bytes: Buffer) {
  // limitInputPixels bounds decoding itself, so a decompression bomb fails before it takes the memory.
  return sharp(bytes, { limitInputPixels: PHOTO_MAX_PIXELS, failOn: "error" });
}

/** The format and size of a photo, judged by its bytes; rejects anything but JPEG, PNG or WebP within limits. */
export async function inspectPhoto(bytes: Buffer) {
  if (bytes.length > PHOTO_MAX_BYTES) {
    throw new RejectedFileError(`This photo is ${formatBytes(bytes.length)}, over the ${formatBytes(PHOTO_MAX_BYTES)} limit.`);
  }
  let metadata: Metadata;
  try {
    // Reading the header decodes no pixels, so the limit is lifted here to name the real size below.
    metadata = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch {
    throw new RejectedFileError("This file is not a photo we can read. Send a JPEG, PNG or WebP image.");
  }
  if (!metadata.format || !acceptedPhotoFormats.has(metadata.format)) {
    const found = metadata.format ? metadata.format.toUpperCase() : "an unknown format";
    throw new RejectedFileError(`This file is ${found}, not a photo we accept. Send a JPEG, PNG or WebP image.`);
  }
  const width = metadata.width ?? 0;
  const height = metadata.height ?? 0;
  if (width * height > PHOTO_MAX_PIXELS) {
    throw new RejectedFileError(
      `This photo is ${width} × ${height} pixels (${Math.round((width * height) / 1_000_000)} megapixels); the limit is ${PHOTO_MAX_PIXELS / 1_000_000} megapixels.`,
    );
  }
  return { format: metadata.format as "jpeg" | "png" | "webp", width, height };
}

/** WebP thumbnail and large view, upright and without EXIF, GPS, XMP or ICC metadata. */
export async function makePhotoVariants(bytes: Buffer) {
  const upright = () => openImage(bytes).rotate();
  try {
    const [thumbnail, large] = await Promise.all([
      upright().resize({ ...PHOTO_VARIANTS.thumbnail, position: "attention" }).webp({ quality: 78 }).toBuffer(),
      upright().resize({ ...PHOTO_VARIANTS.large, withoutEnlargement: true }).webp({ quality: 82 }).toBuffer({ resolveWithObject: true }),
    ]);
    return { thumbnail, large: large.data, width: large.info.width, height: large.info.height };
  } catch (error) {
    if (error instanceof Error && /pixel limit|corrupt|premature|unexpected end|bad/i.test(error.message)) {
      throw new RejectedFileError("This photo could not be read to the end; it may be damaged. Try exporting it again.");
    }
    throw error;
  }
}

/**
 * Whether the bytes are a PDF a reader can open: the header, then a document pdf-lib can parse to a
 * catalogue with at least one page. "%PDF-" followed by HTML or anything else is refused.
 */
export async function isPdf(bytes: Buffer): Promise<boolean> {
  if (bytes.subarray(0, 5).toString("latin1") !== "%PDF-") return false;
  try {
    // Encrypted PDFs are documents too (a certificate may be protected); only their structure is read here.
    const document = await PDFDocument.load(bytes, { ignoreEncryption: true, updateMetadata: false });
    return document.getPageCount() > 0;
  } catch {
    return false;
  }
}

/** Throws RejectedFileError when the uploaded object is missing or over `maxBytes`, after deleting it. */
async function requireUploaded(uploadKey: string, maxBytes: number, what: string) {
  const stat = await statObject(uploadKey);
  if (!stat) throw new RejectedFileError(`The ${what} did not reach storage. Try uploading it again.`);
  if (stat.size > maxBytes) {
    await deleteObjects([uploadKey]);
    throw new RejectedFileError(`This ${what} is ${formatBytes(stat.size)}, over the ${formatBytes(maxBytes)} limit.`);
  }
  if (stat.size === 0) {
    await deleteObjects([uploadKey]);
    throw new RejectedFileError(`This ${what} is empty.`);
  }
}

/**
 * Checks an uploaded photo and writes its variants under `destinationPrefix`. The upload is deleted
 * either way; on a rejection or failure no variant is left behind.
 */
export async function acceptUploadedPhoto({ uploadKey, destinationPrefix }: { uploadKey: string; destinationPrefix: string }) {
  await requireUploaded(uploadKey, PHOTO_MAX_BYTES, "photo");
  const keys = { thumbnailKey: `${destinationPrefix}/thumb.webp`, largeKey: `${destinationPrefix}/large.webp` };
  try {
    const bytes = await readObject(uploadKey);
    await inspectPhoto(bytes);
    const variants = await makePhotoVariants(bytes);
    await writeObject({ key: keys.thumbnailKey, body: variants.thumbnail, contentType: "image/webp" });
    await writeObject({ key: keys.largeKey, body: variants.large, contentType: "image/webp" });
    return { ...keys, width: variants.width, height: variants.height, bytes: bytes.length, largeSha256: sha256Hex(variants.large) };
  } catch (error) {
    await deleteObjects([keys.thumbnailKey, keys.largeKey]);
    throw error;
  } finally {
    await deleteObjects([uploadKey]);
  }
}

/** The SHA-256 of bytes as stored, in lower-case hex. */
export function sha256Hex(bytes: Buffer): string {
  return createHash("sha256").update(bytes).digest("hex");
}

/** Checks an uploaded PDF by its first bytes and moves it to `destinationKey`; the upload is deleted either way. */
export async function acceptUploadedDocument({ uploadKey, destinationKey }: { uploadKey: string; destinationKey: string }) {
  await requireUploaded(uploadKey, DOCUMENT_MAX_BYTES, "document");
  try {
    const bytes = await readObject(uploadKey);
    if (!(await isPdf(bytes))) throw new RejectedFileError("This file is not a PDF. Send manuals and earlier reports as PDF.");
    await writeObject({ key: destinationKey, body: bytes, contentType: "application/pdf" });
    return { key: destinationKey, bytes: bytes.length };
  } finally {
    await deleteObjects([uploadKey]);
  }
}
