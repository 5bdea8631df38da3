// Keyset pagination of the PostgreSQL search: a cursor continues after the last row of its page in every
// sort, ties broken by date and id, so that walking the pages while listings are added, repriced and
// withdrawn never shows one twice or skips one that stayed; a changed or foreign cursor is refused with 400.
import { eq, inArray } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { parseListingSearchParams } from "~/modules/search/search-params.server";
import { SearchUnavailableError, type ListingSearch } from "~/modules/search/search.server";
import { searchMachines } from "~/modules/search/service.server";
import { getListingsApi, insertListings, uniqueWord } from "../../support/search";

const db = getDatabase();
const down = (): never => {
  throw new SearchUnavailableError("unreachable", "search service out of reach in this test");
};
const noService = { searchListings: down, searchListingsTogether: down } as unknown as ListingSearch;

/** One page of the search in `params`, as the API parses it, answered from PostgreSQL. */
async function page(params: string) {
  const parsed = parseListingSearchParams(new URLSearchParams(params));
  if (!parsed.success) throw new Error(JSON.stringify(parsed.errors));
  return searchMachines(db, parsed.query, { search: noService, after: parsed.after });
}

// Twelve listings with many ties: four dates, three prices.
async function tiedListings(word: string) {
  const base = Date.UTC(2026, 10, 1, 9);
  return insertListings(
    Array.from({ length: 12 }, (_, index) => ({
      make: word,
      publishedAt: new Date(base + (index % 4) * 3_600_000),
      priceMinor: [500_000, 700_000, 900_000][index % 3]!,
    })),
  );
}

/** Every id the walk met, following nextCursor to the end; `between` runs after each page. */
async function walk(params: string, between?: (pageNumber: number) => Promise<void>) {
  const seen: string[] = [];
  let answer = await page(params);
  for (let pages = 1; ; pages++) {
    seen.push(...answer.hits.map((hit) => hit.id));
    if (!answer.nextCursor) return { seen, pages };
    expect(pages).toBeLessThan(20);
    await between?.(pages);
    answer = await page(`${params}&after=${encodeURIComponent(answer.nextCursor)}`);
  }
}

describe("keyset pagination of the PostgreSQL search", () => {
  for (const sort of ["newest", "price-ascending", "price-descending", "best-accuracy"]) {
    it(`walks every listing once in the order of one long page (${sort}, ties)`, async () => {
      const word = uniqueWord();
      await tiedListings(word);
      const whole = await page(`q=${word}&sort=${sort}&perPage=24`);
      expect(whole.hits).toHaveLength(12);
      const { seen, pages } = await walk(`q=${word}&sort=${sort}&perPage=5`);
      expect(pages).toBe(3);
      expect(seen).toEqual(whole.hits.map((hit) => hit.id));
    });
  }

  it("neither repeats nor skips a listing while others are added, repriced and withdrawn", async () => {
    const word = uniqueWord();
    const written = await tiedListings(word);
    const withdrawn = new Set<string>();
    const { seen } = await walk(`q=${word}&sort=price-ascending&perPage=4`, async (pageNumber) => {
      // Cheaper than anything: sorts before the cursor, so it is not met (the walk is past it).
      await insertListings([{ make: word, priceMinor: 100_000 }]);
      if (pageNumber > 2) return;
      // A listing not yet met leaves the search (the dearest come last).
      const later = written.filter((listing) => listing.priceMinor === 900_000)[pageNumber]!;
      await db.update(listings).set({ status: "withdrawn" }).where(eq(listings.id, later.id));
      withdrawn.add(later.id);
    });
    expect(new Set(seen).size).toBe(seen.length);
    const stayed = written.filter((listing) => !withdrawn.has(listing.id)).map((listing) => listing.id);
    expect(seen.filter((id) => stayed.includes(id)).sort()).toEqual([...stayed].sort());
    expect(seen.some((id) => withdrawn.has(id))).toBe(false);
    await db.update(listings).set({ status: "withdrawn" }).where(inArray(listings.id, written.map((listing) => listing.id)));
  });

  it("answers 400 with a message for a changed, cut or foreign cursor, and a page number still works", async () => {
    const word = uniqueWord();
    await tiedListings(word);
    const first = await page(`q=${word}&perPage=5`);
    const cursor = first.nextCursor!;
    expect(cursor).toMatch(/^[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+$/);
    const [payload, signature] = cursor.split(".") as [string, string];
    const decoded = JSON.parse(Buffer.from(payload, "base64url").toString("utf8")) as { p: number };
    const forged = `${Buffer.from(JSON.stringify({ ...decoded, p: 7 })).toString("base64url")}.${signature}`;
    const flipped = `${payload.slice(0, -1)}${payload.endsWith("A") ? "B" : "A"}.${signature}`;
    for (const bad of [forged, flipped, cursor.slice(0, -3), `${cursor}x`, "not-a-cursor", "a".repeat(5_000), "\u0000"]) {
      const response = await getListingsApi(new URLSearchParams({ q: word, perPage: "5", after: bad }).toString());
      expect(response.status, bad.slice(0, 40)).toBe(400);
      const body = (await response.json()) as { errors: Record<string, string[]> };
      expect(body.errors.after?.[0]).toMatch(/page link is not valid/);
    }
    // Made for another search (other words, sort or page size): refused with its own message.
    for (const other of [`q=${word}x&perPage=5`, `q=${word}&perPage=5&sort=price-ascending`, `q=${word}&perPage=6`]) {
      const response = await getListingsApi(`${other}&after=${encodeURIComponent(cursor)}`);
      expect(response.status).toBe(400);
      expect(((await response.json()) as { errors: Record<string, string[]> }).errors.after![0]).toMatch(/belongs to another search/);
    }
    // Through the API the cursor continues the search; a page number beside it wins.
    const next = await getListingsApi(`q=${word}&perPage=5&after=${encodeURIComponent(cursor)}`);
    expect(next.status).toBe(200);
    expect(((await next.json()) as { page: number }).page).toBe(2);
    const numbered = (await (await getListingsApi(`q=${word}&perPage=5&page=3&after=${encodeURIComponent(cursor)}`)).json()) as { page: number; nextCursor: string | null };
    expect(numbered.page).toBe(3);
    expect(numbered.nextCursor).toBeNull();
  });
});
