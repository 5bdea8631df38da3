// Machines side by side: up to four listings named by their public addresses (`?m=<slug>&m=<slug>`), so
// that the comparison is a link anyone can open. Only what the public listing page shows is read; a listing
// that is not public (a draft, a withdrawn one, or none at that address) is "unavailable", the same answer
// for each so that the page tells nobody which drafts exist.
import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import type { KeyFigures } from "~/geometry/types";
import { user } from "~/modules/accounts/schema";
import { fileUrl } from "~/modules/files/serve.server";
import { listingPhotos, listings, type Listing } from "~/modules/listings/schema";
import { currentReportsForListings } from "~/modules/reports/service.server";

export const MAX_COMPARED = 4;

const slugSchema = z
  .string()
  .max(120, { error: "A machine's address is at most 120 characters." })
  .regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, { error: "A machine's address holds only lower-case letters, digits and hyphens." });

/** The machines asked for, in order, without repeats; refused with a message when malformed or more than four. */
export function parseComparedSlugs(params: URLSearchParams): { ok: true; slugs: string[] } | { ok: false; message: string } {
  const raw = params.getAll("m");
  // Bounded before any parsing: a link with hundreds of machines is refused, not read.
  if (raw.length > 20) return { ok: false, message: `Compare at most ${MAX_COMPARED} machines at once.` };
  const slugs: string[] = [];
  for (const value of raw) {
    const parsed = slugSchema.safeParse(value.trim());
    if (!parsed.success) return { ok: false, message: `“${value.slice(0, 40)}” is not a machine's address. ${parsed.error.issues[0]!.message}` };
    if (!slugs.includes(parsed.data)) slugs.push(parsed.data);
  }
  if (slugs.length > MAX_COMPARED) return { ok: false, message: `Compare at most ${MAX_COMPARED} machines at once; this link names ${slugs.length}. Leave some out and try again.` };
  return { ok: true, slugs };
}

/** What the comparison shows of one public listing: the public page's specification and its current report's figures. */
export type ComparedMachine = {
  slug: string;
  available: true;
  title: string;
  status: "published" | "sold";
  photoUrl: string | null;
  sellerName: string;
  listing: Omit<Listing, "id" | "sellerId" | "serialNumber" | "slug" | "status" | "createdAt" | "updatedAt" | "publishedAt" | "soldAt" | "withdrawnAt">;
  report: { id: string; grade: string; measuredOn: string; keyFigures: KeyFigures } | null;
};
export type ComparedSlot = ComparedMachine | { slug: string; available: false };

export async function compareMachines(db: Database, slugs: string[]): Promise<ComparedSlot[]> {
  if (!slugs.length) return [];
  const rows = await db
    .select({ listing: listings, sellerName: user.name })
    .from(listings)
    .innerJoin(user, eq(user.id, listings.sellerId))
    .where(and(inArray(listings.slug, slugs), inArray(listings.status, ["published", "sold"])));
  const ids = rows.map((row) => row.listing.id);
  const reports = await currentReportsForListings(db, ids);
  const covers = ids.length
    ? await db
        .selectDistinctOn([listingPhotos.listingId], { listingId: listingPhotos.listingId, key: listingPhotos.thumbnailKey })
        .from(listingPhotos)
        .where(inArray(listingPhotos.listingId, ids))
        .orderBy(listingPhotos.listingId, listingPhotos.position, listingPhotos.createdAt)
    : [];
  const coverOf = new Map(covers.map((cover) => [cover.listingId, fileUrl(cover.key)]));
  return slugs.map((slug): ComparedSlot => {
    const row = rows.find((candidate) => candidate.listing.slug === slug);
    if (!row) return { slug, available: false };
    const { id, sellerId: _seller, serialNumber: _serial, slug: _slug, status, createdAt: _c, updatedAt: _u, publishedAt: _p, soldAt: _s, withdrawnAt: _w, ...shown } = row.listing;
    const report = reports.get(id);
    return {
      slug,
      available: true,
      title: `${row.listing.make} ${row.listing.model}`,
      status: status as "published" | "sold",
      photoUrl: coverOf.get(id) ?? null,
      sellerName: row.sellerName,
      listing: shown,
      report: report ? { id: report.id, grade: report.grade, measuredOn: report.measuredOn, keyFigures: report.keyFigures } : null,
    };
  });
}
