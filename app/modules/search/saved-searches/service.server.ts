// Saved searches: a buyer keeps a search under a name and hears by e-mail when a listing that matches it is
// newly listed or newly verified. Each alert is sent once (a row per saved search, listing and occasion),
// through the mail queue, with a signed one-click unsubscribe link.
import { createHmac, timingSafeEqual } from "node:crypto";
import { and, asc, count, eq, lt, notExists, sql } from "drizzle-orm";
import { data } from "react-router";
import type { Database } from "~/db/client.server";
import { env, sessionSecret } from "~/env.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { user } from "~/modules/accounts/schema";
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

export async function saveSearch(db: Database, owner: SessionUser, input: { name: string; queryString: string }) {
  const query = queryOf(input.queryString);
  if (!query) throw new SavedSearchRuleError("This search has a filter that is not valid any more; change it and save again.");
  const queryString = paramsFromQuery(query).toString();
  return db.transaction(async (tx) => {
    // Serialises one person's saves, so the limit holds with two tabs.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`saved-searches:${owner.id}`}))`);
    const [{ saved }] = await tx.select({ saved: count() }).from(savedSearches).where(eq(savedSearches.userId, owner.id));
    if (saved >= SAVED_SEARCHES_PER_USER) {
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

function signature(savedSearchId: string) {
  return createHmac("sha256", sessionSecret()).update(`saved-search-unsubscribe:${savedSearchId}`).digest("base64url");
}

/** `<id>.<HMAC>`: stops one saved search's alerts without signing in, and nothing else. */
export function unsubscribeToken(savedSearchId: string) {
  return `${savedSearchId}.${signature(savedSearchId)}`;
}

function savedSearchIdOf(token: string): string | null {
  const [id, mac] = token.split(".");
  if (!id || !mac || !/^[0-9a-f-]{36}$/i.test(id)) return null;
  const expected = Buffer.from(signature(id));
  const given = Buffer.from(mac);
  return expected.length === given.length && timingSafeEqual(expected, given) ? id : null;
}

/** What the unsubscribe page shows for a token; null for a forged token or a deleted search. */
export async function savedSearchForToken(db: Database, token: string) {
  const id = savedSearchIdOf(token);
  if (!id) return null;
  const [row] = await db
    .select({ name: savedSearches.name, alertsEnabled: savedSearches.alertsEnabled, email: user.email })
    .from(savedSearches)
    .innerJoin(user, eq(user.id, savedSearches.userId))
    .where(eq(savedSearches.id, id));
  return row ?? null;
}

/** Turns the alerts of the token's saved search off; false when the token is not valid (or the search is gone). */
export async function unsubscribeWithToken(db: Database, token: string): Promise<boolean> {
  const id = savedSearchIdOf(token);
  if (!id) return false;
  const updated = await db.update(savedSearches).set({ alertsEnabled: false }).where(eq(savedSearches.id, id)).returning({ id: savedSearches.id });
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

/**
 * Sends the alerts a just-indexed published listing owes: to every saved search (alerts on) made before
 * the listing was published, or before its current report was signed, that matches it and has not heard
 * about it for that occasion. Matching asks the index (or PostgreSQL) with `id = <listing> AND <search>`.
 */
export async function alertSavedSearchesAbout(db: Database, finder: ListingFinder, source: SourceListing, now: Date): Promise<number> {
  const { listing } = source;
  if (listing.status !== "published") return 0;
  const verified = listingToSearchDocument(listing, source.report).verified;
  const occasions: { occasion: Occasion; at: Date }[] = [];
  if (verified && source.reportSignedAt) occasions.push({ occasion: "verified", at: source.reportSignedAt });
  if (listing.publishedAt) occasions.push({ occasion: "listed", at: listing.publishedAt });

  const owed = new Map<string, { search: typeof savedSearches.$inferSelect; email: string; units: DisplayUnits; occasion: Occasion }>();
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

  let sent = 0;
  for (const { search, email, units, occasion } of owed.values()) {
    const query = queryOf(search.queryString);
    if (!query) continue;
    const match = await finder.find({ ...query, ids: [listing.id], page: 1, hitsPerPage: 1, facets: [] });
    if (match.totalHits === 0) continue;
    const origin = env().APP_ORIGIN;
    const unsubscribeUrl = `${origin}/saved-searches/unsubscribe?token=${encodeURIComponent(unsubscribeToken(search.id))}`;
    const message = await renderEmail(
      SavedSearchAlertEmail({
        searchName: search.name,
        occasion,
        machine: {
          title: `${listing.make} ${listing.model}`.trim(),
          place: [listing.city, countryName(listing.country)].filter(Boolean).join(", "),
          price: listing.priceMinor !== null && listing.currency ? formatMoney(listing.priceMinor, listing.currency) : null,
          accuracy: accuracyLine(source, units),
          listingUrl: `${origin}/machines/${listing.slug}`,
        },
        searchUrl: `${origin}/machines?${search.queryString}`,
        unsubscribeUrl,
      }),
    );
    const queued = await db.transaction(async (tx) => {
      const marked = await tx
        .insert(savedSearchAlerts)
        .values(
          (occasion === "verified" ? (["verified", "listed"] as const) : (["listed"] as const)).map((each) => ({
            savedSearchId: search.id,
            listingId: listing.id,
            occasion: each,
            sentAt: now,
          })),
        )
        .onConflictDoNothing()
        .returning({ occasion: savedSearchAlerts.occasion });
      if (!marked.some((row) => row.occasion === occasion)) return false;
      // Queued in the transaction: the alert is marked as sent and its e-mail queued together, or neither.
      await queueEmail(
        {
          to: email,
          subject: occasion === "verified" ? `Now verified: ${listing.make} ${listing.model} matches “${search.name}”` : `New match for “${search.name}”: ${listing.make} ${listing.model}`,
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
