// Machine history: which earlier listings are the same machine (suggested by make, model and serial, linked only
// when the seller confirms), and what a listing shows of them: signed reports, rebuild records, a trend.
import { and, eq, ne, or, sql } from "drizzle-orm";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import { hasRole, type SessionUser } from "~/modules/accounts/guards.server";
import { listings } from "~/modules/listings/schema";
import { publicRebuildForListing } from "~/modules/rebuilds/service.server";
import { currentReportForListing } from "~/modules/reports/service.server";
import { matchOf, nameKey, serialKey } from "./identity";
import { machineListings, machineMatchRefusals, machines } from "./schema";

export class MachineRuleError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
  }
}

const keyOf = (column: typeof listings.make | typeof listings.model) => sql<string>`lower(regexp_replace(${column}, '[^[:alnum:]]+', '', 'g'))`;
/** `serialKey` in SQL (upper case, letters and digits, O read as 0, I and L as 1). */
const serialKeyOf = sql<string>`translate(upper(regexp_replace(${listings.serialNumber}, '[^[:alnum:]]+', '', 'g')), 'OIL', '011')`;

async function listingFor(db: Database, user: SessionUser, listingId: string) {
  if (!z.uuid().safeParse(listingId).success) throw new MachineRuleError("There is no such listing.", 404);
  const [listing] = await db.select().from(listings).where(eq(listings.id, listingId));
  if (!listing) throw new MachineRuleError("There is no such listing.", 404);
  const owner = listing.sellerId === user.id && hasRole(user, "seller");
  if (!owner && !hasRole(user, "admin")) throw new MachineRuleError("Only the listing's seller can do that.", 403);
  return listing;
}

async function machineOf(db: Pick<Database, "select">, listingId: string): Promise<string | null> {
  const [row] = await db.select({ machineId: machineListings.machineId }).from(machineListings).where(eq(machineListings.listingId, listingId));
  return row?.machineId ?? null;
}

/** Earlier or other listings that look like the same machine, not yet linked to it and not turned down. */
export async function suggestedMatches(db: Database, listing: typeof listings.$inferSelect) {
  const key = serialKey(listing.serialNumber);
  if (key.length < 3) return [];
  // A popular model has many listings: only serials within one character of length can match, and the
  // nearest (by trigrams; the same serial first) are read, so the match is found however many there are.
  const candidates = await db
    .select({ id: listings.id, slug: listings.slug, make: listings.make, model: listings.model, serialNumber: listings.serialNumber, year: listings.year, city: listings.city, country: listings.country, status: listings.status, publishedAt: listings.publishedAt })
    .from(listings)
    .where(
      and(
        ne(listings.id, listing.id),
        ne(listings.status, "draft"),
        sql`${listings.serialNumber} is not null`,
        eq(keyOf(listings.make), nameKey(listing.make)),
        eq(keyOf(listings.model), nameKey(listing.model)),
        sql`abs(length(${serialKeyOf}) - ${key.length}) <= 1`,
      ),
    )
    .orderBy(sql`similarity(${serialKeyOf}, ${key}) desc`, listings.id)
    .limit(50);
  if (!candidates.length) return [];
  const refused = await db
    .select({ a: machineMatchRefusals.listingId, b: machineMatchRefusals.otherListingId })
    .from(machineMatchRefusals)
    .where(or(eq(machineMatchRefusals.listingId, listing.id), eq(machineMatchRefusals.otherListingId, listing.id)));
  const turnedDown = new Set(refused.map((row) => (row.a === listing.id ? row.b : row.a)));
  const own = await machineOf(db, listing.id);
  const linked = own ? new Set((await db.select({ id: machineListings.listingId }).from(machineListings).where(eq(machineListings.machineId, own))).map((row) => row.id)) : new Set<string>();
  return candidates.flatMap((candidate) => {
    if (turnedDown.has(candidate.id) || linked.has(candidate.id)) return [];
    const match = matchOf(listing, candidate);
    if (!match) return [];
    return [{ listingId: candidate.id, slug: candidate.slug, title: `${candidate.make} ${candidate.model}`, serialNumber: candidate.serialNumber!, year: candidate.year, place: `${candidate.city}, ${candidate.country}`, status: candidate.status, listedOn: candidate.publishedAt?.toISOString().slice(0, 10) ?? null, match }];
  });
}

