import { describe, expect, it } from "vitest";
import { parseEnvironment } from "~/env.server";
import { clientAddress, delayAfterFailures, FIRST_DELAY_SECONDS, MAX_DELAY_SECONDS, WRONG_PASSWORD_LIMIT } from "~/modules/accounts/limits.server";

const requestFrom = (forwardedFor?: string) => new Request("http://localhost/api/auth/sign-in/email", { headers: forwardedFor ? { "x-forwarded-for": forwardedFor } : {} });

describe("the client address (X-Forwarded-For as the proxy chain, `common practice`)", () => {
  it("ignores X-Forwarded-For when no proxy is trusted: anyone can write it", () => {
    expect(clientAddress(requestFrom("203.0.113.7"), [])).toBeNull();
    expect(clientAddress(requestFrom("203.0.113.7, 10.0.0.2"), [])).toBeNull();
  });

  it("takes the address our proxy appended, not what the client wrote before it", () => {
    // The client wrote 198.51.100.1 itself; our proxy at 10.0.0.2 appended the address it saw.
    expect(clientAddress(requestFrom("198.51.100.1, 203.0.113.7"), ["10.0.0.2"])).toBe("203.0.113.7");
    expect(clientAddress(requestFrom("198.51.100.1, 203.0.113.7, 10.0.0.2"), ["10.0.0.0/8"])).toBe("203.0.113.7");
    expect(clientAddress(requestFrom("2001:db8::1, fd00::5"), ["fd00::/8"])).toBe("2001:db8::1");
  });

  it("knows no client when the chain holds only trusted proxies, nothing, or junk", () => {
    expect(clientAddress(requestFrom("10.0.0.2"), ["10.0.0.0/8"])).toBeNull();
    expect(clientAddress(requestFrom(), ["10.0.0.0/8"])).toBeNull();
    expect(clientAddress(requestFrom("not-an-address"), ["10.0.0.0/8"])).toBeNull();
  });

  it("TRUSTED_PROXIES takes addresses and CIDR ranges, and names a bad entry", () => {
    const base = { DATABASE_URL: "postgres://app@127.0.0.1:54329/tenthmark", S3_ACCESS_KEY_ID: "a", S3_SECRET_ACCESS_KEY: "b", SESSION_SECRET: "3f9c1a7e5b2d8046c1e9a3f7b5d2084c", STRIPE_SECRET_KEY: "sk_test_9c1a7e5b2d8046c1e9a3f7b5d2084c3f", STRIPE_WEBHOOK_SECRET: "whsec_9c1a7e5b2d8046c1e9a3f7b5d2084c3f", POSTMARK_SERVER_TOKEN: "9c1a7e5b2d8046c1e9a3", MEILISEARCH_API_KEY: "9c1a7e5b2d8046c1e9a3" };
    expect(parseEnvironment(base).TRUSTED_PROXIES).toEqual([]);
    expect(parseEnvironment({ ...base, TRUSTED_PROXIES: " 10.0.0.0/8, 127.0.0.1 ,::1" }).TRUSTED_PROXIES).toEqual(["10.0.0.0/8", "127.0.0.1", "::1"]);
    expect(() => parseEnvironment({ ...base, TRUSTED_PROXIES: "10.0.0.0/33" })).toThrow(/TRUSTED_PROXIES: has "10.0.0.0\/33"/);
    expect(() => parseEnvironment({ ...base, TRUSTED_PROXIES: "proxy.internal" })).toThrow(/TRUSTED_PROXIES: has "proxy.internal"/);
  });
});

describe("the wait after wrong passwords", () => {
  it(`costs nothing while fewer than ${WRONG_PASSWORD_LIMIT} were wrong, then doubles from ${FIRST_DELAY_SECONDS} s up to ${MAX_DELAY_SECONDS} s, never more`, () => {
    expect(Array.from({ length: WRONG_PASSWORD_LIMIT }, (_, failures) => delayAfterFailures(failures))).toEqual(Array(WRONG_PASSWORD_LIMIT).fill(0));
    expect([5, 6, 7, 8, 9, 10].map(delayAfterFailures)).toEqual([30, 60, 120, 240, 300, 300]);
    expect(delayAfterFailures(10_000)).toBe(MAX_DELAY_SECONDS);
  });
});
