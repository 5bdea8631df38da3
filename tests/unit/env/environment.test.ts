import { describe, expect, it } from "vitest";
import { EnvironmentError, parseEnvironment, sessionSecret } from "~/env.server";
import { freshSecrets } from "../../../scripts/lib/local-secrets.ts";

// Values that were once published as defaults or read like placeholders: none may sign anything.
const publishedDefaults = {
  SESSION_SECRET: "development-only-secret-change-me-0123456789",
  STRIPE_WEBHOOK_SECRET: "whsec_tenthmark_payments_stand_in",
  STRIPE_SECRET_KEY: "sk_test_tenthmark_payments_stand_in",
  POSTMARK_SERVER_TOKEN: "local-mail-stand-in-token",
  MEILISEARCH_API_KEY: "tenthmark-local-search-master-key",
};

describe("environment schema", () => {
  const valid = {
    DATABASE_URL: "postgres://app@127.0.0.1:54329/tenthmark",
    S3_ACCESS_KEY_ID: "AKIAEXAMPLEACCESS",
    S3_SECRET_ACCESS_KEY: "bucket-account-secret-value",
    ...freshSecrets(),
  };

  it("accepts a minimal environment with generated secrets and fills the defaults", () => {
    const environment = parseEnvironment(valid);
    expect(environment.NODE_ENV).toBe("development");
    expect(environment.APP_ORIGIN).toBe("http://localhost:3000");
    expect(sessionSecret(environment)).toBe(valid.SESSION_SECRET);
  });

  it("signs with BETTER_AUTH_SECRET when both are set, and takes it alone", () => {
    const better = freshSecrets().SESSION_SECRET;
    expect(sessionSecret(parseEnvironment({ ...valid, BETTER_AUTH_SECRET: better }))).toBe(better);
    const { SESSION_SECRET: _unused, ...withoutSession } = valid;
    expect(sessionSecret(parseEnvironment({ ...withoutSession, BETTER_AUTH_SECRET: better }))).toBe(better);
  });

  it("names a missing DATABASE_URL", () => {
    expect(() => parseEnvironment({})).toThrow(EnvironmentError);
    expect(() => parseEnvironment({})).toThrow(/DATABASE_URL/);
  });

  it("names a DATABASE_URL that is not a postgres URL and says what it must be", () => {
    expect(() => parseEnvironment({ ...valid, DATABASE_URL: "mysql://x" })).toThrow(/DATABASE_URL: must be a postgres:\/\//);
  });

  it("names every bad variable at once", () => {
    try {
      parseEnvironment({ ...valid, DATABASE_URL: "nope", APP_ORIGIN: "not a url", SESSION_SECRET: "short" });
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
  const { REPORT_SIGNING_KEY: _generated, ...otherSecrets } = freshSecrets();
  const base = {
    DATABASE_URL: "postgres://app@127.0.0.1:54329/tenthmark",
    S3_ACCESS_KEY_ID: "AKIAEXAMPLEACCESS",
    S3_SECRET_ACCESS_KEY: "bucket-account-secret-value",
    ...otherSecrets,
  };
  it("is required in production, and must be an Ed25519 Multikey", () => {
    expect(() => parseEnvironment({ ...base, NODE_ENV: "production" })).toThrow(/REPORT_SIGNING_KEY: is required in production/);
    expect(() => parseEnvironment({ ...base, NODE_ENV: "production", REPORT_SIGNING_KEY: "secret" })).toThrow(/REPORT_SIGNING_KEY: must be an Ed25519 private key/);
    expect(parseEnvironment({ ...base, NODE_ENV: "production", REPORT_SIGNING_KEY: "z3u2en7t5LR2WtQH5PfFqMqwVHBeXouLzo6haApm8XHqvjxq" }).REPORT_SIGNING_KEY).toMatch(/^z3u2/);
    expect(parseEnvironment(base).REPORT_SIGNING_KEY).toBeUndefined();
  });
});

describe("secrets in production (source: the security rules of this project, `common practice`)", () => {
  const production = {
    NODE_ENV: "production",
    DATABASE_URL: "postgres://app@127.0.0.1:54329/tenthmark",
    S3_ACCESS_KEY_ID: "AKIAEXAMPLEACCESS",
    S3_SECRET_ACCESS_KEY: "bucket-account-secret-value",
    ...freshSecrets(),
  };
  const without = (name: string) => Object.fromEntries(Object.entries(production).filter(([key]) => key !== name));

  it("starts with generated secrets", () => {
    expect(parseEnvironment(production).NODE_ENV).toBe("production");
  });

  for (const name of ["SESSION_SECRET", "STRIPE_WEBHOOK_SECRET", "STRIPE_SECRET_KEY", "POSTMARK_SERVER_TOKEN", "MEILISEARCH_API_KEY"]) {
    it(`refuses to start without ${name}, and names it`, () => {
      expect(() => parseEnvironment(without(name))).toThrow(new RegExp(`${name}: `));
    });
  }

  it("refuses an empty SESSION_SECRET as missing", () => {
    expect(() => parseEnvironment({ ...production, SESSION_SECRET: "" })).toThrow(/SESSION_SECRET: is required/);
  });

  for (const [name, value] of Object.entries(publishedDefaults)) {
    it(`refuses the published default of ${name}`, () => {
      expect(() => parseEnvironment({ ...production, [name]: value })).toThrow(new RegExp(`${name}: `));
    });
  }

  it("refuses short, repetitive and placeholder secrets, naming the variable", () => {
    expect(() => parseEnvironment({ ...production, SESSION_SECRET: "a".repeat(64) })).toThrow(/SESSION_SECRET: is too repetitive/);
    expect(() => parseEnvironment({ ...production, BETTER_AUTH_SECRET: "0123456789abcdef0123456789abcde" })).toThrow(
      /BETTER_AUTH_SECRET: must be at least 32 characters/,
    );
    expect(() => parseEnvironment({ ...production, SESSION_SECRET: "please-change-me-before-going-live-0123" })).toThrow(/SESSION_SECRET: is a placeholder/);
    expect(() => parseEnvironment({ ...production, STRIPE_WEBHOOK_SECRET: "whsec_abc123" })).toThrow(/STRIPE_WEBHOOK_SECRET: must be at least 24 characters after whsec_/);
    expect(() => parseEnvironment({ ...production, STRIPE_WEBHOOK_SECRET: freshSecrets().SESSION_SECRET })).toThrow(/STRIPE_WEBHOOK_SECRET: must be the signing key/);
  });

  it("takes Stripe's own shape of endpoint secret (whsec_ and 32 characters)", () => {
    expect(() => parseEnvironment({ ...production, STRIPE_WEBHOOK_SECRET: "whsec_Q3b8Vn1xK0pL7mZr2TgY5wHs9JdFa4Ec" })).not.toThrow();
  });
});
