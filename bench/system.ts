// The whole product under load, on this machine: 50 000 listings in PostgreSQL and the index, the production
// build on 127.0.0.1, autocannon against /api/health (the ceiling), the search API, the search page, a listing
// page and a report page; JavaScript per page and LCP from Chromium; the engine's scoring time (from
// bench/scoring.ts); a 24-megapixel photo through the image pipeline. Budgets are checked and printed;
// missing one is reported, not a failure. `npx tsx bench/system.ts` runs it alone. See docs/benchmarks.md.
import { execFileSync } from "node:child_process";
import { copyFileSync, existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { log } from "../scripts/lib/output.ts";
import { freePort } from "../scripts/lib/ports.ts";
import { buildForBench, startBenchApp, startBenchServices, stopBenchApp, stopBenchEnvironment, waitForSearchToSettle, type RunningApp } from "./lib/environment.ts";
import { runLoad, type LoadOutcome } from "./lib/load.ts";
import { measureEntryForm, type EntryFormOutcome } from "./lib/entry-form.ts";
import { measurePages, type PageOutcome } from "./lib/pages.ts";
import { measurePhotoPipeline, type PhotoOutcome } from "./lib/photo.ts";
import { seedBenchData, type SeedResult } from "./lib/seed.ts";
import type { ScoringBenchResult } from "./scoring.ts";

const root = path.resolve(import.meta.dirname, "..");
const resultsFolder = path.join(import.meta.dirname, "results");

function numberFromEnv(name: string, fallback: number, min: number, max: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value) || value < min || value > max) throw new Error(`${name} must be a number from ${min} to ${max} (got "${raw}").`);
  return value;
}

export const BUDGETS = {
  searchApiP95Ms: 50,
  searchApiShareOfCeiling: 0.5,
  // The search API with the index out of reach (every search in PostgreSQL), and its p95 at 500 000 listings.
  databaseSearchP95Ms: 50,
  databaseSearchShareOfCeiling: 0.3,
  databaseSearchP95MsAtScale: 100,
  databaseSearchScaleListings: 500_000,
  // 120 KB as 120 000 bytes (the stricter reading of "KB").
  searchPageGzipJsBytes: 120_000,
  // The search page keeps 5 KB of its budget free, so that features can land; listing and report pages.
  searchPageHeadroomBytes: 5_000,
  detailPageGzipJsBytes: 130_000,
  // Report, search and listing pages: at least this share of the ceiling's requests per second.
  pageShareOfCeiling: 0.3,
  // The report entry form at 820 × 1180 with the CPU slowed 4×: ready to type, and the live verdict's response.
  entryFormReadyMs: 2_000,
  entryFormInpMs: 100,
  lcpMs: 1_000,
  scoringMs: 1,
} as const;

// A buyer's search: verified centre and toolroom lathes with spindle run-out ≤ 5 µm, best accuracy first.
export const SEARCH_QUERY = "category=centre_lathe&category=toolroom_lathe&verified=1&runoutMax=5&sort=best-accuracy";

type Target = { key: string; name: string; path: string; route: string };
type LoadRow = {
  key: string;
  name: string;
  path: string;
  state: "measured" | "not built yet" | "failed";
  note?: string;
  outcome?: LoadOutcome;
  /** Requests the app answered from PostgreSQL because the index did not answer in time (from its log). */
  fallbacks?: number;
  /** How long the search stand-in took after the run to finish the searches the app had given up on. */
  settleMs?: number;
};

export type SystemBenchResult = {
  benchmark: "system";
  date: string;
  machine: { cpus: number; cpuModel: string; memoryGiB: number; node: string; platform: string; loadAverageStart: number[]; loadAverageEnd: number[]; commit: string | null };
  config: { seconds: number; connections: number; listings: number; reports: number; seed: number; warmupSeconds: number; maxRequestsPerRun: number; pageLoads: number; throughputPairs: number; pagesOnly: boolean; gzipLevel: 9 };
  timingsMs: { build: number; seed: SeedResult["timingsMs"]; indexing: number; total: number };
  seed: Omit<SeedResult, "timingsMs">;
  indexing: { indexed: number; removed: number; batchSize: number; ms: number };
  search: { totalHits: number | null; sourceBefore: string | null; sourceAfter: string | null; standInMsPerSearch: number | null };
  load: LoadRow[];
  /**
   * The ceiling and the search API measured alternately (the first pair is their rows in `load`): the
   * throughput budget takes the median pair's ratio, so that other work on the machine weighs on both alike.
   */
  throughputPairs: { ceilingRps: number; searchApiRps: number; ratio: number }[];
  /** The same for the PostgreSQL path: ceiling and PostgreSQL-path runs alternately, each run's p95 too. */
  databasePairs: { ceilingRps: number; databaseRps: number; ratio: number; p95Ms: number }[];
  pages: (PageOutcome | { name: string; path: string; state: "not built yet" })[];
  /** The report entry form on a tablet with the CPU slowed (bench/lib/entry-form.ts). */
  entryForm: EntryFormOutcome | { error: string } | null;
  scoring: ScoringBenchResult | null;
  photo: { appDefaults: PhotoOutcome; cacheOff: PhotoOutcome } | null;
  budgets: { name: string; limit: string; actual: string; met: boolean | null }[];
  errors: string[];
};

