import { describe, expect, it } from "vitest";
import { WRONG_PASSWORD_LIMIT } from "~/modules/accounts/limits.server";
import { createTestUser, testAppOrigin } from "../../support/accounts";

/** Posts our own sign-in form, as a browser without JavaScript would. */
function postSignInForm(email: string, password: string) {
  return fetch(`${testAppOrigin}/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", origin: testAppOrigin },
    body: new URLSearchParams({ email, password, redirectTo: "/account" }),
    redirect: "manual",
  });
}

describe("wrong passwords", () => {
  it(`answer 401 with a clear message, then 429 once ${WRONG_PASSWORD_LIMIT} were wrong — even for the right password`, async () => {
    const person = await createTestUser();
    for (let attempt = 1; attempt <= WRONG_PASSWORD_LIMIT; attempt++) {
      const response = await postSignInForm(person.email, `wrong-password-${attempt}`);
      expect(response.status).toBe(401);
      expect(await response.text()).toMatch(/do not match an account/);
    }
    const limited = await postSignInForm(person.email, `wrong-password-again`);
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(await limited.text()).toMatch(/Too many wrong passwords/);

    const rightButLimited = await postSignInForm(person.email, person.password);
    expect(rightButLimited.status).toBe(429);
    expect(rightButLimited.headers.getSetCookie()).toEqual([]);

    // The same limit guards better-auth's endpoint itself.
    const api = await fetch(`${testAppOrigin}/api/auth/sign-in/email`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: testAppOrigin },
      body: JSON.stringify({ email: person.email, password: person.password }),
    });
    expect(api.status).toBe(429);
  });

  it("count per e-mail address: another person signing in from the same machine is not held up", async () => {
    const target = await createTestUser();
    const neighbour = await createTestUser();
    for (let attempt = 0; attempt <= WRONG_PASSWORD_LIMIT; attempt++) await postSignInForm(target.email, "not-the-password");
    const response = await postSignInForm(neighbour.email, neighbour.password);
    expect(response.status).toBe(302);
    expect(response.headers.get("location")).toBe("/account");
    expect(response.headers.getSetCookie().some((cookie) => /session_token=/.test(cookie) && /HttpOnly/i.test(cookie) && /SameSite=Lax/i.test(cookie))).toBe(true);
  });

  it("are counted through /api/auth too", async () => {
    const person = await createTestUser();
    const viaApi = (password: string) =>
      fetch(`${testAppOrigin}/api/auth/sign-in/email`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: testAppOrigin },
        body: JSON.stringify({ email: person.email, password }),
      });
    for (let attempt = 0; attempt < WRONG_PASSWORD_LIMIT; attempt++) expect((await viaApi("wrong-one-here")).status).toBe(401);
    expect((await viaApi(person.password)).status).toBe(429);
    expect((await postSignInForm(person.email, person.password)).status).toBe(429);
  });
});
