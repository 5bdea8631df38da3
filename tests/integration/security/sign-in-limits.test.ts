// Guessing passwords: the limit is per account whatever address the guesses claim to come from, slows down
// rather than locks out, and counts parallel guesses before any of them is checked.
import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { FIRST_DELAY_SECONDS, MAX_DELAY_SECONDS, WRONG_PASSWORD_LIMIT } from "~/modules/accounts/limits.server";
import { passwordFailure } from "~/modules/accounts/schema";
import { createTestUser, testAppOrigin } from "../../support/accounts";

function signIn(email: string, password: string, forwardedFor?: string) {
  return fetch(`${testAppOrigin}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: testAppOrigin, ...(forwardedFor ? { "x-forwarded-for": forwardedFor } : {}) },
    body: JSON.stringify({ email, password }),
  });
}

function signInForm(email: string, password: string, forwardedFor?: string) {
  return fetch(`${testAppOrigin}/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", origin: testAppOrigin, ...(forwardedFor ? { "x-forwarded-for": forwardedFor } : {}) },
    body: new URLSearchParams({ email, password, redirectTo: "/account" }),
    redirect: "manual",
  });
}

/** Moves the account's wrong passwords `seconds` into the past, as if that long had gone by. */
async function letTimePass(email: string, seconds: number) {
  await getDatabase()
    .update(passwordFailure)
    .set({ failedAt: sql`${passwordFailure.failedAt} - make_interval(secs => ${seconds})` })
    .where(eq(passwordFailure.email, email));
}

describe("the wrong-password limit", () => {
  it("holds per account when every guess claims another X-Forwarded-For (no TRUSTED_PROXIES here)", async () => {
    const person = await createTestUser();
    for (let attempt = 1; attempt <= WRONG_PASSWORD_LIMIT; attempt++) {
      expect((await signIn(person.email, "wrong-password-here", `198.51.100.${attempt}`)).status).toBe(401);
    }
    expect((await signIn(person.email, "wrong-password-here", "198.51.100.99")).status).toBe(429);
    expect((await signInForm(person.email, person.password, "203.0.113.50")).status).toBe(429);
  });

  it("slows down with each wrong password instead of locking the owner out", async () => {
    const person = await createTestUser();
    for (let attempt = 1; attempt <= WRONG_PASSWORD_LIMIT; attempt++) expect((await signIn(person.email, "wrong-password-here")).status).toBe(401);
    const first = await signIn(person.email, "wrong-password-here");
    expect(first.status).toBe(429);
    const firstWait = Number(first.headers.get("retry-after"));
    expect(firstWait).toBeGreaterThan(FIRST_DELAY_SECONDS - 5);
    expect(firstWait).toBeLessThanOrEqual(FIRST_DELAY_SECONDS);

    await letTimePass(person.email, FIRST_DELAY_SECONDS + 1);
    expect((await signIn(person.email, "wrong-password-here")).status).toBe(401);
    const second = await signIn(person.email, "wrong-password-here");
    expect(second.status).toBe(429);
    expect(Number(second.headers.get("retry-after"))).toBeGreaterThan(firstWait);

    // Once the wait is over, the owner's right password signs in, and the count starts again.
    await letTimePass(person.email, 2 * FIRST_DELAY_SECONDS + 1);
    expect((await signIn(person.email, person.password)).status).toBe(200);
    expect(await getDatabase().select().from(passwordFailure).where(eq(passwordFailure.email, person.email))).toEqual([]);
  });

  it(`never asks for a wait longer than ${MAX_DELAY_SECONDS} s, however many guesses a stranger made`, async () => {
    const person = await createTestUser();
    await getDatabase()
      .insert(passwordFailure)
      .values(Array.from({ length: 200 }, () => ({ email: person.email, client: "unknown" })));
    const response = await signIn(person.email, person.password);
    expect(response.status).toBe(429);
    expect(Number(response.headers.get("retry-after"))).toBeLessThanOrEqual(MAX_DELAY_SECONDS);
    expect(await response.json()).toMatchObject({ message: expect.stringMatching(/Wait 5 minutes and try again, or reset your password/) });
  });

  it(`checks no more than ${WRONG_PASSWORD_LIMIT} of 40 wrong passwords sent at once`, async () => {
    const person = await createTestUser();
    const responses = await Promise.all(Array.from({ length: 40 }, (_, index) => signIn(person.email, `wrong-password-${index}`)));
    const statuses = responses.map((response) => response.status);
    expect(statuses.filter((status) => status === 401).length).toBeLessThanOrEqual(WRONG_PASSWORD_LIMIT);
    expect(statuses.filter((status) => status !== 401 && status !== 429)).toEqual([]);
    const [{ failures }] = (await getDatabase()
      .select({ failures: sql<number>`count(*)::int` })
      .from(passwordFailure)
      .where(eq(passwordFailure.email, person.email))) as [{ failures: number }];
    expect(failures).toBeLessThanOrEqual(WRONG_PASSWORD_LIMIT);
  });
});
