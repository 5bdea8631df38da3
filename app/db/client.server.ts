import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import pg from "pg";
import { env } from "~/env.server";
import { keepSearchAnswers } from "~/modules/search/kept-answers.server";
import * as schema from "./schema";

export type Database = NodePgDatabase<typeof schema> & { $client: pg.Pool };

let database: Database | undefined;

/** The one Drizzle client of this process, created on first use. */
export function getDatabase(): Database {
  if (!database) {
    const pool = new pg.Pool({
      connectionString: env().DATABASE_URL,
      max: 16,
      // Under load a request waits its turn for a connection rather than failing; a stopped database
      // still fails at once (connection refused), and the health probe has its own 2 s limit.
      connectionTimeoutMillis: 10_000,
    });
    // An idle client losing its connection (database restarted) must not crash the server.
    pool.on("error", () => {});
    database = drizzle(pool, { schema }) as Database;
    // The process's searches from PostgreSQL reuse their answers while nothing they read has changed.
    keepSearchAnswers(database);
  }
  return database;
}

/** Closes the pool (server shutdown); the next getDatabase() opens a new one. */
export async function closeDatabase(): Promise<void> {
  const current = database;
  database = undefined;
  await current?.$client.end();
}
