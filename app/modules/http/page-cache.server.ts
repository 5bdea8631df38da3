// Rendered pages kept in memory for visitors without a session: the answer a CDN could hold, made once and
// sent again until what it depends on changes. A route opts in with `cachedPage(identify)` as its middleware;
// `identify` names the page (the key: which report, which units) and reads, on every request, the version
// of everything the page shows (a report's row digest, its revisions, the signing keys, the day). A page is
// sent from memory only while that version is the one it was rendered at.
//
// What is never shared: a request with a session cookie always gets its own render (its header names the
// viewer), and only an answer that declares itself `Cache-Control: public` with status 200 and no Set-Cookie
// is kept. The Content-Security-Policy nonce is fresh on every answer: a page is rendered with a placeholder
// for it (random per process, never sent), stored in pieces around it, and joined with this request's nonce;
// every security header is set per answer by the security middleware, as for any page.
// See docs/decisions/page-cache.md.
import { isbot } from "isbot";
import { createContext, RouterContextProvider, type MiddlewareFunction } from "react-router";
import { hasSessionCookie } from "~/modules/accounts/guards.server";
import { cspNonceContext } from "~/modules/security/headers.server";
import { holdsTag, notModified } from "./conditional.server";
import { joinWithNonce, KeptPages, NONCE_PLACEHOLDER, splitAroundNonce } from "./kept-pages.server";

/** A document (HTML) request, or a client-side navigation's data request (`.data`). */
export type RequestKind = "document" | "data";

/**
 * How the browser asked, read from its address before React Router rewrote a data request's (which hides
 * the `.data` from middleware). Null when the server did not say (the development server): no page is cached.
 */
export const requestKindContext = createContext<RequestKind | null>(null);

/** Set by the server entry when React reported an error while rendering the page (after its status was sent). */
export const renderFailedContext = createContext<boolean>(false);

/** The router context of one request, made by our server (server/index.mjs through the server entry). */
export function createLoadContext(originalUrl: string): RouterContextProvider {
  const context = new RouterContextProvider();
  const { pathname } = new URL(originalUrl, "http://localhost");
  context.set(requestKindContext, pathname.endsWith(".data") ? "data" : "document");
  return context;
}

// The nonce's placeholder is shared with the rendered pages (kept-pages.server.ts).
export { NONCE_PLACEHOLDER };

/** What a route says about a request: which page it is and the version of what that page shows. */
export type PageIdentity = { key: string; version: string };

type StoredPage = {
  version: string;
  kind: RequestKind;
  headers: Array<[string, string]>;
  /** The body in pieces around the nonce's places (one piece for a data answer). */
  parts: Buffer<ArrayBuffer>[];
  bytes: number;
};

/** The only headers kept with a page; Set-Cookie and the security headers are never stored. */
const KEPT_HEADERS = ["content-type", "etag", "cache-control", "vary", "last-modified", "x-remix-response"];

/** Whole answers within a byte budget (kept-pages.server.ts); one asked for at another version than it was stored at is dropped. */
export class PageStore {
  private readonly pages: KeptPages<StoredPage>;

  constructor(budgetBytes: number, largestPageBytes: number) {
    this.pages = new KeptPages(budgetBytes, largestPageBytes);
  }

  get size() {
    return this.pages.size;
  }

  get bytes() {
    return this.pages.bytes;
  }

  /** The page kept under `key` if it was stored at `version`; one stored at another version is dropped. */
  get(key: string, version: string): StoredPage | undefined {
    const page = this.pages.get(key);
    if (page && page.version !== version) {
      this.pages.delete(key);
      return undefined;
    }
    return page;
  }

  set(key: string, page: StoredPage): boolean {
    return this.pages.set(key, page);
  }

  delete(key: string) {
    this.pages.delete(key);
  }

  clear() {
    this.pages.clear();
  }
}

/**
 * The process's pages: 32 MiB in all, a page of at most 1 MiB (a report page is about 0.1–0.3 MB with its
 * hydration data, so a couple of hundred pages; keys and bookkeeping are small beside the bodies).
 */
