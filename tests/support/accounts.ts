// Accounts for tests: made through the accounts service (better-auth's adapter and password hashing, no
// e-mail sent), each with a unique address, and signed in through the real /api/auth endpoint.
import { randomUUID } from "node:crypto";
import type { Page } from "playwright-core";
import type { Role } from "~/modules/accounts/guards.server";
import { createAccount, type InspectorStatus } from "~/modules/accounts/service.server";

export const testAppOrigin = process.env.TEST_APP_ORIGIN ?? "http://localhost:3000";

export type TestUser = { id: string; email: string; password: string; name: string };

/** A new account with a unique e-mail address; verified unless told otherwise. */
export async function createTestUser(
  options: { roles?: Role[]; verified?: boolean; inspectorStatus?: InspectorStatus; name?: string; displayUnits?: "mm" | "inch" } = {},
): Promise<TestUser> {
  const tag = randomUUID().slice(0, 12);
  const email = `test-${tag}@example.test`;
  const password = `pw-${randomUUID()}`;
  const name = options.name ?? `Test person ${tag.slice(0, 4)}`;
  const { id } = await createAccount({
    name,
    email,
    password,
    verified: options.verified ?? true,
    roles: options.roles,
    inspectorStatus: options.inspectorStatus,
    displayUnits: options.displayUnits,
  });
  return { id, email, password, name };
}

/** Signs in through POST /api/auth/sign-in/email and returns the Cookie header value for later requests. */
export async function signInCookie(email: string, password: string): Promise<string> {
  const response = await fetch(`${testAppOrigin}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: testAppOrigin },
    body: JSON.stringify({ email, password }),
  });
  if (response.status !== 200) throw new Error(`sign-in of ${email} failed: ${response.status} ${await response.text()}`);
  const cookies = response.headers.getSetCookie().map((line) => line.split(";")[0]);
  if (!cookies.length) throw new Error(`sign-in of ${email} set no cookie`);
  return cookies.join("; ");
}

/** Signs a Playwright page in through the sign-in form and waits until it has left the sign-in page. */
export async function signInPage(page: Page, email: string, password: string, redirectTo?: string) {
  await page.goto(redirectTo ? `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}` : "/sign-in");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await Promise.all([page.waitForURL((url) => url.pathname !== "/sign-in"), page.getByRole("button", { name: "Sign in" }).click()]);
  // The address changes before the destination renders: wait until the sign-in form has gone, so a test's next
  // read of the page is the destination, not the form it came from.
  await page.getByText("Welcome back. Sign in to").waitFor({ state: "detached" });
}
