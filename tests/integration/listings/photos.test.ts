import sharp from "sharp";
import { beforeAll, describe, expect, it } from "vitest";
import { PHOTO_MAX_BYTES } from "~/modules/files/limits";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { hasGpsPointer, hugePng, jpegWithGps, svgDrawing, textPretendingToBeJpeg, onePagePdf } from "../../support/images";
import { createListingAs, listingRow, objectKeysUnder, photoRows, postForm, uploadFileAs } from "../../support/listings";
import { getListingsApi, uniqueWord } from "../../support/search";

let cookie: string;

beforeAll(async () => {
  const seller = await createTestUser({ roles: ["seller"] });
  cookie = await signInCookie(seller.email, seller.password);
});

async function expectNothingLeft(listingId: string) {
  expect(await photoRows(listingId)).toEqual([]);
  expect(await objectKeysUnder(`uploads/${listingId}/`)).toEqual([]);
  expect(await objectKeysUnder(`listings/${listingId}/`)).toEqual([]);
}

describe("hostile files sent as listing photos", () => {
  const cases: Array<[string, () => Promise<{ bytes: Buffer; name: string; type: string; declaredSize?: number }>, RegExp]> = [
    ["a text file named .jpg", async () => ({ bytes: textPretendingToBeJpeg, name: "lathe.jpg", type: "image/jpeg" }), /not a photo we can read/],
    ["an SVG", async () => ({ bytes: svgDrawing, name: "drawing.svg", type: "image/png" }), /SVG, not a photo we accept/],
    [
      "a file over the size limit that claims to be small",
      async () => ({ bytes: Buffer.concat([await jpegWithGps(), Buffer.alloc(PHOTO_MAX_BYTES)]), name: "big.jpg", type: "image/jpeg", declaredSize: 200_000 }),
      /, over the 15 MB limit/,
    ],
    ["a 20000 × 20000 PNG", async () => ({ bytes: await hugePng(), name: "huge.png", type: "image/png" }), /400 megapixels\); the limit is 40 megapixels/],
  ];

  it.each(cases)("rejects %s with a message and leaves no object or row", async (_name, make, message) => {
    const listingId = await createListingAs(cookie);
    const result = await uploadFileAs(cookie, listingId, "photos", await make());
    expect(result.step).toBe("confirm");
    expect(result.status).toBe(422);
    expect(result.body.error).toMatch(message);
    await expectNothingLeft(listingId);
  });

  it("refuses to presign a file declared over the limit, or of a type that is not a photo", async () => {
    const listingId = await createListingAs(cookie);
    const big = await postForm(`/sell/listings/${listingId}/photos`, cookie, { intent: "presign", fileName: "big.jpg", size: String(PHOTO_MAX_BYTES + 1), contentType: "image/jpeg" });
    expect(big.status).toBe(422);
    expect((await big.json()).error).toMatch(/big\.jpg is 15\.0 MB, over the 15 MB limit/);
    const svg = await postForm(`/sell/listings/${listingId}/photos`, cookie, { intent: "presign", fileName: "a.svg", size: "300", contentType: "image/svg+xml" });
    expect(svg.status).toBe(422);
    expect((await svg.json()).error).toMatch(/not a JPEG, PNG or WebP photo/);
    // An empty file, photo or document, is refused before any upload address is handed out.
    for (const [kind, fileName, contentType] of [["photos", "empty.jpg", "image/jpeg"], ["documents", "empty.pdf", "application/pdf"]]) {
      const empty = await postForm(`/sell/listings/${listingId}/${kind}`, cookie, { intent: "presign", fileName, size: "0", contentType });
      expect(empty.status).toBe(422);
      expect((await empty.json()).error).toMatch(/The file is empty/);
    }
    await expectNothingLeft(listingId);
  });

  it("will not confirm another listing's upload", async () => {
    const [mine, other] = [await createListingAs(cookie), await createListingAs(cookie)];
    const presign = await postForm(`/sell/listings/${other}/photos`, cookie, { intent: "presign", fileName: "a.jpg", size: "1000", contentType: "image/jpeg" });
    const { uploadKey } = await presign.json();
    const confirm = await postForm(`/sell/listings/${mine}/photos`, cookie, { intent: "confirm", fileName: "a.jpg", uploadKey });
    expect(confirm.status).toBe(422);
    expect((await confirm.json()).error).toMatch(/does not belong to this listing/);
  });
});

