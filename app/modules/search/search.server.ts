// The listing index behind the `meilisearch` SDK, configured only by MEILISEARCH_* variables: apply the
// index settings, index and remove listings, and search with a stated timeout. When the service is down,
// slow or answering with server errors, calls throw SearchUnavailableError so that the caller can answer
// from PostgreSQL (searches) or retry later through the queue (writes).
import {
  Meilisearch,
  MeilisearchApiError,
  MeilisearchRequestError,
  MeilisearchTaskTimeOutError,
  type EnqueuedTaskPromise,
  type MultiSearchParams,
  type MultiSearchQuery,
  type SearchResponse,
  type Task,
} from "meilisearch";
import { env } from "~/env.server";
import type { ListingSearchDocument } from "../../../search/document.ts";
import { listingFilter, listingSortRules, type ListingSearchQuery } from "../../../search/query.ts";
import { LISTINGS_INDEX_UID, LISTINGS_PRIMARY_KEY, listingIndexSettings } from "../../../search/settings.ts";
import { searchHttpClient } from "./search-http.server";

export type SearchUnavailableReason = "unreachable" | "timeout" | "server-error" | "index-missing" | "rejected";

/** The search service cannot answer now; nothing was changed by the failed call. */
export class SearchUnavailableError extends Error {
  override name = "SearchUnavailableError";
  constructor(
    readonly reason: SearchUnavailableReason,
    message: string,
    options?: { cause?: unknown },
  ) {
    super(message, options);
  }
}

/** The service answered, but an index update it accepted failed (the task's error is kept as the cause). */
export class SearchIndexingError extends Error {
  override name = "SearchIndexingError";
}

export type SearchConnection = {
  host: string;
  apiKey: string;
  /** How long a search may take before SearchUnavailableError("timeout"). */
  searchTimeoutMs: number;
  /** How long an index update may take to be accepted and processed (default 10 s). */
  writeTimeoutMs?: number;
  /**
   * After a search finds the service down, slow or failing, how long searches fail at once without asking it
   * (default 0: every search asks). Spares each request of a down period the timeout or the refused connection.
   */
  holdOffMs?: number;
};

export const LISTING_FACETS = ["category", "grade", "verified", "country"] as const;
export type ListingFacet = (typeof LISTING_FACETS)[number];

/**
 * The attributes a result is built from (`toHit` in service.server.ts, the saved-search alert's match):
 * the index sends these alone, not the description, seller and the other fields only search on.
 */
export const LISTING_HIT_ATTRIBUTES = [
  "id", "slug", "status", "category", "categoryLabel", "condition", "title", "year", "swingMm", "betweenCentresMm",
  "priceMinor", "currency", "city", "region", "country", "photoUrl", "publishedAt", "verified", "reportId", "grade",
  "reportDate", "spindleRunoutUm", "axialSlipUm", "spindleParallelismVerticalUm", "spindleParallelismHorizontalUm",
  "centreHeightUm", "bedStraightnessUm", "tableFlatnessUm", "travelSquarenessUm",
  "xPositioningAccuracyUm", "xRepeatabilityUm", "yPositioningAccuracyUm", "yRepeatabilityUm", "zPositioningAccuracyUm", "zRepeatabilityUm",
] as const satisfies readonly (keyof ListingSearchDocument)[];

export type ListingSearchHit = Pick<ListingSearchDocument, (typeof LISTING_HIT_ATTRIBUTES)[number]>;

/** The last row's sort values (each a string, a finite number or null): where the next page starts. */
export type ListingCursorKey = (string | number | null)[];

/**
 * A search and the facets to count for it (all four unless said; none for a total alone). `after` is the
 * previous page's last sort key: PostgreSQL reads the page after it (keyset); the index, which pages by
 * number, reads `page`.
 */
export type ListingSearchRequest = ListingSearchQuery & { facets?: readonly ListingFacet[]; after?: ListingCursorKey };

export type ListingSearchResult = {
  hits: ListingSearchHit[];
  totalHits: number;
  page: number;
  hitsPerPage: number;
  totalPages: number;
  /** Counts per value over all matching listings, e.g. `{ grade: { A: 3, B: 5 } }`; `{}` for a facet not asked for. */
  facets: Record<ListingFacet, Record<string, number>>;
  processingTimeMs: number;
};

export type ListingSearch = ReturnType<typeof createListingSearch>;

