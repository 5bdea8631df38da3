// Saved searches: a buyer keeps a search under a name and hears by e-mail when a listing that matches it is
// newly listed or newly verified. Each alert is sent once (a row per saved search, listing and occasion),
// through the mail queue, with a signed one-click unsubscribe link. One event makes at most one e-mail per
// person: every matching search of theirs is named in it, and nothing is sent to the people the report
// notice already told.
import { createHmac, timingSafeEqual } from "node:crypto";
import { and, asc, eq, inArray, lt, notExists, sql } from "drizzle-orm";
import { data } from "react-router";
import type { Database } from "~/db/client.server";
import { env, sessionSecret } from "~/env.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { user } from "~/modules/accounts/schema";
import { bookings } from "~/modules/inspections/schema";
import { listings } from "~/modules/listings/schema";
import { reports } from "~/modules/reports/schema";
import { countryName } from "~/modules/listings/catalogue";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { formatMoney, type DisplayUnits } from "~/modules/units/format";
import { listingToSearchDocument } from "../../../../search/document.ts";
import type { ListingSearchQuery } from "../../../../search/query.ts";
import { describeSearch } from "../describe";
import { formatDeviation } from "../figures";
import type { SourceListing } from "../listing-source.server";
import { paramsFromQuery, parseListingSearchParams } from "../search-params.server";
import type { ListingFinder } from "../service.server";
import { SavedSearchAlertEmail } from "./alert-email";
import { savedSearchAlerts, savedSearches } from "./schema";

export const SAVED_SEARCHES_PER_USER = 25;

/** A rule the request broke; its message is shown beside the form. */
export class SavedSearchRuleError extends Error {
  override name = "SavedSearchRuleError";
}

/** The stored query string read back; a search saved under older rules that no longer parses matches nothing. */
function queryOf(queryString: string): ListingSearchQuery | null {
  const parsed = parseListingSearchParams(new URLSearchParams(queryString));
  return parsed.success ? parsed.query : null;
}

/**
 * What makes two searches the same: the canonical parameters (µm and mm, whatever units the form sent),
 * with list values in a fixed order. Inch and metric forms of one search compare equal.
 */
export function searchIdentity(query: ListingSearchQuery): string {
  const params = paramsFromQuery(query);
  const pairs = [...params.entries()].sort(([a, x], [b, y]) => (a === b ? x.localeCompare(y) : a.localeCompare(b)));
  return new URLSearchParams(pairs).toString();
}

export async function saveSearch(db: Database, owner: SessionUser, input: { name: string; queryString: string }) {
  const query = queryOf(input.queryString);
  if (!query) throw new SavedSearchRuleError("This search has a filter that is not valid any more; change it and save again.");
  const queryString = paramsFromQuery(query).toString();
  return db.transaction(async (tx) => {
    // Serialises one person's saves, so the limit holds with two tabs.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`saved-searches:${owner.id}`}))`);
    const existing = await tx
      .select({ name: savedSearches.name, queryString: savedSearches.queryString })
      .from(savedSearches)
      .where(eq(savedSearches.userId, owner.id));
    const identity = searchIdentity(query);
    const same = existing.find((row) => {
      const kept = queryOf(row.queryString);
      return kept !== null && searchIdentity(kept) === identity;
    });
    if (same) {
      throw new SavedSearchRuleError(`You already keep this search as “${same.name}” (the same filters, whatever units they were given in).`);
    }
    if (existing.length >= SAVED_SEARCHES_PER_USER) {
      throw new SavedSearchRuleError(`You can keep up to ${SAVED_SEARCHES_PER_USER} saved searches; delete one you no longer need first.`);
    }
    const [created] = await tx
      .insert(savedSearches)
      .values({ userId: owner.id, name: input.name.trim(), queryString })
      .returning({ id: savedSearches.id, name: savedSearches.name, queryString: savedSearches.queryString });
    return created;
  });
}

export async function listSavedSearches(db: Database, owner: SessionUser) {
  const rows = await db.select().from(savedSearches).where(eq(savedSearches.userId, owner.id)).orderBy(asc(savedSearches.createdAt));
  return rows.map((row) => {
    const query = queryOf(row.queryString);
    return {
      id: row.id,
      name: row.name,
      queryString: row.queryString,
      summary: query ? describeSearch(query, owner.displayUnits) : "This search no longer reads; delete it and save it again.",
      alertsEnabled: row.alertsEnabled,
      createdAt: row.createdAt.toISOString(),
    };
  });
}

function notFound(): never {
  throw data("There is no such saved search. It may have been deleted.", { status: 404 });
}

/** Deletes one of the owner's saved searches; somebody else's is a 404, as if it did not exist. */
export async function deleteSavedSearch(db: Database, owner: SessionUser, savedSearchId: string) {
  const deleted = await db
    .delete(savedSearches)
    .where(and(eq(savedSearches.id, savedSearchId), eq(savedSearches.userId, owner.id)))
    .returning({ id: savedSearches.id });
  if (!deleted.length) notFound();
}

