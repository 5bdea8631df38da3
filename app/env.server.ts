import { z } from "zod";

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
  SESSION_SECRET: z
    .string()
    .min(32, { error: "must be at least 32 characters (generate one with `openssl rand -hex 32`)" })
    .default("development-only-secret-change-me-0123456789"),
  // File storage (S3 or anything speaking its API; locally the s3rver stand-in in stand-ins/files).
  S3_ENDPOINT: z.url({ error: "must be the S3 endpoint URL, e.g. https://s3.eu-central-1.amazonaws.com" }).default("http://127.0.0.1:4568"),
  S3_REGION: z.string().min(1).default("us-east-1"),
  S3_BUCKET: z.string().min(3, { error: "must name the bucket for photos and documents" }).default("tenthmark-files"),
  S3_ACCESS_KEY_ID: z.string().min(1).default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().min(1).default("S3RVER"),
  // Sessions are signed with SESSION_SECRET unless BETTER_AUTH_SECRET is set.
  BETTER_AUTH_SECRET: z.string().min(32, { error: "must be at least 32 characters" }).optional(),
  // E-mail through Postmark (locally the stand-in in stand-ins/mail).
  POSTMARK_SERVER_TOKEN: z.string().min(1, { error: "must be the Postmark server API token" }).default("local-mail-stand-in-token"),
  POSTMARK_API_HOST: z
    .string()
    .regex(/^[a-z0-9.-]+(:\d+)?$/i, { error: "must be host or host:port, e.g. api.postmarkapp.com" })
    .default("127.0.0.1:4580"),
  POSTMARK_USE_HTTPS: z.enum(["true", "false"]).default("false").transform((value) => value === "true"),
  MAIL_FROM: z.string().min(3, { error: "must be the sender, e.g. Tenthmark <mail@example.test>" }).default("Tenthmark <mail@tenthmark.example.test>"),
  // Job queue (pg-boss) schema in DATABASE_URL; tests may run a queue of their own in another schema.
  JOB_QUEUE_SCHEMA: z.string().regex(/^[a-z_][a-z0-9_]*$/).default("pgboss"),
  // Set to "false" to run no job workers in this process (e.g. a web-only server).
  JOB_WORKERS: z.enum(["true", "false"]).default("true").transform((value) => value === "true"),
  // Payments through Stripe (locally the stand-in in stand-ins/payments, whose key and secret are the defaults).
  // With Stripe itself, leave STRIPE_API_HOST, STRIPE_API_PORT and STRIPE_API_PROTOCOL unset (or empty).
  STRIPE_SECRET_KEY: z
    .string()
    .regex(/^(sk|rk)_(test|live)_/, { error: "must be a Stripe secret key (sk_test_… or sk_live_…)" })
    .default("sk_test_tenthmark_payments_stand_in"),
  STRIPE_WEBHOOK_SECRET: z
    .string()
    .startsWith("whsec_", { error: "must be the signing secret of the webhook endpoint (whsec_…)" })
    .default("whsec_tenthmark_payments_stand_in"),
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
  MEILISEARCH_API_KEY: z.string().min(1, { error: "must be a Meilisearch API key with search and write rights" }).default("tenthmark-local-search-master-key"),
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
});

export type Environment = z.infer<typeof environmentSchema>;

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
