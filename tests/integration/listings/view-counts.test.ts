// Listing page views are counted in memory and written in batches: one statement adds each listing-day's
// views to what is stored, a listing removed meanwhile is left out, and a person's visit to the page is
// stored within the counter's interval while a robot's is not.
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listingDailyViews, listings } from "~/modules/listings/schema";
import { writeViewCounts } from "~/modules/listings/views.server";
import { createTestUser, testAppOrigin } from "../../support/accounts";
import { insertPublishedLathe } from "../../support/listings";

const db = getDatabase();

const publishedLathe = (sellerId: string) => insertPublishedLathe(sellerId, { slugPrefix: "counted-lathe", description: "Test lathe for the view counts" });

async function storedViews(listingId: string, day?: string) {
  const rows = await db
    .select({ day: listingDailyViews.day, views: listingDailyViews.views })
    .from(listingDailyViews)
    .where(day ? and(eq(listingDailyViews.listingId, listingId), eq(listingDailyViews.day, day)) : eq(listingDailyViews.listingId, listingId));
  return rows.reduce((sum, row) => sum + row.views, 0);
}

describe("listing view counts written in batches", () => {
  it("adds each batch to the stored counts per day, and leaves out a listing that no longer exists", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const lathe = await publishedLathe(seller.id);
    await writeViewCounts(db, [
      { listingId: lathe.id, day: "2026-12-04", views: 7 },
      { listingId: lathe.id, day: "2026-12-05", views: 2 },
      { listingId: randomUUID(), day: "2026-12-05", views: 3 },
    ]);
    await writeViewCounts(db, [{ listingId: lathe.id, day: "2026-12-05", views: 40 }]);
    expect(await storedViews(lathe.id, "2026-12-04")).toBe(7);
    expect(await storedViews(lathe.id, "2026-12-05")).toBe(42);
    await writeViewCounts(db, []);
  });

  it("stores a person's visit within seconds, without the page waiting for it; a robot's visit is not counted", { timeout: 30_000 }, async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const lathe = await publishedLathe(seller.id);
    const person = { "user-agent": "Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/130.0 Safari/537.36" };
    const robot = { "user-agent": "Mozilla/5.0 (compatible; Googlebot/2.1; +http://www.google.com/bot.html)" };
    for (let i = 0; i < 3; i++) expect((await fetch(`${testAppOrigin}/machines/${lathe.slug}`, { headers: person })).status).toBe(200);
    expect((await fetch(`${testAppOrigin}/machines/${lathe.slug}`, { headers: robot })).status).toBe(200);
    await expect.poll(() => storedViews(lathe.id), { timeout: 15_000, interval: 500 }).toBe(3);
    // Nothing more arrives later: the robot's visit was never counted.
    await new Promise((resolve) => setTimeout(resolve, 6_000));
    expect(await storedViews(lathe.id)).toBe(3);
  });
});
