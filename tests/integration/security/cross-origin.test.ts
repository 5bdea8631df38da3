// A change sent from another website (or from nowhere a browser would say) is refused with 403 before the
// action runs; Stripe's webhook, the public JSON API and one-click unsubscribe keep working without Origin.
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { userRole } from "~/modules/accounts/schema";
import { savedSearches } from "~/modules/search/saved-searches/schema";
import { unsubscribeToken } from "~/modules/search/saved-searches/service.server";
import { createTestUser, signInCookie, testAppOrigin, type TestUser } from "../../support/accounts";
import { completedSession, heldBooking, postWebhook, signedEvent } from "../../support/inspections";
import { createListingAs, listingRow } from "../../support/listings";

const db = getDatabase();
const elsewhere = "https://lathes-for-less.example";
const refusedFromElsewhere = /sent from another website, so it was refused/;
const refusedFromNowhere = /sent without saying which page it came from/;

let buyer: TestUser;
let buyerCookie: string;
let sellerCookie: string;
let listingId: string;

beforeAll(async () => {
  buyer = await createTestUser();
  buyerCookie = await signInCookie(buyer.email, buyer.password);
  const seller = await createTestUser({ roles: ["seller"] });
  sellerCookie = await signInCookie(seller.email, seller.password);
  listingId = await createListingAs(sellerCookie);
});

function post(path: string, headers: Record<string, string>, body: BodyInit = new URLSearchParams({ intent: "seller" })) {
  return fetch(`${testAppOrigin}${path}`, { method: "POST", headers, body, redirect: "manual" });
}

async function rolesOf(userId: string) {
  return (await db.select().from(userRole).where(eq(userRole.userId, userId))).map((row) => row.role).sort();
}

describe("a form posted from another website", () => {
  it("is refused with 403 and a message on the page, and the action does not run", async () => {
    const before = await rolesOf(buyer.id);
    const response = await post("/account", { cookie: buyerCookie, origin: elsewhere });
    expect(response.status).toBe(403);
    expect(await response.text()).toMatch(refusedFromElsewhere);
    expect(await rolesOf(buyer.id)).toEqual(before);
  });

  it("is refused with Origin: null, with a foreign Referer and no Origin, and on a client-side navigation's .data request", async () => {
    for (const headers of [{ origin: "null" }, { referer: `${elsewhere}/offer` }] as Array<Record<string, string>>) {
      const response = await post("/account", { cookie: buyerCookie, ...headers });
      expect(response.status, JSON.stringify(headers)).toBe(403);
      expect(await response.text()).toMatch(refusedFromElsewhere);
    }
    const data = await post("/account.data", { cookie: buyerCookie, origin: elsewhere });
    expect(data.status).toBe(403);
    expect(await data.text()).toMatch(refusedFromElsewhere);
    expect(await rolesOf(buyer.id)).not.toContain("seller");
  });

  it("is refused on resource routes, the JSON API and better-auth's endpoints, with JSON for the API", async () => {
    const before = await listingRow(listingId);
    const upload = await post(`/sell/listings/${listingId}/photos`, { cookie: sellerCookie, origin: elsewhere }, new URLSearchParams({ intent: "presign", fileName: "a.jpg", size: "1000", contentType: "image/jpeg" }));
    expect(upload.status).toBe(403);
    expect(await upload.text()).toMatch(refusedFromElsewhere);
    const deleting = await post(`/sell/listings/${listingId}`, { cookie: sellerCookie, origin: elsewhere }, new URLSearchParams({ intent: "delete" }));
    expect(deleting.status).toBe(403);
    expect(await listingRow(listingId)).toEqual(before);

    const api = await post("/api/v1/evaluations", { origin: elsewhere, "content-type": "application/json" }, "{}");
    expect(api.status).toBe(403);
    expect(await api.json()).toMatchObject({ error: "cross_origin_request", reason: "cross-origin", message: expect.stringMatching(refusedFromElsewhere) });

    const signOut = await post("/api/auth/sign-out", { cookie: buyerCookie, origin: elsewhere }, "");
    expect(signOut.status).toBe(403);
    const session = await fetch(`${testAppOrigin}/api/auth/get-session`, { headers: { cookie: buyerCookie } }).then((response) => response.json());
    expect(session?.user?.id, "the session survives").toBe(buyer.id);
  });
});

describe("a form posted with neither Origin nor Referer", () => {
  it("is refused on a page action", async () => {
    const response = await post("/account", { cookie: buyerCookie });
    expect(response.status).toBe(403);
    expect(await response.text()).toMatch(refusedFromNowhere);
  });

  it("is refused on better-auth's endpoints", async () => {
    const response = await post("/api/auth/sign-in/email", { "content-type": "application/json" }, JSON.stringify({ email: buyer.email, password: buyer.password }));
    expect(response.status).toBe(403);
    expect(response.headers.getSetCookie()).toEqual([]);
  });

  it("reaches the public JSON API, which answers for itself", async () => {
    const response = await post("/api/v1/evaluations", { "content-type": "application/json" }, "{}");
    expect(response.status).toBe(422);
  });

  it("reaches Stripe's webhook, which checks the signature", async () => {
    const unsigned = await post("/api/webhooks/stripe", { "content-type": "application/json" }, "{}");
    expect(unsigned.status).toBe(400);
    const held = await heldBooking();
    const event = signedEvent("checkout.session.completed", completedSession(held));
    const delivered = await postWebhook(event);
    expect(delivered.status).toBe(200);
  });

  it("reaches one-click unsubscribe, where the signed token is the proof", async () => {
    const [saved] = await db.insert(savedSearches).values({ userId: buyer.id, name: "Big lathes", queryString: "swingMin=400" }).returning();
    const response = await post(`/saved-searches/unsubscribe?token=${encodeURIComponent(unsubscribeToken(saved!.id))}`, { "content-type": "application/x-www-form-urlencoded" }, "List-Unsubscribe=One-Click");
    expect(response.status).toBe(200);
    const [after] = await db.select().from(savedSearches).where(eq(savedSearches.id, saved!.id));
    expect(after?.alertsEnabled).toBe(false);
  });
});

describe("a form posted from our own pages", () => {
  it("goes through with our Origin, its 127.0.0.1 twin, or only a Referer of ours", async () => {
    const twin = testAppOrigin.replace("localhost", "127.0.0.1");
    for (const headers of [{ origin: testAppOrigin }, { origin: twin }, { referer: `${testAppOrigin}/account` }] as Array<Record<string, string>>) {
      const person = await createTestUser();
      const cookie = await signInCookie(person.email, person.password);
      const response = await post("/account", { cookie, ...headers });
      expect(response.status, JSON.stringify(headers)).toBe(200);
      expect(await rolesOf(person.id)).toContain("seller");
    }
  });
});
