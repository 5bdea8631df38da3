// The `meilisearch` SDK's own calls against the search stand-in (started here on a free port), then the
// search module on top of it, including what it does when the service is slow or stopped.
import { randomBytes } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { Meilisearch, MeilisearchApiError, type Index } from "meilisearch";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createListingSearch, SearchIndexingError, SearchUnavailableError } from "~/modules/search/search.server";
import { freePort } from "../../../scripts/lib/ports.ts";
import { listingToSearchDocument, type ListingSearchDocument, type SearchableListing, type SearchableReport } from "../../../search/document.ts";
import { listingIndexSettings, LISTINGS_INDEX_UID } from "../../../search/settings.ts";
import { startSearchStandIn, type SearchStandIn } from "../../../search/stand-in/index.ts";

// One key for this file's stand-ins, so that a restarted one still takes the clients' key.
const masterKey = randomBytes(16).toString("hex");

// Invented machines, dealers and places.
function listing(id: string, overrides: Partial<SearchableListing>): SearchableListing {
  return {
    id,
    slug: `orvik-cl-360-${id}`,
    status: "published",
    category: "centre_lathe",
    categoryLabel: "Centre lathe",
    condition: "used",
    make: "Orvik",
    model: "CL-360",
    year: 1998,
    description: "Reconditioned centre lathe with new spindle bearings and a reground bed.",
    swingMm: 360,
    betweenCentresMm: 1000,
    spindleBoreMm: 52,
    priceMinor: 1_450_000,
    currency: "EUR",
    city: "Aldmoor",
    region: "North Brae",
    country: "DE",
    sellerName: "Aldmoor Machine Exchange",
    publishedAt: new Date("2026-03-01T10:00:00Z"),
    photoUrl: null,
    ...overrides,
  };
}

function report(id: string, grade: SearchableReport["grade"], spindleRunOut: number, measuredOn = "2026-02-20"): SearchableReport {
  return {
    id,
    grade,
    measuredOn: new Date(`${measuredOn}T00:00:00Z`),
    keyFigures: {
      spindleRunOut,
      axialSlip: 3,
      spindleParallelismVertical: -6,
      spindleParallelismHorizontal: 4,
      centreHeight: 12,
      bedStraightness: 9,
      tableFlatness: null,
      travelSquareness: null,
      xPositioningAccuracy: null,
      xRepeatability: null,
      yPositioningAccuracy: null,
      yRepeatability: null,
      zPositioningAccuracy: null,
      zRepeatability: null,
    },
  };
}

const documents: ListingSearchDocument[] = [
  listingToSearchDocument(listing("lathe-1", { model: "Precision 280", priceMinor: 2_100_000, publishedAt: new Date("2026-03-05T00:00:00Z") }), report("r-1", "A", 3)),
  listingToSearchDocument(listing("lathe-2", { make: "Brenna", model: "Toolroom 250", category: "toolroom_lathe", categoryLabel: "Toolroom lathe", priceMinor: 1_800_000, city: "Port Halden", country: "NL" }), report("r-2", "B", 5)),
  listingToSearchDocument(listing("lathe-3", { make: "Brenna", model: "Heavy 500", swingMm: 500, priceMinor: 3_200_000 }), report("r-3", "C", 9)),
  listingToSearchDocument(listing("lathe-4", { model: "Apprentice 200", swingMm: 200, priceMinor: 650_000, description: "Bench lathe, as taken out of a training workshop." }), null),
  listingToSearchDocument(listing("lathe-5", { make: "Veltry", model: "Ferro 330", status: "withdrawn", priceMinor: 990_000 }), report("r-5", "B", 4)),
  listingToSearchDocument(listing("mill-1", { make: "Veltry", model: "Knee mill 3", category: "milling_machine", categoryLabel: "Milling machine", priceMinor: 1_200_000, swingMm: null, betweenCentresMm: null }), null),
];
const ids = (hits: Array<{ id: unknown }>) => hits.map((hit) => hit.id);

async function apiError(promise: Promise<unknown>): Promise<MeilisearchApiError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof MeilisearchApiError) return error;
    throw error;
  }
  throw new Error("the call succeeded");
}

let dataDir: string;
let port: number;
let standIn: SearchStandIn;
let client: Meilisearch;
let listings: Index<ListingSearchDocument>;

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-search-test-"));
  port = await freePort();
  standIn = await startSearchStandIn({ port, dataDir, appOrigin: "http://localhost", masterKey });
  client = new Meilisearch({ host: standIn.env.MEILISEARCH_HOST, apiKey: standIn.env.MEILISEARCH_API_KEY });
  listings = client.index<ListingSearchDocument>(LISTINGS_INDEX_UID);
});

