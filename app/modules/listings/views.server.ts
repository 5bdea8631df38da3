// The process's one listing-view counter (view-counter.ts), writing to `listing_daily_views`: a page view
// adds to memory; the counts are written every few seconds, and on shutdown (jobs/workers.server.ts).
import { sql } from "drizzle-orm";
import { getDatabase, type Database } from "~/db/client.server";
import { createViewCounter, type ViewCount, type ViewCounter } from "./view-counter";

// A seller's dashboard shows a view within seconds; a busy page costs one write per listing and interval.
const FLUSH_EVERY_MS = 5_000;
// Distinct listing-days held before a write is started early (twice this and new ones are dropped).
const MAX_PENDING = 5_000;

/** Adds a batch of counts to the stored ones in one statement; counts of a listing deleted meanwhile are left out. */
export async function writeViewCounts(db: Database, counts: ViewCount[]) {
  if (!counts.length) return;
  await db.execute(sql`
    insert into listing_daily_views (listing_id, day, views)
    select counted.listing_id, counted.day, counted.views
    from unnest(${sql.param(counts.map((count) => count.listingId))}::uuid[], ${sql.param(counts.map((count) => count.day))}::text[], ${sql.param(counts.map((count) => count.views))}::int[])
      as counted(listing_id, day, views)
    join listings on listings.id = counted.listing_id
    on conflict (listing_id, day) do update set views = listing_daily_views.views + excluded.views`);
}

let counter: ViewCounter | undefined;

function viewCounter() {
  counter ??= createViewCounter({
    write: (counts) => writeViewCounts(getDatabase(), counts),
    flushEveryMs: FLUSH_EVERY_MS,
    maxPending: MAX_PENDING,
    warn: (message) => console.warn(message),
  });
  return counter;
}

/** Counts one view of a public listing's page (the caller has left out robots, its seller and reloads). */
export function countListingView(listingId: string, now = new Date()) {
  viewCounter().count(listingId, now);
}

/** Writes every view counted so far: on shutdown, and in tests that read the counts. */
export async function flushListingViews() {
  if (!counter) return;
  counter.stop();
  await counter.flush();
}
