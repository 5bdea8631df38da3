import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import pg from "pg";
import { env } from "~/env.server";
import * as schema from "./schema";

export type Database = NodePgDatabase<typeof schema> & { $client: pg.Pool };

let database: Database | undefined;

/** The one Drizzle client of this process, created on first use. */
export function getDatabase(): Database {
  if (!database) {
    const pool = new pg.Pool({
      connectionString: env().DATABASE_URL,
      max: 10,
      // A stopped database must fail a request quickly, not hang it.
      connectionTimeoutMillis: 2_000,
    });
    // An idle client losing its connection (database restarted) must not crash the server.
    pool.on("error", () => {});
    database = drizzle(pool, { schema }) as Database;
  }
  return database;
}
