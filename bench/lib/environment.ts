// A bench run's own world, like `npm test`'s: a throwaway PostgreSQL cluster and the stand-ins on free
// ports, the production build in build-test/bench-<id>, served on 127.0.0.1. `stopBenchEnvironment()`
// (or Ctrl-C) stops all of it and removes the cluster's and the build's folders.
import { spawn, type ChildProcess } from "node:child_process";
import { createWriteStream, mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { buildIfNeeded } from "../../scripts/lib/build.ts";
import { roleOf } from "../../scripts/lib/database-roles.ts";
import { runMigrations } from "../../scripts/lib/migrate.ts";
import { log } from "../../scripts/lib/output.ts";
import { freshSecrets } from "../../scripts/lib/local-secrets.ts";
import { freePort } from "../../scripts/lib/ports.ts";
import { startCluster } from "../../scripts/lib/postgres.ts";
import { onStop, stopAll, stopOnSignals, waitForHttp } from "../../scripts/lib/processes.ts";
import { standInEnvironment, startStandIns, type StandIn } from "../../scripts/lib/stand-ins.ts";
import { registerKey } from "../../scripts/lib/signing-key.ts";

const root = path.resolve(import.meta.dirname, "../..");

export type BenchEnvironment = {
  workDir: string;
  databaseUrl: string;
  /** The owner role's connection: the bulk seed writes and analyzes as the tables' owner. */
  ownerUrl: string;
  /** The environment that points app code at this run's database and stand-ins. */
  appEnvironment: Record<string, string>;
  standIns: StandIn[];
  buildDirectory: string;
  buildMs: number;
};

/** The cluster, migrations and stand-ins; also sets this process's env so app modules imported afterwards use them. */
export async function startBenchServices(): Promise<BenchEnvironment> {
  stopOnSignals();
  const workDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-bench-"));
  onStop(() => rmSync(workDir, { recursive: true, force: true }));

  const cluster = await startCluster({ dataDir: path.join(workDir, "postgres"), port: await freePort(), database: "tenthmark_bench" });
  onStop(() => cluster.stop());
  await runMigrations(cluster.ownerUrl, roleOf(cluster.url));

  // The app's origin is fixed before the stand-ins start (they are told where it lives).
  const appPort = await freePort();
  const appOrigin = `http://127.0.0.1:${appPort}`;
  const secrets = freshSecrets();
  const signingKey = secrets.REPORT_SIGNING_KEY;
  // In use from 1970, so that the invented reports signed in the past fall inside its period.
  await registerKey(cluster.ownerUrl, signingKey, { now: new Date(0) });
  const standIns = await startStandIns({ dataDir: workDir, appOrigin, secrets, searchSnapshots: false });
  for (const standIn of standIns) onStop(() => standIn.stop());

  const appEnvironment: Record<string, string> = {
    ...secrets,
    ...standInEnvironment(standIns),
    DATABASE_URL: cluster.url,
    REPORT_SIGNING_KEY: signingKey,
    APP_ORIGIN: appOrigin,
    PORT: String(appPort),
  };
  Object.assign(process.env, appEnvironment);
  const buildDirectory = `build-test/bench-${path.basename(workDir).replace(/^tenthmark-bench-/, "")}`;
  return { workDir, databaseUrl: cluster.url, ownerUrl: cluster.ownerUrl, appEnvironment, standIns, buildDirectory, buildMs: 0 };
}

/** Builds the production bundle into the run's own folder (removed at the end). */
export function buildForBench(environment: BenchEnvironment) {
  onStop(() => rmSync(path.join(root, environment.buildDirectory), { recursive: true, force: true }));
  const started = performance.now();
  buildIfNeeded(environment.buildDirectory, true);
  environment.buildMs = performance.now() - started;
}

export type RunningApp = { origin: string; child: ChildProcess; logFile: string; logText: () => string };

/**
 * Serves the build with our server (server/index.mjs) on 127.0.0.1, web only (JOB_WORKERS=false: the bench indexes
 * itself and wants no start-up re-index running under the load). Its output goes to a log file.
 */
export async function startBenchApp(
  environment: BenchEnvironment,
  options: { name?: string; port?: number; env?: Record<string, string>; nodeFlags?: string[] } = {},
): Promise<RunningApp> {
  const name = options.name ?? "app";
  const logFile = path.join(environment.workDir, `${name}.log`);
  const output = createWriteStream(logFile);
  const origin = options.port ? `http://127.0.0.1:${options.port}` : environment.appEnvironment.APP_ORIGIN!;
  const port = options.port ? String(options.port) : environment.appEnvironment.PORT!;
  // Node itself runs our server's script, so that flags such as --cpu-prof (refused in NODE_OPTIONS) can be given.
  const serve = path.join(root, "server/index.mjs");
  const child = spawn(process.execPath, [...(options.nodeFlags ?? []), serve, `${environment.buildDirectory}/server/index.js`], {
    cwd: root,
    env: {
      ...process.env,
      ...environment.appEnvironment,
      ...options.env,
      APP_ORIGIN: origin,
      PORT: port,
      NODE_ENV: "production",
      HOST: "127.0.0.1",
      JOB_WORKERS: "false",
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout.pipe(output);
  child.stderr.pipe(output);
  onStop(
    () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        const timer = setTimeout(() => child.kill("SIGKILL"), 5_000);
        child.once("exit", () => {
          clearTimeout(timer);
          resolve();
        });
        child.kill("SIGTERM");
      }),
  );
  await waitForHttp(`${origin}/api/health`);
  log("bench", `production build served at ${origin} (${name})`);
  return { origin, child, logFile, logText: () => readFileSync(logFile, "utf8") };
}

/**
 * Stops one app server started by startBenchApp (the others keep running). react-router-serve closes its
 * port on SIGTERM but the process lives on while the job queue's timers run, hence SIGKILL after 5 s.
 */
export function stopBenchApp(app: RunningApp): Promise<void> {
  return new Promise((resolve) => {
    if (app.child.exitCode !== null || app.child.signalCode !== null) return resolve();
    const timer = setTimeout(() => app.child.kill("SIGKILL"), 5_000);
    app.child.once("exit", () => {
      clearTimeout(timer);
      resolve();
    });
    app.child.kill("SIGTERM");
  });
}

/**
 * Waits until the search stand-in (which runs in this process) answers its health check within 100 ms:
 * searches the app gave up on are still computed there, and must not spill into the next load run.
 */
export async function waitForSearchToSettle(host: string, timeoutMs = 120_000): Promise<number> {
  const started = performance.now();
  while (performance.now() - started < timeoutMs) {
    const asked = performance.now();
    await fetch(`${host}/health`).catch(() => null);
    if (performance.now() - asked < 100) return performance.now() - started;
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`the search stand-in was still busy ${timeoutMs / 1000} s after the load stopped`);
}

export async function stopBenchEnvironment() {
  await stopAll();
}