function commitOf(): string | null {
  try {
    const commit = execFileSync("git", ["rev-parse", "--short", "HEAD"], { cwd: root, encoding: "utf8" }).trim();
    // The build is of the working tree: say so when app/ holds changes not committed yet.
    const changed = execFileSync("git", ["status", "--porcelain", "--", "app"], { cwd: root, encoding: "utf8" }).trim();
    return changed ? `${commit} + uncommitted changes in app/` : commit;
  } catch {
    return null;
  }
}

/** Whether app/routes.ts declares this route yet (the search and reports pages landed while this was written). */
function routeDeclared(route: string): boolean {
  return readFileSync(path.join(root, "app/routes.ts"), "utf8").includes(`route("${route}"`);
}

export async function indexListings(databaseUrl: string, batchSize: number) {
  const { reindexAllListings } = await import("../app/modules/search/indexing.server.ts");
  const { createListingSearch } = await import("../app/modules/search/search.server.ts");
  const { getDatabase } = await import("../app/db/client.server.ts");
  void databaseUrl;
  const search = createListingSearch({
    host: process.env.MEILISEARCH_HOST!,
    apiKey: process.env.MEILISEARCH_API_KEY!,
    searchTimeoutMs: 10_000,
    // A 5 000-document task on the stand-in takes seconds; the app's default 10 s is for single updates.
    writeTimeoutMs: 10 * 60_000,
  });
  const started = performance.now();
  const db = getDatabase();
  try {
    const outcome = await reindexAllListings(db, {
      search,
      batchSize,
      onProgress: (done) => log("bench", `indexed ${done} published listings (${((performance.now() - started) / 1000).toFixed(1)} s)`),
    });
    return { ...outcome, batchSize, ms: performance.now() - started };
  } finally {
    await db.$client.end();
  }
}

async function getStatus(url: string): Promise<{ status: number; body: string }> {
  const response = await fetch(url, { redirect: "manual" });
  return { status: response.status, body: await response.text() };
}

function countFallbacks(app: RunningApp): number {
  return (app.logText().match(/\[search\] answering from PostgreSQL/g) ?? []).length;
}

/** One search of the bench's query straight against the stand-in, with nothing else running (median of 21 after 5 unmeasured, ms). */
async function timeStandInSearch(appOrigin: string): Promise<number> {
  void appOrigin;
  const { createListingSearch } = await import("../app/modules/search/search.server.ts");
  const { parseListingSearchParams } = await import("../app/modules/search/search-params.server.ts");
  const parsed = parseListingSearchParams(new URLSearchParams(SEARCH_QUERY));
  if (!parsed.success) throw new Error(`the bench's search query is not valid: ${JSON.stringify(parsed.errors)}`);
  const search = createListingSearch({ host: process.env.MEILISEARCH_HOST!, apiKey: process.env.MEILISEARCH_API_KEY!, searchTimeoutMs: 60_000 });
  // The first few open the connection and warm the stand-in's caches; a single slow one must not decide.
  for (let i = 0; i < 5; i++) await search.searchListings(parsed.query);
  const samples: number[] = [];
  for (let i = 0; i < 21; i++) {
    const started = performance.now();
    await search.searchListings(parsed.query);
    samples.push(performance.now() - started);
  }
  return samples.sort((a, b) => a - b)[10]!;
}

async function scoringResult(): Promise<ScoringBenchResult> {
  // `npm run bench` runs bench/scoring.ts just before this file: use its fresh result rather than run it twice.
  const file = path.join(resultsFolder, "scoring.json");
  const processStarted = Date.now() - performance.now();
  if (existsSync(file) && statSync(file).mtimeMs >= processStarted) return JSON.parse(readFileSync(file, "utf8")) as ScoringBenchResult;
  const { runScoringBench } = await import("./scoring.ts");
  return runScoringBench();
}

const ms = (value: number | undefined | null, digits = 1) => (value === undefined || value === null || !Number.isFinite(value) ? "—" : `${value.toFixed(digits)} ms`);
const kb = (bytes: number) => `${(bytes / 1000).toFixed(1)} KB`;
const times = (ratio: number) => (Number.isFinite(ratio) ? `${ratio.toFixed(2)}×` : "—");

