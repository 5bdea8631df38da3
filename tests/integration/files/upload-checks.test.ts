// Uploads that only look right: a "PDF" that is the PDF header and then a web page (as a listing document
// and as an inspector's certificate), and set-up photos filed under a code that is no test of the report's
// profile. Each is refused with a message and leaves nothing stored.
import { beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { OUTSTANDING_UPLOADS_PER_LISTING } from "~/modules/files/limits";
import { htmlBehindPdfHeader, onePagePdf } from "../../support/images";
import { certifiedInspector } from "../../support/inspections";
import { createListingAs, objectKeysUnder, postForm, uploadFileAs } from "../../support/listings";
import { acceptedBooking, inspectorCookie } from "../../support/reports";

describe("documents must parse as PDF", () => {
  let cookie: string;
  beforeAll(async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    cookie = await signInCookie(seller.email, seller.password);
  });

  it("a listing document that is the PDF header and then HTML is refused and nothing is kept", async () => {
    const listingId = await createListingAs(cookie);
    const refused = await uploadFileAs(cookie, listingId, "documents", { bytes: htmlBehindPdfHeader, name: "manual.pdf", type: "application/pdf" });
    expect(refused.status).toBe(422);
    expect(refused.body.error).toMatch(/not a PDF/);
    expect(await objectKeysUnder(`uploads/${listingId}/`)).toEqual([]);
    expect(await objectKeysUnder(`listings/${listingId}/documents/`)).toEqual([]);
    const accepted = await uploadFileAs(cookie, listingId, "documents", { bytes: await onePagePdf(), name: "manual.pdf", type: "application/pdf" });
    expect(accepted.status).toBe(200);
  });

  it("an inspector's certificate that is the PDF header and then HTML is refused", async () => {
    const inspector = await certifiedInspector();
    const inspectorSession = await signInCookie(inspector.email, inspector.password);
    const send = (bytes: Buffer) => {
      const body = new FormData();
      body.set("intent", "certificate");
      body.set("certificate", new File([new Uint8Array(bytes)], "certificate.pdf", { type: "application/pdf" }));
      return fetch(`${testAppOrigin}/inspector/profile`, { method: "POST", body, headers: { cookie: inspectorSession, origin: testAppOrigin }, redirect: "manual" });
    };
    const refused = await send(htmlBehindPdfHeader);
    expect(refused.status).toBe(422);
    expect(await refused.text()).toMatch(/not a PDF/);
    expect(await objectKeysUnder(`inspectors/${inspector.id}/`)).toEqual([]);
    expect((await send(await onePagePdf("Certificate of competence"))).status).toBe(200);
  });
});

describe("set-up photos are filed under a test of the report's profile", () => {
  it("refuses a made-up test code at presign, and takes one of the profile's", async () => {
    const filed = await acceptedBooking();
    const cookie = await inspectorCookie(filed.inspector);
    const presign = (testCode: string) =>
      postForm(`/inspector/bookings/${filed.bookingId}/report/photos`, cookie, { intent: "presign", testCode, fileName: "setup.jpg", size: "100000", contentType: "image/jpeg" });
    for (const code of ["NOT-A-TEST", "__proto__", "L-SP-NOSE-2"]) {
      const refused = await presign(code);
      expect(refused.status, code).toBe(422);
      expect((await refused.json()).error).toMatch(/not a test of this report's profile/);
    }
    expect((await presign("L-SP-NOSE")).status).toBe(200);
  });

  it("refuses a made-up test code at confirm too", async () => {
    const filed = await acceptedBooking();
    const cookie = await inspectorCookie(filed.inspector);
    const confirm = await postForm(`/inspector/bookings/${filed.bookingId}/report/photos`, cookie, {
      intent: "confirm",
      testCode: "NOT-A-TEST",
      uploadKey: `uploads/reports/${filed.bookingId}/00000000-0000-4000-8000-000000000000`,
    });
    expect(confirm.status).toBe(422);
    expect((await confirm.json()).error).toMatch(/not a test of this report's profile/);
  });
});

describe("the presigned upload address", () => {
  it("signs the declared size and type, so storage refuses another body (S3 checks; the local stand-in does not)", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const cookie = await signInCookie(seller.email, seller.password);
    const listingId = await createListingAs(cookie);
    const presign = await postForm(`/sell/listings/${listingId}/photos`, cookie, { intent: "presign", fileName: "bed.jpg", size: "123456", contentType: "image/jpeg" });
    expect(presign.status).toBe(200);
    const url = new URL(((await presign.json()) as { uploadUrl: string }).uploadUrl);
    expect(url.searchParams.get("X-Amz-SignedHeaders")?.split(";")).toEqual(expect.arrayContaining(["content-length", "content-type", "host"]));
  });
});

describe("outstanding upload addresses per listing", () => {
  it("hands out at most the cap, and gives one back when an upload is confirmed", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const cookie = await signInCookie(seller.email, seller.password);
    const listingId = await createListingAs(cookie);
    const presign = () => postForm(`/sell/listings/${listingId}/documents`, cookie, { intent: "presign", fileName: "manual.pdf", size: "1000", contentType: "application/pdf" });
    const answers: number[] = [];
    for (let i = 0; i < OUTSTANDING_UPLOADS_PER_LISTING; i++) answers.push((await presign()).status);
    expect(answers.every((status) => status === 200)).toBe(true);
    const refused = await presign();
    expect(refused.status).toBe(422);
    expect((await refused.json()).error).toMatch(/already under way/);
  });
});