export async function setSavedSearchAlerts(db: Database, owner: SessionUser, savedSearchId: string, enabled: boolean) {
  const updated = await db
    .update(savedSearches)
    .set({ alertsEnabled: enabled })
    .where(and(eq(savedSearches.id, savedSearchId), eq(savedSearches.userId, owner.id)))
    .returning({ id: savedSearches.id });
  if (!updated.length) notFound();
}

// ————— One-click unsubscribe —————

const MAX_SEARCHES_PER_TOKEN = SAVED_SEARCHES_PER_USER;

function signature(ids: string[]) {
  return createHmac("sha256", sessionSecret()).update(`saved-search-unsubscribe:${ids.join("~")}`).digest("base64url");
}

/** `<id>[~<id>…].<HMAC>`: stops the alerts of these saved searches without signing in, and nothing else. */
export function unsubscribeToken(savedSearchIds: string | string[]) {
  const ids = typeof savedSearchIds === "string" ? [savedSearchIds] : savedSearchIds;
  return `${ids.join("~")}.${signature(ids)}`;
}

function savedSearchIdsOf(token: string): string[] | null {
  if (token.length > 40 * MAX_SEARCHES_PER_TOKEN + 100) return null;
  const [joined, mac, extra] = token.split(".");
  if (!joined || !mac || extra !== undefined) return null;
  const ids = joined.split("~");
  if (ids.length > MAX_SEARCHES_PER_TOKEN || !ids.every((id) => /^[0-9a-f-]{36}$/i.test(id))) return null;
  const expected = Buffer.from(signature(ids));
  const given = Buffer.from(mac);
  return expected.length === given.length && timingSafeEqual(expected, given) ? ids : null;
}

/** What the unsubscribe page shows for a token; null for a forged token or deleted searches. */
export async function savedSearchForToken(db: Database, token: string) {
  const ids = savedSearchIdsOf(token);
  if (!ids) return null;
  const rows = await db
    .select({ name: savedSearches.name, alertsEnabled: savedSearches.alertsEnabled })
    .from(savedSearches)
    .where(inArray(savedSearches.id, ids))
    .orderBy(asc(savedSearches.createdAt));
  if (!rows.length) return null;
  return { names: rows.map((row) => row.name), alertsEnabled: rows.some((row) => row.alertsEnabled) };
}

/** Turns the alerts of the token's saved searches off; false when the token is not valid (or the searches are gone). */
export async function unsubscribeWithToken(db: Database, token: string): Promise<boolean> {
  const ids = savedSearchIdsOf(token);
  if (!ids) return false;
  const updated = await db.update(savedSearches).set({ alertsEnabled: false }).where(inArray(savedSearches.id, ids)).returning({ id: savedSearches.id });
  return updated.length > 0;
}

// ————— Alerts —————

type Occasion = "listed" | "verified";

function accuracyLine(source: SourceListing, units: DisplayUnits): string | null {
  const document = listingToSearchDocument(source.listing, source.report);
  if (!document.verified || !document.grade) return null;
  const figures = [
    document.spindleRunoutUm === null ? null : `spindle run-out ${formatDeviation(document.spindleRunoutUm, units)}`,
    document.axialSlipUm === null ? null : `axial slip ${formatDeviation(document.axialSlipUm, units)}`,
  ].filter(Boolean);
  return [`Grade ${document.grade}`, ...figures].join(" · ");
}

/** The people a signed report's own notice goes to (the buyer who booked, the seller): they hear of it once, there. */
async function toldByReportNotice(db: Database, reportId: string): Promise<Set<string>> {
  const [row] = await db
    .select({ buyerId: bookings.buyerId, sellerId: listings.sellerId })
    .from(reports)
    .innerJoin(bookings, eq(bookings.id, reports.bookingId))
    .innerJoin(listings, eq(listings.id, reports.listingId))
    .where(eq(reports.id, reportId));
  return new Set(row ? [row.buyerId, row.sellerId] : []);
}

type OwedAlert = { search: typeof savedSearches.$inferSelect; email: string; units: DisplayUnits; occasion: Occasion };

/**
 * Sends the alerts a just-indexed published listing owes: to every saved search (alerts on) made before
 * the listing was published, or before its current report was signed, that matches it and has not heard
 * about it for that occasion. Matching asks the index (or PostgreSQL) with `id = <listing> AND <search>`.
 * A person with several matching searches gets one e-mail naming them all; a person the report notice
 * told about the verification gets none (their searches are marked as told).
 */
