import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { readObject, writeObject } from "~/modules/files/storage.server";
import { reportPhotos } from "~/modules/reports/schema";
import { testAppOrigin } from "../../support/accounts";
import { jpegWithGps } from "../../support/images";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";

describe("GET /api/v1/reports/verify", () => {
  it("says which signed report a hash belongs to", async () => {
    const booked = await acceptedBooking();
    const signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    const response = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${signed.contentHash}`);
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({
      match: true,
      intact: true,
      hash: signed.contentHash,
      report: { id: signed.id, status: "signed", revision: 1, grade: "B", machine: "Tessmar DL 330", url: `${testAppOrigin}/reports/${signed.id}` },
    });
    // Upper case is the same hash.
    const upper = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${signed.contentHash!.toUpperCase()}`);
    expect(((await upper.json()) as { match: boolean }).match).toBe(true);
  });

  it("answers no match for a well-formed hash no report has", async () => {
    // SHA-256("abc") = ba7816bf… (FIPS 180-2, appendix B.1): well formed, and no report's.
    const abc = createHash("sha256").update("abc").digest("hex");
    expect(abc).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    const response = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${abc}`);
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ match: false, hash: abc });
  });

  it("answers 400 with a message for bad input", async () => {
    for (const bad of ["", "abc", "z".repeat(64), "a".repeat(63), "a".repeat(65), "%27%20or%201%3D1"]) {
      const response = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${bad}`);
      expect(response.status, bad).toBe(400);
      const body = (await response.json()) as { errors: { hash: string[] } };
      expect(body.errors.hash[0]).toMatch(/64 hexadecimal/);
    }
  });

  it("answers 404 for a report id that is not a signed report", async () => {
    expect((await fetch(`${testAppOrigin}/api/v1/reports/5f2b1b7e-0000-4000-8000-000000000000`)).status).toBe(404);
    expect((await fetch(`${testAppOrigin}/api/v1/reports/not-a-uuid`)).status).toBe(404);
  });
});

describe("the set-up photos sealed with a report", () => {
  it("are checked again on verification: as signed, until the stored photo is swapped", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const photoId = await uploadSetupPhoto(cookie, booked.bookingId, "L-SP-NOSE", await jpegWithGps({ width: 800, height: 600, tint: "#3355aa" }));
    const form = completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "2", "4", "2"], instrumentId: "i1", photoId } });
    const signed = await fileAndSign(cookie, booked.bookingId, form);

    // The photo's digest is part of what was sealed: the SHA-256 of the large variant as stored.
    const [photo] = await db.select().from(reportPhotos).where(eq(reportPhotos.id, photoId));
    const stored = await readObject(photo!.largeKey);
    const sealedPhoto = JSON.parse(signed.canonicalJson!).tests["L-SP-NOSE"].photo;
    expect(sealedPhoto).toEqual({ id: photoId, width: photo!.width, height: photo!.height, sha256: createHash("sha256").update(stored).digest("hex") });

    const verify = async () => (await (await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${signed.contentHash}`)).json()) as { intact: boolean; photos: unknown };
    expect(await verify()).toMatchObject({ intact: true, photos: { sealed: 1, checked: true, changed: [] } });

    // Someone with access to the bucket swaps the photo: the report's own hash still holds, the photo check does not.
    await writeObject({ key: photo!.largeKey, body: await jpegWithGps({ width: 800, height: 600, tint: "#aa5533" }), contentType: "image/webp" });
    expect(await verify()).toMatchObject({ intact: true, photos: { sealed: 1, checked: true, changed: [photoId] } });
    const page = await (await fetch(`${testAppOrigin}/reports/verify?hash=${signed.contentHash}`)).text();
    expect(page).toContain("1 of its 1 set-up photo(s) no longer match what was signed.");
  });
});

async function uploadSetupPhoto(cookie: string, bookingId: string, testCode: string, bytes: Buffer): Promise<string> {
  const endpoint = `${testAppOrigin}/inspector/bookings/${bookingId}/report/photos`;
  const step = (fields: Record<string, string>) => fetch(endpoint, { method: "POST", body: new URLSearchParams(fields), headers: { cookie, origin: testAppOrigin } });
  const ticket = (await (await step({ intent: "presign", testCode, fileName: "setup.jpg", size: String(bytes.length), contentType: "image/jpeg" })).json()) as { uploadUrl: string; uploadKey: string };
  const put = await fetch(ticket.uploadUrl, { method: "PUT", body: new Uint8Array(bytes), headers: { "content-type": "image/jpeg" } });
  expect(put.status).toBe(200);
  const confirmed = await step({ intent: "confirm", testCode, uploadKey: ticket.uploadKey });
  expect(confirmed.status).toBe(200);
  return ((await confirmed.json()) as { photo: { id: string } }).photo.id;
}
