// `npm start`: PostgreSQL, migrations, the local stand-ins, demo data on an empty database, the production
// build, and the app server on http://localhost:3000 — all stopped again on Ctrl-C or SIGTERM.
import { existsSync, mkdirSync } from "node:fs";
import path from "node:path";
import { buildIfNeeded } from "./lib/build.ts";
import { roleOf } from "./lib/database-roles.ts";
import { runMigrations } from "./lib/migrate.ts";
import { log } from "./lib/output.ts";
import { secretsForDataFolder } from "./lib/local-secrets.ts";
import { isPortFree } from "./lib/ports.ts";
import { startCluster } from "./lib/postgres.ts";
import { onStop, startChild, stopAll, stopOnSignals, waitForHttp } from "./lib/processes.ts";
import { seedDemoDataIfEmpty, demoSignIns } from "./lib/seed.ts";
import { registerKey } from "./lib/signing-key.ts";
import { standInEnvironment, startStandIns } from "./lib/stand-ins.ts";

const root = path.resolve(import.meta.dirname, "..");
// The product runs on Node 20 with the SDK version the lockfile pins; the SDK's notice about its releases
// after January 2027 needing Node 22 is for whoever upgrades it, not for every start.
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";
if (existsSync(path.join(root, ".env"))) process.loadEnvFile(path.join(root, ".env"));

async function main() {
  stopOnSignals();
  const port = Number(process.env.PORT ?? 3000);
  if (!(await isPortFree(port))) throw new Error(`Port ${port} is taken. Stop what runs there, or start with PORT=3100 npm start.`);
  const appOrigin = process.env.APP_ORIGIN ?? `http://localhost:${port}`;
  const dataDir = path.resolve(root, process.env.TENTHMARK_DATA_DIR ?? ".data");
  mkdirSync(dataDir, { recursive: true });

  // A DATABASE_URL in the environment (or .env) means a PostgreSQL of your own: no local cluster then. The
  // app connects with DATABASE_URL; migrations and the signing key's registration use DATABASE_OWNER_URL.
  let databaseUrl = process.env.DATABASE_URL;
  let ownerUrl = process.env.DATABASE_OWNER_URL;
  if (!databaseUrl) {
    const cluster = await startCluster({
      dataDir: path.join(dataDir, "postgres"),
      port: Number(process.env.TENTHMARK_PG_PORT ?? 54329),
      database: "tenthmark",
    });
    onStop(() => cluster.stop());
    databaseUrl = cluster.url;
    ownerUrl = cluster.ownerUrl;
  } else if (!ownerUrl) {
    log("postgres", "DATABASE_OWNER_URL is not set: migrations run as DATABASE_URL's role, which then owns the tables (not for production)");
    ownerUrl = databaseUrl;
  }
  log("postgres", `ready at ${databaseUrl}`);
  await runMigrations(ownerUrl, roleOf(databaseUrl));
  // Random secrets made once for this data folder and kept beside its data; the stand-ins check and sign with them.
  const secrets = secretsForDataFolder(dataDir);
  // The report signing key (the environment's, or the data folder's), registered as the current key.
  const signingKey = process.env.REPORT_SIGNING_KEY || secrets.REPORT_SIGNING_KEY;
  const registered = await registerKey(ownerUrl, signingKey, { coverPastDays: 800 });
  if (registered.added) log("app", `report signing key ${registered.id} registered`);

  // Fixed stand-in ports by default; TENTHMARK_FREE_PORTS=1 takes free ones (a second copy side by side).
  const standIns = await startStandIns({ dataDir, appOrigin, secrets, ports: process.env.TENTHMARK_FREE_PORTS ? undefined : {} });
  for (const standIn of standIns) onStop(() => standIn.stop());
  // What the environment (or .env) sets wins over a stand-in, even an empty value: that is how a hosted
  // service is chosen. An empty secret is no secret: the generated one is used.
  const standInSettings = Object.fromEntries(Object.entries(standInEnvironment(standIns)).filter(([key]) => process.env[key] === undefined));
  const generatedSecrets = Object.fromEntries(Object.entries(secrets).filter(([key]) => !process.env[key]));
  const environment = {
    ...process.env,
    ...generatedSecrets,
    ...standInSettings,
    NODE_ENV: "production",
    DATABASE_URL: databaseUrl,
    REPORT_SIGNING_KEY: signingKey,
    APP_ORIGIN: appOrigin,
    PORT: String(port),
    // Loopback only unless told otherwise (a deployment sets HOST=0.0.0.0 behind its proxy).
    HOST: process.env.HOST ?? "127.0.0.1",
  };
  Object.assign(process.env, environment);
  await seedDemoDataIfEmpty(databaseUrl);

  buildIfNeeded("build");
  // The request log goes to a file (replayed webhooks alone are dozens of lines); warnings and errors show here too.
  const appLog = path.join(dataDir, "app.log");
  startChild("app", process.execPath, [path.join(root, "server/index.mjs"), "build/server/index.js"], environment, { logFile: appLog, echo: "stderr" });
  await waitForHttp(`http://127.0.0.1:${port}/api/health`);

  for (const standIn of standIns) for (const [key, value] of Object.entries(standIn.env)) if (/URL$/.test(key)) log(standIn.name, `${key}=${value}`);
  const shownLog = path.relative(process.cwd(), appLog);
  log("app", `request log: ${shownLog.startsWith("..") ? appLog : shownLog}`);
  log("app", "Press Ctrl-C to stop.");
  // Last, so that they are what a newcomer sees.
  log("app", "");
  log("app", `Tenthmark is running at ${appOrigin}`);
  const signIns = demoSignIns();
  const printed = signIns.filter((signIn) => signIn.printed);
  if (printed.length) {
    log("app", "Demo sign-ins:");
    for (const signIn of printed) log("app", `  ${signIn.role.padEnd(16)} ${signIn.email.padEnd(34)} ${signIn.password}`);
    const more = signIns.length - printed.length;
    if (more) log("app", `  …and ${more} more (other dealers, a private seller, inspectors, buyers): see "Demo sign-ins" in README.md`);
  }
}

main().catch(async (error) => {
  console.error(`\nnpm start failed: ${error instanceof Error ? error.message : String(error)}`);
  await stopAll();
  process.exit(1);
});
