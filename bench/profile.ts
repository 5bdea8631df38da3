// A CPU profile of the app serving one route under load: the bench's data (50 000 listings unless
// BENCH_LISTINGS says otherwise), the production build with V8's --cpu-prof, autocannon for BENCH_SECONDS.
// Prints the functions that took most of the app's (and the search stand-in's) time and leaves the
// .cpuprofile files in bench/results/
// (open it in Chromium's DevTools). `npm run bench:profile -- /api/v1/listings?...` picks the route.
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { Session } from "node:inspector/promises";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { log } from "../scripts/lib/output.ts";
import { freePort } from "../scripts/lib/ports.ts";
import { buildForBench, startBenchApp, startBenchServices, stopBenchApp, stopBenchEnvironment } from "./lib/environment.ts";
import { runLoad } from "./lib/load.ts";
import { seedBenchData } from "./lib/seed.ts";
import { indexListings, SEARCH_QUERY } from "./system.ts";

type ProfileNode = { id: number; callFrame: { functionName: string; url: string; lineNumber: number }; children?: number[] };
type CpuProfile = { nodes: ProfileNode[]; samples: number[]; timeDeltas: number[] };

const target = process.argv[2] ?? `/api/v1/listings?${SEARCH_QUERY}`;
const seconds = Number(process.env.BENCH_SECONDS ?? 10);
const listings = Number(process.env.BENCH_LISTINGS ?? 50_000);
const profileDir = path.join(import.meta.dirname, "results", `profile-${new Date().toISOString().replace(/[:.]/g, "-")}`);

/** Self time per function and per file (package or app module), largest first. */
function summarise(profile: CpuProfile) {
  const selfMs = new Map<number, number>();
  profile.samples.forEach((id, index) => selfMs.set(id, (selfMs.get(id) ?? 0) + (profile.timeDeltas[index] ?? 0) / 1000));
  const byFunction = new Map<string, number>();
  const byPlace = new Map<string, number>();
  let total = 0;
  for (const node of profile.nodes) {
    const ms = selfMs.get(node.id) ?? 0;
    total += ms;
    const url = node.callFrame.url.replace(/^file:\/\//, "");
    const place = url.includes("node_modules/") ? url.replace(/.*node_modules\/((@[^/]+\/)?[^/]+).*/, "$1") : url ? path.relative(process.cwd(), url) : `(${node.callFrame.functionName || "native"})`;
    const name = `${node.callFrame.functionName || "(anonymous)"} ${place}:${node.callFrame.lineNumber + 1}`;
    byFunction.set(name, (byFunction.get(name) ?? 0) + ms);
    byPlace.set(place, (byPlace.get(place) ?? 0) + ms);
  }
  const top = (map: Map<string, number>, count: number) =>
    [...map].sort((a, b) => b[1] - a[1]).slice(0, count).map(([name, ms]) => `${((100 * ms) / total).toFixed(1).padStart(5)}%  ${name}`);
  return { totalMs: total, functions: top(byFunction, 40), places: top(byPlace, 25) };
}

async function main() {
  mkdirSync(profileDir, { recursive: true });
  try {
    const environment = await startBenchServices();
    buildForBench(environment);
    await seedBenchData(environment.ownerUrl, { listings, reports: Math.min(3_000, listings), seed: 20_260_501 });
    await indexListings(environment.databaseUrl, 5_000);
    // BENCH_PROFILE_SOURCE=database: the search service out of reach, as the system bench's PostgreSQL-path row.
    const unreachable = process.env.BENCH_PROFILE_SOURCE === "database" ? { MEILISEARCH_HOST: `http://127.0.0.1:${await freePort()}` } : undefined;
    const app = await startBenchApp(environment, { nodeFlags: ["--cpu-prof", `--cpu-prof-dir=${profileDir}`], ...(unreachable ? { env: unreachable } : {}) }).catch((error: unknown) => {
      console.error(readFileSync(path.join(environment.workDir, "app.log"), "utf8").slice(-3000));
      throw error;
    });
    // The search stand-in runs in this process: profile it too, for the load alone.
    const session = new Session();
    session.connect();
    await session.post("Profiler.enable");
    await session.post("Profiler.start");
    const outcome = await runLoad({ url: `${app.origin}${target}`, connections: 10, seconds, warmupSeconds: 1, maxRequests: 200_000 });
    const { profile } = await session.post("Profiler.stop");
    writeFileSync(path.join(profileDir, "search-stand-in.cpuprofile"), JSON.stringify(profile));
    session.disconnect();
    log("profile", `${outcome.requestsPerSecond.toFixed(0)} req/s against ${target}`);
    await stopBenchApp(app);
  } finally {
    await stopBenchEnvironment();
  }
  const files = readdirSync(profileDir).filter((file) => file.endsWith(".cpuprofile"));
  for (const file of files) {
    const summary = summarise(JSON.parse(readFileSync(path.join(profileDir, file), "utf8")) as CpuProfile);
    console.log(`\n${file}: ${(summary.totalMs / 1000).toFixed(1)} s sampled\n\nby package or module:\n${summary.places.join("\n")}\n\nby function (self time):\n${summary.functions.join("\n")}`);
  }
  if (!files.length) console.log(`no profile was written to ${profileDir} (the app did not exit cleanly)`);
}

// Run only when called itself: `npm run bench` imports every module of this folder to find its benchmarks.
if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) await main();
