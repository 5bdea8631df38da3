import { isIP } from "node:net";
import { z } from "zod";

/**
 * What real strength means for a secret: long enough (at least `minLength` characters after its prefix),
 * not made of a handful of characters repeated, and not a placeholder or a value that was ever published
 * as a default. `npm start`, `npm test` and the bench generate random ones (scripts/lib/local-secrets.ts);
 * anything else sets them itself (`openssl rand -hex 32`).
 */
const placeholderPattern = /change[-_ ]?me|replace[-_ ]?me|placeholder|example|development[-_ ]?only|your[-_ ]?(secret|key|token)|not[-_ ]?secret|stand[-_ ]?in|insecure|dummy|tenthmark|master[-_ ]?key|secret|password/i;
const minDistinctCharacters = 8;

function secretSetting(name: string, options: { prefix?: string; minLength: number; prefixError?: string }) {
  const prefix = options.prefix ?? "";
  return z
    .string({ error: `is required: set ${name} (\`npm start\` and \`npm test\` generate it; elsewhere \`openssl rand -hex 32\`)` })
    .check((context) => {
      const value = context.value;
      if (prefix && !value.startsWith(prefix)) {
        context.issues.push({ code: "custom", input: value, message: options.prefixError ?? `must start with ${prefix}` });
        return;
      }
      const body = value.slice(prefix.length);
      const problem =
        body.length < options.minLength
          ? `must be at least ${options.minLength} characters${prefix ? ` after ${prefix}` : ""} (generate one with \`openssl rand -hex 32\`)`
          : new Set(body).size < minDistinctCharacters
            ? "is too repetitive (generate one with `openssl rand -hex 32`)"
            : placeholderPattern.test(body)
              ? "is a placeholder or a published default (generate one with `openssl rand -hex 32`)"
              : null;
      if (problem) context.issues.push({ code: "custom", input: value, message: problem });
    });
}

const optionalWhenEmpty = <T extends z.ZodType>(schema: T) => z.preprocess((value) => (value === "" ? undefined : value), schema.optional());

/**
 * Every setting the server reads, validated once at boot. Each service is configured here alone, so
 * pointing the app at a hosted service instead of its local stand-in is a change of environment.
 */
