import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listingInquiries, listingWatches } from "~/modules/listings/schema";
import { createTestUser, signInCookie } from "../../support/accounts";
import { jpegWithGps } from "../../support/images";
import { createListingAs, listingRow, postForm, uploadFileAs } from "../../support/listings";
import { latestEmailTo } from "../../support/mailbox";

let seller: { email: string; cookie: string };
let buyer: { id: string; email: string; cookie: string };
let listingId: string;
let slug: string;

beforeAll(async () => {
  const madeSeller = await createTestUser({ roles: ["seller"], name: "Brekke Machine Sales" });
  seller = { email: madeSeller.email, cookie: await signInCookie(madeSeller.email, madeSeller.password) };
  const madeBuyer = await createTestUser({ name: "Ingrid Solheim" });
  buyer = { id: madeBuyer.id, email: madeBuyer.email, cookie: await signInCookie(madeBuyer.email, madeBuyer.password) };
  listingId = await createListingAs(seller.cookie);
  await uploadFileAs(seller.cookie, listingId, "photos", { bytes: await jpegWithGps(), name: "front.jpg", type: "image/jpeg" });
  expect((await postForm(`/sell/listings/${listingId}`, seller.cookie, { intent: "publish" })).status).toBe(302);
  slug = (await listingRow(listingId)).slug;
});

const inquiriesOf = (senderId: string) =>
  getDatabase().select().from(listingInquiries).where(and(eq(listingInquiries.listingId, listingId), eq(listingInquiries.senderId, senderId)));

describe("a buyer's question to the seller", () => {
  it("is stored and e-mailed to the seller with the buyer as reply-to", async () => {
    const message = "Can I see it cutting before I decide? Is the leadscrew original?";
    const response = await postForm(`/machines/${slug}`, buyer.cookie, { intent: "inquire", listingId, message, phone: "+47 555 01 234" });
    expect(response.status).toBe(200);
    expect((await inquiriesOf(buyer.id)).map((row) => row.message)).toEqual([message]);

    const email = await latestEmailTo(seller.email, { waitMs: 20_000, matching: (m) => m.tag === "listing-inquiry" });
    expect(email.subject).toBe("Question about your Halvorsen ML 280");
    expect(email.replyTo).toBe(buyer.email);
    expect(email.text).toContain(message);
    expect(email.text).toContain("Ingrid Solheim");
  });

  it("rejects a message too short to answer, and stores nothing", async () => {
    const other = await createTestUser();
    const cookie = await signInCookie(other.email, other.password);
    const response = await postForm(`/machines/${slug}`, cookie, { intent: "inquire", listingId, message: "Price?" });
    expect(response.status).toBe(422);
    expect(await response.text()).toContain("Write at least 10 characters");
    expect(await inquiriesOf(other.id)).toEqual([]);
  });
});

describe("watching a listing", () => {
  it("adds and removes the buyer's watch", async () => {
    const watches = () =>
      getDatabase().select().from(listingWatches).where(and(eq(listingWatches.listingId, listingId), eq(listingWatches.userId, buyer.id)));
    expect((await postForm(`/machines/${slug}`, buyer.cookie, { intent: "watch", listingId })).status).toBe(200);
    expect(await watches()).toHaveLength(1);
    expect((await postForm(`/machines/${slug}`, buyer.cookie, { intent: "watch", listingId })).status).toBe(200);
    expect(await watches()).toHaveLength(1);
    expect((await postForm(`/machines/${slug}`, buyer.cookie, { intent: "unwatch", listingId })).status).toBe(200);
    expect(await watches()).toHaveLength(0);
  });
});