export async function runSystemBench(): Promise<SystemBenchResult> {
  const started = performance.now();
  const config = {
    seconds: numberFromEnv("BENCH_SECONDS", 10, 1, 120),
    connections: numberFromEnv("BENCH_CONNECTIONS", 10, 1, 100),
    listings: numberFromEnv("BENCH_LISTINGS", 50_000, 100, 500_000),
    reports: numberFromEnv("BENCH_REPORTS", 3_000, 1, 20_000),
    seed: numberFromEnv("BENCH_SEED", 20_260_501, 0, 2 ** 32 - 1),
    throughputPairs: numberFromEnv("BENCH_PAIRS", 3, 1, 9),
    // BENCH_ONLY=pages: Chromium's steps alone (scripts, LCP, the tablet entry form), no load runs or photo.
    pagesOnly: process.env.BENCH_ONLY === "pages",
    warmupSeconds: 0,
    maxRequestsPerRun: 200_000,
    pageLoads: 3,
    gzipLevel: 9 as const,
  };
  config.warmupSeconds = Math.min(3, Math.max(1, Math.round(config.seconds / 5)));
  const result: SystemBenchResult = {
    benchmark: "system",
    date: new Date().toISOString(),
    machine: {
      cpus: os.cpus().length,
      cpuModel: os.cpus()[0]?.model ?? "unknown",
      memoryGiB: Math.round((os.totalmem() / 1024 ** 3) * 10) / 10,
      node: process.version,
      platform: `${os.platform()} ${os.release()}`,
      loadAverageStart: os.loadavg().map((value) => Math.round(value * 100) / 100),
      loadAverageEnd: [],
      commit: commitOf(),
    },
    config,
    timingsMs: { build: 0, seed: { accounts: 0, listings: 0, photos: 0, reports: 0, analyze: 0, total: 0 }, indexing: 0, total: 0 },
    seed: { listings: 0, published: 0, reports: 0, photoSets: 0, dealers: 0, sample: { slug: "", listingId: "", reportId: "" } },
    indexing: { indexed: 0, removed: 0, batchSize: 5_000, ms: 0 },
    search: { totalHits: null, sourceBefore: null, sourceAfter: null, standInMsPerSearch: null },
    load: [],
    throughputPairs: [],
    databasePairs: [],
    pages: [],
    entryForm: null,
    scoring: null,
    photo: null,
    budgets: [],
    errors: [],
  };

  let workDir: string | null = null;
  try {
    const environment = await startBenchServices();
    workDir = environment.workDir;
    buildForBench(environment);
    result.timingsMs.build = environment.buildMs;

    log("bench", `seeding ${config.listings} listings and ${config.reports} signed reports`);
    const seeded = await seedBenchData(environment.ownerUrl, config);
    const { timingsMs: seedTimings, ...seedFacts } = seeded;
    result.seed = seedFacts;
    result.timingsMs.seed = seedTimings;
    log("bench", `seeded in ${(seedTimings.total / 1000).toFixed(1)} s (listings ${(seedTimings.listings / 1000).toFixed(1)} s, reports ${(seedTimings.reports / 1000).toFixed(1)} s)`);

    result.indexing = await indexListings(environment.databaseUrl, 5_000);
    result.timingsMs.indexing = result.indexing.ms;
    log("bench", `indexed ${result.indexing.indexed} listings in ${(result.indexing.ms / 1000).toFixed(1)} s`);

    const app = await startBenchApp(environment);
    const { slug, reportId } = seeded.sample;
    const targets: Target[] = [
      { key: "ceiling", name: "/api/health (ceiling)", path: "/api/health", route: "api/health" },
      { key: "searchApi", name: "search API", path: `/api/v1/listings?${SEARCH_QUERY}`, route: "api/v1/listings" },
      { key: "searchPage", name: "search page", path: `/machines?${SEARCH_QUERY}`, route: "machines" },
      { key: "listingPage", name: "listing page", path: `/machines/${slug}`, route: "machines/:slug" },
      { key: "reportPage", name: "report page", path: `/reports/${reportId}`, route: "reports/:reportId" },
    ];

    // Every target must answer 200 before it is loaded; a route not declared yet gets a "not built yet" row.
    const ready: Target[] = [];
    for (const target of targets) {
      if (!routeDeclared(target.route) || (target.key === "reportPage" && !reportId)) {
        result.load.push({ key: target.key, name: target.name, path: target.path, state: "not built yet" });
        continue;
      }
      const answer = await getStatus(`${app.origin}${target.path}`);
      if (answer.status !== 200) {
        const message = `${target.name} (${target.path}) answered ${answer.status} before the load: ${answer.body.slice(0, 200)}`;
        result.errors.push(message);
        result.load.push({ key: target.key, name: target.name, path: target.path, state: "failed", note: `answered ${answer.status}` });
        continue;
      }
      if (target.key === "searchApi") {
        const body = JSON.parse(answer.body) as { source: string; totalHits: number };
        result.search.sourceBefore = body.source;
        result.search.totalHits = body.totalHits;
      }
      ready.push(target);
    }
    // A few requests each before anything is timed: the first render of each route compiles its code paths.
    for (const target of ready) for (let i = 0; i < 5; i++) await getStatus(`${app.origin}${target.path}`);

    // Chromium first, while nothing else loads the machine.
    const pageTargets = [
      { name: "home page", path: "/", route: "" },
      ...targets.filter((target) => ["searchPage", "listingPage", "reportPage"].includes(target.key)),
    ];
    log("bench", `Chromium: JavaScript and LCP of ${pageTargets.length} pages, ${config.pageLoads} cold loads each`);
    const measurable = pageTargets.filter((page) => page.route === "" || ready.some((target) => target.path === page.path));
    const measured = await measurePages(app.origin, measurable, config.pageLoads);
    for (const page of pageTargets) {
      const found = measured.find((outcome) => outcome.path === page.path);
      result.pages.push(found ?? { name: page.name, path: page.path, state: "not built yet" });
      if (found && found.status !== 200) result.errors.push(`${page.name} answered ${found.status} in Chromium`);
    }
    log("bench", "Chromium: the report entry form on a tablet with the CPU slowed 4×");
    try {
      result.entryForm = await measureEntryForm(app.origin, environment.ownerUrl, config.pageLoads);
    } catch (error) {
      const cause = error instanceof Error && error.cause instanceof Error ? ` (${error.cause.message})` : "";
      result.entryForm = { error: `${error instanceof Error ? error.message.split("\n")[0] : String(error)}${cause}` };
      result.errors.push(`the report entry form: ${result.entryForm.error}`);
    }

    for (const target of config.pagesOnly ? [] : ready) {
      log("bench", `load: ${target.name} for ${config.seconds} s with ${config.connections} connections`);
      const before = countFallbacks(app);
      const outcome = await runLoad({ url: `${app.origin}${target.path}`, connections: config.connections, seconds: config.seconds, warmupSeconds: config.warmupSeconds, maxRequests: config.maxRequestsPerRun });
      const row: LoadRow = { key: target.key, name: target.name, path: target.path, state: "measured", outcome, fallbacks: countFallbacks(app) - before };
      if (outcome.non2xx || outcome.errors || outcome.timeouts) row.note = `${outcome.non2xx} non-2xx, ${outcome.errors} errors, ${outcome.timeouts} timeouts`;
      row.settleMs = await waitForSearchToSettle(process.env.MEILISEARCH_HOST!);
      result.load.push(row);
    }
    // More alternating pairs of the ceiling and the search API for the throughput budget (see throughputPairs).
    const firstCeiling = result.load.find((row) => row.key === "ceiling")?.outcome;
    const firstSearch = result.load.find((row) => row.key === "searchApi")?.outcome;
    if (firstCeiling && firstSearch) {
      const pair = (ceilingRps: number, searchApiRps: number) => ({ ceilingRps, searchApiRps, ratio: searchApiRps / ceilingRps });
      result.throughputPairs.push(pair(firstCeiling.requestsPerSecond, firstSearch.requestsPerSecond));
      const [ceiling, searchApi] = [targets[0]!, targets[1]!];
      for (let round = 2; round <= config.throughputPairs; round++) {
        log("bench", `load: ceiling and search API again, pair ${round} of ${config.throughputPairs}`);
        const plan = (target: Target) => ({ url: `${app.origin}${target.path}`, connections: config.connections, seconds: config.seconds, warmupSeconds: config.warmupSeconds, maxRequests: config.maxRequestsPerRun });
        const ceilingOutcome = await runLoad(plan(ceiling));
        const searchOutcome = await runLoad(plan(searchApi));
        await waitForSearchToSettle(process.env.MEILISEARCH_HOST!);
        result.throughputPairs.push(pair(ceilingOutcome.requestsPerSecond, searchOutcome.requestsPerSecond));
      }
    }
    if (!config.pagesOnly && ready.some((target) => target.key === "searchApi")) {
      result.search.standInMsPerSearch = await timeStandInSearch(app.origin);
      // The same search API with the index out of reach, so that every search runs in PostgreSQL: the
      // product's own path, apart from the stand-in's speed.
      const databaseApp = await startBenchApp(environment, { name: "app-database", port: await freePort(), env: { MEILISEARCH_HOST: `http://127.0.0.1:${await freePort()}` } });
      const target = targets.find((candidate) => candidate.key === "searchApi")!;
      const check = await getStatus(`${databaseApp.origin}${target.path}`);
      const source = check.status === 200 ? (JSON.parse(check.body) as { source: string }).source : `answered ${check.status}`;
      if (source !== "database") result.errors.push(`the search API with the index unreachable answered from ${source}`);
      for (let i = 0; i < 5; i++) await getStatus(`${databaseApp.origin}${target.path}`);
      // Alternating with the ceiling, as the search API's pairs: the budgets take the median pair.
      const plan = (origin: string, targetPath: string) => ({ url: `${origin}${targetPath}`, connections: config.connections, seconds: config.seconds, warmupSeconds: config.warmupSeconds, maxRequests: config.maxRequestsPerRun });
      let outcome: LoadOutcome | undefined;
      for (let round = 1; round <= config.throughputPairs; round++) {
        log("bench", `load: ceiling, then the search API from PostgreSQL, pair ${round} of ${config.throughputPairs}`);
        const ceilingOutcome = await runLoad(plan(app.origin, targets[0]!.path));
        const databaseOutcome = await runLoad(plan(databaseApp.origin, target.path));
        outcome ??= databaseOutcome;
        result.databasePairs.push({ ceilingRps: ceilingOutcome.requestsPerSecond, databaseRps: databaseOutcome.requestsPerSecond, ratio: databaseOutcome.requestsPerSecond / ceilingOutcome.requestsPerSecond, p95Ms: databaseOutcome.latencyMs.p95 });
      }
      const row: LoadRow = { key: "searchApiDatabase", name: "search API, PostgreSQL path (index unreachable)", path: target.path, state: "measured", outcome: outcome! };
      if (outcome!.non2xx || outcome!.errors || outcome!.timeouts) row.note = `${outcome!.non2xx} non-2xx, ${outcome!.errors} errors, ${outcome!.timeouts} timeouts`;
      result.load.push(row);
      await stopBenchApp(databaseApp);
    }
    const order = [...targets.map((target) => target.key), "searchApiDatabase"];
    result.load.sort((a, b) => order.indexOf(a.key) - order.indexOf(b.key));
    if (ready.some((target) => target.key === "searchApi")) {
      const after = await getStatus(`${app.origin}/api/v1/listings?${SEARCH_QUERY}`);
      result.search.sourceAfter = after.status === 200 ? (JSON.parse(after.body) as { source: string }).source : `answered ${after.status}`;
    }
  } finally {
    result.machine.loadAverageEnd = os.loadavg().map((value) => Math.round(value * 100) / 100);
    // The app servers' logs outlive the run's folder: they name the cause of any 500 under load.
    mkdirSync(resultsFolder, { recursive: true });
    for (const name of ["app", "app-database"]) {
      const file = workDir ? path.join(workDir, `${name}.log`) : null;
      if (file && existsSync(file)) copyFileSync(file, path.join(resultsFolder, `system-${name}.log`));
    }
    await stopBenchEnvironment();
  }

  // With everything else stopped: the photo pipeline in child processes, then the engine's scoring.
  if (!config.pagesOnly) {
    log("bench", "photo pipeline: a 24-megapixel JPEG, three runs per setting");
    result.photo = await measurePhotoPipeline(3);
  }
  result.scoring = await scoringResult();
  result.timingsMs.total = performance.now() - started;
  result.budgets = checkBudgets(result);

  mkdirSync(resultsFolder, { recursive: true });
  const stamp = result.date.replace(/[:.]/g, "-");
  writeFileSync(path.join(resultsFolder, "system.json"), `${JSON.stringify(result, null, 2)}\n`);
  writeFileSync(path.join(resultsFolder, `system-${stamp}.json`), `${JSON.stringify(result, null, 2)}\n`);
  console.log(`\n${formatTable(result)}\n`);
  console.log(`Saved bench/results/system.json (and system-${stamp}.json).`);
  if (result.errors.length) throw new Error(`some targets did not answer as they should:\n  ${result.errors.join("\n  ")}`);
  return result;
}

