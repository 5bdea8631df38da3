// Rendered pages kept by the digest of their data. The loaders of a page that opts in (`handle.keepRendered`)
// run on every request as usual — every read fresh, views counted — and only React's rendering of the result
// is kept: a page whose data (every route's loader data, byte for byte as JSON), address, build and day are
// the ones it was rendered from is the same HTML, so it is sent again instead of rendered again. A changed
// price, photo, report or search result is changed data, so the next request renders anew; nothing is
// time-based and nothing can be stale. Only for visitors without a session (their header names nobody).
// The Content-Security-Policy nonce is fresh on every answer: a kept page is rendered with a placeholder for
// it (random per process, never sent), stored in pieces around it, and joined with this request's nonce.
// See docs/benchmarks.md ("Search and listing pages").
import { createHash, randomBytes } from "node:crypto";
import { getSessionCookie } from "better-auth/cookies";
import type { EntryContext } from "react-router";
import { SESSION_COOKIE_PREFIX } from "~/modules/accounts/auth.server";

/**
 * Stands in for the nonce while a page to be kept is rendered: 192 random bits per process in hex (nothing
 * HTML or JavaScript escapes), replaced by each answer's nonce, so no page or user text can carry it.
 */
export const RENDER_NONCE_PLACEHOLDER = `n${randomBytes(24).toString("hex")}`;

type KeptPage = { digest: string; parts: Buffer[]; bytes: number };

/** A byte-bounded store of rendered pages by address, least recently used first out. */
export class RenderedPages {
  private readonly pages = new Map<string, KeptPage>();
  private used = 0;

  constructor(
    readonly budgetBytes: number,
    readonly largestPageBytes: number,
  ) {}

  get size() {
    return this.pages.size;
  }

  get bytes() {
    return this.used;
  }

  /** The page kept under `key` if it was rendered from data with this digest. */
  get(key: string, digest: string): KeptPage | undefined {
    const page = this.pages.get(key);
    if (!page || page.digest !== digest) return undefined;
    // Most recently used last.
    this.pages.delete(key);
    this.pages.set(key, page);
    return page;
  }

  set(key: string, digest: string, html: Buffer) {
    this.delete(key);
    if (html.length > this.largestPageBytes) return;
    const page = { digest, parts: splitAroundPlaceholder(html), bytes: html.length + key.length };
    this.pages.set(key, page);
    this.used += page.bytes;
    for (const [oldest, stored] of this.pages) {
      if (this.used <= this.budgetBytes) break;
      this.pages.delete(oldest);
      this.used -= stored.bytes;
    }
  }

  delete(key: string) {
    const page = this.pages.get(key);
    if (!page) return;
    this.pages.delete(key);
    this.used -= page.bytes;
  }

  clear() {
    this.pages.clear();
    this.used = 0;
  }
}

/**
 * The process's kept pages: 24 MiB, a page of at most 512 KiB (a search page is about 85 KB, a listing page
 * about 25 KB): about three hundred search pages, more listings.
 */
export const renderedPages = new RenderedPages(24 * 1024 * 1024, 512 * 1024);

const marker = Buffer.from(RENDER_NONCE_PLACEHOLDER);

/** A page rendered with the placeholder, in pieces around its places. */
export function splitAroundPlaceholder(html: Buffer): Buffer[] {
  const parts: Buffer[] = [];
  let from = 0;
  for (let at = html.indexOf(marker, from); at >= 0; at = html.indexOf(marker, from)) {
    parts.push(html.subarray(from, at));
    from = at + marker.length;
  }
  parts.push(html.subarray(from));
  return parts;
}

/** A kept page's HTML with this answer's nonce in the placeholder's places. */
export function joinWithNonce(parts: Buffer[], nonce: string): Uint8Array<ArrayBuffer> {
  // Buffers over the process's own memory (never a SharedArrayBuffer), as a Response body takes them.
  if (parts.length === 1) return parts[0]! as Uint8Array<ArrayBuffer>;
  const nonceBytes = Buffer.from(nonce);
  const pieces: Buffer[] = [];
  parts.forEach((part, index) => {
    if (index) pieces.push(nonceBytes);
    pieces.push(part);
  });
  return Buffer.concat(pieces) as Uint8Array<ArrayBuffer>;
}

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
  if (getSessionCookie(request.headers, { cookiePrefix: SESSION_COOKIE_PREFIX })) return null;
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
