// After a search finds the service down, searches answer from PostgreSQL at once for a short hold-off instead
// of each waiting out the timeout or a refused connection; once it is over, the index is asked again.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { ensureIndexSettings, syncListing } from "~/modules/search/indexing.server";
import { createListingSearch, SearchUnavailableError, type ListingSearch } from "~/modules/search/search.server";
import { searchMachines } from "~/modules/search/service.server";
import { insertListings, ownSearch, uniqueWord } from "../../support/search";

const db = getDatabase();
const word = uniqueWord();
let own: Awaited<ReturnType<typeof ownSearch>>;
let held: ListingSearch;

beforeAll(async () => {
  own = await ownSearch({ searchTimeoutMs: 500 });
  held = createListingSearch({ ...own.connection, holdOffMs: 1_500 });
  const [listing] = await insertListings([{ make: word }]);
  await ensureIndexSettings(own.search);
  await syncListing(db, listing!.id, { search: own.search, alerts: false });
}, 60_000);

afterAll(async () => {
  await own?.dispose();
});

describe("the hold-off after a failed search", () => {
  it("answers from PostgreSQL without asking the service while it lasts, then asks again", async () => {
    expect((await searchMachines(db, { text: word }, { search: held })).source).toBe("index");

    own.standIn!.setLatency(2_000);
    const slow = Date.now();
    expect((await searchMachines(db, { text: word }, { search: held })).source).toBe("database");
    expect(Date.now() - slow).toBeGreaterThanOrEqual(450);

    // The service answers quickly again, but the hold-off is not over: no timeout is waited, no request sent.
    own.standIn!.setLatency(0);
    const held1 = Date.now();
    const during = await searchMachines(db, { text: word }, { search: held });
    expect(during.source).toBe("database");
    expect(during.hits).toHaveLength(1);
    expect(Date.now() - held1).toBeLessThan(450);
    await expect(held.searchListings({ text: word })).rejects.toThrow(SearchUnavailableError);
    await expect(held.searchListings({ text: word })).rejects.toThrow(/not asked again/);

    await new Promise((resolve) => setTimeout(resolve, 1_600));
    expect((await searchMachines(db, { text: word }, { search: held })).source).toBe("index");
    // A search without a hold-off (the default) asks every time.
    expect((await searchMachines(db, { text: word }, { search: own.search })).source).toBe("index");
  });
});