function loadOf(result: SystemBenchResult, key: string) {
  return result.load.find((row) => row.key === key && row.state === "measured")?.outcome;
}

/** The median of the alternating pairs' ratios (an odd count: the middle one; an even count: the mean of the middle two). */
export function medianRatio(pairs: SystemBenchResult["throughputPairs"]): number | null {
  if (!pairs.length) return null;
  const ratios = pairs.map((pair) => pair.ratio).sort((a, b) => a - b);
  const middle = Math.floor(ratios.length / 2);
  return ratios.length % 2 ? ratios[middle]! : (ratios[middle - 1]! + ratios[middle]!) / 2;
}

function throughputBudget(result: SystemBenchResult): SystemBenchResult["budgets"][number] {
  const median = medianRatio(result.throughputPairs);
  const pairs = result.throughputPairs.map((pair) => `${pair.searchApiRps.toFixed(0)}/${pair.ceilingRps.toFixed(0)} = ${times(pair.ratio)}`);
  return {
    name: "search API throughput",
    limit: `≥ ${BUDGETS.searchApiShareOfCeiling}× the ceiling`,
    actual: median === null ? "not built yet" : `${times(median)}, median of ${pairs.length} alternating runs (search API/ceiling req/s: ${pairs.join(", ")})`,
    met: median === null ? null : median >= BUDGETS.searchApiShareOfCeiling,
  };
}

