// For the search tests: listings written straight into PostgreSQL (the listings domain's own tests cover
// its forms), a search stand-in of the test's own on a free port, and the app's search API.
import { randomUUID } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { getDatabase, type Database } from "~/db/client.server";
import * as schema from "~/db/schema";
import { listings } from "~/modules/listings/schema";
import { createListingSearch } from "~/modules/search/search.server";
import { freePort } from "../../scripts/lib/ports.ts";
import { startSearchStandIn, type SearchStandIn } from "../../search/stand-in/index.ts";
import { createTestUser, testAppOrigin } from "./accounts";

/** A word no other test uses, to find one test's listings by text or region. */
export function uniqueWord(prefix = "zq") {
  return `${prefix}${randomUUID().replace(/-/g, "").slice(0, 8)}`;
}

/** Published listings of a new seller, written directly; returns their rows. Invented makes and places. */
export async function insertListings(rows: Array<Partial<typeof listings.$inferInsert>>) {
  const seller = await createTestUser({ roles: ["seller"], name: "Quarrow Tool Traders" });
  const written = [];
  for (const row of rows) {
    const [listing] = await getDatabase()
      .insert(listings)
      .values({
        sellerId: seller.id,
        slug: `search-test-${randomUUID().slice(0, 12)}`,
        status: "published",
        category: "centre_lathe",
        make: "Quarrow",
        model: "CL 300",
        year: 1990,
        swingOverBedMm: 300,
        distanceBetweenCentresMm: 800,
        city: "Heddon Vale",
        country: "GB",
        priceMinor: 900_000,
        currency: "EUR",
        condition: "used",
        description: "Test lathe for search.",
        publishedAt: new Date(),
        ...row,
      })
      .returning();
    written.push(listing!);
  }
  return written;
}

/** A search stand-in of this test's own, with the search module pointed at it. */
export async function ownSearch(options: { searchTimeoutMs?: number; port?: number; masterKey?: string } = {}) {
  const dataDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-search-own-"));
  const port = options.port ?? (await freePort());
  let standIn: SearchStandIn | null = await startSearchStandIn({ port, dataDir, appOrigin: testAppOrigin, masterKey: options.masterKey });
  const masterKey = standIn.env.MEILISEARCH_API_KEY;
  const connection = { host: `http://127.0.0.1:${port}`, apiKey: standIn.env.MEILISEARCH_API_KEY!, searchTimeoutMs: options.searchTimeoutMs ?? 500, writeTimeoutMs: 3_000 };
  return {
    port,
    connection,
    search: createListingSearch(connection),
    get standIn() {
      return standIn;
    },
    async stop() {
      await standIn?.stop();
      standIn = null;
    },
    async restart() {
      standIn ??= await startSearchStandIn({ port, dataDir, appOrigin: testAppOrigin, masterKey });
    },
    async dispose() {
      await standIn?.stop();
      standIn = null;
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export function getListingsApi(query: string) {
  return fetch(`${testAppOrigin}/api/v1/listings?${query}`, { headers: { accept: "application/json" } });
}

/**
 * A second client of the test database whose PostgreSQL searches keep no answers (only the app's own client
 * does): for tests that write past the triggers, as a hostile database owner would, and must see the search
 * read the rows anew. Close it with `end()`.
 */
export function databaseKeepingNoSearchAnswers() {
  const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 2 });
  return { db: drizzle(pool, { schema }) as unknown as Database, end: () => pool.end() };
}
