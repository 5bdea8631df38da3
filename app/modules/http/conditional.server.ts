// Conditional GETs for what does not change between requests (a signed report): an entity tag made from
// everything the answer depends on, and the 304 answer to a request that already holds it.
import { createHash } from "node:crypto";

/** A weak entity tag over the given parts (anything JSON can write). */
export function entityTag(parts: unknown[]): string {
  return `W/"${createHash("sha256").update(JSON.stringify(parts)).digest("base64url").slice(0, 27)}"`;
}

/** Whether the request's If-None-Match names this tag (or `*`); weak comparison, as RFC 9110 asks for GET. */
export function holdsTag(request: Request, tag: string): boolean {
  const header = request.headers.get("if-none-match");
  if (!header) return false;
  const opaque = (value: string) => value.trim().replace(/^W\//, "");
  return header.split(",").some((candidate) => candidate.trim() === "*" || opaque(candidate) === opaque(tag));
}

/**
 * 304 Not Modified with the validators and caching headers only. No Content-Security-Policy: the stored page's
 * policy must keep the nonce its scripts carry (a 304's headers replace the stored ones).
 */
export function notModified(headers: Headers): Response {
  const kept = new Headers();
  for (const name of ["etag", "cache-control", "vary"]) {
    const value = headers.get(name);
    if (value) kept.set(name, value);
  }
  return new Response(null, { status: 304, headers: kept });
}