const middleOf = (values: number[]) => medianRatio(values.map((ratio) => ({ ceilingRps: 0, searchApiRps: 0, ratio })));

/** The PostgreSQL path's budgets: p95 and throughput at 50 000 listings, p95 at 500 000; medians of the alternating pairs. */
function databaseBudgets(result: SystemBenchResult): SystemBenchResult["budgets"] {
  const pairs = result.databasePairs ?? [];
  const ratio = middleOf(pairs.map((pair) => pair.ratio));
  const p95 = middleOf(pairs.map((pair) => pair.p95Ms));
  const runs = pairs.map((pair) => `${pair.databaseRps.toFixed(0)}/${pair.ceilingRps.toFixed(0)} = ${times(pair.ratio)}, p95 ${ms(pair.p95Ms)}`).join("; ");
  const atScale = result.config.listings >= BUDGETS.databaseSearchScaleListings;
  const p95Limit = atScale ? BUDGETS.databaseSearchP95MsAtScale : BUDGETS.databaseSearchP95Ms;
  return [
    {
      name: atScale ? `search API, PostgreSQL path p95 at ${BUDGETS.databaseSearchScaleListings.toLocaleString("en")} listings` : "search API, PostgreSQL path p95",
      limit: `< ${p95Limit} ms`,
      actual: p95 === null ? "not measured" : `${ms(p95)}, median of ${pairs.length} runs`,
      met: p95 === null ? null : p95 < p95Limit,
    },
    {
      name: "search API, PostgreSQL path throughput",
      limit: `≥ ${BUDGETS.databaseSearchShareOfCeiling}× the ceiling`,
      actual: ratio === null ? "not measured" : `${times(ratio)}, median of ${pairs.length} alternating runs (PostgreSQL path/ceiling req/s: ${runs})`,
      met: ratio === null ? null : ratio >= BUDGETS.databaseSearchShareOfCeiling,
    },
  ];
}

