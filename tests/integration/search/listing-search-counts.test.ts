// listing_search_counts, the facet counts a search on the facets' columns alone reads, follows listing_search
// through every write in the same transaction: listings inserted, unpublished, moved, deleted; a report signed
// and superseded by a correction; a write rolled back. And a search counted from it gives the same totals and
// facets as the same search counted over listing_search.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { searchListingsInDatabase } from "~/modules/search/listing-source.server";
import type { ListingSearchRequest } from "~/modules/search/search.server";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { insertListings } from "../../support/search";

const db = getDatabase();
const allStatuses = ["draft", "published", "sold", "withdrawn"];

/** Combinations whose stored count differs from listing_search's own count, read in one snapshot. */
async function countsOutOfStep(): Promise<unknown[]> {
  const { rows } = await db.$client.query(`
    select coalesce(a.status::text, b.status::text) as status, coalesce(a.category::text, b.category::text) as category,
      coalesce(a.grade, b.grade) as grade, coalesce(a.verified, b.verified) as verified, coalesce(a.country, b.country) as country,
      a.listings as counted, b.listings as stored
    from (select status, category, grade, verified, country, count(*)::bigint as listings from listing_search group by 1, 2, 3, 4, 5) a
    full join (select * from listing_search_counts where listings <> 0) b
      on a.status = b.status and a.category = b.category and a.grade is not distinct from b.grade and a.verified = b.verified and a.country = b.country
    where a.listings is distinct from b.listings`);
  return rows;
}

// A price bound every listing meets: the same search, but counted over listing_search (not a facet column).
const overListingSearch = (query: ListingSearchRequest): ListingSearchRequest => ({ ...query, priceMinor: { min: 0 } });

/** Both reads in one snapshot, so that other tests' writes meanwhile cannot tell them apart. */
const inOneSnapshot = <T>(read: (tx: never) => Promise<T>) => db.transaction((tx) => read(tx as never), { isolationLevel: "repeatable read", accessMode: "read only" });

/** The same search counted both ways: the totals and facets must be equal; returns them. */
async function countedBothWays(query: ListingSearchRequest) {
  const [fromCounts, fromRows] = await inOneSnapshot(async (tx) => [
    await searchListingsInDatabase(tx, { ...query, hitsPerPage: 0 }),
    await searchListingsInDatabase(tx, { ...overListingSearch(query), hitsPerPage: 0 }),
  ]);
  expect({ total: fromCounts.totalHits, facets: fromCounts.facets }, JSON.stringify(query)).toEqual({ total: fromRows.totalHits, facets: fromRows.facets });
  return fromCounts;
}