export async function alertSavedSearchesAbout(db: Database, finder: ListingFinder, source: SourceListing, now: Date): Promise<number> {
  const { listing } = source;
  if (listing.status !== "published") return 0;
  const verified = listingToSearchDocument(listing, source.report).verified;
  const occasions: { occasion: Occasion; at: Date }[] = [];
  if (verified && source.reportSignedAt) occasions.push({ occasion: "verified", at: source.reportSignedAt });
  if (listing.publishedAt) occasions.push({ occasion: "listed", at: listing.publishedAt });

  const owed = new Map<string, OwedAlert>();
  for (const { occasion, at } of occasions) {
    const candidates = await db
      .select({ search: savedSearches, email: user.email, units: user.displayUnits })
      .from(savedSearches)
      .innerJoin(user, eq(user.id, savedSearches.userId))
      .where(
        and(
          eq(savedSearches.alertsEnabled, true),
          lt(savedSearches.createdAt, at),
          notExists(
            db
              .select({ one: sql`1` })
              .from(savedSearchAlerts)
              .where(
                and(
                  eq(savedSearchAlerts.savedSearchId, savedSearches.id),
                  eq(savedSearchAlerts.listingId, listing.id),
                  eq(savedSearchAlerts.occasion, occasion),
                ),
              ),
          ),
        ),
      );
    // Verified is the better news: a search owed both hears it once, as verified.
    for (const candidate of candidates) if (!owed.has(candidate.search.id)) owed.set(candidate.search.id, { ...candidate, occasion });
  }

  // The matching searches, by person.
  const byPerson = new Map<string, OwedAlert[]>();
  for (const alert of owed.values()) {
    const query = queryOf(alert.search.queryString);
    if (!query) continue;
    const match = await finder.find({ ...query, ids: [listing.id], page: 1, hitsPerPage: 1, facets: [] });
    if (match.totalHits === 0) continue;
    const list = byPerson.get(alert.search.userId) ?? [];
    list.push(alert);
    byPerson.set(alert.search.userId, list);
  }
  if (!byPerson.size) return 0;

  const verifiedNews = [...owed.values()].some((alert) => alert.occasion === "verified");
  const toldAlready = verifiedNews && source.report ? await toldByReportNotice(db, source.report.id) : new Set<string>();
  const origin = env().APP_ORIGIN;
  const title = `${listing.make} ${listing.model}`.trim();

  let sent = 0;
  for (const [personId, alerts] of byPerson) {
    alerts.sort((a, b) => a.search.createdAt.getTime() - b.search.createdAt.getTime());
    const occasion: Occasion = alerts.some((alert) => alert.occasion === "verified") ? "verified" : "listed";
    const silent = occasion === "verified" && toldAlready.has(personId);
    const queued = await db.transaction(async (tx) => {
      const marked = await tx
        .insert(savedSearchAlerts)
        .values(
          alerts.flatMap(({ search, occasion: each }) =>
            (each === "verified" ? (["verified", "listed"] as const) : (["listed"] as const)).map((kind) => ({
              savedSearchId: search.id,
              listingId: listing.id,
              occasion: kind,
              sentAt: now,
            })),
          ),
        )
        .onConflictDoNothing()
        .returning({ savedSearchId: savedSearchAlerts.savedSearchId, occasion: savedSearchAlerts.occasion });
      // Another worker may have told some of them meanwhile: name only the searches this run marked.
      const fresh = alerts.filter(({ search, occasion: each }) => marked.some((row) => row.savedSearchId === search.id && row.occasion === each));
      if (!fresh.length || silent) return false;
      const { email, units } = fresh[0]!;
      const ids = fresh.map(({ search }) => search.id);
      const unsubscribeUrl = `${origin}/saved-searches/unsubscribe?token=${encodeURIComponent(unsubscribeToken(ids))}`;
      const message = await renderEmail(
        SavedSearchAlertEmail({
          searches: fresh.map(({ search }) => ({ name: search.name, url: `${origin}/machines?${search.queryString}` })),
          occasion,
          machine: {
            title,
            place: [listing.city, countryName(listing.country)].filter(Boolean).join(", "),
            price: listing.priceMinor !== null && listing.currency ? formatMoney(listing.priceMinor, listing.currency) : null,
            accuracy: accuracyLine(source, units),
            listingUrl: `${origin}/machines/${listing.slug}`,
          },
          unsubscribeUrl,
        }),
      );
      const named = fresh.length === 1 ? `“${fresh[0]!.search.name}”` : `${fresh.length} of your saved searches`;
      // Queued in the transaction: the alerts are marked as sent and the e-mail queued together, or neither.
      await queueEmail(
        {
          to: email,
          subject: occasion === "verified" ? `Now verified: ${title} matches ${named}` : `New match for ${named}: ${title}`,
          ...message,
          tag: "saved-search-alert",
          // Mail clients offer their own "unsubscribe" from these; the POST (RFC 8058) needs no page visit.
          headers: [
            { name: "List-Unsubscribe", value: `<${unsubscribeUrl}>` },
            { name: "List-Unsubscribe-Post", value: "List-Unsubscribe=One-Click" },
          ],
        },
        { within: tx },
      );
      return true;
    });
    if (queued) sent += 1;
  }
  return sent;
}