export function checkBudgets(result: SystemBenchResult): SystemBenchResult["budgets"] {
  const api = loadOf(result, "searchApi");
  const searchPage = result.pages.find((page) => page.path.startsWith("/machines?"));
  const budgets: SystemBenchResult["budgets"] = [
    {
      name: "search API p95",
      limit: `< ${BUDGETS.searchApiP95Ms} ms`,
      actual: api ? ms(api.latencyMs.p95) : "not built yet",
      met: api ? api.latencyMs.p95 < BUDGETS.searchApiP95Ms : null,
    },
    throughputBudget(result),
    ...databaseBudgets(result),
    {
      name: "search page JavaScript (gzip)",
      limit: `< ${kb(BUDGETS.searchPageGzipJsBytes)}`,
      actual: searchPage && "scriptGzipBytes" in searchPage ? kb(searchPage.scriptGzipBytes) : "not built yet",
      met: searchPage && "scriptGzipBytes" in searchPage ? searchPage.scriptGzipBytes < BUDGETS.searchPageGzipJsBytes : null,
    },
    {
      name: "search page JavaScript, room to spare",
      limit: `≥ ${kb(BUDGETS.searchPageHeadroomBytes)} under its budget`,
      actual: searchPage && "scriptGzipBytes" in searchPage ? kb(BUDGETS.searchPageGzipJsBytes - searchPage.scriptGzipBytes) : "not built yet",
      met: searchPage && "scriptGzipBytes" in searchPage ? BUDGETS.searchPageGzipJsBytes - searchPage.scriptGzipBytes >= BUDGETS.searchPageHeadroomBytes : null,
    },
  ];
  for (const key of ["searchPage", "listingPage", "reportPage"]) {
    const row = result.load.find((each) => each.key === key);
    const outcome = loadOf(result, key);
    const ceiling = loadOf(result, "ceiling");
    const share = outcome && ceiling ? outcome.requestsPerSecond / ceiling.requestsPerSecond : null;
    budgets.push({
      name: `${row?.name ?? key} throughput`,
      limit: `≥ ${BUDGETS.pageShareOfCeiling}× the ceiling`,
      actual: share === null ? "not measured" : `${times(share)} (${outcome!.requestsPerSecond.toFixed(0)} req/s)`,
      met: share === null ? null : share >= BUDGETS.pageShareOfCeiling,
    });
  }
  for (const page of result.pages) {
    if (!("scriptGzipBytes" in page) || page.path.startsWith("/machines?") || page.path === "/") continue;
    budgets.push({ name: `${page.name} JavaScript (gzip)`, limit: `< ${kb(BUDGETS.detailPageGzipJsBytes)}`, actual: kb(page.scriptGzipBytes), met: page.scriptGzipBytes < BUDGETS.detailPageGzipJsBytes });
  }
  for (const page of result.pages) {
    if (!("lcpMs" in page)) continue;
    budgets.push({ name: `LCP, ${page.name}`, limit: `< ${ms(BUDGETS.lcpMs, 0)}`, actual: ms(page.lcpMs, 0), met: page.lcpMs < BUDGETS.lcpMs });
  }
  const entry = result.entryForm && "readyMs" in result.entryForm ? result.entryForm : null;
  budgets.push(
    {
      name: "report entry form on a tablet (4× CPU slowdown), page ready",
      limit: `< ${ms(BUDGETS.entryFormReadyMs, 0)}`,
      actual: entry ? `${ms(entry.readyMs, 0)} median of ${entry.readyRunsMs.map((value) => value.toFixed(0)).join(", ")} ms; ${kb(entry.htmlBytes)} of HTML` : result.entryForm && "error" in result.entryForm ? result.entryForm.error : "not measured",
      met: entry ? entry.readyMs < BUDGETS.entryFormReadyMs : null,
    },
    {
      name: "report entry form on a tablet (4× CPU slowdown), typing a reading: INP",
      limit: `< ${ms(BUDGETS.entryFormInpMs, 0)}, live verdict shown`,
      actual: entry ? `${ms(entry.inpMs, 0)} (worst of ${entry.interactions} interactions over 16 ms); verdict ${entry.verdictShown ? "shown" : "NOT shown"}` : "not measured",
      met: entry ? entry.inpMs < BUDGETS.entryFormInpMs && entry.verdictShown : null,
    },
  );
  budgets.push({
    name: "scoring a full report",
    limit: `< ${BUDGETS.scoringMs} ms`,
    actual: result.scoring ? `${(result.scoring.scoreReportMs * 1000).toFixed(1)} µs` : "—",
    met: result.scoring ? result.scoring.scoreReportMs < BUDGETS.scoringMs : null,
  });
  return budgets;
}

