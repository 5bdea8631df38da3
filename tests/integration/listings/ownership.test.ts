import { beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { jpegWithGps } from "../../support/images";
import { createListingAs, listingRow, photoRows, postForm, uploadFileAs, validListingFields } from "../../support/listings";

const people = {} as Record<"owner" | "otherSeller" | "buyer" | "admin", { id: string; cookie: string }>;
let listingId: string;

beforeAll(async () => {
  for (const [key, roles] of [
    ["owner", ["seller"]],
    ["otherSeller", ["seller"]],
    ["buyer", []],
    ["admin", ["admin"]],
  ] as const) {
    const person = await createTestUser({ roles: [...roles] });
    people[key] = { id: person.id, cookie: await signInCookie(person.email, person.password) };
  }
  listingId = await createListingAs(people.owner.cookie);
  const upload = await uploadFileAs(people.owner.cookie, listingId, "photos", { bytes: await jpegWithGps(), name: "front.jpg", type: "image/jpeg" });
  expect(upload.status).toBe(200);
});

describe("only the owner (or an admin) can touch a listing", () => {
  it("gives another seller 403 on the edit page, every action and the uploads, and changes nothing", async () => {
    const before = await listingRow(listingId);
    const [photo] = await photoRows(listingId);
    const other = people.otherSeller.cookie;

    const page = await fetch(`${testAppOrigin}/sell/listings/${listingId}`, { headers: { cookie: other } });
    expect(page.status).toBe(403);
    expect(await page.text()).toMatch(/Only the owner of this listing can do that/);

    const attempts = [
      postForm(`/sell/listings/${listingId}`, other, validListingFields({ make: "Changed", price: "1" })),
      postForm(`/sell/listings/${listingId}`, other, { intent: "publish" }),
      postForm(`/sell/listings/${listingId}`, other, { intent: "delete" }),
      postForm(`/sell/listings/${listingId}`, other, { intent: "photo-delete", photoId: photo.id }),
      postForm(`/sell/listings/${listingId}/photos`, other, { intent: "presign", fileName: "x.jpg", size: "1000", contentType: "image/jpeg" }),
      postForm(`/sell/listings/${listingId}/documents`, other, { intent: "presign", fileName: "x.pdf", size: "1000", contentType: "application/pdf" }),
    ];
    for (const response of await Promise.all(attempts)) expect(response.status).toBe(403);

    expect(await listingRow(listingId)).toEqual(before);
    expect((await photoRows(listingId)).map((row) => row.id)).toEqual([photo.id]);
  });

  it("refuses a buyer without the seller role a new listing", async () => {
    const response = await postForm("/sell/new", people.buyer.cookie, validListingFields());
    expect(response.status).toBe(403);
  });

  it("sends a signed-out visitor to sign in", async () => {
    const response = await fetch(`${testAppOrigin}/sell/listings/${listingId}`, { redirect: "manual" });
    expect(response.status).toBe(302);
    expect(response.headers.get("location")).toMatch(/^\/sign-in\?redirectTo=/);
  });

  it("lets the owner and an admin edit and publish", async () => {
    const saved = await postForm(`/sell/listings/${listingId}`, people.owner.cookie, validListingFields({ price: "9900" }));
    expect(saved.status).toBe(302);
    expect((await listingRow(listingId)).priceMinor).toBe(990_000);

    const published = await postForm(`/sell/listings/${listingId}`, people.admin.cookie, { intent: "publish" });
    expect(published.status).toBe(302);
    expect((await listingRow(listingId)).status).toBe("published");
  });
});
