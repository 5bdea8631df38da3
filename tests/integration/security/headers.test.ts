// Every answer of the app carries the security headers; a page's inline scripts carry this request's nonce.
import { describe, expect, it } from "vitest";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";

const expectedHeaders = {
  "x-content-type-options": "nosniff",
  "referrer-policy": "strict-origin-when-cross-origin",
  "x-frame-options": "DENY",
};

function directivesOf(response: Response) {
  const policy = response.headers.get("content-security-policy") ?? "";
  return new Map(
    policy
      .split(";")
      .map((part) => part.trim().split(/\s+/))
      .filter((words) => words[0])
      .map(([name, ...sources]) => [name!, sources]),
  );
}

function expectSecurityHeaders(response: Response, what: string) {
  for (const [name, value] of Object.entries(expectedHeaders)) expect(response.headers.get(name), `${name} on ${what}`).toBe(value);
  expect(response.headers.get("permissions-policy"), `permissions-policy on ${what}`).toMatch(/camera=\(\).*geolocation=\(\)/);
  const csp = directivesOf(response);
  expect(csp.get("default-src"), what).toEqual(["'self'"]);
  expect(csp.get("frame-ancestors"), what).toEqual(["'none'"]);
  expect(csp.get("object-src"), what).toEqual(["'none'"]);
  expect(csp.get("base-uri"), what).toEqual(["'self'"]);
  return csp;
}

describe("security headers", () => {
  it("are on pages, 404 pages, redirects, data requests, resource routes, the API and files", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const cookie = await signInCookie(seller.email, seller.password);
    const requests: Array<[string, RequestInit?]> = [
      ["/"],
      ["/machines"],
      ["/no-such-page-at-all"],
      ["/sell/new"], // a redirect to sign-in for a visitor
      ["/sell/new", { headers: { cookie } }],
      ["/_root.data"],
      ["/api/health"],
      ["/api/v1/listings?q=lathe"],
      ["/api/v1/evaluations"], // 405
      ["/api/auth/get-session", { headers: { cookie } }],
      ["/files/no/such/object.jpg"],
      ["/reports/verify?hash=00"],
    ];
    for (const [path, init] of requests) {
      const response = await fetch(`${testAppOrigin}${path}`, { redirect: "manual", ...init });
      expect(response.status, path).toBeLessThan(500);
      expectSecurityHeaders(response, `${path} (${response.status})`);
      await response.arrayBuffer();
    }
  });

  it("allow only our own scripts and this request's nonce, the bucket for uploads and the checkout page for forms", async () => {
    const response = await fetch(`${testAppOrigin}/`);
    const csp = expectSecurityHeaders(response, "/");
    const html = await response.text();
    const scriptSources = csp.get("script-src")!;
    expect(scriptSources[0]).toBe("'self'");
    const nonce = /^'nonce-([A-Za-z0-9+/=]+)'$/.exec(scriptSources[1] ?? "")?.[1];
    expect(nonce, `script-src ${scriptSources.join(" ")}`).toBeTruthy();
    expect(scriptSources).toHaveLength(2);
    expect(scriptSources.join(" ")).not.toMatch(/unsafe-inline|unsafe-eval|\*/);

    // Every inline script React Router and React write carries the nonce.
    const inlineScripts = [...html.matchAll(/<script\b([^>]*)>/g)].map((match) => match[1]!);
    expect(inlineScripts.length).toBeGreaterThan(0);
    for (const attributes of inlineScripts) expect(attributes).toContain(`nonce="${nonce}"`);

    expect(csp.get("connect-src")).toEqual(["'self'", new URL(process.env.S3_ENDPOINT!).origin]);
    const checkout = `http://${process.env.STRIPE_API_HOST}:${process.env.STRIPE_API_PORT}`;
    expect(csp.get("form-action")).toEqual(["'self'", new URL(checkout).origin]);
    expect(csp.get("img-src")).toEqual(["'self'", "data:", "blob:"]);

    const again = await fetch(`${testAppOrigin}/`);
    expect(directivesOf(again).get("script-src")![1], "a new nonce per request").not.toBe(scriptSources[1]);
    await again.arrayBuffer();
  });
});
