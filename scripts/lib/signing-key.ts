// Registering a report signing key as the one signing from now on (the key itself is one of the local
// secrets of a data folder or run, scripts/lib/local-secrets.ts, or REPORT_SIGNING_KEY in production).
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { registerSigningKey, signingKeyFromMultibase } from "../../app/modules/reports/signing.server.ts";
import * as schema from "../../app/db/schema.ts";

/**
 * Registers the key as current (the previous one is retired from now); a key already current is left as it is.
 * `coverPastDays`: on a database with no accounts yet (the demo scenario is about to be loaded, with reports
 * signed in its past), the key's period starts that many days back.
 */
export async function registerKey(ownerDatabaseUrl: string, privateKeyMultibase: string, options: { now?: Date; coverPastDays?: number } = {}) {
  const pool = new pg.Pool({ connectionString: ownerDatabaseUrl, max: 1 });
  try {
    const db = drizzle(pool, { schema });
    const key = signingKeyFromMultibase(privateKeyMultibase);
    let from = options.now ?? new Date();
    if (options.coverPastDays) {
      const { rows } = await pool.query<{ empty: boolean }>(`select not exists (select 1 from "user") as empty`);
      if (rows[0]?.empty) from = new Date(from.getTime() - options.coverPastDays * 86_400_000);
    }
    return { ...(await registerSigningKey(db, key.publicKeyMultibase, from)), publicKeyMultibase: key.publicKeyMultibase };
  } finally {
    await pool.end();
  }
}
