// The headers reach the static files our server sends before the app (hashed assets, the favicon), HSTS is
// sent exactly when the public origin is https, and no answer body carries the session token.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { freePort } from "../../../scripts/lib/ports.ts";
import { waitForHttp } from "../../../scripts/lib/processes.ts";
import { createTestUser, testAppOrigin } from "../../support/accounts";

const root = path.resolve(import.meta.dirname, "../../..");

/** A static asset the home page links to (a hashed script under /assets/). */
async function assetPath(origin: string) {
  const html = await fetch(`${origin}/`).then((response) => response.text());
  const asset = /(?:src|href)="(\/assets\/[^"]+\.(?:js|css))"/.exec(html)?.[1];
  expect(asset, "the home page links a hashed asset").toBeTruthy();
  return asset!;
}

function expectStaticHeaders(response: Response, what: string) {
  expect(response.status, what).toBe(200);
  expect(response.headers.get("x-content-type-options"), what).toBe("nosniff");
  expect(response.headers.get("x-frame-options"), what).toBe("DENY");
  expect(response.headers.get("content-security-policy"), what).toMatch(/default-src 'none'.*frame-ancestors 'none'/);
}

describe("static files", () => {
  it("carry nosniff, frame and policy headers: /assets/*, /favicon.svg; no HSTS over http", async () => {
    for (const file of [await assetPath(testAppOrigin), "/favicon.svg"]) {
      const response = await fetch(`${testAppOrigin}${file}`);
      expectStaticHeaders(response, file);
      expect(response.headers.get("strict-transport-security"), file).toBeNull();
      await response.arrayBuffer();
    }
    const page = await fetch(`${testAppOrigin}/`);
    expect(page.headers.get("strict-transport-security")).toBeNull();
    await page.arrayBuffer();
  });
});

describe("with an https APP_ORIGIN", () => {
  let server: ChildProcess | undefined;
  afterAll(() => {
    server?.kill("SIGTERM");
  });

  it("every answer, static files included, asks for https only (HSTS)", async () => {
    const port = await freePort();
    server = spawn(process.execPath, [path.join(root, "server/index.mjs"), process.env.TEST_SERVER_BUILD!], {
      cwd: root,
      env: { ...process.env, NODE_ENV: "production", PORT: String(port), HOST: "127.0.0.1", APP_ORIGIN: "https://tenthmark.example.test", JOB_WORKERS: "false" },
      stdio: "ignore",
    });
    const origin = `http://127.0.0.1:${port}`;
    await waitForHttp(`${origin}/api/health`, { anyStatus: true });
    for (const file of ["/", "/api/health", "/machines", await assetPath(origin), "/favicon.svg"]) {
      const response = await fetch(`${origin}${file}`);
      expect(response.headers.get("strict-transport-security"), file).toMatch(/^max-age=63072000; includeSubDomains$/);
      await response.arrayBuffer();
    }
  });
});

describe("the session token", () => {
  const hasToken = (value: unknown): boolean =>
    value !== null && typeof value === "object" && Object.entries(value).some(([key, item]) => key === "token" || hasToken(item));

  it("is in the HttpOnly cookie only, never in a body: sign-up, sign-in, get-session, list-sessions", async () => {
    const email = `token-${Date.now()}@example.test`;
    const signUp = await fetch(`${testAppOrigin}/api/auth/sign-up/email`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: testAppOrigin },
      body: JSON.stringify({ name: "Token Tester", email, password: "a-long-password-1234" }),
    });
    expect(signUp.status).toBe(200);
    const signUpBody = await signUp.json();
    expect(signUpBody).toMatchObject({ user: { email } });
    expect(hasToken(signUpBody)).toBe(false);

    const person = await createTestUser();
    const signIn = await fetch(`${testAppOrigin}/api/auth/sign-in/email`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: testAppOrigin },
      body: JSON.stringify({ email: person.email, password: person.password }),
    });
    expect(signIn.status).toBe(200);
    const sessionCookie = signIn.headers.getSetCookie().find((line) => /session_token=/.test(line))!;
    expect(sessionCookie).toMatch(/HttpOnly/i);
    const signInBody = await signIn.json();
    expect(signInBody).toMatchObject({ user: { email: person.email } });
    expect(hasToken(signInBody)).toBe(false);

    const cookie = sessionCookie.split(";")[0]!;
    const rawToken = decodeURIComponent(cookie.split("=")[1]!).split(".")[0]!;
    for (const endpoint of ["/api/auth/get-session", "/api/auth/list-sessions"]) {
      const response = await fetch(`${testAppOrigin}${endpoint}`, { headers: { cookie } });
      expect(response.status, endpoint).toBe(200);
      const text = await response.text();
      expect(text, endpoint).not.toContain(rawToken);
      expect(hasToken(JSON.parse(text)), endpoint).toBe(false);
    }
  });
});
