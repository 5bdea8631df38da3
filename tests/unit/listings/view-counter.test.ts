import { afterEach, describe, expect, it, vi } from "vitest";
import { createViewCounter, type ViewCount } from "~/modules/listings/view-counter";

const day = new Date("2026-12-05T10:00:00Z");
const nextDay = new Date("2026-12-06T00:00:01Z");

function recording(options: { fail?: () => boolean; maxPending?: number } = {}) {
  const batches: ViewCount[][] = [];
  const warnings: string[] = [];
  const counter = createViewCounter({
    write: async (counts) => {
      if (options.fail?.()) throw new Error("connection refused");
      batches.push(counts.map((count) => ({ ...count })));
    },
    flushEveryMs: 5_000,
    maxPending: options.maxPending ?? 100,
    warn: (message) => warnings.push(message),
    warnEveryMs: 0,
  });
  return { counter, batches, warnings };
}

afterEach(() => vi.useRealTimers());

describe("listing views counted in memory and written in batches", () => {
  it("adds up the views of a listing and day into one count and writes them together", async () => {
    const { counter, batches } = recording();
    for (let i = 0; i < 250; i++) counter.count("listing-a", day);
    counter.count("listing-b", day);
    counter.count("listing-a", nextDay);
    expect(batches).toEqual([]);
    await counter.flush();
    expect(batches).toEqual([
      [
        { listingId: "listing-a", day: "2026-12-05", views: 250 },
        { listingId: "listing-b", day: "2026-12-05", views: 1 },
        { listingId: "listing-a", day: "2026-12-06", views: 1 },
      ],
    ]);
    // Written once: nothing is written twice.
    await counter.flush();
    expect(batches).toHaveLength(1);
    counter.stop();
  });

  it("writes on its own every interval, without a request waiting for it", async () => {
    vi.useFakeTimers();
    const { counter, batches } = recording();
    counter.count("listing-a", day);
    await vi.advanceTimersByTimeAsync(4_999);
    expect(batches).toEqual([]);
    await vi.advanceTimersByTimeAsync(1);
    expect(batches).toEqual([[{ listingId: "listing-a", day: "2026-12-05", views: 1 }]]);
    counter.stop();
  });

  it("keeps the counts of a failed write for the next one, and warns", async () => {
    let failing = true;
    const { counter, batches, warnings } = recording({ fail: () => failing });
    counter.count("listing-a", day);
    counter.count("listing-a", day);
    await counter.flush();
    expect(batches).toEqual([]);
    expect(counter.pending()).toBe(1);
    expect(warnings[0]).toMatch(/could not write 1 listing view counts/);
    counter.count("listing-a", day);
    failing = false;
    await counter.flush();
    expect(batches).toEqual([[{ listingId: "listing-a", day: "2026-12-05", views: 3 }]]);
    counter.stop();
  });

  it("holds a bounded number of listing-days: writes early when full, drops new ones beyond twice the bound and says so", async () => {
    let failing = true;
    const { counter, batches, warnings } = recording({ fail: () => failing, maxPending: 3 });
    for (let i = 0; i < 10; i++) counter.count(`listing-${i}`, day);
    await counter.flush();
    // The early writes failed, so what they held was kept; never more than twice the bound.
    expect(counter.pending()).toBeLessThanOrEqual(6);
    expect(warnings.some((message) => /views not counted/.test(message))).toBe(true);
    // A listing already held still counts.
    counter.count("listing-0", day);
    failing = false;
    await counter.flush();
    const written = batches.flat();
    expect(written.length).toBeLessThanOrEqual(6);
    expect(written.find((count) => count.listingId === "listing-0")?.views).toBe(2);
    counter.stop();
  });

  it("starts a write as soon as the bound is reached", async () => {
    const { counter, batches } = recording({ maxPending: 3 });
    counter.count("listing-1", day);
    counter.count("listing-2", day);
    expect(batches).toEqual([]);
    counter.count("listing-3", day);
    await counter.flush();
    expect(batches[0]).toHaveLength(3);
    counter.stop();
  });

  it("a flush asked for during a write waits for it and then writes what came in meanwhile", async () => {
    let release: () => void = () => {};
    const batches: ViewCount[][] = [];
    const counter = createViewCounter({
      write: async (counts) => {
        batches.push(counts);
        if (batches.length === 1) await new Promise<void>((resolve) => (release = resolve));
      },
      flushEveryMs: 5_000,
      maxPending: 100,
    });
    counter.count("listing-a", day);
    const first = counter.flush();
    await vi.waitFor(() => expect(batches).toHaveLength(1));
    counter.count("listing-b", day);
    const second = counter.flush();
    expect(batches).toHaveLength(1);
    release();
    await Promise.all([first, second]);
    expect(batches.map((batch) => batch.map((count) => count.listingId))).toEqual([["listing-a"], ["listing-b"]]);
    counter.stop();
  });
});
