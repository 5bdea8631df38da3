// The search's continuation cursor (`after` in GET /api/v1/listings and the search page's address): opaque to
// the reader, signed so that any changed byte is refused, and bound to the search it was made for. It carries
// the next page's number (the index pages by number) and the last row's sort values (PostgreSQL reads the rows
// after them, so that rows added or removed meanwhile neither repeat nor skip a result).
import { createHmac, timingSafeEqual } from "node:crypto";
import { z } from "zod";
import { sessionSecret } from "~/env.server";
import type { ListingSearchQuery } from "../../../search/query.ts";
import type { ListingCursorKey } from "./search.server";

/** A cursor's longest text: a page number, four sort values and the signature. */
export const MAX_CURSOR_LENGTH = 400;
export const MAX_CURSOR_PAGE = 1000;

export type ListingCursor = { page: number; key: ListingCursorKey | null };

const payloadSchema = z.object({
  v: z.literal(1),
  // The search the cursor belongs to (a digest of its parameters, sort and page size).
  d: z.string().max(32),
  p: z.number().int().min(2).max(MAX_CURSOR_PAGE),
  k: z
    .array(z.union([z.string().max(64), z.number().refine(Number.isFinite), z.null()]))
    .min(1)
    .max(4)
    .nullable(),
});

const TOKEN = /^[A-Za-z0-9_-]+\.[A-Za-z0-9_-]{22}$/;

function signature(payload: string) {
  return createHmac("sha256", sessionSecret()).update(`listing-search-cursor:${payload}`).digest("base64url").slice(0, 22);
}

/** What a cursor is bound to: the search's filters and words, its sort and its page size (never the page). */
function searchDigest(query: ListingSearchQuery, canonical: string) {
  return createHmac("sha256", "listing-search").update(`${canonical}|${query.sort ?? ""}|${query.hitsPerPage ?? ""}`).digest("base64url").slice(0, 16);
}

/** `canonical` is the search as canonical parameters without its page (paramsFromQuery). */
export function encodeListingCursor(query: ListingSearchQuery, canonical: string, cursor: ListingCursor): string {
  const payload = Buffer.from(JSON.stringify({ v: 1, d: searchDigest(query, canonical), p: cursor.page, k: cursor.key })).toString("base64url");
  return `${payload}.${signature(payload)}`;
}

export type DecodedCursor = { ok: true; cursor: ListingCursor } | { ok: false; message: string };

export function decodeListingCursor(token: string, query: ListingSearchQuery, canonical: string): DecodedCursor {
  const refused = { ok: false, message: "This page link is not valid (it was changed or cut short); start the search again from its first page." } as const;
  if (token.length > MAX_CURSOR_LENGTH || !TOKEN.test(token)) return refused;
  const [payload, given] = token.split(".") as [string, string];
  const expected = Buffer.from(signature(payload));
  if (!timingSafeEqual(expected, Buffer.from(given))) return refused;
  let parsed: z.infer<typeof payloadSchema>;
  try {
    const result = payloadSchema.safeParse(JSON.parse(Buffer.from(payload, "base64url").toString("utf8")));
    if (!result.success) return refused;
    parsed = result.data;
  } catch {
    return refused;
  }
  if (parsed.d !== searchDigest(query, canonical)) {
    return { ok: false, message: "This page link belongs to another search (its filters, sort or page size changed); start again from the first page." };
  }
  return { ok: true, cursor: { page: parsed.p, key: parsed.k } };
}