afterAll(async () => {
  await standIn?.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

describe("search stand-in through the meilisearch SDK", () => {
  it("answers the health check without a key", async () => {
    expect(await new Meilisearch({ host: standIn.env.MEILISEARCH_HOST }).health()).toEqual({ status: "available" });
  });

  it("creates an index through a task that goes enqueued → succeeded, and refuses a second one", async () => {
    const enqueued = await client.createIndex(LISTINGS_INDEX_UID, { primaryKey: "id" });
    expect(enqueued).toMatchObject({ indexUid: LISTINGS_INDEX_UID, status: "enqueued", type: "indexCreation" });
    const task = await client.tasks.waitForTask(enqueued);
    expect(task).toMatchObject({ uid: enqueued.taskUid, status: "succeeded", error: null });
    expect(Date.parse(task.enqueuedAt)).toBeLessThanOrEqual(Date.parse(task.startedAt!));
    expect(Date.parse(task.startedAt!)).toBeLessThanOrEqual(Date.parse(task.finishedAt!));

    const again = await client.createIndex(LISTINGS_INDEX_UID).waitTask();
    expect(again.status).toBe("failed");
    expect(again.error).toMatchObject({ code: "index_already_exists", type: "invalid_request" });
    expect((await client.getIndex(LISTINGS_INDEX_UID)).primaryKey).toBe("id");
    expect((await client.getIndexes()).results.map((index) => index.uid)).toContain(LISTINGS_INDEX_UID);
  });

  it("applies the listing settings and reads them back, whole and per setting", async () => {
    expect((await listings.updateSettings(listingIndexSettings).waitTask()).status).toBe("succeeded");
    const settings = await listings.getSettings();
    expect(settings.filterableAttributes).toEqual(listingIndexSettings.filterableAttributes);
    expect(settings.searchableAttributes).toEqual(listingIndexSettings.searchableAttributes);
    expect(await listings.getSortableAttributes()).toEqual(listingIndexSettings.sortableAttributes);
    expect(await listings.getRankingRules()).toEqual(listingIndexSettings.rankingRules);

    await listings.updateSortableAttributes(["priceMinor"]).waitTask();
    expect(await listings.getSortableAttributes()).toEqual(["priceMinor"]);
    await listings.resetSortableAttributes().waitTask();
    expect(await listings.getSortableAttributes()).toEqual([]);
    await listings.updateSortableAttributes(listingIndexSettings.sortableAttributes).waitTask();
    await listings.updateFilterableAttributes(listingIndexSettings.filterableAttributes).waitTask();
    await listings.updateSearchableAttributes(listingIndexSettings.searchableAttributes).waitTask();
  });

  it("rejects a bad setting with the setting's error code", async () => {
    const error = await apiError(listings.updateRankingRules(["words", "cheapest first"]).waitTask());
    expect(error.response.status).toBe(400);
    expect(error.cause).toMatchObject({ code: "invalid_settings_ranking_rules", type: "invalid_request" });
    expect(error.cause?.link).toMatch(/invalid_settings_ranking_rules$/);
  });

  it("adds documents, then gets one and lists them", async () => {
    const task = await listings.addDocuments(documents).waitTask();
    expect(task).toMatchObject({ status: "succeeded", type: "documentAdditionOrUpdate", details: { receivedDocuments: 6, indexedDocuments: 6 } });
    expect(await listings.getDocument("lathe-2")).toMatchObject({ make: "Brenna", spindleRunoutUm: 5, spindleParallelismVerticalUm: 6 });
    expect(await listings.getDocument("lathe-2", { fields: ["make", "model"] })).toEqual({ make: "Brenna", model: "Toolroom 250" });
    const page = await listings.getDocuments({ limit: 2, offset: 1, fields: ["id"] });
    expect(page).toEqual({ results: [{ id: "lathe-2" }, { id: "lathe-3" }], offset: 1, limit: 2, total: 6 });
    const filtered = await listings.getDocuments({ filter: "verified = false", fields: ["id"] });
    expect(ids(filtered.results)).toEqual(["lathe-4", "mill-1"]);
    const missing = await apiError(listings.getDocument("no-such-listing"));
    expect(missing.response.status).toBe(404);
    expect(missing.cause?.code).toBe("document_not_found");
  });

  it("fails a task whose documents lack the primary key, and keeps the index as it was", async () => {
    const task = await listings.addDocuments([{ make: "Nameless" } as unknown as ListingSearchDocument]).waitTask();
    expect(task.status).toBe("failed");
    expect(task.error).toMatchObject({ code: "missing_document_id", type: "invalid_request" });
    expect((await listings.getStats()).numberOfDocuments).toBe(6);
  });

  it("ranks full-text matches, with prefix and length-dependent typo tolerance", async () => {
    expect(ids((await listings.search("toolroom")).hits)).toEqual(["lathe-2"]);
    // “precison” (8 letters) is one typo from “precision”: allowed from 5 letters on.
    expect(ids((await listings.search("precison")).hits)).toEqual(["lathe-1"]);
    // The last word matches as a prefix.
    expect(ids((await listings.search("knee mi")).hits)).toEqual(["mill-1"]);
    // “Ovik” (4 letters) may not carry a typo, so it does not find “Orvik”.
    expect((await listings.search("Ovik")).hits).toEqual([]);
    expect(ids((await listings.search("orvik")).hits).sort()).toEqual(["lathe-1", "lathe-4"]);
    // Documents with every word come before those missing the last one.
    expect(ids((await listings.search("brenna heavy")).hits)).toEqual(["lathe-3", "lathe-2"]);
    const response = await listings.search("orvik");
    expect(response).toMatchObject({ query: "orvik", offset: 0, limit: 20, estimatedTotalHits: 2 });
    expect(typeof response.processingTimeMs).toBe("number");
  });

  // The listing settings end the ranking rules with `publishedAt:desc` and `id:desc`; lathe-1 is the
  // newest, the others were published together.
  const newestThenId = ["lathe-1", "mill-1", "lathe-5", "lathe-4", "lathe-3", "lathe-2"];

  it("returns every document in the custom ranking rules' order for an empty query", async () => {
    expect(ids((await listings.search("")).hits)).toEqual(newestThenId);
    expect(ids((await listings.search(null)).hits)).toHaveLength(6);
  });

  it("filters with strings and with the nested array form", async () => {
    const runout = await listings.search("", { filter: "verified = true AND spindleRunoutUm <= 5 AND status = published" });
    expect(ids(runout.hits)).toEqual(["lathe-1", "lathe-2"]);
    const arrays = await listings.search("", { filter: ["status = published", ["grade = A", "category = milling_machine"]] });
    expect(ids(arrays.hits)).toEqual(["lathe-1", "mill-1"]);
    const range = await listings.search("", { filter: "swingMm 300 TO 400 AND grade NOT IN [A, C]" });
    expect(ids(range.hits)).toEqual(["lathe-5", "lathe-2"]);
    expect(ids((await listings.search("", { filter: "grade IS NULL" })).hits)).toEqual(["mill-1", "lathe-4"]);
    expect(ids((await listings.searchGet("", { filter: "country = nl" })).hits)).toEqual(["lathe-2"]);
  });

  it("counts facets over all matches and gives the range of numeric ones", async () => {
    const response = await listings.search("", { filter: "status = published", facets: ["grade", "verified", "priceMinor"], limit: 1 });
    expect(response.hits).toHaveLength(1);
    expect(response.facetDistribution?.grade).toEqual({ A: 1, B: 1, C: 1 });
    expect(response.facetDistribution?.verified).toEqual({ false: 2, true: 3 });
    expect(response.facetStats).toEqual({ priceMinor: { min: 650_000, max: 3_200_000 } });
  });

  it("sorts first and leaves ties to the rules after `sort`; documents without the attribute come last", async () => {
    const cheapest = await listings.search("", { sort: ["priceMinor:asc"], filter: "status = published" });
    expect(ids(cheapest.hits)).toEqual(["lathe-4", "mill-1", "lathe-2", "lathe-1", "lathe-3"]);
    const best = await listings.search("", { sort: ["gradeRank:asc", "spindleRunoutUm:asc"] });
    expect(ids(best.hits)).toEqual(["lathe-1", "lathe-5", "lathe-2", "lathe-3", "mill-1", "lathe-4"]);
    const newestOrvik = await listings.search("orvik", { sort: ["publishedAt:desc"] });
    expect(ids(newestOrvik.hits)).toEqual(["lathe-1", "lathe-4"]);
  });

  it("pages by page/hitsPerPage and by offset/limit, and retrieves only the asked attributes", async () => {
    const page = await listings.search("", { page: 2, hitsPerPage: 4, attributesToRetrieve: ["id", "grade"] });
    expect(page).toMatchObject({ page: 2, hitsPerPage: 4, totalHits: 6, totalPages: 2 });
    expect(page.hits).toEqual([
      { id: "lathe-3", grade: "C" },
      { id: "lathe-2", grade: "B" },
    ]);
    const offset = await listings.search("", { offset: 4, limit: 10 });
    expect(offset).toMatchObject({ offset: 4, limit: 10, estimatedTotalHits: 6 });
    expect(ids(offset.hits)).toEqual(["lathe-3", "lathe-2"]);
  });

  it("answers a multi-search with each search's own answer, in order, and names a failing one", async () => {
    const searches = [
      { filter: "status = published AND verified = true", facets: ["grade"], sort: ["priceMinor:asc"], page: 1, hitsPerPage: 2 },
      { filter: "status = published", facets: ["verified"], page: 1, hitsPerPage: 0 },
      { q: "brenna", facets: ["category"] },
    ];
    const together = await client.multiSearch({ queries: searches.map((search) => ({ indexUid: LISTINGS_INDEX_UID, ...search })) });
    expect(together.results.map((result) => result.indexUid)).toEqual([LISTINGS_INDEX_UID, LISTINGS_INDEX_UID, LISTINGS_INDEX_UID]);
    for (const [position, { q, ...parameters }] of searches.entries()) {
      const alone = await listings.search(q ?? null, parameters);
      const { indexUid: _indexUid, processingTimeMs: _together, ...answer } = together.results[position]!;
      const { processingTimeMs: _alone, ...expected } = alone;
      expect(answer).toEqual(expected);
    }
    expect(together.results[1]).toMatchObject({ hits: [], totalHits: 5, facetDistribution: { verified: { false: 2, true: 3 } } });

    const failing = await apiError(
      client.multiSearch({ queries: [{ indexUid: LISTINGS_INDEX_UID }, { indexUid: LISTINGS_INDEX_UID, filter: "make = Orvik" }] }),
    );
    expect(failing.response.status).toBe(400);
    expect(failing.cause?.code).toBe("invalid_search_filter");
    expect(failing.cause?.message).toMatch(/^Inside `\.queries\[1\]`: .*Attribute `make` is not filterable/);
  });

  it("answers a bad filter with invalid_search_filter naming the position", async () => {
    const syntax = await apiError(listings.search("", { filter: "spindleRunoutUm <= " }));
    expect(syntax.response.status).toBe(400);
    expect(syntax.cause).toMatchObject({ code: "invalid_search_filter", type: "invalid_request" });
    expect(syntax.cause?.message).toMatch(/column 20: expected a value after `<=`/);

    const notFilterable = await apiError(listings.search("", { filter: "make = Orvik" }));
    expect(notFilterable.cause?.code).toBe("invalid_search_filter");
    expect(notFilterable.cause?.message).toMatch(/Attribute `make` is not filterable/);

    const sort = await apiError(listings.search("", { sort: ["make:asc"] }));
    expect(sort.cause?.code).toBe("invalid_search_sort");
    const sortSyntax = await apiError(listings.search("", { sort: ["priceMinor"] }));
    expect(sortSyntax.cause?.message).toMatch(/expected expression ending by `:asc` or `:desc`/);
    const facet = await apiError(listings.search("", { facets: ["model"] }));
    expect(facet.cause?.code).toBe("invalid_search_facets");
    const unknownIndex = await apiError(client.index("nowhere").search(""));
    expect(unknownIndex.response.status).toBe(404);
    expect(unknownIndex.cause?.code).toBe("index_not_found");
  });

  it("refuses a wrong or missing key with the engine's auth errors", async () => {
    const wrong = await apiError(new Meilisearch({ host: standIn.env.MEILISEARCH_HOST, apiKey: "not-the-key" }).index(LISTINGS_INDEX_UID).search(""));
    expect(wrong.response.status).toBe(403);
    expect(wrong.cause).toMatchObject({ code: "invalid_api_key", type: "auth" });
    const missing = await apiError(new Meilisearch({ host: standIn.env.MEILISEARCH_HOST }).getIndexes());
    expect(missing.response.status).toBe(401);
    expect(missing.cause).toMatchObject({ code: "missing_authorization_header", type: "auth" });
  });

  it("updates documents in part and deletes one, a batch, by filter, and all", async () => {
    await listings.updateDocuments([{ id: "lathe-4", priceMinor: 600_000 }]).waitTask();
    expect(await listings.getDocument("lathe-4")).toMatchObject({ priceMinor: 600_000, make: "Orvik" });

    const byFilter = await listings.deleteDocuments({ filter: "status = withdrawn" }).waitTask();
    expect(byFilter).toMatchObject({ status: "succeeded", type: "documentDeletion", details: { deletedDocuments: 1 } });
    expect(await listings.deleteDocument("mill-1").waitTask()).toMatchObject({ details: { deletedDocuments: 1 } });
    expect(ids((await listings.search("")).hits)).toEqual(["lathe-1", "lathe-4", "lathe-3", "lathe-2"]);

    const badFilter = await apiError(listings.deleteDocuments({ filter: "status = " }));
    expect(badFilter.cause?.code).toBe("invalid_document_filter");
    const notFilterable = await listings.deleteDocuments({ filter: "make = Orvik" }).waitTask();
    expect(notFilterable.status).toBe("failed");
    expect(notFilterable.error?.code).toBe("invalid_document_filter");

    const scratch = client.index<{ id: number }>("scratch");
    await scratch.addDocuments([{ id: 1 }, { id: 2 }, { id: 3 }]).waitTask();
    expect((await scratch.deleteDocuments([1, 3]).waitTask()).details?.deletedDocuments).toBe(2);
    expect(ids((await scratch.search("")).hits)).toEqual([2]);
    await scratch.deleteAllDocuments().waitTask();
    expect((await scratch.getStats()).numberOfDocuments).toBe(0);
    expect((await client.deleteIndex("scratch").waitTask()).status).toBe("succeeded");
    expect((await client.deleteIndex("scratch").waitTask()).error?.code).toBe("index_not_found");
  });

  it("lists tasks newest first and filters them", async () => {
    const tasks = await client.tasks.getTasks({ limit: 3 });
    expect(tasks.results).toHaveLength(3);
    expect(tasks.results[0]!.uid).toBeGreaterThan(tasks.results[1]!.uid);
    expect(tasks.next).toBe(tasks.results[2]!.uid - 1);
    const failed = await client.tasks.getTasks({ statuses: ["failed"], indexUids: [LISTINGS_INDEX_UID] });
    expect(failed.results.length).toBeGreaterThan(0);
    expect(failed.results.every((task) => task.status === "failed" && task.error !== null)).toBe(true);
    expect((await apiError(client.tasks.getTask(999_999))).cause?.code).toBe("task_not_found");
  });

  it("keeps the index, settings and documents over a stop and a restart on the same port", async () => {
    const lastTaskUid = (await client.tasks.getTasks({ limit: 1 })).results[0]!.uid;
    await standIn.stop();
    await expect(client.health()).rejects.toThrow();
    standIn = await startSearchStandIn({ port, dataDir, appOrigin: "http://localhost", masterKey });
    expect(ids((await listings.search("")).hits)).toEqual(["lathe-1", "lathe-4", "lathe-3", "lathe-2"]);
    expect(await listings.getFilterableAttributes()).toEqual(listingIndexSettings.filterableAttributes);
    expect(ids((await listings.search("precison")).hits)).toEqual(["lathe-1"]);
    // Task numbers carry on from before the restart.
    const next = await listings.updateDocuments([{ id: "lathe-3", priceMinor: 3_000_000 }]).waitTask();
    expect(next.uid).toBe(lastTaskUid + 1);
  });
});

describe("search module", () => {
  let moduleStandIn: SearchStandIn;
  let moduleDataDir: string;
  let modulePort: number;
  const searchTimeoutMs = 300;

  beforeAll(async () => {
    moduleDataDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-search-module-"));
    modulePort = await freePort();
    moduleStandIn = await startSearchStandIn({ port: modulePort, dataDir: moduleDataDir, masterKey });
  });
  afterAll(async () => {
    await moduleStandIn?.stop();
    rmSync(moduleDataDir, { recursive: true, force: true });
  });

  const search = () => createListingSearch({ ...connection(), searchTimeoutMs });
  const connection = () => ({ host: moduleStandIn.env.MEILISEARCH_HOST, apiKey: moduleStandIn.env.MEILISEARCH_API_KEY });

  it("applies the settings (twice without harm), indexes, searches and removes listings", async () => {
    const listingSearch = search();
    await listingSearch.applyIndexSettings();
    expect((await listingSearch.applyIndexSettings()).status).toBe("succeeded");
    await listingSearch.indexListings(documents);

    const verified = await listingSearch.searchListings({ maxSpindleRunoutUm: 5, verifiedOnly: true, sort: "best-accuracy" });
    expect(ids(verified.hits)).toEqual(["lathe-1", "lathe-2"]);
    expect(verified).toMatchObject({ totalHits: 2, page: 1, hitsPerPage: 20, totalPages: 1 });
    expect(verified.facets.grade).toEqual({ A: 1, B: 1 });

    const text = await listingSearch.searchListings({ text: "brenna", sort: "price-ascending" });
    expect(ids(text.hits)).toEqual(["lathe-2", "lathe-3"]);
    const recent = await listingSearch.searchListings({ maxReportAgeDays: 30 }, new Date("2026-03-10T00:00:00Z"));
    // Relevance without words is newest first, equal dates by id from the last, as in the fallback.
    expect(ids(recent.hits)).toEqual(["lathe-1", "lathe-3", "lathe-2"]);
    const paged = await listingSearch.searchListings({ page: 2, hitsPerPage: 2 });
    expect(paged).toMatchObject({ totalHits: 5, totalPages: 3, page: 2 });
    expect(paged.facets.category).toEqual({ centre_lathe: 3, milling_machine: 1, toolroom_lathe: 1 });

    const queries = [{ verifiedOnly: true, sort: "best-accuracy" as const }, { page: 1, hitsPerPage: 0 }, { text: "brenna" }];
    const together = await listingSearch.searchListingsTogether(queries);
    const alone = await Promise.all(queries.map((query) => listingSearch.searchListings(query)));
    const withoutTime = ({ processingTimeMs: _time, ...result }: { processingTimeMs: number }) => result;
    expect(together.map(withoutTime)).toEqual(alone.map(withoutTime));
    expect(together[1]).toMatchObject({ hits: [], totalHits: 5, totalPages: 0 });

    await listingSearch.removeListing("lathe-3");
    expect(ids((await listingSearch.searchListings({ text: "brenna" })).hits)).toEqual(["lathe-2"]);
    expect((await listingSearch.indexedListingIds()).sort()).toEqual(["lathe-1", "lathe-2", "lathe-4", "lathe-5", "mill-1"]);
  });

  it("throws SearchIndexingError when the service refuses an update", async () => {
    const bad = [{ ...documents[0]!, id: "not a valid id" }];
    await expect(search().indexListings(bad)).rejects.toBeInstanceOf(SearchIndexingError);
  });

  it("gives up after the stated timeout with SearchUnavailableError when the service is slow", async () => {
    moduleStandIn.setLatency(2_000);
    try {
      const started = performance.now();
      const error = await search().searchListings({}).catch((caught: unknown) => caught);
      const elapsed = performance.now() - started;
      expect(error).toBeInstanceOf(SearchUnavailableError);
      expect((error as SearchUnavailableError).reason).toBe("timeout");
      expect(elapsed).toBeGreaterThanOrEqual(searchTimeoutMs - 20);
      expect(elapsed).toBeLessThan(1_500);
      const together = await search().searchListingsTogether([{}, { verifiedOnly: true }]).catch((caught: unknown) => caught);
      expect((together as SearchUnavailableError).reason).toBe("timeout");
    } finally {
      moduleStandIn.setLatency(0);
    }
  });

  it("throws SearchUnavailableError when the service is stopped, and works again once it is back", async () => {
    await moduleStandIn.stop();
    const down = await search().searchListings({ text: "orvik" }).catch((caught: unknown) => caught);
    expect(down).toBeInstanceOf(SearchUnavailableError);
    expect((down as SearchUnavailableError).reason).toBe("unreachable");
    await expect(search().removeListing("lathe-1")).rejects.toBeInstanceOf(SearchUnavailableError);

    moduleStandIn = await startSearchStandIn({ port: modulePort, dataDir: moduleDataDir, masterKey });
    expect(ids((await search().searchListings({ text: "orvik" })).hits).sort()).toEqual(["lathe-1", "lathe-4"]);
  });

  it("says when the key is refused or the index is missing", async () => {
    const refused = await createListingSearch({ ...connection(), apiKey: "wrong", searchTimeoutMs }).searchListings({}).catch((caught: unknown) => caught);
    expect((refused as SearchUnavailableError).reason).toBe("rejected");
    const client = new Meilisearch(connection());
    await client.deleteIndex(LISTINGS_INDEX_UID).waitTask();
    const missing = await search().searchListings({}).catch((caught: unknown) => caught);
    expect((missing as SearchUnavailableError).reason).toBe("index-missing");
  });
});
