// The watchlist: the machines a person watches, and one e-mail a day at most with what changed among them
// (a lower price, a newly signed report, sold or withdrawn). Each watch remembers what its watcher was last
// told; the daily job compares, sends one digest per person through the mail queue and moves the marks on,
// in one transaction. The digest carries a signed one-click unsubscribe link (RFC 2369 / RFC 8058 headers).
import { createHmac, timingSafeEqual } from "node:crypto";
import { and, asc, desc, eq, isNull, lt, or, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { env, sessionSecret } from "~/env.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { user } from "~/modules/accounts/schema";
import { fileUrl } from "~/modules/files/serve.server";
import { registerWorker } from "~/modules/jobs/queue.server";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { currentReportsForListings } from "~/modules/reports/service.server";
import { formatMoney } from "~/modules/units/format";
import { countryName } from "./catalogue";
import { WatchDigestEmail, type WatchNews } from "./emails/watch-digest";
import { listingPhotos, listings, listingWatches, watchDigests } from "./schema";

/** A person watches at most this many machines (each is a row the digest reads every day). */
export const WATCHES_PER_USER = 200;
/** The digest goes out at most once in this span, whatever the schedule or a second server does. */
const DIGEST_SPACING_MS = 20 * 60 * 60 * 1000;
const DIGEST_BATCH = 200;
export const WATCH_DIGEST_QUEUE = "listings.watch-digest";

const statusWords: Record<string, string> = { published: "For sale", sold: "Sold", withdrawn: "Withdrawn", draft: "Not offered" };

/** The watched machines of a person, newest watch first, with what the list page shows. */
export async function listWatchedMachines(db: Database, viewer: SessionUser) {
  const rows = await db
    .select({
      listing: {
        id: listings.id,
        slug: listings.slug,
        make: listings.make,
        model: listings.model,
        year: listings.year,
        city: listings.city,
        country: listings.country,
        status: listings.status,
        priceMinor: listings.priceMinor,
        currency: listings.currency,
      },
      watchedAt: listingWatches.createdAt,
      seenPriceMinor: listingWatches.seenPriceMinor,
      coverKey: sql<string | null>`(select ${listingPhotos.thumbnailKey} from ${listingPhotos} where ${listingPhotos.listingId} = ${listings.id} order by ${listingPhotos.position}, ${listingPhotos.createdAt} limit 1)`,
    })
    .from(listingWatches)
    .innerJoin(listings, eq(listings.id, listingWatches.listingId))
    .where(eq(listingWatches.userId, viewer.id))
    .orderBy(desc(listingWatches.createdAt))
    .limit(WATCHES_PER_USER);
  const reports = await currentReportsForListings(
    db,
    rows.map((row) => row.listing.id),
  );
  const [digest] = await db.select({ digestsOff: watchDigests.digestsOff }).from(watchDigests).where(eq(watchDigests.userId, viewer.id));
  return {
    digestsOn: !digest?.digestsOff,
    machines: rows.map(({ listing, watchedAt, coverKey }) => {
      const report = reports.get(listing.id);
      return {
        listingId: listing.id,
        // Sold and withdrawn listings have no public page any more.
        href: listing.status === "published" ? `/machines/${listing.slug}` : null,
        title: `${listing.make} ${listing.model}`.trim(),
        year: listing.year,
        place: [listing.city, countryName(listing.country)].filter(Boolean).join(", "),
        status: listing.status,
        statusLabel: statusWords[listing.status] ?? listing.status,
        price: formatMoney(listing.priceMinor, listing.currency),
        grade: report?.grade ?? null,
        photoUrl: coverKey ? fileUrl(coverKey) : null,
        watchedOn: watchedAt.toISOString().slice(0, 10),
      };
    }),
  };
}

/** Stops watching a machine, whatever its state now (a sold one can be taken off the list too). */
export async function stopWatching(db: Database, viewer: SessionUser, listingId: string) {
  await db.delete(listingWatches).where(and(eq(listingWatches.listingId, listingId), eq(listingWatches.userId, viewer.id)));
}

/** Turns the person's digest on or off (from the list page). */
export async function setWatchDigests(db: Database, viewer: SessionUser, on: boolean) {
  await db
    .insert(watchDigests)
    .values({ userId: viewer.id, digestsOff: !on })
    .onConflictDoUpdate({ target: watchDigests.userId, set: { digestsOff: !on } });
}

// ————— One-click unsubscribe —————

function signature(userId: string) {
  return createHmac("sha256", sessionSecret()).update(`watch-digest-unsubscribe:${userId}`).digest("base64url");
}

/** `<account id>.<HMAC>`: stops this person's watch digests without signing in, and nothing else. */
export function watchDigestToken(userId: string) {
  return `${userId}.${signature(userId)}`;
}

function userIdOf(token: string): string | null {
  if (token.length > 200) return null;
  const [id, mac, extra] = token.split(".");
  if (!id || !mac || extra !== undefined || !/^[A-Za-z0-9_-]{1,64}$/.test(id)) return null;
  const expected = Buffer.from(signature(id));
  const given = Buffer.from(mac);
  return expected.length === given.length && timingSafeEqual(expected, given) ? id : null;
}

/** What the unsubscribe page shows: whether the digests are on; null for a forged token. */
export async function watchDigestForToken(db: Database, token: string): Promise<{ digestsOn: boolean } | null> {
  const id = userIdOf(token);
  if (!id) return null;
  const [person] = await db.select({ id: user.id }).from(user).where(eq(user.id, id));
  if (!person) return null;
  const [digest] = await db.select({ digestsOff: watchDigests.digestsOff }).from(watchDigests).where(eq(watchDigests.userId, id));
  return { digestsOn: !digest?.digestsOff };
}

/** Turns the token's digests off; false when the token is not valid. */
export async function stopWatchDigestsWithToken(db: Database, token: string): Promise<boolean> {
  const id = userIdOf(token);
  if (!id) return false;
  const [person] = await db.select({ id: user.id }).from(user).where(eq(user.id, id));
  if (!person) return false;
  await db.insert(watchDigests).values({ userId: id, digestsOff: true }).onConflictDoUpdate({ target: watchDigests.userId, set: { digestsOff: true } });
  return true;
}

// ————— The daily digest —————

type WatchRow = {
  listingId: string;
  slug: string;
  make: string;
  model: string;
  city: string;
  country: string;
  status: string;
  priceMinor: number;
  currency: string;
  seenPriceMinor: number | null;
  seenStatus: string | null;
  toldThrough: Date;
};

/** What changed for one watch since its watcher was last told; empty when nothing worth a line did. */
export function watchChanges(watch: WatchRow, report: { grade: string; signedAt: Date } | null): string[] {
  const changes: string[] = [];
  const wasOffered = watch.seenStatus === null || watch.seenStatus === "published";
  if (wasOffered && watch.status === "sold") changes.push("Sold.");
  if (wasOffered && watch.status === "withdrawn") changes.push("Withdrawn by the seller.");
  if (watch.status !== "published") return changes;
  if (watch.seenPriceMinor !== null && watch.priceMinor < watch.seenPriceMinor) {
    changes.push(`Price down from ${formatMoney(watch.seenPriceMinor, watch.currency)} to ${formatMoney(watch.priceMinor, watch.currency)}.`);
  }
  if (report && report.signedAt > watch.toldThrough) changes.push(`Now verified: an inspector signed an accuracy report, grade ${report.grade}.`);
  return changes;
}

/** People with watches whose digest is on and not sent within the spacing, after `after` (by account id). */
async function dueWatchers(db: Database, now: Date, after: string | null) {
  const spacedFrom = new Date(now.getTime() - DIGEST_SPACING_MS);
  const rows = await db
    .selectDistinct({ userId: listingWatches.userId })
    .from(listingWatches)
    .leftJoin(watchDigests, eq(watchDigests.userId, listingWatches.userId))
    .where(
      and(
        or(isNull(watchDigests.userId), and(eq(watchDigests.digestsOff, false), or(isNull(watchDigests.lastSentAt), lt(watchDigests.lastSentAt, spacedFrom)))),
        after ? sql`${listingWatches.userId} > ${after}` : undefined,
      ),
    )
    .orderBy(asc(listingWatches.userId))
    .limit(DIGEST_BATCH);
  return rows.map((row) => row.userId);
}

/** Sends one person's digest if anything changed; true when one was queued. */
async function digestFor(db: Database, userId: string, now: Date): Promise<boolean> {
  const origin = env().APP_ORIGIN;
  return db.transaction(async (tx) => {
    // One digest per person at a time, and at most one within the spacing, with two servers at once.
    await tx.insert(watchDigests).values({ userId }).onConflictDoNothing();
    const [state] = await tx.select().from(watchDigests).where(eq(watchDigests.userId, userId)).for("update");
    if (!state || state.digestsOff || (state.lastSentAt && now.getTime() - state.lastSentAt.getTime() < DIGEST_SPACING_MS)) return false;
    const [person] = await tx.select({ email: user.email }).from(user).where(eq(user.id, userId));
    if (!person) return false;
    const watches: WatchRow[] = await tx
      .select({
        listingId: listings.id,
        slug: listings.slug,
        make: listings.make,
        model: listings.model,
        city: listings.city,
        country: listings.country,
        status: listings.status,
        priceMinor: listings.priceMinor,
        currency: listings.currency,
        seenPriceMinor: listingWatches.seenPriceMinor,
        seenStatus: listingWatches.seenStatus,
        toldThrough: listingWatches.toldThrough,
      })
      .from(listingWatches)
      .innerJoin(listings, eq(listings.id, listingWatches.listingId))
      .where(eq(listingWatches.userId, userId))
      .orderBy(desc(listingWatches.createdAt))
      .limit(WATCHES_PER_USER);
    const reports = await currentReportsForListings(
      tx as unknown as Database,
      watches.map((watch) => watch.listingId),
    );
    const news: (WatchNews & { listingId: string })[] = [];
    for (const watch of watches) {
      const report = reports.get(watch.listingId);
      const changes = watchChanges(watch, report ? { grade: report.grade, signedAt: new Date(report.signedAt) } : null);
      if (!changes.length) continue;
      news.push({
        listingId: watch.listingId,
        title: `${watch.make} ${watch.model}`.trim(),
        place: [watch.city, countryName(watch.country)].filter(Boolean).join(", "),
        listingUrl: watch.status === "published" ? `${origin}/machines/${watch.slug}` : null,
        changes,
      });
    }
    if (!news.length) return false;
    // What the watcher has now been told, for every watch with news.
    for (const watch of watches.filter((each) => news.some((item) => item.listingId === each.listingId))) {
      await tx
        .update(listingWatches)
        .set({ seenPriceMinor: watch.priceMinor, seenStatus: watch.status as never, toldThrough: now })
        .where(and(eq(listingWatches.userId, userId), eq(listingWatches.listingId, watch.listingId)));
    }
    await tx.update(watchDigests).set({ lastSentAt: now }).where(eq(watchDigests.userId, userId));
    const unsubscribeUrl = `${origin}/watched/unsubscribe?token=${encodeURIComponent(watchDigestToken(userId))}`;
    const message = await renderEmail(WatchDigestEmail({ machines: news, watchlistUrl: `${origin}/account/watched`, unsubscribeUrl }));
    await queueEmail(
      {
        to: person.email,
        subject: news.length === 1 ? `Watched machine: ${news[0]!.title} — ${news[0]!.changes[0]}` : `${news.length} of your watched machines changed`,
        ...message,
        tag: "watch-digest",
        headers: [
          { name: "List-Unsubscribe", value: `<${unsubscribeUrl}>` },
          { name: "List-Unsubscribe-Post", value: "List-Unsubscribe=One-Click" },
        ],
      },
      { within: tx },
    );
    return true;
  });
}

/** Sends every due digest; returns how many went out. Run daily by the queue's schedule. */
export async function sendWatchDigests(db: Database, now: Date = new Date()): Promise<number> {
  let sent = 0;
  for (let after: string | null = null; ; ) {
    const due = await dueWatchers(db, now, after);
    if (!due.length) break;
    after = due.at(-1)!;
    for (const userId of due) if (await digestFor(db, userId, now)) sent += 1;
  }
  return sent;
}

/** Declares the daily digest job (see ~/modules/jobs/workers.server): 07:00 UTC, morning in Europe. */
export function declareWatchlistWorkers(getDatabase: () => Database) {
  registerWorker(
    WATCH_DIGEST_QUEUE,
    async () => {
      const sent = await sendWatchDigests(getDatabase());
      if (sent) console.info(`[watchlist] sent ${sent} digest(s)`);
    },
    { retryLimit: 3, retryDelay: 60, policy: "short", expireInSeconds: 30 * 60 },
    { cron: "0 7 * * *" },
  );
}
