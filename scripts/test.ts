// `npm test`: a throwaway PostgreSQL cluster on a free port, migrations, the stand-ins, a production build on
// a free port, then every Vitest project (unit, integration, browser). Leaves nothing running behind it;
// its exit code is the truth. Extra arguments are handed to Vitest (e.g. `npm test -- tests/unit`).
import { spawn } from "node:child_process";
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { buildIfNeeded } from "./lib/build.ts";
import { roleOf } from "./lib/database-roles.ts";
import { runMigrations } from "./lib/migrate.ts";
import { log } from "./lib/output.ts";
import { freshSecrets } from "./lib/local-secrets.ts";
import { freePort } from "./lib/ports.ts";
import { startCluster } from "./lib/postgres.ts";
import { onStop, startChild, stopAll, stopOnSignals, waitForHttp } from "./lib/processes.ts";
import { standInEnvironment, startStandIns } from "./lib/stand-ins.ts";
import { ensureChromium } from "./lib/chromium.ts";
import { registerKey } from "./lib/signing-key.ts";

const root = path.resolve(import.meta.dirname, "..");
// The product runs on Node 20 with the SDK version the lockfile pins; the SDK's notice about its releases
// after January 2027 needing Node 22 is for whoever upgrades it, not for every start.
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";

async function main(): Promise<number> {
  stopOnSignals();
  const workDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-test-"));
  onStop(() => rmSync(workDir, { recursive: true, force: true }));

  const cluster = await startCluster({ dataDir: path.join(workDir, "postgres"), port: await freePort(), database: "tenthmark_test" });
  onStop(() => cluster.stop());
  await runMigrations(cluster.ownerUrl, roleOf(cluster.url));

  const port = await freePort();
  const appOrigin = `http://localhost:${port}`;
  // Fresh random secrets for this run, whatever the shell or .env holds.
  const secrets = freshSecrets();
  const signingKey = secrets.REPORT_SIGNING_KEY;
  await registerKey(cluster.ownerUrl, signingKey);
  const standIns = await startStandIns({ dataDir: workDir, appOrigin, secrets });
  for (const standIn of standIns) onStop(() => standIn.stop());

  const environment: NodeJS.ProcessEnv = {
    ...process.env,
    ...secrets,
    ...standInEnvironment(standIns),
    DATABASE_URL: cluster.url,
    // For the tests that act as the owner role (an attacker with the migrations' rights, or the bulk fixtures).
    TEST_DATABASE_OWNER_URL: cluster.ownerUrl,
    REPORT_SIGNING_KEY: signingKey,
    APP_ORIGIN: appOrigin,
    TEST_APP_ORIGIN: appOrigin,
    TEST_WORK_DIR: workDir,
    CHROMIUM_PATH: ensureChromium(),
    // Hundreds of test files sign in from 127.0.0.1, a few minutes apart at most: the flood guard's one shared
    // count would refuse some of them. The per-account limit on wrong passwords (tested) is unchanged.
    SIGN_IN_REQUESTS_PER_MINUTE: "5000",
  };
  // It would win over this run's SESSION_SECRET.
  delete environment.BETTER_AUTH_SECRET;

  // A build folder of this run's own, so that test runs side by side never overwrite each other's bundle.
  const buildDirectory = `build-test/${path.basename(workDir)}`;
  onStop(() => rmSync(path.join(root, buildDirectory), { recursive: true, force: true }));
  buildIfNeeded(buildDirectory, true);
  environment.TEST_SERVER_BUILD = `${buildDirectory}/server/index.js`;
  // The app's own log (thousands of request lines) goes to a file; the part written while a failing test
  // file ran is printed after the results, and the whole of it kept in test-results/ when anything failed.
  const appLog = path.join(workDir, "app.log");
  startChild(
    "app",
    process.execPath,
    [path.join(root, "server/index.mjs"), environment.TEST_SERVER_BUILD],
    { ...environment, NODE_ENV: "production", PORT: String(port), HOST: "127.0.0.1" },
    { logFile: appLog, echo: "none" },
  );
  try {
    await waitForHttp(`http://127.0.0.1:${port}/api/health`);
  } catch (error) {
    if (existsSync(appLog)) process.stdout.write(readFileSync(appLog, "utf8"));
    throw error;
  }
  log("test", `app under test at ${appOrigin}`);

  const resultsFile = path.join(workDir, "vitest-results.json");
  const vitest = spawn(
    path.join(root, "node_modules/.bin/vitest"),
    ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${resultsFile}`, ...process.argv.slice(2)],
    { cwd: root, stdio: "inherit", env: { ...environment, NODE_ENV: "test" } },
  );
  const exitCode: number = await new Promise((resolve) => vitest.on("exit", (code) => resolve(code ?? 1)));
  if (exitCode !== 0) {
    printAppLogOfFailures(resultsFile, appLog);
    printFailedTests(resultsFile);
  }
  printSummary(resultsFile, exitCode);
  return exitCode;
}

/** The app's log lines written while each failing test file ran (files run side by side: others' lines too). */
function printAppLogOfFailures(resultsFile: string, appLog: string) {
  if (!existsSync(appLog)) return;
  const lines = readFileSync(appLog, "utf8").split("\n").filter(Boolean);
  const kept = path.join(root, "test-results", "app.log");
  mkdirSync(path.dirname(kept), { recursive: true });
  copyFileSync(appLog, kept);
  let failedFiles: Array<{ name: string; startTime: number; endTime: number }> = [];
  try {
    const results = JSON.parse(readFileSync(resultsFile, "utf8"));
    failedFiles = (results.testResults ?? []).filter((file: { status: string }) => file.status === "failed");
  } catch {
    // No results: the whole log is kept in test-results/app.log.
  }
  for (const file of failedFiles) {
    const from = file.startTime - 1_000;
    const to = file.endTime + 1_000;
    const during = lines.filter((line) => {
      const time = Date.parse(line.slice(0, 24));
      return time >= from && time <= to;
    });
    const shown = during.slice(-120);
    console.log(`\n── app log while ${path.relative(root, file.name)} ran (${during.length} lines${during.length > shown.length ? `, the last ${shown.length} shown` : ""}) ──`);
    for (const line of shown) console.log(line.length > 300 ? `${line.slice(0, 300)}… (${line.length} characters)` : line);
  }
  console.log(`\nThe app's whole log of this run: ${path.relative(root, kept)}`);
}

/** The failed tests named again after the app's log, so that the end of the output says what failed. */
function printFailedTests(resultsFile: string) {
  type Assertion = { status: string; fullName: string; failureMessages?: string[] };
  try {
    const results = JSON.parse(readFileSync(resultsFile, "utf8"));
    const failed: string[] = [];
    for (const file of results.testResults ?? []) {
      const name = path.relative(root, file.name);
      const assertions = (file.assertionResults ?? []).filter((a: Assertion) => a.status === "failed");
      if (assertions.length === 0 && file.status === "failed") failed.push(`${name}: ${String(file.message ?? "").split("\n")[0].slice(0, 300)}`);
      for (const assertion of assertions as Assertion[]) {
        const firstLine = (assertion.failureMessages?.[0] ?? "").split("\n")[0].slice(0, 300);
        failed.push(`${name} › ${assertion.fullName}: ${firstLine}`);
      }
    }
    if (failed.length === 0) return;
    console.log("\nFailed:");
    for (const line of failed) console.log(`  ✗ ${line}`);
  } catch {
    // No results to read: the summary line says so.
  }
}

/** The closing line CI reads: counts from Vitest's JSON report. */
function printSummary(resultsFile: string, exitCode: number) {
  try {
    const results = JSON.parse(readFileSync(resultsFile, "utf8"));
    const skipped = (results.numPendingTests ?? 0) + (results.numTodoTests ?? 0);
    console.log(`\ntests: ${results.numPassedTests} passed, ${results.numFailedTests} failed, ${skipped} skipped`);
  } catch {
    console.log(`\ntests: 0 passed, 1 failed (no results were written; vitest exited ${exitCode})`);
  }
}

main()
  .then(async (code) => {
    await stopAll();
    process.exit(code);
  })
  .catch(async (error) => {
    console.error(`\nnpm test failed before the tests could run: ${error instanceof Error ? error.stack : String(error)}`);
    await stopAll();
    console.log("\ntests: 0 passed, 1 failed");
    process.exit(1);
  });
