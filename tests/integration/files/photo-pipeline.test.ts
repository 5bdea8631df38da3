import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { acceptUploadedDocument, acceptUploadedPhoto, RejectedFileError } from "~/modules/files/images.server";
import { PHOTO_MAX_BYTES } from "~/modules/files/limits";
import { presignUpload, readObject, statObject } from "~/modules/files/storage.server";
import { hasGpsPointer, hugePng, jpegWithGps, svgDrawing, textPretendingToBeJpeg, onePagePdf } from "../../support/images";

/** Puts bytes into the bucket the way a browser does: a PUT to a presigned URL. */
async function uploadAsBrowser(bytes: Buffer, contentType: string) {
  const uploadKey = `uploads/${randomUUID()}/${randomUUID()}`;
  const url = await presignUpload({ key: uploadKey, contentType, contentLength: bytes.length });
  const response = await fetch(url, { method: "PUT", body: new Uint8Array(bytes), headers: { "content-type": contentType } });
  expect(response.status).toBe(200);
  return uploadKey;
}

function destination() {
  return `listings/${randomUUID()}/photos/${randomUUID()}`;
}

async function expectRejected(bytes: Buffer, contentType: string, message: RegExp) {
  const uploadKey = await uploadAsBrowser(bytes, contentType);
  const destinationPrefix = destination();
  const attempt = acceptUploadedPhoto({ uploadKey, destinationPrefix });
  await expect(attempt).rejects.toBeInstanceOf(RejectedFileError);
  await expect(attempt).rejects.toThrow(message);
  // Nothing is left in the bucket: neither the upload nor a variant.
  expect(await statObject(uploadKey)).toBeNull();
  expect(await statObject(`${destinationPrefix}/thumb.webp`)).toBeNull();
  expect(await statObject(`${destinationPrefix}/large.webp`)).toBeNull();
}

describe("photo pipeline", () => {
  it("stores the upload byte for byte through a presigned URL (no chunk encoding)", async () => {
    const photo = await jpegWithGps();
    const uploadKey = await uploadAsBrowser(photo, "image/jpeg");
    expect((await readObject(uploadKey)).equals(photo)).toBe(true);
  });

  it("makes an upright WebP thumbnail and large view with no EXIF, GPS or XMP left, and deletes the original", async () => {
    const photo = await jpegWithGps({ width: 2400, height: 1800 });
    const original = await sharp(photo).metadata();
    expect(hasGpsPointer(original.exif)).toBe(true);

    const uploadKey = await uploadAsBrowser(photo, "image/jpeg");
    const destinationPrefix = destination();
    const accepted = await acceptUploadedPhoto({ uploadKey, destinationPrefix });

    expect(await statObject(uploadKey)).toBeNull();
    for (const key of [accepted.thumbnailKey, accepted.largeKey]) {
      const variant = await sharp(await readObject(key)).metadata();
      expect(variant.format).toBe("webp");
      expect(variant.exif).toBeUndefined();
      expect(variant.xmp).toBeUndefined();
      expect(variant.iptc).toBeUndefined();
    }
    const thumbnail = await sharp(await readObject(accepted.thumbnailKey)).metadata();
    expect([thumbnail.width, thumbnail.height]).toEqual([480, 360]);
    expect([accepted.width, accepted.height]).toEqual([1600, 1200]);
  });

  it("rejects a text file named .jpg", async () => {
    await expectRejected(textPretendingToBeJpeg, "image/jpeg", /not a photo we can read/);
  });

  it("rejects an SVG drawing", async () => {
    await expectRejected(svgDrawing, "image/jpeg", /SVG, not a photo we accept/);
  });

  it("rejects a file over the size limit", async () => {
    const oversized = Buffer.concat([await jpegWithGps(), Buffer.alloc(PHOTO_MAX_BYTES)]);
    await expectRejected(oversized, "image/jpeg", /, over the 15 MB limit/);
  });

  it("rejects a 20000 × 20000 PNG by its pixel count", async () => {
    const png = await hugePng();
    expect(png.length).toBeLessThan(PHOTO_MAX_BYTES);
    await expectRejected(png, "image/png", /20000 × 20000 pixels \(400 megapixels\); the limit is 40 megapixels/);
  });

  it("accepts a PDF that parses and rejects a JPEG sent as a document", async () => {
    const pdf = await onePagePdf();
    const pdfKey = await uploadAsBrowser(pdf, "application/pdf");
    const destinationKey = `listings/${randomUUID()}/documents/${randomUUID()}.pdf`;
    await acceptUploadedDocument({ uploadKey: pdfKey, destinationKey });
    expect((await readObject(destinationKey)).equals(pdf)).toBe(true);
    expect(await statObject(pdfKey)).toBeNull();

    const jpegKey = await uploadAsBrowser(await jpegWithGps(), "application/pdf");
    const otherKey = `listings/${randomUUID()}/documents/${randomUUID()}.pdf`;
    await expect(acceptUploadedDocument({ uploadKey: jpegKey, destinationKey: otherKey })).rejects.toThrow(/not a PDF/);
    expect(await statObject(jpegKey)).toBeNull();
    expect(await statObject(otherKey)).toBeNull();
  });
});