describe("listing_search_counts", () => {
  it("follows inserts, status changes, moves, deletes and a rolled-back write", async () => {
    // A country of its own for this test, so that other tests' listings do not move its counts.
    const country = "AQ";
    const written = await insertListings([
      { country, category: "centre_lathe" },
      { country, category: "centre_lathe" },
      { country, category: "surface_grinder" },
      { country, category: "milling_machine", status: "draft", publishedAt: null },
    ]);
    expect(await countsOutOfStep()).toEqual([]);
    expect(await countedBothWays({ countries: [country] })).toMatchObject({ totalHits: 3, facets: { category: { centre_lathe: 2, surface_grinder: 1 }, country: { AQ: 3 }, verified: { false: 3 } } });
    expect((await countedBothWays({ countries: [country], statuses: allStatuses })).totalHits).toBe(4);

    await db.update(listings).set({ status: "sold" }).where(eq(listings.id, written[0]!.id));
    expect(await countsOutOfStep()).toEqual([]);
    expect(await countedBothWays({ countries: [country], categories: ["centre_lathe"] })).toMatchObject({ totalHits: 1 });

    await db.update(listings).set({ country: "BV" }).where(eq(listings.id, written[1]!.id));
    expect(await countsOutOfStep()).toEqual([]);
    expect((await countedBothWays({ countries: [country, "BV"] })).facets.country).toEqual({ AQ: 1, BV: 1 });

    await db.delete(listings).where(eq(listings.id, written[2]!.id));
    expect(await countsOutOfStep()).toEqual([]);
    expect((await countedBothWays({ countries: [country] })).totalHits).toBe(0);

    await expect(
      db.transaction(async (tx) => {
        await tx.update(listings).set({ status: "published", publishedAt: new Date() }).where(eq(listings.id, written[3]!.id));
        throw new Error("rolled back");
      }),
    ).rejects.toThrow("rolled back");
    expect(await countsOutOfStep()).toEqual([]);
    expect((await countedBothWays({ countries: [country, "BV"], statuses: allStatuses })).facets.category).toEqual({ centre_lathe: 2, milling_machine: 1 });
  });

  it("follows a report's signing and its supersession by a correction", async () => {
    const country = "HM";
    const booked = await acceptedBooking();
    await db.update(listings).set({ country }).where(eq(listings.id, booked.listing.id));
    expect(await countedBothWays({ countries: [country] })).toMatchObject({ totalHits: 1, facets: { verified: { false: 1 }, grade: {} } });

    const cookie = await inspectorCookie(booked.inspector);
    const first = await fileAndSign(cookie, booked.bookingId, completeForm());
    expect(await countsOutOfStep()).toEqual([]);
    const signed = await countedBothWays({ countries: [country] });
    expect(signed.facets.grade).toEqual({ [first.grade]: 1 });
    expect(signed.facets.verified).toEqual({ [String(first.grade !== "incomplete")]: 1 });
    expect((await countedBothWays({ countries: [country], verifiedOnly: true, grades: [first.grade] })).totalHits).toBe(first.grade === "incomplete" ? 0 : 1);

    await fetch(`${testAppOrigin}/inspector/reports/${first.id}/correct`, { method: "POST", headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
    const second = await fileAndSign(cookie, booked.bookingId, completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "40", "3"], instrumentId: "i1" } }));
    expect(second.id).not.toBe(first.id);
    expect(await countsOutOfStep()).toEqual([]);
    expect((await countedBothWays({ countries: [country] })).facets.grade).toEqual({ [second.grade]: 1 });
    for (const grade of ["A", "B", "C", "D", "incomplete"]) await countedBothWays({ countries: [country], grades: [grade], statuses: allStatuses });
  });

  it("gives every facet-only search the totals and facets listing_search gives", async () => {
    const categories = ["centre_lathe", "toolroom_lathe", "milling_machine"];
    const searches: ListingSearchRequest[] = [
      {},
      { statuses: allStatuses },
      { categories },
      { verifiedOnly: true },
      { grades: ["A", "B"] },
      { grades: ["incomplete"] },
      { countries: ["GB", "DE"] },
      { categories: ["centre_lathe"], verifiedOnly: true, grades: ["A"], countries: ["GB"] },
      { facets: ["grade"] },
      { facets: [] },
    ];
    for (const search of searches) await countedBothWays(search);
    // Several searches together (the page and its facets without their own filter) share one statement.
    const together = [{ categories, verifiedOnly: true }, { verifiedOnly: true, hitsPerPage: 0 }, { categories, hitsPerPage: 0 }];
    const { searchListingsInDatabaseTogether } = await import("~/modules/search/listing-source.server");
    const [fromCounts, fromRows] = await inOneSnapshot(async (tx) => [
      await searchListingsInDatabaseTogether(tx, together),
      await searchListingsInDatabaseTogether(tx, together.map(overListingSearch)),
    ]);
    expect(fromCounts.map((result) => [result.totalHits, result.facets])).toEqual(fromRows.map((result) => [result.totalHits, result.facets]));
    expect(fromCounts[0]!.hits.map((hit) => hit.id)).toEqual(fromRows[0]!.hits.map((hit) => hit.id));
  });

  it("is what a search with only facet filters reads (a search with other filters reads listing_search)", async () => {
    const statements: string[] = [];
    const { drizzle } = await import("drizzle-orm/node-postgres");
    const schema = await import("~/db/schema");
    const logged = drizzle(db.$client, { schema, logger: { logQuery: (query) => void statements.push(query) } });
    await searchListingsInDatabase(logged as never, { categories: ["centre_lathe"], verifiedOnly: true, hitsPerPage: 0 });
    expect(statements.at(-1)).toContain('from "listing_search_counts"');
    await searchListingsInDatabase(logged as never, { categories: ["centre_lathe"], maxSpindleRunoutUm: 5, hitsPerPage: 0 });
    expect(statements.at(-1)).toContain('from "listing_search"');
  });
});
