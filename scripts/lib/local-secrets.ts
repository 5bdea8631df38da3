// The secrets of a local run, never a value written in code: `npm start` makes them once per data folder
// (kept in `<data folder>/secrets.json`, readable by its owner only, reused on the next start), `npm test`
// and the bench make fresh ones per run. The app and the stand-ins get the same values, so the payments
// stand-in signs webhooks with the secret the app checks them with.
import { randomBytes } from "node:crypto";
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { newSigningKeyMultibase } from "../../app/modules/reports/signing.server.ts";

const random = (bytes: number) => randomBytes(bytes).toString("hex");

/** Every generated secret, by the variable it is passed in: adding one is adding a line here. */
const generators = {
  SESSION_SECRET: () => random(32),
  STRIPE_SECRET_KEY: () => `sk_test_${random(24)}`,
  STRIPE_WEBHOOK_SECRET: () => `whsec_${random(32)}`,
  POSTMARK_SERVER_TOKEN: () => random(24),
  MEILISEARCH_API_KEY: () => random(24),
  // The Ed25519 key that signs report credentials (an Ed25519 Multikey); `npm run signing-key -- rotate` replaces it.
  REPORT_SIGNING_KEY: () => newSigningKeyMultibase(),
} satisfies Record<string, () => string>;

export type LocalSecrets = { [name in keyof typeof generators]: string };

export const SECRETS_FILE = "secrets.json";

/** A new set of secrets for a throwaway run (tests, bench). */
export function freshSecrets(): LocalSecrets {
  return Object.fromEntries(Object.entries(generators).map(([name, generate]) => [name, generate()])) as LocalSecrets;
}

/**
 * The secrets of a data folder: read from its secrets file, any missing one generated and the file written
 * back with mode 0600. The same folder gives the same secrets on every start (sessions survive a restart).
 */
export function secretsForDataFolder(dataDir: string): LocalSecrets {
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, SECRETS_FILE);
  const stored: Partial<Record<string, unknown>> = existsSync(file) ? (JSON.parse(readFileSync(file, "utf8")) as Record<string, unknown>) : {};
  const secrets = {} as Record<string, string>;
  let changed = !existsSync(file);
  for (const [name, generate] of Object.entries(generators)) {
    const value = stored[name];
    if (typeof value === "string" && value.length > 0) secrets[name] = value;
    else {
      secrets[name] = generate();
      changed = true;
    }
  }
  if (changed) writeFileSync(file, `${JSON.stringify({ ...stored, ...secrets }, null, 2)}\n`, { mode: 0o600 });
  // A file copied in or made by hand may be readable by others: tighten it every time.
  chmodSync(file, 0o600);
  return secrets as LocalSecrets;
}

/** Replaces one secret of a data folder with a new generated value (a key rotation); returns the new value. */
export function renewSecretOfDataFolder(dataDir: string, name: keyof LocalSecrets): string {
  secretsForDataFolder(dataDir);
  const file = path.join(dataDir, SECRETS_FILE);
  const stored = JSON.parse(readFileSync(file, "utf8")) as Record<string, string>;
  stored[name] = generators[name]();
  writeFileSync(file, `${JSON.stringify(stored, null, 2)}\n`, { mode: 0o600 });
  chmodSync(file, 0o600);
  return stored[name];
}