/** One Markdown table: data, load, pages, scoring, photo, budgets. */
export function formatTable(result: SystemBenchResult): string {
  const rows: [string, string, string][] = [];
  const s = (value: number) => `${(value / 1000).toFixed(1)} s`;
  const seedTimes = result.timingsMs.seed;
  rows.push([
    "seed PostgreSQL",
    `${result.seed.listings.toLocaleString("en")} listings (${result.seed.published.toLocaleString("en")} published), ${result.seed.reports.toLocaleString("en")} signed reports`,
    `${s(seedTimes.total)} (listings ${s(seedTimes.listings)}, photos ${s(seedTimes.photos)}, reports ${s(seedTimes.reports)}, analyze ${s(seedTimes.analyze)})`,
  ]);
  rows.push([
    "index (search stand-in)",
    `${result.indexing.indexed.toLocaleString("en")} documents in batches of ${result.indexing.batchSize.toLocaleString("en")}`,
    `${s(result.indexing.ms)} (${((result.indexing.indexed / result.indexing.ms) * 1000).toFixed(0)} documents/s, through reindexAllListings)`,
  ]);
  if (result.search.sourceBefore !== null) {
    rows.push([
      "search API answer",
      `${result.search.totalHits ?? "?"} hits; answered from ${result.search.sourceBefore} before the load, ${result.search.sourceAfter ?? "?"} after`,
      `/api/v1/listings?${SEARCH_QUERY}`,
    ]);
  }
  if (result.search.standInMsPerSearch !== null) {
    rows.push([
      "search stand-in, one search",
      `${ms(result.search.standInMsPerSearch)} median of 21, nothing else running`,
      `the bench's query straight to the stand-in; the app waits ${process.env.MEILISEARCH_SEARCH_TIMEOUT_MS ?? 800} ms (MEILISEARCH_SEARCH_TIMEOUT_MS) before PostgreSQL`,
    ]);
  }
  const ceiling = loadOf(result, "ceiling");
  for (const row of result.load) {
    if (row.state !== "measured" || !row.outcome) {
      rows.push([`load ${row.name}`, row.state, row.note ?? row.path]);
      continue;
    }
    const o = row.outcome;
    const ratio = (value: number, of: number | undefined) => (of ? times(value / of) : "—");
    rows.push([
      `load ${row.name}`,
      `${o.requestsPerSecond.toFixed(0)} req/s · p50 ${ms(o.latencyMs.p50)} · p95 ${ms(o.latencyMs.p95)} · p99 ${ms(o.latencyMs.p99)}`,
      row.key === "ceiling"
        ? `${o.requests.toLocaleString("en")} requests${row.note ? `; ${row.note}` : ""}`
        : `vs ceiling: req/s ${ratio(o.requestsPerSecond, ceiling?.requestsPerSecond)} · p50 ${ratio(o.latencyMs.p50, ceiling?.latencyMs.p50)} · p95 ${ratio(o.latencyMs.p95, ceiling?.latencyMs.p95)} · p99 ${ratio(o.latencyMs.p99, ceiling?.latencyMs.p99)}${row.note ? `; ${row.note}` : ""}${row.fallbacks ? `; ${row.fallbacks} fell back to PostgreSQL` : ""}${row.settleMs && row.settleMs > 1000 ? `; stand-in busy ${s(row.settleMs)} after` : ""}`,
    ]);
  }
  for (const page of result.pages) {
    if (!("scriptGzipBytes" in page)) {
      rows.push([`page ${page.name}`, page.state, page.path]);
      continue;
    }
    rows.push([
      `page ${page.name}`,
      `JS ${kb(page.scriptGzipBytes)} gzip (${kb(page.scriptBytes)} raw, ${page.scripts.length} scripts) · LCP ${ms(page.lcpMs, 0)}`,
      `LCP loads: ${page.lcpSamplesMs.map((value) => value.toFixed(0)).join(", ")} ms; element ${page.lcpElement}`,
    ]);
  }
  if (result.scoring) {
    rows.push([
      "engine: score a full report",
      `${(result.scoring.scoreReportMs * 1000).toFixed(1)} µs median`,
      `${result.scoring.ratioToJsonParse.toFixed(1)}× JSON.parse of the payload; with zod parse ${(result.scoring.validateAndScoreMs * 1000).toFixed(1)} µs`,
    ]);
  }
  if (result.photo) {
    for (const [label, outcome] of [
      ["app's sharp settings", result.photo.appDefaults],
      ["sharp cache off", result.photo.cacheOff],
    ] as const) {
      rows.push([
        `photo 24 MP, ${label}`,
        `${ms(outcome.medianMs, 0)} median of ${outcome.runs} (first ${ms(outcome.firstRunMs, 0)}) · peak RSS ${outcome.peakRssMiB.toFixed(0)} MiB`,
        `${outcome.width}×${outcome.height}, ${(outcome.inputBytes / 1e6).toFixed(1)} MB JPEG; ${outcome.peakAboveBeforeMiB.toFixed(0)} MiB above the process's ${outcome.rssBeforeMiB.toFixed(0)} MiB before; sharp concurrency ${outcome.sharp.concurrency}`,
      ]);
    }
  }
  for (const budget of result.budgets) {
    rows.push([`budget: ${budget.name} ${budget.limit}`, budget.met === null ? "not measured" : budget.met ? "met" : "MISSED", budget.actual]);
  }
  const header: [string, string, string] = ["measure", "result", "detail"];
  const widths = header.map((title, column) => Math.max(title.length, ...rows.map((row) => row[column]!.length)));
  const line = (cells: string[]) => `| ${cells.map((cell, column) => cell.padEnd(widths[column]!)).join(" | ")} |`;
  const facts = `${result.machine.cpus} × ${result.machine.cpuModel}, ${result.machine.memoryGiB} GiB, Node ${result.machine.node}, ${result.date}, commit ${result.machine.commit ?? "?"}; load ${result.config.seconds} s × ${result.config.connections} connections after ${result.config.warmupSeconds} s warm-up; load average ${result.machine.loadAverageStart.join(" ")} → ${result.machine.loadAverageEnd.join(" ")}`;
  return [facts, "", line(header), line(widths.map((width) => "-".repeat(width))), ...rows.map(line)].join("\n");
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  runSystemBench()
    .then(() => process.exit(0))
    .catch((error) => {
      console.error(error instanceof Error ? error.message : String(error));
      process.exit(1);
    });
}