export function createListingSearch(connection: SearchConnection) {
  const writeTimeoutMs = connection.writeTimeoutMs ?? 10_000;
  const client = new Meilisearch({ host: connection.host, apiKey: connection.apiKey, timeout: writeTimeoutMs });
  const index = client.index<ListingSearchDocument>(LISTINGS_INDEX_UID);
  // Searches carry their own AbortSignal.timeout and go through a lighter HTTP client (search-http.server.ts);
  // a second SDK client spares each one the SDK's extra timer.
  const searchClient = new Meilisearch({ host: connection.host, apiKey: connection.apiKey, httpClient: searchHttpClient });
  const searchIndex = searchClient.index<ListingSearchDocument>(LISTINGS_INDEX_UID);
  const holdOffMs = connection.holdOffMs ?? 0;
  let heldOff: { until: number; error: SearchUnavailableError } | null = null;

  /** A search through the hold-off: refused at once while it lasts, and starting one when the service fails. */
  async function searchCall<T>(call: () => Promise<T>): Promise<T> {
    if (heldOff && performance.now() < heldOff.until) {
      throw new SearchUnavailableError(heldOff.error.reason, `${heldOff.error.message} (not asked again for ${holdOffMs} ms)`, { cause: heldOff.error });
    }
    try {
      const result = await call();
      heldOff = null;
      return result;
    } catch (error) {
      if (error instanceof SearchUnavailableError && holdOffMs > 0) heldOff = { until: performance.now() + holdOffMs, error };
      throw error;
    }
  }

  /** Sends an index update and waits until the service has processed it. */
  async function update(what: string, send: () => EnqueuedTaskPromise): Promise<Task> {
    const task = await callService(what, async () => client.tasks.waitForTask(await send(), { timeout: writeTimeoutMs, interval: 50 }), writeTimeoutMs);
    if (task.status !== "succeeded") {
      throw new SearchIndexingError(`${what} failed in the search service: ${task.error?.message ?? task.status}`, { cause: task.error });
    }
    return task;
  }

  return {
    /** Creates the listing index if need be and applies search/settings.ts; safe to run on every start. */
    async applyIndexSettings(): Promise<Task> {
      const created = await callService("Creating the listing index", async () =>
        client.tasks.waitForTask(await client.createIndex(LISTINGS_INDEX_UID, { primaryKey: LISTINGS_PRIMARY_KEY }), { timeout: writeTimeoutMs }),
        writeTimeoutMs,
      );
      if (created.status !== "succeeded" && created.error?.code !== "index_already_exists") {
        throw new SearchIndexingError(`Creating the listing index failed: ${created.error?.message ?? created.status}`, { cause: created.error });
      }
      return update("Applying the listing index settings", () => index.updateSettings(listingIndexSettings));
    },

    /** Adds or replaces listings' documents (whole documents, by id). */
    async indexListings(documents: ListingSearchDocument[]): Promise<Task | null> {
      if (documents.length === 0) return null;
      return update(`Indexing ${documents.length} listing(s)`, () => index.addDocuments(documents, { primaryKey: LISTINGS_PRIMARY_KEY }));
    },

    async removeListing(id: string): Promise<Task> {
      return update(`Removing listing ${id} from the index`, () => index.deleteDocument(id));
    },

    /** Every listing id in the index, for a re-index to find what to remove. */
    async indexedListingIds(): Promise<string[]> {
      const ids: string[] = [];
      for (let offset = 0; ; offset += 1000) {
        const page = await callService("Listing the indexed listings", () => index.getDocuments({ fields: ["id"], offset, limit: 1000 }), writeTimeoutMs);
        ids.push(...page.results.map((document) => String(document.id)));
        if (page.results.length < 1000) return ids;
      }
    },

    async searchListings(query: ListingSearchRequest, now: Date = new Date()): Promise<ListingSearchResult> {
      const response = await searchCall(() =>
        callService(
          "Searching listings",
          () => searchIndex.search(null, searchParameters(query, now), { signal: AbortSignal.timeout(connection.searchTimeoutMs) }),
          connection.searchTimeoutMs,
        ),
      );
      return toResult(response);
    },

    /**
     * Several searches in one request to the service (its multi-search), answered in order: one round
     * trip, and one timeout for all of them.
     */
    async searchListingsTogether(queries: ListingSearchRequest[], now: Date = new Date()): Promise<ListingSearchResult[]> {
      if (queries.length === 0) return [];
      if (queries.length === 1) return [await this.searchListings(queries[0]!, now)];
      const response = await searchCall(() =>
        callService(
          "Searching listings",
          () =>
            searchClient.multiSearch<MultiSearchParams, ListingSearchDocument>(
              { queries: queries.map((query): MultiSearchQuery => ({ indexUid: LISTINGS_INDEX_UID, ...searchParameters(query, now) })) },
              { signal: AbortSignal.timeout(connection.searchTimeoutMs) },
            ),
          connection.searchTimeoutMs,
        ),
      );
      return response.results.map(toResult);
    },
  };
}

