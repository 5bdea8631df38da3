// Rendered pages kept by the digest of their data. The loaders of a page that opts in (`handle.keepRendered`)
// run on every request as usual — every read fresh, views counted — and only React's rendering of the result
// is kept: a page whose data (every route's loader data, byte for byte as JSON), address, build and day are
// the ones it was rendered from is the same HTML, so it is sent again instead of rendered again. A changed
// price, photo, report or search result is changed data, so the next request renders anew; nothing is
// time-based and nothing can be stale. Only for visitors without a session (their header names nobody).
// The Content-Security-Policy nonce is fresh on every answer: a kept page is rendered with a placeholder for
// it (kept-pages.server.ts: random per process, never sent), stored in pieces around it, and joined with this
// request's nonce.
// See docs/benchmarks.md ("Search and listing pages").
import { createHash } from "node:crypto";
import type { EntryContext } from "react-router";
import { hasSessionCookie } from "~/modules/accounts/guards.server";
import { KeptPages, splitAroundNonce } from "./kept-pages.server";

type KeptPage = { digest: string; parts: Buffer<ArrayBuffer>[]; bytes: number };

/** Rendered pages by address within a byte budget (kept-pages.server.ts), each answered only for its data's digest. */
export class RenderedPages {
  private readonly pages: KeptPages<KeptPage>;

  constructor(budgetBytes: number, largestPageBytes: number) {
    this.pages = new KeptPages(budgetBytes, largestPageBytes);
  }

  get size() {
    return this.pages.size;
  }

  get bytes() {
    return this.pages.bytes;
  }

  /** The page kept under `key` if it was rendered from data with this digest. */
  get(key: string, digest: string): KeptPage | undefined {
    const page = this.pages.get(key);
    return page?.digest === digest ? page : undefined;
  }

  /** Keeps a page rendered with the nonce's placeholder; its pieces around the placeholder either way. */
  set(key: string, digest: string, html: Buffer<ArrayBuffer>): Buffer<ArrayBuffer>[] {
    const parts = splitAroundNonce(html);
    this.pages.set(key, { digest, parts, bytes: html.length + key.length });
    return parts;
  }

  delete(key: string) {
    this.pages.delete(key);
  }

  clear() {
    this.pages.clear();
  }
}

/**
 * The process's kept pages: 24 MiB, a page of at most 512 KiB (a search page is about 85 KB, a listing page
 * about 25 KB): about three hundred search pages, more listings.
 */
export const renderedPages = new RenderedPages(24 * 1024 * 1024, 512 * 1024);

/** Thrown by the digest's replacer: a value that JSON would not show whole (a promise, a map…). */
class NotPlainData extends Error {}

function plainOnly(_key: string, value: unknown) {
  if (value === undefined || value === null) return value;
  const kind = typeof value;
  if (kind === "function" || kind === "bigint" || kind === "symbol") throw new NotPlainData();
  if (kind === "object" && !Array.isArray(value) && !(value instanceof Date)) {
    const prototype = Object.getPrototypeOf(value);
    if (prototype !== Object.prototype && prototype !== null) throw new NotPlainData();
  }
  return value;
}

/**
 * Which kept page a document request may be answered with, and the digest of what it is rendered from; null
 * when it is not to be kept: another method, a session, a status other than 200, an action's answer, an
 * error, a route that has not opted in, or data that is not plain (a deferred promise renders later).
 */
export function keptPageIdentity(request: Request, statusCode: number, routerContext: EntryContext): { key: string; digest: string } | null {
  if (request.method.toUpperCase() !== "GET" || statusCode !== 200) return null;
  const handler = routerContext.staticHandlerContext;
  if (handler.actionData || handler.errors) return null;
  const leaf = handler.matches.at(-1);
  const module = leaf ? routerContext.routeModules[leaf.route.id] : undefined;
  if (!(module?.handle as { keepRendered?: boolean } | undefined)?.keepRendered) return null;
  if (hasSessionCookie(request)) return null;
  let data: string;
  try {
    data = JSON.stringify(handler.loaderData, plainOnly);
  } catch (error) {
    if (error instanceof NotPlainData) return null;
    throw error;
  }
  const url = new URL(request.url);
  // The day (UTC and the server's own) too: a page may show a date or a year it reads from the clock.
  const today = new Date();
  const days = `${today.toISOString().slice(0, 10)} ${today.toDateString()}`;
  const digest = createHash("sha256").update(data).update("\u0000").update(days).digest("base64url");
  return { key: `${routerContext.manifest.version} ${url.pathname}${url.search}`, digest };
}
