// Our own limit on guessing passwords: wrong passwords are counted per e-mail address *and* client, so that
// one address under attack is protected while many people signing in from one address (an office, a test
// run on 127.0.0.1) are not held up by each other. better-auth's own per-address limit stays on as a flood
// guard (auth.server.ts).
import { and, count, eq, gt, lt } from "drizzle-orm";
import { getDatabase } from "~/db/client.server";
import { passwordFailure } from "./schema";

export const WRONG_PASSWORD_LIMIT = 5;
export const WRONG_PASSWORD_WINDOW_MS = 15 * 60 * 1000;

/** The client a request comes from: the first forwarded address set by our proxy, else one shared key. */
export function clientKey(request: Request): string {
  const forwarded = request.headers.get("x-forwarded-for")?.split(",")[0]?.trim();
  return forwarded || "direct";
}

export type LimitCheck = { limited: false } | { limited: true; retryAfterSeconds: number };

export async function checkWrongPasswordLimit(email: string, client: string): Promise<LimitCheck> {
  const database = getDatabase();
  const since = new Date(Date.now() - WRONG_PASSWORD_WINDOW_MS);
  const where = and(eq(passwordFailure.email, email.toLowerCase()), eq(passwordFailure.client, client), gt(passwordFailure.failedAt, since));
  const [row] = await database.select({ failures: count() }).from(passwordFailure).where(where);
  if ((row?.failures ?? 0) < WRONG_PASSWORD_LIMIT) return { limited: false };
  const [oldest] = await database.select({ failedAt: passwordFailure.failedAt }).from(passwordFailure).where(where).orderBy(passwordFailure.failedAt).limit(1);
  const freesAt = (oldest?.failedAt.getTime() ?? Date.now()) + WRONG_PASSWORD_WINDOW_MS;
  return { limited: true, retryAfterSeconds: Math.max(1, Math.ceil((freesAt - Date.now()) / 1000)) };
}

export async function recordWrongPassword(email: string, client: string) {
  const database = getDatabase();
  await database.insert(passwordFailure).values({ email: email.toLowerCase(), client });
  // Old rows are of no use to the limit; drop them as we go.
  await database.delete(passwordFailure).where(lt(passwordFailure.failedAt, new Date(Date.now() - 2 * WRONG_PASSWORD_WINDOW_MS)));
}

export async function clearWrongPasswords(email: string, client: string) {
  await getDatabase()
    .delete(passwordFailure)
    .where(and(eq(passwordFailure.email, email.toLowerCase()), eq(passwordFailure.client, client)));
}
