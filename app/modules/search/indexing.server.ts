// Keeping the listing index in step with PostgreSQL. Every change of a listing or its report queues one
// index update (`queueListingIndexUpdate`); the worker loads the listing with its current report, indexes
// or removes it, and then tells saved searches about it. While the search service is down the job fails
// and pg-boss retries it with backoff, so the index catches up; a full re-index runs at each start and
// with `npm run search:reindex`.
import type { Database } from "~/db/client.server";
import { enqueue, registerWorker } from "~/modules/jobs/queue.server";
import { listingToSearchDocument } from "../../../search/document.ts";
import { listingIdsAfter, loadSearchableListings } from "./listing-source.server";
import { alertSavedSearchesAbout } from "./saved-searches/service.server";
import { listingSearch, type ListingSearch } from "./search.server";
import { createListingFinder } from "./service.server";

export const INDEX_LISTING_QUEUE = "search.index-listing";
export const REINDEX_QUEUE = "search.reindex";

type IndexListingJob = { listingId: string };
type ReindexJob = { reason: string };

/** Queues the index update of one listing (call after any change of it or of its reports). */
export async function queueListingIndexUpdate(listingId: string): Promise<void> {
  // One waiting job per listing is enough: the worker reads the listing as it is when it runs.
  await enqueue<IndexListingJob>(INDEX_LISTING_QUEUE, { listingId }, { singletonKey: listingId });
}

/** Queues a full re-index (the worker runs it; a second request while one waits is dropped). */
export async function queueFullReindex(reason: string): Promise<void> {
  await enqueue<ReindexJob>(REINDEX_QUEUE, { reason }, { singletonKey: "full" });
}

// Settings go to the index once per process and search connection, before its first write.
const settingsApplied = new WeakMap<ListingSearch, Promise<unknown>>();
export function ensureIndexSettings(search: ListingSearch): Promise<unknown> {
  let applied = settingsApplied.get(search);
  if (!applied) {
    applied = search.applyIndexSettings();
    settingsApplied.set(search, applied);
    applied.catch(() => settingsApplied.delete(search));
  }
  return applied;
}

export type SyncOutcome = "indexed" | "removed";

/**
 * Brings one listing's document up to date: indexed while published, removed otherwise. Throws
 * SearchUnavailableError while the service is down (the job is then retried). With `alerts`, saved
 * searches that match a newly listed or newly verified listing are told by e-mail.
 */
export async function syncListing(
  db: Database,
  listingId: string,
  options: { search?: ListingSearch; alerts?: boolean; now?: Date } = {},
): Promise<SyncOutcome> {
  const search = options.search ?? listingSearch();
  await ensureIndexSettings(search);
  const source = (await loadSearchableListings(db, [listingId])).get(listingId);
  if (!source || source.listing.status !== "published") {
    await search.removeListing(listingId);
    return "removed";
  }
  await search.indexListings([listingToSearchDocument(source.listing, source.report)]);
  if (options.alerts ?? true) {
    await alertSavedSearchesAbout(db, createListingFinder(db, { search, now: options.now }), source, options.now ?? new Date());
  }
  return "indexed";
}

/** Indexes every published listing and removes every other document; sends no alerts. */
export async function reindexAllListings(
  db: Database,
  options: { search?: ListingSearch; batchSize?: number; onProgress?: (done: number) => void } = {},
): Promise<{ indexed: number; removed: number }> {
  const search = options.search ?? listingSearch();
  const batchSize = options.batchSize ?? 200;
  await search.applyIndexSettings();
  const published = new Set<string>();
  for (let after: string | null = null; ; ) {
    const batch = await listingIdsAfter(db, after, batchSize);
    if (!batch.length) break;
    after = batch.at(-1)!.id;
    const ids = batch.filter((row) => row.status === "published").map((row) => row.id);
    const sources = await loadSearchableListings(db, ids);
    const documents = [...sources.values()].map((source) => listingToSearchDocument(source.listing, source.report));
    await search.indexListings(documents);
    for (const document of documents) published.add(document.id);
    options.onProgress?.(published.size);
  }
  let removed = 0;
  for (const id of await search.indexedListingIds()) {
    if (published.has(id)) continue;
    await search.removeListing(id);
    removed += 1;
  }
  return { indexed: published.size, removed };
}

let startupReindexQueued = false;

/** Declares the search workers of this process (see ~/modules/jobs/workers.server) and queues the start-up re-index. */
export function declareSearchWorkers(getDatabase: () => Database) {
  // Backoff from 2 s doubling, twelve tries (about four and a half hours): a search service that is out
  // for an afternoon misses nothing, and the next start's re-index covers anything longer.
  const retries = { retryLimit: 12, retryDelay: 2, retryBackoff: true };
  registerWorker<IndexListingJob>(INDEX_LISTING_QUEUE, async ({ listingId }) => void (await syncListing(getDatabase(), listingId)), {
    ...retries,
    // At most one waiting and one running update per listing.
    policy: "stately",
    expireInSeconds: 120,
  });
  registerWorker<ReindexJob>(
    REINDEX_QUEUE,
    async () => {
      const { indexed, removed } = await reindexAllListings(getDatabase());
      console.info(`[search] re-indexed ${indexed} published listing(s), removed ${removed} stale document(s)`);
    },
    { ...retries, policy: "short", expireInSeconds: 30 * 60 },
  );
  if (!startupReindexQueued) {
    startupReindexQueued = true;
    // Applies the index settings and repairs whatever drifted while this server was down.
    queueFullReindex("start").catch((error) =>
      console.warn(`[search] could not queue the start-up re-index: ${error instanceof Error ? error.message : String(error)}`),
    );
  }
}
