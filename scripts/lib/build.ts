import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { log } from "./output.ts";

const root = path.resolve(import.meta.dirname, "../..");
const inputs = ["app", "search", "public", "package-lock.json", "vite.config.ts", "react-router.config.ts", "tsconfig.json"];

function newestMtime(target: string): number {
  if (!existsSync(target)) return 0;
  const stats = statSync(target);
  if (!stats.isDirectory()) return stats.mtimeMs;
  let newest = stats.mtimeMs;
  for (const entry of readdirSync(target)) newest = Math.max(newest, newestMtime(path.join(target, entry)));
  return newest;
}

/** Builds the production bundle into `buildDirectory` unless it is newer than every source file. */
export function buildIfNeeded(buildDirectory: string, force = false) {
  const serverEntry = path.join(root, buildDirectory, "server", "index.js");
  const sourcesTime = Math.max(...inputs.map((input) => newestMtime(path.join(root, input))));
  if (!force && existsSync(serverEntry) && statSync(serverEntry).mtimeMs > sourcesTime) {
    log("build", `${buildDirectory}/ is up to date`);
    return;
  }
  log("build", `building the production bundle into ${buildDirectory}/ (about a minute)`);
  const started = Date.now();
  // The bundler's progress and advice stay out of the way; all of it is shown if the build fails.
  const result = spawnSync(path.join(root, "node_modules/.bin/react-router"), ["build"], {
    cwd: root,
    encoding: "utf8",
    maxBuffer: 64 * 1024 * 1024,
    env: { ...process.env, TENTHMARK_BUILD_DIR: buildDirectory, NODE_ENV: "production" },
  });
  if (result.status !== 0) {
    process.stdout.write(result.stdout ?? "");
    process.stderr.write(result.stderr ?? "");
    throw new Error(`react-router build failed (exit ${result.status ?? result.signal})`);
  }
  log("build", `built in ${((Date.now() - started) / 1000).toFixed(0)} s`);
}
