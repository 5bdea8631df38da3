// The report signing key on a developer's machine and in tests: one Ed25519 key per data folder, kept in a
// file only its owner can read, and the registration of a key as the one signing from now on.
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { newSigningKeyMultibase, registerSigningKey, signingKeyFromMultibase } from "../../app/modules/reports/signing.server.ts";
import * as schema from "../../app/db/schema.ts";

export function signingKeyFile(dataDir: string) {
  return path.join(dataDir, "secrets", "report-signing-key");
}

/** The data folder's signing key, made on first use. */
export function localSigningKey(dataDir: string): string {
  const file = signingKeyFile(dataDir);
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  return writeLocalSigningKey(dataDir, newSigningKeyMultibase());
}

export function writeLocalSigningKey(dataDir: string, key: string): string {
  const file = signingKeyFile(dataDir);
  mkdirSync(path.dirname(file), { recursive: true, mode: 0o700 });
  writeFileSync(file, `${key}\n`, { mode: 0o600 });
  chmodSync(file, 0o600);
  return key;
}

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
