// How the search SDK sends the buyer's searches: through undici's request() rather than the SDK's default
// fetch(). A search is one small POST and one JSON answer, on every search page and API call; fetch's
// web-stream and Headers machinery cost several times more CPU per call on this path (about 0.2 ms a
// search, measured in docs/benchmarks.md). Index writes keep the SDK's own fetch, with its error handling.
import { MeilisearchApiError } from "meilisearch";
import { Agent, request } from "undici";

// Kept-alive connections to the search service, shared by every search of this process.
const dispatcher = new Agent({ keepAliveTimeout: 4_000, connections: 32 });

// The SDK sends the same Headers object with every call; read it into plain headers once.
const plainHeaders = new WeakMap<object, Record<string, string>>();
function headersOf(headers: HeadersInit | undefined): Record<string, string> {
  if (!headers) return {};
  if (!(headers instanceof Headers)) return Object.fromEntries(new Headers(headers).entries());
  let plain = plainHeaders.get(headers);
  if (!plain) plainHeaders.set(headers, (plain = Object.fromEntries(headers.entries())));
  return plain;
}

/**
 * The SDK's `httpClient`: answers the parsed JSON body, or throws MeilisearchApiError for an error status
 * (the SDK hands such errors on wrapped in MeilisearchRequestError, as their cause). An aborted search
 * (its AbortSignal.timeout) rejects with the signal's reason, a TimeoutError.
 */
export async function searchHttpClient(input: RequestInfo | URL, init: RequestInit = {}): Promise<unknown> {
  const url = input instanceof URL ? input : new URL(typeof input === "string" ? input : input.url);
  const response = await request(url, {
    method: (init.method ?? "GET") as "GET" | "POST",
    headers: headersOf(init.headers),
    body: typeof init.body === "string" ? init.body : undefined,
    signal: init.signal ?? undefined,
    dispatcher,
  });
  const text = await response.body.text();
  const parsed: unknown = text === "" ? undefined : JSON.parse(text);
  if (response.statusCode >= 200 && response.statusCode < 300) return parsed;
  throw new MeilisearchApiError(new Response(null, { status: response.statusCode }), parsed as ConstructorParameters<typeof MeilisearchApiError>[1]);
}

/** Closes the kept-alive connections, so that a stopping server is not held open by them. */
export function closeSearchConnections(): Promise<void> {
  return dispatcher.close();
}
