// The indexing worker in this test process, with a queue schema of its own (so the app server's workers do
// not take its jobs) and a search stand-in of its own that is down at first: the update waits in
// PostgreSQL, is retried, and lands in the index once the stand-in is back.
import { randomUUID } from "node:crypto";
import pg from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { freePort } from "../../../scripts/lib/ports.ts";

const schema = `pgboss_search_test_${randomUUID().slice(0, 8)}`;
let stopQueue: (() => Promise<void>) | undefined;
let dispose: (() => Promise<void>) | undefined;

afterAll(async () => {
  await stopQueue?.();
  await dispose?.();
  const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await client.connect();
  await client.query(`drop schema if exists "${schema}" cascade`);
  await client.end();
});

async function jobStates(client: pg.Client, listingId: string) {
  const { rows } = await client.query(`select state from "${schema}".job where name = 'search.index-listing' and data->>'listingId' = $1`, [listingId]);
  return rows.map((row) => row.state as string);
}

describe("indexing while the search service is down", () => {
  it("retries the update and catches up once the service is back", { timeout: 90_000 }, async () => {
    const port = await freePort();
    process.env.MEILISEARCH_HOST = `http://127.0.0.1:${port}`;
    process.env.JOB_QUEUE_SCHEMA = schema;
    const queue = await import("~/modules/jobs/queue.server");
    const { getDatabase } = await import("~/db/client.server");
    const indexing = await import("~/modules/search/indexing.server");
    const { insertListings, ownSearch, uniqueWord } = await import("../../support/search");
    stopQueue = queue.stopQueue;
    indexing.declareSearchWorkers(getDatabase);
    await queue.startWorkers();

    const word = uniqueWord();
    const [listing] = await insertListings([{ make: word, model: "CL 290" }]);
    await indexing.queueListingIndexUpdate(listing!.id);

    const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await client.connect();
    let states: string[] = [];
    for (let waited = 0; waited < 20_000 && !states.includes("retry"); waited += 250) {
      await new Promise((resolve) => setTimeout(resolve, 250));
      states = await jobStates(client, listing!.id);
    }
    expect(states).toContain("retry");

    // The service comes back on the same address and with the key the worker uses, with an empty index.
    const own = await ownSearch({ port, masterKey: process.env.MEILISEARCH_API_KEY });
    dispose = own.dispose;
    let found = 0;
    // The start-up re-index (also queued in this schema) may index it first; the update's own retry must still complete.
    for (let waited = 0; waited < 60_000 && !(found && states.join() === "completed"); waited += 500) {
      await new Promise((resolve) => setTimeout(resolve, 500));
      found = await own.search.searchListings({ ids: [listing!.id] }).then((result) => result.totalHits, () => 0);
      states = await jobStates(client, listing!.id);
    }
    expect(found).toBe(1);
    expect(states).toEqual(["completed"]);
    const [hit] = (await own.search.searchListings({ text: word })).hits;
    expect(hit).toMatchObject({ id: listing!.id, status: "published", verified: false });
    await client.end();
  });
});
