// What both of the server's page caches share (page-cache.server.ts: whole answers of a route that opts in,
// before its loaders run; rendered-pages.server.ts: React's rendering of fresh loader data): the nonce's
// placeholder a kept page is rendered with, the page in pieces around it, and a byte-bounded store.
import { randomBytes } from "node:crypto";

/**
 * Stands in for the Content-Security-Policy nonce while a page to be kept is rendered: 192 random bits per
 * process, in hex (no character HTML or JavaScript escapes, so it is written as given). It leaves the process
 * only replaced by an answer's nonce, so no page, address or user text can carry it unless it was guessed.
 */
export const NONCE_PLACEHOLDER = `n${randomBytes(24).toString("hex")}`;

const placeholderBytes = Buffer.from(NONCE_PLACEHOLDER);

/** A page rendered with the placeholder, in pieces around its places (one piece when it has none). */
export function splitAroundNonce(body: Buffer<ArrayBuffer>): Buffer<ArrayBuffer>[] {
  const parts: Buffer<ArrayBuffer>[] = [];
  let from = 0;
  for (let at = body.indexOf(placeholderBytes, from); at !== -1; at = body.indexOf(placeholderBytes, from)) {
    parts.push(body.subarray(from, at));
    from = at + placeholderBytes.length;
  }
  parts.push(body.subarray(from));
  return parts;
}

/** A kept page with this answer's nonce in the placeholder's places. */
export function joinWithNonce(parts: Buffer<ArrayBuffer>[], nonce: string): Buffer<ArrayBuffer> {
  if (parts.length === 1) return parts[0]!;
  const nonceBytes = Buffer.from(nonce);
  const pieces: Buffer[] = [];
  parts.forEach((part, index) => {
    if (index > 0) pieces.push(nonceBytes);
    pieces.push(part);
  });
  return Buffer.concat(pieces);
}

/** Kept pages by key within a byte budget, least recently used first out; a page over the largest size is refused. */
export class KeptPages<Page extends { bytes: number }> {
  private readonly pages = new Map<string, Page>();
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

  /** The page under `key`, marked as the most recently used. */
  get(key: string): Page | undefined {
    const page = this.pages.get(key);
    if (!page) return undefined;
    this.pages.delete(key);
    this.pages.set(key, page);
    return page;
  }

  set(key: string, page: Page): boolean {
    this.delete(key);
    if (page.bytes > this.largestPageBytes) return false;
    this.pages.set(key, page);
    this.used += page.bytes;
    for (const [oldest, stored] of this.pages) {
      if (this.used <= this.budgetBytes) break;
      this.pages.delete(oldest);
      this.used -= stored.bytes;
    }
    return true;
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
