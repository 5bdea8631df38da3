// The index (through the search stand-in) and the PostgreSQL fallback answer the same buyer's search
// with the same listings in the same order, the same total and the same facet counts: a property test
// over random filters, sorts and pages, on listings whose prices and publication dates tie often (so
// that the tie-breaks — newest first, then id — are exercised) and whose regions are written once
// composed and once decomposed (so that both compare Unicode-normalised text).
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { ensureIndexSettings, syncListing } from "~/modules/search/indexing.server";
import { searchListingsInDatabase } from "~/modules/search/listing-source.server";
import { listingSorts, type ListingSearchQuery } from "../../../search/query.ts";
import { insertListings, ownSearch, uniqueWord } from "../../support/search";

const db = getDatabase();
const word = uniqueWord();
let own: Awaited<ReturnType<typeof ownSearch>>;
let ids: string[] = [];

const categories = ["centre_lathe", "toolroom_lathe", "milling_machine"] as const;
const prices = [500_000, 900_000, 900_000, 1_400_000];
const dates = [new Date("2026-01-10T09:00:00Z"), new Date("2026-02-01T12:00:00Z"), new Date("2026-02-01T12:00:00Z")];
// “Île” composed and decomposed: the same region to the engine, and so to the fallback.
const regions = ["\u00cele", "I\u0302le", "Nord", null];
// Supplies at the edges of the search's bands (380 and 415 V are "three-phase 400 V"), and one not given.
const supplies = [
  { supplyVoltage: 400, supplyPhases: 3 },
  { supplyVoltage: 415, supplyPhases: 3 },
  { supplyVoltage: 230, supplyPhases: 1 },
  { supplyVoltage: 230, supplyPhases: 3 },
  { supplyVoltage: 380, supplyPhases: 3 },
  { supplyVoltage: null, supplyPhases: null },
];

beforeAll(async () => {
  own = await ownSearch({ searchTimeoutMs: 2_000 });
  const rows = Array.from({ length: 14 }, (_, n) => ({
    make: word,
    // One model written with a decomposed “ä”, to be found by “präzision” and “prazision” alike.
    model: n === 1 ? "Pra\u0308zision 2" : `M ${n}`,
    category: categories[n % categories.length],
    priceMinor: prices[n % prices.length]!,
    currency: n % 5 === 0 ? "GBP" : "EUR",
    swingOverBedMm: 200 + (n % 4) * 50,
    country: n % 3 === 0 ? "FR" : "DE",
    region: regions[n % regions.length],
    publishedAt: dates[n % dates.length],
    ...supplies[n % supplies.length],
  }));
  ids = (await insertListings(rows)).map((listing) => listing.id);
  await ensureIndexSettings(own.search);
  for (const id of ids) await syncListing(db, id, { search: own.search, alerts: false });
}, 120_000);

afterAll(async () => {
  await own?.dispose();
});

// Every search is confined to this test's listings: by its word, by their ids, or both.
const queryArbitrary: fc.Arbitrary<ListingSearchQuery> = fc
  .record(
    {
      scope: fc.constantFrom("word", "ids", "both"),
      categories: fc.subarray([...categories]),
      currency: fc.constantFrom("EUR", "GBP"),
      priceMinor: fc.record({ min: fc.constantFrom(400_000, 900_000), max: fc.constantFrom(900_000, 2_000_000) }, { requiredKeys: [] }),
      swingMm: fc.record({ min: fc.constantFrom(200, 250), max: fc.constantFrom(300, 400) }, { requiredKeys: [] }),
      countries: fc.subarray(["FR", "DE"]),
      region: fc.constantFrom("\u00cele", "I\u0302le", "\u00eele", "nord"),
      supply: fc.constantFrom("3x400", "3x230", "1x230", "3x480"),
      sort: fc.constantFrom(...listingSorts),
      page: fc.integer({ min: 1, max: 3 }),
      hitsPerPage: fc.integer({ min: 1, max: 6 }),
    },
    { requiredKeys: ["scope", "sort", "page", "hitsPerPage"] },
  )
  .map(({ scope, ...rest }) => ({
    ...rest,
    ...(scope !== "ids" ? { text: word } : {}),
    ...(scope !== "word" ? { ids } : {}),
  }));

describe("the index and the PostgreSQL fallback", () => {
  it("give the same ids in the same order, the same totals and facet counts", async () => {
    await fc.assert(
      fc.asyncProperty(queryArbitrary, async (query) => {
        const [fromIndex, fromDatabase] = await Promise.all([own.search.searchListings(query), searchListingsInDatabase(db, query)]);
        const label = JSON.stringify(query);
        expect(fromDatabase.hits.map((hit) => hit.id), label).toEqual(fromIndex.hits.map((hit) => hit.id));
        expect(fromDatabase.totalHits, label).toBe(fromIndex.totalHits);
        expect(fromDatabase.facets, label).toEqual(fromIndex.facets);
      }),
      { numRuns: 60 },
    );
  }, 120_000);

  it("find words whatever their accents and Unicode form", async () => {
    for (const text of ["Pr\u00e4zision", "prazision", "PRA\u0308ZISION"]) {
      const [fromIndex, fromDatabase] = await Promise.all([own.search.searchListings({ ids, text }), searchListingsInDatabase(db, { ids, text })]);
      expect(fromIndex.hits.map((hit) => hit.id), text).toEqual([ids[1]]);
      expect(fromDatabase.hits.map((hit) => hit.id), text).toEqual([ids[1]]);
    }
  });

  it("filter by the supply a machine runs on, the band's ends included", async () => {
    const expected = ids.filter((_, n) => [0, 1, 4].includes(n % supplies.length));
    const fromIndex = await own.search.searchListings({ ids, supply: "3x400", hitsPerPage: 20 });
    const fromDatabase = await searchListingsInDatabase(db, { ids, supply: "3x400", hitsPerPage: 20 });
    expect(new Set(fromIndex.hits.map((hit) => hit.id))).toEqual(new Set(expected));
    expect(fromDatabase.hits.map((hit) => hit.id)).toEqual(fromIndex.hits.map((hit) => hit.id));
  });

  it("match a region written decomposed as the same region", async () => {
    const composed = await own.search.searchListings({ ids, region: "\u00cele", hitsPerPage: 20 });
    const decomposed = await searchListingsInDatabase(db, { ids, region: "I\u0302le", hitsPerPage: 20 });
    expect(composed.totalHits).toBe(8);
    expect(decomposed.hits.map((hit) => hit.id)).toEqual(composed.hits.map((hit) => hit.id));
  });
});