export const environmentSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z
    .string({ error: "is required (a postgres:// connection string)" })
    .regex(/^postgres(ql)?:\/\//, { error: "must be a postgres:// or postgresql:// connection string" }),
  APP_ORIGIN: z
    .url({ error: "must be the public origin of the app, e.g. http://localhost:3000" })
    .default("http://localhost:3000"),
  // Signs sessions, e-mail tokens and unsubscribe links; BETTER_AUTH_SECRET, when set, is used instead.
  SESSION_SECRET: optionalWhenEmpty(secretSetting("SESSION_SECRET", { minLength: 32 })),
  // File storage (S3 or anything speaking its API; locally the s3rver stand-in in stand-ins/files).
  S3_ENDPOINT: z.url({ error: "must be the S3 endpoint URL, e.g. https://s3.eu-central-1.amazonaws.com" }).default("http://127.0.0.1:4568"),
  S3_REGION: z.string().min(1).default("us-east-1"),
  S3_BUCKET: z.string().min(3, { error: "must name the bucket for photos and documents" }).default("tenthmark-files"),
  S3_ACCESS_KEY_ID: z.string({ error: "is required (the access key of the bucket's account)" }).min(1),
  S3_SECRET_ACCESS_KEY: z.string({ error: "is required (the key of the bucket's account)" }).min(1),
  BETTER_AUTH_SECRET: optionalWhenEmpty(secretSetting("BETTER_AUTH_SECRET", { minLength: 32 })),
  // E-mail through Postmark (locally the stand-in in stand-ins/mail).
  POSTMARK_SERVER_TOKEN: secretSetting("POSTMARK_SERVER_TOKEN", { minLength: 16 }),
  POSTMARK_API_HOST: z
    .string()
    .regex(/^[a-z0-9.-]+(:\d+)?$/i, { error: "must be host or host:port, e.g. api.postmarkapp.com" })
    .default("127.0.0.1:4580"),
  POSTMARK_USE_HTTPS: z.enum(["true", "false"]).default("false").transform((value) => value === "true"),
  MAIL_FROM: z.string().min(3, { error: "must be the sender, e.g. Tenthmark <mail@example.test>" }).default("Tenthmark <mail@tenthmark.example.test>"),
  // The proxies in front of the app (IP addresses or CIDR ranges, comma-separated) whose X-Forwarded-For
  // entries are believed. Unset: the header is ignored and sign-in limits count per account alone.
  TRUSTED_PROXIES: z
    .string()
    .default("")
    .transform((value) => value.split(",").map((entry) => entry.trim()).filter(Boolean))
    .check((context) => {
      for (const entry of context.value) {
        const [address = "", prefix, extra] = entry.split("/");
        const family = isIP(address);
        const bits = family === 6 ? 128 : 32;
        const prefixOk = prefix === undefined || (/^\d{1,3}$/.test(prefix) && Number(prefix) <= bits);
        if (!family || !prefixOk || extra !== undefined) {
          context.issues.push({ code: "custom", input: context.value, message: `has "${entry}", which is not an IP address or CIDR range (e.g. 10.0.0.0/8, 127.0.0.1)` });
        }
      }
    }),
  // Sign-in requests per minute from one client address before the flood guard answers 429 (all of them
  // share one count where TRUSTED_PROXIES is unset). `npm test` raises it: every test signs in from 127.0.0.1.
  SIGN_IN_REQUESTS_PER_MINUTE: z.coerce.number().int().min(10).max(100_000).default(300),
  // Job queue (pg-boss) schema in DATABASE_URL; tests may run a queue of their own in another schema.
  JOB_QUEUE_SCHEMA: z.string().regex(/^[a-z_][a-z0-9_]*$/).default("pgboss"),
  // Set to "false" to run no job workers in this process (e.g. a web-only server).
  JOB_WORKERS: z.enum(["true", "false"]).default("true").transform((value) => value === "true"),
  // Payments through Stripe (locally the stand-in in stand-ins/payments, given the same generated key and secret).
  // With Stripe itself, leave STRIPE_API_HOST, STRIPE_API_PORT and STRIPE_API_PROTOCOL unset (or empty).
  STRIPE_SECRET_KEY: z
    .string({ error: "is required: a Stripe API key (sk_… or rk_…)" })
    .regex(/^(sk|rk)_(test|live)_/, { error: "must be a Stripe API key (sk_… or rk_…)" })
    .pipe(secretSetting("STRIPE_SECRET_KEY", { minLength: 32 })),
  // Stripe's endpoint secrets are whsec_ and 32 or more characters.
  STRIPE_WEBHOOK_SECRET: secretSetting("STRIPE_WEBHOOK_SECRET", {
    prefix: "whsec_",
    minLength: 24,
    prefixError: "must be the signing key of the webhook endpoint (whsec_…)",
  }),
  STRIPE_API_HOST: z.preprocess(
    (value) => (value === "" ? undefined : value),
    z.string().regex(/^[a-z0-9.-]+$/i, { error: "must be a host name, e.g. 127.0.0.1" }).optional(),
  ),
  STRIPE_API_PORT: z.preprocess((value) => (value === "" ? undefined : value), z.coerce.number().int().min(1).max(65535).optional()),
  STRIPE_API_PROTOCOL: z.preprocess((value) => (value === "" ? undefined : value), z.enum(["http", "https"]).optional()),
  STRIPE_TIMEOUT_MS: z.coerce.number().int().min(1000).default(10_000),
  // Unset: none against a local stand-in (STRIPE_API_HOST set), two against Stripe itself.
  STRIPE_MAX_NETWORK_RETRIES: z.preprocess((value) => (value === "" ? undefined : value), z.coerce.number().int().min(0).max(5).optional()),
  // The stand-in's own address (its test control API); unset with Stripe itself.
  STRIPE_STAND_IN_URL: z.preprocess((value) => (value === "" ? undefined : value), z.url().optional()),
  // Listing search through Meilisearch (locally the stand-in in search/stand-in, whose master key is the default).
  MEILISEARCH_HOST: z.url({ error: "must be the Meilisearch URL, e.g. http://127.0.0.1:7700" }).default("http://127.0.0.1:7701"),
  // A Meilisearch API key with search and write rights.
  MEILISEARCH_API_KEY: secretSetting("MEILISEARCH_API_KEY", { minLength: 16 }),
  // Milliseconds a search may take before the page answers from PostgreSQL instead.
  MEILISEARCH_SEARCH_TIMEOUT_MS: z.coerce.number().int().min(50).default(800),
  // The Ed25519 private key that signs report credentials, as a Multikey (z3u2…). Required in production;
  // `npm start` keeps one per data folder. `npm run signing-key -- rotate` replaces it.
  REPORT_SIGNING_KEY: z.preprocess(
    (value) => (value === "" ? undefined : value),
    z.string().regex(/^z[1-9A-HJ-NP-Za-km-z]{40,60}$/, { error: "must be an Ed25519 private key as a Multikey (z3u2…); make one with `npm run signing-key -- new`" }).optional(),
  ),
}).superRefine((value, context) => {
  if (value.NODE_ENV === "production" && !value.REPORT_SIGNING_KEY) {
    context.addIssue({ code: "custom", path: ["REPORT_SIGNING_KEY"], message: "is required in production (the key that signs report credentials); make one with `npm run signing-key -- new`" });
  }
}).check((context) => {
  if (!context.value.SESSION_SECRET && !context.value.BETTER_AUTH_SECRET) {
    context.issues.push({
      code: "custom",
      input: context.value,
      path: ["SESSION_SECRET"],
      message: "is required (`npm start` and `npm test` generate it; elsewhere `openssl rand -hex 32`), or BETTER_AUTH_SECRET",
    });
  }
});

export type Environment = z.infer<typeof environmentSchema>;

/** The secret that signs sessions, e-mail tokens and links: BETTER_AUTH_SECRET when set, else SESSION_SECRET. */
export function sessionSecret(environment: Environment = env()): string {
  return (environment.BETTER_AUTH_SECRET ?? environment.SESSION_SECRET)!;
}

export class EnvironmentError extends Error {
  override name = "EnvironmentError";
}

/** Parses a variables object; the message names every bad variable and what it must be. */
export function parseEnvironment(source: Record<string, string | undefined>): Environment {
  const result = environmentSchema.safeParse(source);
  if (result.success) return result.data;
  const lines = result.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
  throw new EnvironmentError(`Invalid environment:\n${lines.join("\n")}`);
}

let cached: Environment | undefined;

export function env(): Environment {
  cached ??= parseEnvironment(process.env);
  return cached;
}
