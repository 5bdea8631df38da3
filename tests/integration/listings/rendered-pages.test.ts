// The listing and search pages are rendered once per version of their data for visitors without a session
// (app/modules/http/rendered-pages.server.ts): a kept page is byte for byte the fresh one apart from its
// nonce, every answer has its own nonce (the same in the page and its Content-Security-Policy), a change of
// the listing shows at once, and a signed-in visitor always gets a page of their own.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { insertPublishedLathe } from "../../support/listings";

const db = getDatabase();
// The placeholder a kept page is rendered with: "n" and 48 hex digits. It must never be sent.
const PLACEHOLDER = /n[0-9a-f]{48}/;

const publishedLathe = (sellerId: string) => insertPublishedLathe(sellerId, { slugPrefix: "kept-lathe", description: "Test lathe for the kept pages" });

async function load(address: string, headers: Record<string, string> = {}) {
  const response = await fetch(`${testAppOrigin}${address}`, { headers });
  expect(response.status).toBe(200);
  const html = await response.text();
  const nonces = new Set([...html.matchAll(/nonce="([^"]+)"/g)].map((match) => match[1]));
  expect(nonces.size).toBe(1);
  const nonce = [...nonces][0]!;
  expect(response.headers.get("content-security-policy")).toContain(`'nonce-${nonce}'`);
  expect(html).not.toMatch(PLACEHOLDER);
  return { html, nonce };
}

describe("pages kept by the digest of their data", () => {
  it("sends the listing page again with a fresh nonce, and renders anew when the listing changes", async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Osterfeld Maschinen" });
    const lathe = await publishedLathe(seller.id);
    const address = `/machines/${lathe.slug}`;
    const first = await load(address);
    const second = await load(address);
    expect(second.nonce).not.toBe(first.nonce);
    expect(second.html.replaceAll(second.nonce, "NONCE")).toBe(first.html.replaceAll(first.nonce, "NONCE"));
    expect(first.html).toContain("€12,000");

    await db.update(listings).set({ priceMinor: 1_150_000, description: "Repriced after the inspection" }).where(eq(listings.id, lathe.id));
    const repriced = await load(address);
    expect(repriced.html).toContain("€11,500");
    expect(repriced.html).toContain("Repriced after the inspection");
    expect(repriced.html).not.toContain("€12,000");

    // Withdrawn: the page is gone at once, never served from what was kept.
    await db.update(listings).set({ status: "withdrawn" }).where(eq(listings.id, lathe.id));
    expect((await fetch(`${testAppOrigin}${address}`)).status).toBe(404);
  });

  it("gives a signed-in visitor a page of their own, with their name in its header", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const lathe = await publishedLathe(seller.id);
    const address = `/machines/${lathe.slug}`;
    await load(address);
    await load(address);
    const buyer = await createTestUser({ name: "Liesel Amberg" });
    const cookie = await signInCookie(buyer.email, buyer.password);
    const own = await load(address, { cookie });
    expect(own.html).toContain("Watch this machine");
    expect((await load(address)).html).not.toContain("Watch this machine");
  });

  it("sends the search page again with a fresh nonce, the same apart from it", async () => {
    const address = "/machines?category=centre_lathe&sort=newest";
    const first = await load(address);
    const second = await load(address);
    expect(second.nonce).not.toBe(first.nonce);
    // A listing published between the two loads would change the answer; compare only if none was.
    if (first.html.length === second.html.length) expect(second.html.replaceAll(second.nonce, "NONCE")).toBe(first.html.replaceAll(first.nonce, "NONCE"));
  });
});