describe("a real photo", () => {
  it("is served only as WebP variants with no EXIF or GPS left", async () => {
    const listingId = await createListingAs(cookie);
    const original = await jpegWithGps({ width: 2000, height: 1500 });
    expect(hasGpsPointer((await sharp(original).metadata()).exif)).toBe(true);

    const result = await uploadFileAs(cookie, listingId, "photos", { bytes: original, name: "headstock.jpg", type: "image/jpeg" });
    expect(result.status).toBe(200);
    const photo = result.body.photo as { thumbnailUrl: string; largeUrl: string };
    for (const url of [photo.thumbnailUrl, photo.largeUrl]) {
      const response = await fetch(`${testAppOrigin}${url}`);
      expect(response.status).toBe(200);
      expect(response.headers.get("content-type")).toBe("image/webp");
      const metadata = await sharp(Buffer.from(await response.arrayBuffer())).metadata();
      expect(metadata.exif).toBeUndefined();
      expect(metadata.xmp).toBeUndefined();
    }
    // The original, with its GPS position, is gone from the bucket.
    expect(await objectKeysUnder(`uploads/${listingId}/`)).toEqual([]);
    expect((await objectKeysUnder(`listings/${listingId}/`)).sort()).toHaveLength(2);
  });

  it("can be reordered, made the cover and deleted; a draft is deleted with its files", async () => {
    const listingId = await createListingAs(cookie);
    const refused = await postForm(`/sell/listings/${listingId}`, cookie, { intent: "publish" });
    expect(refused.status).toBe(422);
    expect(await refused.text()).toMatch(/Add at least one photo before publishing/);

    for (const tint of ["#aa3322", "#2233aa", "#22aa33"]) {
      const upload = await uploadFileAs(cookie, listingId, "photos", { bytes: await jpegWithGps({ width: 640, height: 480, tint }), name: `${tint}.jpg`, type: "image/jpeg" });
      expect(upload.status).toBe(200);
    }
    const order = async () => (await photoRows(listingId)).sort((a, b) => a.position - b.position).map((row) => row.originalName);
    expect(await order()).toEqual(["#aa3322.jpg", "#2233aa.jpg", "#22aa33.jpg"]);

    const photos = await photoRows(listingId);
    const byName = (name: string) => photos.find((photo) => photo.originalName === name)!.id;
    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "photo-cover", photoId: byName("#22aa33.jpg") })).status).toBe(302);
    expect(await order()).toEqual(["#22aa33.jpg", "#aa3322.jpg", "#2233aa.jpg"]);
    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "photo-later", photoId: byName("#22aa33.jpg") })).status).toBe(302);
    expect(await order()).toEqual(["#aa3322.jpg", "#22aa33.jpg", "#2233aa.jpg"]);

    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "photo-delete", photoId: byName("#aa3322.jpg") })).status).toBe(302);
    expect(await order()).toEqual(["#22aa33.jpg", "#2233aa.jpg"]);
    expect(await objectKeysUnder(`listings/${listingId}/photos/${byName("#aa3322.jpg")}/`)).toEqual([]);

    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "delete" })).status).toBe(302);
    expect(await listingRow(listingId)).toBeUndefined();
    await expectNothingLeft(listingId);
  });

  it("keeps the order the seller chose the photos in, whichever upload finishes first", async () => {
    const listingId = await createListingAs(cookie);
    const endpoint = `/sell/listings/${listingId}/photos`;
    const chosen = ["#aa3322", "#2233aa", "#22aa33"];
    const tickets: Array<{ name: string; bytes: Buffer; uploadKey: string; uploadUrl: string }> = [];
    for (const tint of chosen) {
      const bytes = await jpegWithGps({ width: 640, height: 480, tint });
      const presign = await postForm(endpoint, cookie, { intent: "presign", fileName: `${tint}.jpg`, size: String(bytes.length), contentType: "image/jpeg" });
      tickets.push({ name: `${tint}.jpg`, bytes, ...((await presign.json()) as { uploadKey: string; uploadUrl: string }) });
    }
    const order = async () => (await photoRows(listingId)).sort((a, b) => a.position - b.position).map((row) => row.originalName);
    // The last one chosen finishes first, then the first; the seller's cover is still the first chosen.
    for (const ticket of [tickets[2], tickets[0]]) {
      await fetch(ticket.uploadUrl, { method: "PUT", body: new Uint8Array(ticket.bytes), headers: { "content-type": "image/jpeg" } });
      expect((await postForm(endpoint, cookie, { intent: "confirm", fileName: ticket.name, uploadKey: ticket.uploadKey })).status).toBe(200);
    }
    expect(await order()).toEqual(["#aa3322.jpg", "#22aa33.jpg"]);
    // After a move while the middle one is still on its way, it arrives after the photo now in its place.
    const lastId = (await photoRows(listingId)).find((photo) => photo.originalName === "#22aa33.jpg")!.id;
    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "photo-cover", photoId: lastId })).status).toBe(302);
    expect(await order()).toEqual(["#22aa33.jpg", "#aa3322.jpg"]);
    await fetch(tickets[1].uploadUrl, { method: "PUT", body: new Uint8Array(tickets[1].bytes), headers: { "content-type": "image/jpeg" } });
    expect((await postForm(endpoint, cookie, { intent: "confirm", fileName: tickets[1].name, uploadKey: tickets[1].uploadKey })).status).toBe(200);
    expect(await order()).toEqual(["#22aa33.jpg", "#aa3322.jpg", "#2233aa.jpg"]);
  });

  it("shows a published listing's new cover in search results", async () => {
    const word = uniqueWord("cover");
    const listingId = await createListingAs(cookie, { model: `ML ${word}` });
    for (const tint of ["#aa3322", "#2233aa"]) {
      expect((await uploadFileAs(cookie, listingId, "photos", { bytes: await jpegWithGps({ width: 640, height: 480, tint }), name: `${tint}.jpg`, type: "image/jpeg" })).status).toBe(200);
    }
    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "publish" })).status).toBe(302);
    const photos = await photoRows(listingId);
    const [first, second] = [...photos].sort((a, b) => a.position - b.position);
    const photoInResults = async () => {
      const body = (await (await getListingsApi(`q=${word}`)).json()) as { hits: Array<{ id: string; photoUrl: string | null }> };
      return body.hits.find((hit) => hit.id === listingId)?.photoUrl ?? null;
    };
    const waitFor = async (photoId: string) => {
      for (const deadline = Date.now() + 20_000; Date.now() < deadline; await new Promise((resolve) => setTimeout(resolve, 250))) {
        if ((await photoInResults())?.includes(photoId)) return;
      }
      throw new Error(`search results never showed photo ${photoId}; last: ${await photoInResults()}`);
    };
    await waitFor(first!.id);

    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "photo-cover", photoId: second!.id })).status).toBe(302);
    await waitFor(second!.id);
    expect((await postForm(`/sell/listings/${listingId}`, cookie, { intent: "photo-delete", photoId: second!.id })).status).toBe(302);
    await waitFor(first!.id);
  });

  it("accepts a PDF document and refuses a photo sent as one", async () => {
    const listingId = await createListingAs(cookie);
    const pdf = await onePagePdf();
    const accepted = await uploadFileAs(cookie, listingId, "documents", { bytes: pdf, name: "Operator manual.pdf", type: "application/pdf" });
    expect(accepted.status).toBe(200);
    expect(accepted.body.document.title).toBe("Operator manual");
    const refused = await uploadFileAs(cookie, listingId, "documents", { bytes: await jpegWithGps(), name: "report.pdf", type: "application/pdf" });
    expect(refused.status).toBe(422);
    expect(refused.body.error).toMatch(/not a PDF/);
    expect(await objectKeysUnder(`uploads/${listingId}/`)).toEqual([]);
    expect(await objectKeysUnder(`listings/${listingId}/documents/`)).toHaveLength(1);
  });
});