export const pageStore = new PageStore(32 * 1024 * 1024, 1024 * 1024);

/** Whether a Cache-Control value lets a shared cache keep the answer. */
function isPublic(cacheControl: string | null): boolean {
  if (!cacheControl) return false;
  const directives = cacheControl.toLowerCase().split(",").map((directive) => directive.trim().split("=")[0]);
  return directives.includes("public") && !directives.some((name) => name === "private" || name === "no-store");
}

/** The answer from a stored page, with this request's nonce in it. */
function answerFrom(page: StoredPage, request: Request, nonce: string): Response {
  const headers = new Headers(page.headers);
  const tag = headers.get("etag");
  if (tag && holdsTag(request, tag)) return notModified(headers);
  if (request.method.toUpperCase() === "HEAD") return new Response(null, { status: 200, headers });
  return new Response(joinWithNonce(page.parts, nonce), { status: 200, headers });
}

/**
 * The route middleware that keeps the route's page for visitors without a session. `identify` returns null
 * for a request whose page is not to be kept (an address with other parameters, a draft, nothing there);
 * it is given the address without React Router's `_routes` (which is part of a data request's key).
 */
export function cachedPage(
  identify: (args: { url: URL; params: Record<string, string | undefined>; context: Readonly<RouterContextProvider> }) => Promise<PageIdentity | null>,
  store: PageStore = pageStore,
): MiddlewareFunction<Response> {
  return async ({ request, params, context }, next) => {
    const kind = context.get(requestKindContext);
    const method = request.method.toUpperCase();
    const nonce = context.get(cspNonceContext);
    if (!kind || !nonce || (method !== "GET" && method !== "HEAD") || hasSessionCookie(request)) return next();
    const url = new URL(request.url);
    const routes = url.searchParams.get("_routes");
    url.searchParams.delete("_routes");
    // Which loaders a data request asks for is part of its answer; a document never names any.
    if (routes !== null && (kind === "document" || routes.length > 200)) return next();
    const identity = await identify({ url, params, context });
    if (!identity) return next();
    // Robots are sent the page whole (the server entry waits for all of it), people as it streams: two pages.
    const reader = isbot(request.headers.get("user-agent") ?? "") ? "robot" : "person";
    const key = `${kind}\n${reader}\n${identity.key}\n${routes === null ? "" : routes.split(",").sort().join(",")}`;

    const stored = store.get(key, identity.version);
    if (stored) return answerFrom(stored, request, nonce);
    // A HEAD has no body to keep.
    if (method === "HEAD") return next();

    if (kind === "document") context.set(cspNonceContext, NONCE_PLACEHOLDER);
    let response: Response;
    try {
      response = await next();
    } finally {
      context.set(cspNonceContext, nonce);
    }
    // Whatever came back (a page, an error page, a 304), the placeholder never leaves: read it whole, keep it if
    // it may be kept, and answer with this request's nonce in its place.
    const body = response.body ? Buffer.from(await response.arrayBuffer()) : null;
    const parts = body ? splitAroundNonce(body) : [];
    const headers = new Headers();
    for (const [name, value] of response.headers) headers.append(name, value.replaceAll(NONCE_PLACEHOLDER, nonce));
    const contentType = headers.get("content-type") ?? "";
    const keepable =
      body !== null &&
      response.status === 200 &&
      !context.get(renderFailedContext) &&
      !headers.has("set-cookie") &&
      isPublic(headers.get("cache-control")) &&
      (kind === "document" ? contentType.startsWith("text/html") && parts.length > 1 : parts.length === 1);
    if (keepable) {
      const kept: Array<[string, string]> = [];
      for (const name of KEPT_HEADERS) {
        const value = headers.get(name);
        if (value !== null) kept.push([name, value]);
      }
      store.set(key, { version: identity.version, kind, headers: kept, parts, bytes: body.length + key.length + identity.version.length });
    }
    return new Response(body === null ? null : joinWithNonce(parts, nonce), { status: response.status, statusText: response.statusText, headers });
  };
}