function searchParameters(query: ListingSearchRequest, now: Date) {
  const hitsPerPage = query.hitsPerPage ?? 20;
  const facets = query.facets ?? LISTING_FACETS;
  const q = query.text?.trim() || null;
  return {
    q,
    filter: listingFilter(query, now),
    // A count alone needs no order and no attributes.
    ...(hitsPerPage > 0 ? { sort: listingSortRules(query.sort, q !== null), attributesToRetrieve: [...LISTING_HIT_ATTRIBUTES] } : {}),
    ...(facets.length ? { facets: [...facets] } : {}),
    page: query.page ?? 1,
    hitsPerPage,
  };
}

function toResult(response: SearchResponse<ListingSearchDocument>): ListingSearchResult {
  const distribution = response.facetDistribution ?? {};
  return {
    hits: response.hits as ListingSearchHit[],
    totalHits: response.totalHits ?? 0,
    page: response.page ?? 1,
    hitsPerPage: response.hitsPerPage ?? 0,
    totalPages: response.totalPages ?? 0,
    facets: Object.fromEntries(LISTING_FACETS.map((facet) => [facet, distribution[facet] ?? {}])) as ListingSearchResult["facets"],
    processingTimeMs: response.processingTimeMs,
  };
}

/** Runs one call to the service, turning “down, slow or failing” into SearchUnavailableError. */
async function callService<T>(what: string, call: () => Promise<T>, timeoutMs: number): Promise<T> {
  try {
    return await call();
  } catch (caught) {
    // An error status met by the search client reaches us wrapped by the SDK as a request error.
    const error = caught instanceof MeilisearchRequestError && caught.cause instanceof MeilisearchApiError ? caught.cause : caught;
    throw asUnavailable(what, error, timeoutMs) ?? error;
  }
}

function asUnavailable(what: string, error: unknown, timeoutMs: number): SearchUnavailableError | null {
  if (error instanceof MeilisearchApiError) {
    const status = error.response.status;
    const code = error.cause?.code;
    if (status >= 500) return new SearchUnavailableError("server-error", `${what}: the search service answered ${status} (${error.message}).`, { cause: error });
    if (code === "index_not_found") return new SearchUnavailableError("index-missing", `${what}: the listing index does not exist yet.`, { cause: error });
    if (status === 401 || status === 403) {
      return new SearchUnavailableError("rejected", `${what}: the search service refused the API key (${code}); check MEILISEARCH_API_KEY.`, { cause: error });
    }
    return null;
  }
  if (error instanceof MeilisearchTaskTimeOutError) {
    return new SearchUnavailableError("timeout", `${what}: the search service did not finish the update within ${timeoutMs} ms.`, { cause: error });
  }
  if (error instanceof MeilisearchRequestError) {
    const cause = error.cause;
    // An aborted fetch (our AbortSignal.timeout) or the SDK's own request timeout.
    const timedOut = cause instanceof Error && (cause.name === "TimeoutError" || cause.name === "MeilisearchRequestTimeOutError");
    return timedOut
      ? new SearchUnavailableError("timeout", `${what}: the search service did not answer within ${timeoutMs} ms.`, { cause: error })
      : new SearchUnavailableError("unreachable", `${what}: the search service cannot be reached (${describeCause(cause)}).`, { cause: error });
  }
  return null;
}

function describeCause(cause: unknown): string {
  if (cause instanceof Error) {
    const inner = (cause as { cause?: unknown }).cause;
    return inner instanceof Error ? `${cause.message}: ${inner.message}` : cause.message;
  }
  return String(cause);
}

/** The app's hold-off after a failed search: short, so the index is back in use within a second of recovering. */
export const SEARCH_HOLD_OFF_MS = 1_000;

let fromEnvironment: ListingSearch | undefined;

/** The listing search configured by MEILISEARCH_HOST, MEILISEARCH_API_KEY and MEILISEARCH_SEARCH_TIMEOUT_MS. */
export function listingSearch(): ListingSearch {
  const settings = env();
  fromEnvironment ??= createListingSearch({
    host: settings.MEILISEARCH_HOST,
    apiKey: settings.MEILISEARCH_API_KEY,
    searchTimeoutMs: settings.MEILISEARCH_SEARCH_TIMEOUT_MS,
    holdOffMs: SEARCH_HOLD_OFF_MS,
  });
  return fromEnvironment;
}

export const applyIndexSettings = () => listingSearch().applyIndexSettings();
export const indexListings = (documents: ListingSearchDocument[]) => listingSearch().indexListings(documents);
export const removeListing = (id: string) => listingSearch().removeListing(id);
export const searchListings = (query: ListingSearchRequest, now?: Date) => listingSearch().searchListings(query, now);
