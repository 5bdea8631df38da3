// Our own limit on guessing passwords, per account whatever address the guesses come from: a few wrong
// passwords are free, then each further attempt waits a delay that doubles up to a ceiling. A stranger can
// slow an account down but never lock its owner out for longer than the ceiling (and a reset link always
// works). Each attempt reserves its place under a per-account lock before the password is looked at, so
// parallel guesses cannot slip past the count. better-auth's own per-client limit stays on as a flood guard
// (auth.server.ts); the client address is trusted from X-Forwarded-For only through TRUSTED_PROXIES.
import { BlockList, isIP } from "node:net";
import { and, eq, lt, sql } from "drizzle-orm";
import { getDatabase } from "~/db/client.server";
import { env } from "~/env.server";
import { passwordFailure } from "./schema";

/** Wrong passwords for one account within the window that cost nothing. */
export const WRONG_PASSWORD_LIMIT = 5;
export const WRONG_PASSWORD_WINDOW_MS = 15 * 60 * 1000;
/** The wait after the first wrong password past the free ones; it doubles with each further one. */
export const FIRST_DELAY_SECONDS = 30;
/** The longest wait, however many wrong passwords: the most a stranger can hold an owner up. */
export const MAX_DELAY_SECONDS = 5 * 60;

/** Seconds to wait after the latest of `failures` wrong passwords (0 while they are within the free ones). */
export function delayAfterFailures(failures: number): number {
  if (failures < WRONG_PASSWORD_LIMIT) return 0;
  return Math.min(MAX_DELAY_SECONDS, FIRST_DELAY_SECONDS * 2 ** Math.min(30, failures - WRONG_PASSWORD_LIMIT));
}

/** The header our auth route hands better-auth the client address in, set by us alone (never the client's). */
export const CLIENT_ADDRESS_HEADER = "x-tenthmark-client-address";

function trustedProxyList(entries: string[]): BlockList {
  const list = new BlockList();
  for (const entry of entries) {
    const [address, prefix] = entry.split("/");
    const family = isIP(address!) === 6 ? "ipv6" : "ipv4";
    if (prefix === undefined) list.addAddress(address!, family);
    else list.addSubnet(address!, Number(prefix), family);
  }
  return list;
}

/**
 * The client's address, or null when it cannot be known. X-Forwarded-For is read only when TRUSTED_PROXIES
 * lists the proxies in front of the app: walking it from the right, the addresses our proxies appended are
 * skipped and the first other one is the client. Without the setting any client could write the header.
 */
export function clientAddress(request: Request, trustedProxies: string[] = env().TRUSTED_PROXIES): string | null {
  if (!trustedProxies.length) return null;
  const hops = (request.headers.get("x-forwarded-for") ?? "")
    .split(",")
    .map((hop) => hop.trim())
    .filter(Boolean);
  const trusted = trustedProxyList(trustedProxies);
  for (let index = hops.length - 1; index >= 0; index--) {
    const hop = hops[index]!;
    const family = isIP(hop);
    if (!family) return null;
    if (!trusted.check(hop, family === 6 ? "ipv6" : "ipv4")) return hop;
  }
  return null;
}

/** What the wrong-password rows record as the client: its address, or "unknown". */
export function clientKey(request: Request): string {
  return clientAddress(request) ?? "unknown";
}

export type LimitCheck = { limited: false; attemptId: string } | { limited: true; retryAfterSeconds: number };

/**
 * Decides whether this sign-in attempt may have its password checked, and if so counts it at once as a wrong
 * password (`settleSignInAttempt` takes it back when it was not). Attempts for one account take turns.
 */
export async function reserveSignInAttempt(email: string, client: string): Promise<LimitCheck> {
  const address = email.toLowerCase();
  return getDatabase().transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`sign-in:${address}`}))`);
    const since = new Date(Date.now() - WRONG_PASSWORD_WINDOW_MS);
    const [row] = await tx
      .select({ failures: sql<number>`count(*)::int`, latest: sql<string | null>`max(${passwordFailure.failedAt})` })
      .from(passwordFailure)
      .where(and(eq(passwordFailure.email, address), sql`${passwordFailure.failedAt} > ${since.toISOString()}`));
    const failures = row?.failures ?? 0;
    const delayMs = delayAfterFailures(failures) * 1000;
    if (delayMs > 0 && row?.latest) {
      const allowedAt = new Date(row.latest).getTime() + delayMs;
      if (allowedAt > Date.now()) return { limited: true, retryAfterSeconds: Math.max(1, Math.ceil((allowedAt - Date.now()) / 1000)) };
    }
    const [reserved] = await tx.insert(passwordFailure).values({ email: address, client }).returning({ id: passwordFailure.id });
    return { limited: false, attemptId: reserved!.id };
  });
}

/** After the password was checked: a wrong one stays counted; the right one clears the account's count; anything else is not counted. */
export async function settleSignInAttempt(email: string, attemptId: string, outcome: "wrong-password" | "signed-in" | "not-checked") {
  const database = getDatabase();
  if (outcome === "signed-in") await database.delete(passwordFailure).where(eq(passwordFailure.email, email.toLowerCase()));
  else if (outcome === "not-checked") await database.delete(passwordFailure).where(eq(passwordFailure.id, attemptId));
  // Old rows are of no use to the limit; drop them as we go.
  else await database.delete(passwordFailure).where(lt(passwordFailure.failedAt, new Date(Date.now() - 2 * WRONG_PASSWORD_WINDOW_MS)));
}