/** The seller says the suggested listing is this same machine: both join one machine. */
export async function confirmMatch(db: Database, user: SessionUser, listingId: string, otherListingId: string) {
  const listing = await listingFor(db, user, listingId);
  const suggestion = (await suggestedMatches(db, listing)).find((candidate) => candidate.listingId === otherListingId);
  if (!suggestion) throw new MachineRuleError("That listing is not a suggested match for this machine.", 422);
  await db.transaction(async (tx) => {
    const own = await machineOf(tx, listing.id);
    const theirs = await machineOf(tx, otherListingId);
    if (own && theirs && own !== theirs) throw new MachineRuleError("Both listings already belong to different machines; staff can split one first.", 409);
    let machineId = own ?? theirs;
    if (!machineId) machineId = (await tx.insert(machines).values({}).returning({ id: machines.id }))[0]!.id;
    for (const id of [listing.id, otherListingId]) {
      await tx.insert(machineListings).values({ listingId: id, machineId, confirmedBy: user.id }).onConflictDoNothing();
    }
  });
}

/** The seller says the suggested listing is another machine: it is not suggested again. */
export async function refuseMatch(db: Database, user: SessionUser, listingId: string, otherListingId: string) {
  const listing = await listingFor(db, user, listingId);
  if (!z.uuid().safeParse(otherListingId).success) throw new MachineRuleError("There is no such listing.", 404);
  const [other] = await db.select({ id: listings.id }).from(listings).where(eq(listings.id, otherListingId));
  if (!other) throw new MachineRuleError("There is no such listing.", 404);
  await db.insert(machineMatchRefusals).values({ listingId: listing.id, otherListingId, refusedBy: user.id }).onConflictDoNothing();
}

/** Staff take a listing out of a wrong match; it is not suggested with those listings again. */
export async function splitListing(db: Database, staff: SessionUser, listingId: string) {
  if (!hasRole(staff, "admin")) throw new MachineRuleError("Only staff can split a machine's history.", 403);
  const listing = await listingFor(db, staff, listingId);
  await db.transaction(async (tx) => {
    const machineId = await machineOf(tx, listing.id);
    if (!machineId) throw new MachineRuleError("This listing is not linked to a machine.", 422);
    const others = (await tx.select({ id: machineListings.listingId }).from(machineListings).where(and(eq(machineListings.machineId, machineId), ne(machineListings.listingId, listing.id)))).map((row) => row.id);
    await tx.delete(machineListings).where(eq(machineListings.listingId, listing.id));
    if (others.length) await tx.insert(machineMatchRefusals).values(others.map((other) => ({ listingId: listing.id, otherListingId: other, refusedBy: staff.id }))).onConflictDoNothing();
    // A machine left with one listing has no history to tell.
    if (others.length === 1) await tx.delete(machines).where(eq(machines.id, machineId));
  });
}

export async function linkedListings(db: Database, listingId: string) {
  const machineId = await machineOf(db, listingId);
  if (!machineId) return [];
  return db
    .select({ id: listings.id, slug: listings.slug, make: listings.make, model: listings.model, status: listings.status, publishedAt: listings.publishedAt, serialNumber: listings.serialNumber })
    .from(machineListings)
    .innerJoin(listings, eq(listings.id, machineListings.listingId))
    .where(and(eq(machineListings.machineId, machineId), ne(listings.id, listingId), ne(listings.status, "draft")));
}

export type MachineHistory = Awaited<ReturnType<typeof machineHistory>>;

/** What a listing shows of its machine's other listings: their signed reports and rebuild records, and a trend. */
export async function machineHistory(db: Database, listingId: string) {
  const others = await linkedListings(db, listingId);
  if (!others.length) return null;
  const entries = await Promise.all(
    others.map(async (other) => {
      const report = await currentReportForListing(db, other.id);
      const rebuild = await publicRebuildForListing(db, other.id);
      return {
        title: `${other.make} ${other.model}`,
        slug: other.status === "published" || other.status === "sold" ? other.slug : null,
        listedOn: other.publishedAt?.toISOString().slice(0, 10) ?? null,
        report: report ? { id: report.id, grade: report.grade, measuredOn: report.measuredOn, inspectorName: report.inspectorName, keyFigures: report.keyFigures } : null,
        rebuild: rebuild ? { asFoundOn: rebuild.asFoundOn, asRebuiltOn: rebuild.asRebuiltOn, confirmed: Boolean(rebuild.confirmation), workDone: rebuild.workDone } : null,
      };
    }),
  );
  const current = await currentReportForListing(db, listingId);
  const trend = [...entries.flatMap((entry) => (entry.report ? [{ measuredOn: entry.report.measuredOn, keyFigures: entry.report.keyFigures }] : [])), ...(current ? [{ measuredOn: current.measuredOn, keyFigures: current.keyFigures }] : [])].sort((a, b) =>
    a.measuredOn.localeCompare(b.measuredOn),
  );
  return { entries: entries.sort((a, b) => (b.listedOn ?? "").localeCompare(a.listedOn ?? "")), trend };
}

