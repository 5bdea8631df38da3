// Upload limits, shared by the forms (which state them) and the server (which enforces them).

export const PHOTO_MAX_BYTES = 15 * 1024 * 1024;
/** Far below sharp's default (268 MP): a 40 MP photo is larger than any phone or DSLR frame a dealer sends. */
export const PHOTO_MAX_PIXELS = 40_000_000;
export const PHOTO_TYPES = ["image/jpeg", "image/png", "image/webp"] as const;
export const PHOTOS_PER_LISTING = 24;

export const DOCUMENT_MAX_BYTES = 20 * 1024 * 1024;
export const DOCUMENT_TYPES = ["application/pdf"] as const;
export const DOCUMENTS_PER_LISTING = 10;
/** Presigned upload addresses a listing may have outstanding (handed out, not yet confirmed or expired). */
export const OUTSTANDING_UPLOADS_PER_LISTING = 30;
/** How long a presigned upload address stays valid. */
export const UPLOAD_URL_SECONDS = 900;

export function formatBytes(bytes: number): string {
  const megabytes = bytes / (1024 * 1024);
  if (megabytes >= 1) return `${Number.isInteger(megabytes) ? megabytes : megabytes.toFixed(1)} MB`;
  return `${Math.max(1, Math.round(bytes / 1024))} KB`;
}

export const photoLimitText = `JPEG, PNG or WebP, up to ${formatBytes(PHOTO_MAX_BYTES)} and ${PHOTO_MAX_PIXELS / 1_000_000} megapixels each`;
export const documentLimitText = `PDF, up to ${formatBytes(DOCUMENT_MAX_BYTES)} each`;
