// Load runs against the app: each in a child process (bench/lib/load-worker.ts) with autocannon, bounded
// by time and by a request count, one after another so that they never overlap.
import { spawn } from "node:child_process";
import path from "node:path";
import type { LoadOutcome, LoadPlan } from "./load-worker.ts";

const root = path.resolve(import.meta.dirname, "../..");

export type { LoadOutcome, LoadPlan };

export function runLoad(plan: LoadPlan): Promise<LoadOutcome> {
  return new Promise((resolve, reject) => {
    const child = spawn(path.join(root, "node_modules/.bin/tsx"), [path.join(import.meta.dirname, "load-worker.ts"), JSON.stringify(plan)], {
      cwd: root,
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    // A hung run must not hang the bench: twice its planned time and it is stopped.
    const limit = setTimeout(() => child.kill("SIGKILL"), (plan.seconds + plan.warmupSeconds) * 2_000 + 30_000);
    child.on("exit", (code) => {
      clearTimeout(limit);
      const line = stdout.trim().split("\n").at(-1);
      if (code !== 0 || !line) return reject(new Error(`the load run against ${plan.url} failed (exit ${code}): ${stderr.trim().slice(-500)}`));
      try {
        resolve(JSON.parse(line) as LoadOutcome);
      } catch {
        reject(new Error(`the load run against ${plan.url} printed no result: ${stdout.slice(-300)}`));
      }
    });
  });
}
