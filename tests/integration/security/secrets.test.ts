// No known secret signs anything: tokens made with a once-published default are refused, the e-mail-change
// flows the product does not offer cannot be driven by any token, and the server will not start with a
// missing or weak secret.
import { spawn } from "node:child_process";
import { createHmac } from "node:crypto";
import path from "node:path";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { user } from "~/modules/accounts/schema";
import { freePort } from "../../../scripts/lib/ports.ts";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";

const root = path.resolve(import.meta.dirname, "../../..");
// The session secret this code base once shipped as its default (`npm start` ran with it).
const formerDefaultSecret = "development-only-secret-change-me-0123456789";

/** An HS256 JWT, the shape of better-auth's e-mail tokens. */
function signToken(claims: Record<string, unknown>, secret: string) {
  const encode = (value: object) => Buffer.from(JSON.stringify(value)).toString("base64url");
  const now = Math.floor(Date.now() / 1000);
  const unsigned = `${encode({ alg: "HS256" })}.${encode({ ...claims, iat: now, exp: now + 3600 })}`;
  return `${unsigned}.${createHmac("sha256", secret).update(unsigned).digest("base64url")}`;
}

const verifyEmail = (token: string, cookie?: string) =>
  fetch(`${testAppOrigin}/api/auth/verify-email?token=${encodeURIComponent(token)}`, { headers: cookie ? { cookie } : {}, redirect: "manual" });

async function accountRow(id: string) {
  const [row] = await getDatabase().select({ email: user.email, emailVerified: user.emailVerified }).from(user).where(eq(user.id, id));
  return row!;
}

describe("e-mail tokens", () => {
  it("refuses a confirmation token signed with the former default secret: no verification, no session", async () => {
    const person = await createTestUser({ verified: false });
    const response = await verifyEmail(signToken({ email: person.email, userId: person.id }, formerDefaultSecret));
    expect(response.status).toBe(401);
    expect(response.headers.getSetCookie().some((cookie) => /session_token=[^;]/.test(cookie))).toBe(false);
    expect((await accountRow(person.id)).emailVerified).toBe(false);
  });

  it("refuses a change-of-address token signed with the former default secret", async () => {
    const person = await createTestUser();
    const token = signToken({ email: person.email, updateTo: "taker@example.test", userId: person.id, requestType: "change-email-verification" }, formerDefaultSecret);
    expect((await verifyEmail(token)).status).toBeGreaterThanOrEqual(400);
    expect((await accountRow(person.id)).email).toBe(person.email);
  });

  it("changes no address even with a correctly signed change-of-address token, of any kind", async () => {
    const secret = process.env.SESSION_SECRET!;
    const person = await createTestUser();
    for (const requestType of ["change-email-verification", "change-email-confirmation", undefined]) {
      const token = signToken({ email: person.email, updateTo: "taker@example.test", userId: person.id, requestType }, secret);
      const response = await verifyEmail(token);
      expect(response.status).toBe(400);
      expect(await response.json()).toMatchObject({ code: "INVALID_TOKEN" });
      expect(await accountRow(person.id)).toEqual({ email: person.email, emailVerified: true });
    }
  });

  it("still confirms an address with a correctly signed confirmation token", async () => {
    const person = await createTestUser({ verified: false });
    const response = await verifyEmail(signToken({ email: person.email, userId: person.id }, process.env.SESSION_SECRET!));
    expect(response.status).toBe(200);
    expect((await accountRow(person.id)).emailVerified).toBe(true);
  });

  it("a confirmation token is no password-reset token", async () => {
    const person = await createTestUser();
    const token = signToken({ email: person.email, userId: person.id }, process.env.SESSION_SECRET!);
    const response = await fetch(`${testAppOrigin}/api/auth/reset-password`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: testAppOrigin },
      body: JSON.stringify({ token, newPassword: "a-new-password-1234" }),
    });
    expect(response.status).toBe(400);
    await signInCookie(person.email, person.password);
  });

  it("the endpoints of flows the product does not offer answer 404", async () => {
    const person = await createTestUser();
    const cookie = await signInCookie(person.email, person.password);
    for (const [endpoint, body] of [
      ["/api/auth/change-email", { newEmail: "taker@example.test" }],
      ["/api/auth/update-user", { name: "Renamed" }],
      ["/api/auth/delete-user", {}],
    ] as const) {
      const response = await fetch(`${testAppOrigin}${endpoint}`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: testAppOrigin, cookie },
        body: JSON.stringify(body),
      });
      expect(response.status, endpoint).toBe(404);
    }
    expect((await accountRow(person.id)).email).toBe(person.email);
  });
});

describe("the production server", () => {
  /** Starts the production build with one setting changed; resolves with its exit code and output. */
  async function startWith(change: Record<string, string | undefined>) {
    const environment: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: "production", PORT: String(await freePort()), HOST: "127.0.0.1", JOB_WORKERS: "false" };
    delete environment.BETTER_AUTH_SECRET;
    for (const [name, value] of Object.entries(change)) {
      if (value === undefined) delete environment[name];
      else environment[name] = value;
    }
    const child = spawn(process.execPath, [path.join(root, "server/index.mjs"), process.env.TEST_SERVER_BUILD!], { cwd: root, env: environment });
    let output = "";
    child.stdout.on("data", (chunk) => (output += chunk));
    child.stderr.on("data", (chunk) => (output += chunk));
    const code = await new Promise<number | null>((resolve) => {
      const timer = setTimeout(() => {
        child.kill("SIGTERM");
        resolve(null);
      }, 15_000);
      child.on("exit", (exitCode) => {
        clearTimeout(timer);
        resolve(exitCode);
      });
    });
    return { code, output };
  }

  it.each([
    ["SESSION_SECRET", undefined, /SESSION_SECRET: is required/],
    ["SESSION_SECRET", formerDefaultSecret, /SESSION_SECRET: is a placeholder or a published default/],
    ["SESSION_SECRET", "too-short-for-a-secret", /SESSION_SECRET: must be at least 32 characters/],
    ["STRIPE_WEBHOOK_SECRET", undefined, /STRIPE_WEBHOOK_SECRET: /],
    ["STRIPE_WEBHOOK_SECRET", "whsec_tenthmark_payments_stand_in", /STRIPE_WEBHOOK_SECRET: is a placeholder or a published default/],
  ])("refuses to start when %s is %s, naming it", async (name, value, message) => {
    const { code, output } = await startWith({ [name]: value });
    expect(code).toBe(1);
    expect(output).toMatch(message);
  });
});
