// Listing page views counted in memory and written in batches, so that a page view waits for no write.
// One counter per listing and day, as `listing_daily_views` keeps them; the server writes what it has
// counted every few seconds, when it holds many listings at once, and when it is told to stop.

export type ViewCount = { listingId: string; day: string; views: number };

export type ViewCounterOptions = {
  /** Writes a batch (adding to what is stored); a failure keeps the batch for the next try. */
  write: (counts: ViewCount[]) => Promise<void>;
  /** How often counted views are written. */
  flushEveryMs: number;
  /** Listing-days held at most: a write starts at this many, and new ones beyond twice this are dropped. */
  maxPending: number;
  /** Told when views were dropped or a write failed (at most once per `warnEveryMs`). */
  warn?: (message: string) => void;
  warnEveryMs?: number;
};

export type ViewCounter = {
  count: (listingId: string, now?: Date) => void;
  /** Writes everything counted so far; resolves when it is stored (or the write failed and was kept). */
  flush: () => Promise<void>;
  /** Listing-days counted and not yet written. */
  pending: () => number;
  /** Stops the timer; what is pending stays until `flush()`. */
  stop: () => void;
};

export function createViewCounter(options: ViewCounterOptions): ViewCounter {
  let pending = new Map<string, ViewCount>();
  let writing: Promise<void> | null = null;
  let timer: ReturnType<typeof setInterval> | null = null;
  let dropped = 0;
  let lastWarning = 0;

  function warn(message: string) {
    const now = Date.now();
    if (now - lastWarning < (options.warnEveryMs ?? 60_000)) return;
    lastWarning = now;
    options.warn?.(message);
  }

  function add(count: ViewCount) {
    const key = `${count.listingId} ${count.day}`;
    const held = pending.get(key);
    if (held) held.views += count.views;
    else if (pending.size < options.maxPending * 2) pending.set(key, { ...count });
    else dropped += count.views;
  }

  async function writeOnce() {
    const batch = [...pending.values()];
    pending = new Map();
    if (!batch.length) return;
    try {
      await options.write(batch);
    } catch (error) {
      // Kept for the next try (within the bound): a database that is briefly away loses no views.
      for (const count of batch) add(count);
      warn(`[views] could not write ${batch.length} listing view counts, kept for the next try: ${error instanceof Error ? error.message : String(error)}`);
    }
    if (dropped) {
      warn(`[views] ${dropped} views not counted: more than ${options.maxPending * 2} listing-days were waiting to be written`);
      dropped = 0;
    }
  }

  function flush(): Promise<void> {
    // One write at a time; a flush asked for during a write writes what came in meanwhile after it.
    const next: Promise<void> = (writing ?? Promise.resolve()).then(writeOnce).finally(() => {
      if (writing === next) writing = null;
    });
    writing = next;
    return next;
  }

  return {
    count(listingId, now = new Date()) {
      add({ listingId, day: now.toISOString().slice(0, 10), views: 1 });
      if (!timer) {
        timer = setInterval(() => void flush(), options.flushEveryMs);
        // The timer alone must not keep a stopping server alive; shutdown flushes explicitly.
        timer.unref?.();
      }
      if (pending.size >= options.maxPending && !writing) void flush();
    },
    flush,
    pending: () => pending.size,
    stop() {
      if (timer) clearInterval(timer);
      timer = null;
    },
  };
}
