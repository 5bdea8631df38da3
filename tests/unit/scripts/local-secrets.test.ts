import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync, chmodSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { parseEnvironment } from "~/env.server";
import { freshSecrets, SECRETS_FILE, secretsForDataFolder } from "../../../scripts/lib/local-secrets.ts";

const folders: string[] = [];
const dataFolder = () => {
  const folder = mkdtempSync(path.join(os.tmpdir(), "tenthmark-secrets-"));
  folders.push(folder);
  return folder;
};
afterEach(() => {
  for (const folder of folders.splice(0)) rmSync(folder, { recursive: true, force: true });
});

describe("local secrets", () => {
  it("are made once per data folder, readable by the owner only, and reused on the next start", () => {
    const folder = dataFolder();
    const first = secretsForDataFolder(folder);
    const file = path.join(folder, SECRETS_FILE);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(secretsForDataFolder(folder)).toEqual(first);
    expect(JSON.parse(readFileSync(file, "utf8"))).toEqual(first);
  });

  it("fill in a secret missing from an older file and keep the others; tighten a file others could read", () => {
    const folder = dataFolder();
    const file = path.join(folder, SECRETS_FILE);
    const { SESSION_SECRET } = freshSecrets();
    writeFileSync(file, JSON.stringify({ SESSION_SECRET }));
    chmodSync(file, 0o644);
    const secrets = secretsForDataFolder(folder);
    expect(secrets.SESSION_SECRET).toBe(SESSION_SECRET);
    expect(secrets.STRIPE_WEBHOOK_SECRET).toMatch(/^whsec_[0-9a-f]{64}$/);
    expect(statSync(file).mode & 0o777).toBe(0o600);
  });

  it("differ on every run and pass the production checks", () => {
    const [one, two] = [freshSecrets(), freshSecrets()];
    for (const name of Object.keys(one) as Array<keyof typeof one>) expect(one[name]).not.toBe(two[name]);
    expect(() =>
      parseEnvironment({
        NODE_ENV: "production",
        DATABASE_URL: "postgres://app@127.0.0.1:54329/tenthmark",
        S3_ACCESS_KEY_ID: "AKIAEXAMPLEACCESS",
        S3_SECRET_ACCESS_KEY: "bucket-account-key",
        ...one,
      }),
    ).not.toThrow();
  });
});
