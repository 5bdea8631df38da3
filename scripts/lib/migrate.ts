import { existsSync } from "node:fs";
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { grantAppRole, roleOf } from "./database-roles.ts";
import { log } from "./output.ts";

const migrationsFolder = path.resolve(import.meta.dirname, "../../drizzle");

/**
 * Applies the SQL migrations in `drizzle/` as the owner role, publishes the engine's built-in tolerance
 * profile versions that the database does not hold yet (docs/decisions/tolerance-profiles-in-the-database.md),
 * then grants the app's role (`appRole`) what it may do with the tables. With one URL for both (a PostgreSQL
 * of your own without a second role), no grants.
 */
export async function runMigrations(databaseUrl: string, appRole?: string) {
  if (!existsSync(path.join(migrationsFolder, "meta", "_journal.json"))) {
    log("postgres", "no migrations yet");
    return;
  }
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1 });
  try {
    await migrate(drizzle(pool), { migrationsFolder });
    log("postgres", "migrations applied");
    const { seedBuiltInProfiles } = await import("../../app/modules/profiles/built-in.server.ts");
    await seedBuiltInProfiles(drizzle(pool), (message) => log("postgres", message));
  } finally {
    await pool.end();
  }
  if (appRole && appRole !== roleOf(databaseUrl)) await grantAppRole(databaseUrl, appRole);
}
