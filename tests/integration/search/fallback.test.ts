// The buyer's search answered from the index, then — with the search stand-in stopped mid-test, or slowed
// past the timeout — the same filters answered from PostgreSQL, with the notice and nothing failing.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { ensureIndexSettings, syncListing } from "~/modules/search/indexing.server";
import { INCOMPLETE_NOTICE, searchMachines } from "~/modules/search/service.server";
import type { ListingSearchQuery } from "../../../search/query.ts";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { insertListings, ownSearch, uniqueWord } from "../../support/search";

const db = getDatabase();
const word = uniqueWord();
let own: Awaited<ReturnType<typeof ownSearch>>;
let verifiedId: string;
let ids: Record<string, string>;

beforeAll(async () => {
  own = await ownSearch({ searchTimeoutMs: 500 });
  const [small, toolroom, heavy] = await insertListings([
    { make: word, model: "CL 280", swingOverBedMm: 280, priceMinor: 850_000 },
    { make: word, model: "TR 250", category: "toolroom_lathe", swingOverBedMm: 250, priceMinor: 1_500_000 },
    { make: word, model: "HD 400", swingOverBedMm: 400, priceMinor: 1_100_000, currency: "GBP" },
  ]);
  // A lathe with a signed report (spindle run-out 4 µm, grade B), filed through the reports pages.
  const booking = await acceptedBooking();
  await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
  await db.update(listings).set({ make: word }).where(eq(listings.id, booking.listing.id));
  verifiedId = booking.listing.id;
  ids = { small: small!.id, toolroom: toolroom!.id, heavy: heavy!.id, verified: verifiedId };
  await ensureIndexSettings(own.search);
  for (const id of Object.values(ids)) await syncListing(db, id, { search: own.search, alerts: false });
}, 120_000);

afterAll(async () => {
  await own?.dispose();
});

const queries: Record<string, ListingSearchQuery> = {
  everything: { text: word, sort: "newest" },
  "centre lathes": { text: word, categories: ["centre_lathe"], sort: "newest" },
  "verified, run-out ≤ 5 µm": { text: word, verifiedOnly: true, maxSpindleRunoutUm: 5, sort: "newest" },
  "grade B, axial slip ≤ 3 µm": { text: word, grades: ["B"], maxAxialSlipUm: 3, sort: "newest" },
  "euro price range, cheapest first": { text: word, currency: "EUR", priceMinor: { min: 800_000, max: 1_300_000 }, sort: "price-ascending" },
  "swing 260 to 350 mm": { text: word, swingMm: { min: 260, max: 350 }, sort: "newest" },
  "report measured in the last 30 days": { text: word, maxReportAgeDays: 30, sort: "newest" },
};

async function answers() {
  const result: Record<string, { source: string; ids: string[]; total: number; facets: unknown }> = {};
  for (const [name, query] of Object.entries(queries)) {
    const answer = await searchMachines(db, query, { search: own.search });
    result[name] = { source: answer.source, ids: answer.hits.map((hit) => hit.id), total: answer.totalHits, facets: answer.facets };
  }
  return result;
}

describe("the machine search", () => {
  it("answers from the index, and with the stand-in stopped, the same filters from PostgreSQL", async () => {
    const fromIndex = await answers();
    for (const answer of Object.values(fromIndex)) expect(answer.source).toBe("index");
    expect(fromIndex.everything!.total).toBe(4);
    expect(fromIndex["centre lathes"]!.ids.sort()).toEqual([ids.small, ids.heavy, ids.verified].sort());
    expect(fromIndex["verified, run-out ≤ 5 µm"]!.ids).toEqual([verifiedId]);
    expect(fromIndex["grade B, axial slip ≤ 3 µm"]!.ids).toEqual([verifiedId]);
    // 8,500 and 12,400 EUR; the GBP lathe is not converted, the 15,000 EUR one is over the limit.
    expect(fromIndex["euro price range, cheapest first"]!.ids).toEqual([ids.small, verifiedId]);
    expect(fromIndex["swing 260 to 350 mm"]!.ids.sort()).toEqual([ids.small, verifiedId].sort());
    expect(fromIndex["report measured in the last 30 days"]!.ids).toEqual([verifiedId]);

    await own.stop();
    const started = Date.now();
    const fromDatabase = await answers();
    for (const [name, answer] of Object.entries(fromDatabase)) {
      expect(answer.source, name).toBe("database");
      expect(answer.total, name).toBe(fromIndex[name]!.total);
      expect(answer.facets, name).toEqual(fromIndex[name]!.facets);
      if (queries[name]!.sort === "price-ascending") expect(answer.ids, name).toEqual(fromIndex[name]!.ids);
      else expect([...answer.ids].sort(), name).toEqual([...fromIndex[name]!.ids].sort());
    }
    // A closed port fails at once: no timeout is waited out per query.
    expect(Date.now() - started).toBeLessThan(10_000);
    const answer = await searchMachines(db, queries.everything!, { search: own.search });
    expect(answer.notice).toBe(INCOMPLETE_NOTICE);
  });

  it("falls back when the service answers slower than the timeout", async () => {
    await own.restart();
    own.standIn!.setLatency(1_500);
    const started = Date.now();
    const answer = await searchMachines(db, queries["verified, run-out ≤ 5 µm"]!, { search: own.search });
    expect(answer.source).toBe("database");
    expect(answer.hits.map((hit) => hit.id)).toEqual([verifiedId]);
    // One timeout (500 ms) for the first query; the rest of the request goes straight to PostgreSQL.
    expect(Date.now() - started).toBeLessThan(1_400);
    own.standIn!.setLatency(0);
    expect((await searchMachines(db, queries["verified, run-out ≤ 5 µm"]!, { search: own.search })).source).toBe("index");
  });

  it("says which filter to widen when nothing matches, from the index and from PostgreSQL alike", async () => {
    const tooTight: ListingSearchQuery = { text: word, verifiedOnly: true, maxSpindleRunoutUm: 2, sort: "newest" };
    for (const mode of ["index", "database"] as const) {
      if (mode === "database") await own.stop();
      const answer = await searchMachines(db, tooTight, { search: own.search });
      expect(answer.source).toBe(mode);
      expect(answer.totalHits).toBe(0);
      expect(answer.emptyBecause).toBe("No machines with spindle run-out ≤ 2 µm, a verified report, the words “" + word + "”");
      // Run-out 4 µm: the next round limits are 3, 4, 5 … µm; 4 is the first that finds it.
      expect(answer.suggestions[0]).toMatchObject({ filter: "maxSpindleRunoutUm", count: 1, text: "1 machine with spindle run-out ≤ 4 µm" });
      expect(new URLSearchParams(answer.suggestions[0]!.queryString).get("runoutMax")).toBe("4");
      const inInches = await searchMachines(db, tooTight, { search: own.search, units: "inch" });
      // 0.0001 in = 2.54 µm finds nothing; 0.0002 in = 5.08 µm finds the 4 µm lathe.
      expect(inInches.suggestions[0]).toMatchObject({ text: "1 machine with spindle run-out ≤ 0.0002 in" });
    }
    await own.restart();
  });
});
