// PostgreSQL search answers kept by the app's client are given again only while search_generation has not moved,
// and every write to a table a search reads moves it in the same transaction: a listing changed, its photos, a
// write rolled back (nothing moves), a bare statement as the database owner. A client that was not asked to keep
// answers reads anew every time.
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { currentSearchGeneration, keptSearchAnswers } from "~/modules/search/kept-answers.server";
import { searchListingsInDatabase } from "~/modules/search/listing-source.server";
import { databaseKeepingNoSearchAnswers, insertListings } from "../../support/search";

const db = getDatabase();
const { db: plain, end } = databaseKeepingNoSearchAnswers();
afterAll(end);

describe("kept PostgreSQL search answers", () => {
  it("are reused until a write moves the generation, and then read anew", async () => {
    const [listing] = await insertListings([{ make: "Velmor", model: "KA 1" }]);
    const query = { ids: [listing!.id], statuses: ["published"], hitsPerPage: 5 };
    const first = await searchListingsInDatabase(db, query);
    expect(first.hits.map((hit) => hit.title ?? hit.id)).toHaveLength(1);
    const again = await searchListingsInDatabase(db, query);
    // The same kept objects (frozen), the same generation.
    expect(again.hits[0]).toBe(first.hits[0]);
    expect(Object.isFrozen(again.hits[0])).toBe(true);

    const before = await currentSearchGeneration(db);
    await db.update(listings).set({ status: "withdrawn" }).where(eq(listings.id, listing!.id));
    expect(await currentSearchGeneration(db)).toBeGreaterThan(before);
    expect((await searchListingsInDatabase(db, query)).hits).toHaveLength(0);
  });

  it("a rolled-back write leaves the generation where it was", async () => {
    const [listing] = await insertListings([{ make: "Velmor", model: "KA 2" }]);
    const before = await currentSearchGeneration(db);
    await expect(
      db.transaction(async (tx) => {
        await tx.update(listings).set({ priceMinor: 1 }).where(eq(listings.id, listing!.id));
        throw new Error("rolled back");
      }),
    ).rejects.toThrow("rolled back");
    expect(await currentSearchGeneration(db)).toBe(before);
  });

  it("a write by plain SQL on the tables the app writes moves the generation", async () => {
    const [listing] = await insertListings([{ make: "Velmor", model: "KA 3" }]);
    for (const statement of [
      `update listings set city = city where id = $1`,
      `update listing_search set listing_id = listing_id where listing_id = $1`,
      `delete from listing_photos where listing_id = $1`,
      `update reports set listing_id = listing_id where false and listing_id = $1`,
    ]) {
      const before = await currentSearchGeneration(db);
      await db.$client.query(statement, [listing!.id]);
      expect(await currentSearchGeneration(db), statement).toBeGreaterThan(before);
    }
  });

  it("a client not asked to keep answers reads anew every time", async () => {
    expect(keptSearchAnswers(plain)).toBeNull();
    const [listing] = await insertListings([{ make: "Velmor", model: "KA 4" }]);
    const query = { ids: [listing!.id], statuses: ["published"], hitsPerPage: 5 };
    const first = await searchListingsInDatabase(plain, query);
    const again = await searchListingsInDatabase(plain, query);
    expect(again.hits[0]).not.toBe(first.hits[0]);
    expect(again.hits[0]).toEqual(first.hits[0]);
  });
});
