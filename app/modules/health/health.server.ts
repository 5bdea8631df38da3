import { sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";

export type DatabaseCheck = { ok: true } | { ok: false; reason: string };

/** Asks the database for one row, giving up after a short wait so that a health probe never hangs. */
export async function checkDatabase(database: Database, timeoutMs = 2_000): Promise<DatabaseCheck> {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      database.execute(sql`select 1`),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error(`no answer within ${timeoutMs} ms`)), timeoutMs);
      }),
    ]);
    return { ok: true };
  } catch (error) {
    const message = error instanceof Error ? error.message || error.name : String(error);
    return { ok: false, reason: `database unreachable: ${message}` };
  } finally {
    clearTimeout(timer);
  }
}
