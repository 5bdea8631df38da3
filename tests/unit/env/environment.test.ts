import { describe, expect, it } from "vitest";
import { EnvironmentError, parseEnvironment } from "~/env.server";

describe("environment schema", () => {
  const valid = { DATABASE_URL: "postgres://app@127.0.0.1:54329/tenthmark" };

  it("accepts a minimal environment and fills the defaults", () => {
    const environment = parseEnvironment(valid);
    expect(environment.NODE_ENV).toBe("development");
    expect(environment.APP_ORIGIN).toBe("http://localhost:3000");
  });

  it("names a missing DATABASE_URL", () => {
    expect(() => parseEnvironment({})).toThrow(EnvironmentError);
    expect(() => parseEnvironment({})).toThrow(/DATABASE_URL/);
  });

  it("names a DATABASE_URL that is not a postgres URL and says what it must be", () => {
    expect(() => parseEnvironment({ DATABASE_URL: "mysql://x" })).toThrow(/DATABASE_URL: must be a postgres:\/\//);
  });

  it("names every bad variable at once", () => {
    try {
      parseEnvironment({ DATABASE_URL: "nope", APP_ORIGIN: "not a url", SESSION_SECRET: "short" });
      expect.unreachable();
    } catch (error) {
      const message = (error as Error).message;
      expect(message).toMatch(/DATABASE_URL/);
      expect(message).toMatch(/APP_ORIGIN/);
      expect(message).toMatch(/SESSION_SECRET: must be at least 32 characters/);
    }
  });
});

describe("the report signing key", () => {
  const base = { DATABASE_URL: "postgres://app@127.0.0.1:54329/tenthmark" };
  it("is required in production, and must be an Ed25519 Multikey", () => {
    expect(() => parseEnvironment({ ...base, NODE_ENV: "production" })).toThrow(/REPORT_SIGNING_KEY: is required in production/);
    expect(() => parseEnvironment({ ...base, NODE_ENV: "production", REPORT_SIGNING_KEY: "secret" })).toThrow(/REPORT_SIGNING_KEY: must be an Ed25519 private key/);
    expect(parseEnvironment({ ...base, NODE_ENV: "production", REPORT_SIGNING_KEY: "z3u2en7t5LR2WtQH5PfFqMqwVHBeXouLzo6haApm8XHqvjxq" }).REPORT_SIGNING_KEY).toMatch(/^z3u2/);
    expect(parseEnvironment(base).REPORT_SIGNING_KEY).toBeUndefined();
  });
});
