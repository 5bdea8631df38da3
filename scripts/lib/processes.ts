import { spawn, type ChildProcess } from "node:child_process";
import { log } from "./output.ts";

const children = new Set<ChildProcess>();
const cleanups: Array<() => void | Promise<void>> = [];

/** Starts a long-running child whose output is prefixed with `name`; it is stopped by `stopAll`. */
export function startChild(name: string, command: string, args: string[], env: NodeJS.ProcessEnv = process.env) {
  const child = spawn(command, args, { env, stdio: ["ignore", "pipe", "pipe"], detached: false });
  children.add(child);
  const forward = (chunk: Buffer) => log(name, chunk.toString().replace(/\n$/, ""));
  child.stdout?.on("data", forward);
  child.stderr?.on("data", forward);
  child.on("exit", () => children.delete(child));
  return child;
}

export function onStop(cleanup: () => void | Promise<void>) {
  cleanups.push(cleanup);
}

export async function stopAll() {
  await Promise.all(
    [...children].map(
      (child) =>
        new Promise<void>((resolve) => {
          if (child.exitCode !== null) return resolve();
          const timer = setTimeout(() => child.kill("SIGKILL"), 5_000);
          child.once("exit", () => {
            clearTimeout(timer);
            resolve();
          });
          child.kill("SIGTERM");
        }),
    ),
  );
  for (const cleanup of cleanups.reverse()) {
    try {
      await cleanup();
    } catch (error) {
      console.error(error);
    }
  }
  cleanups.length = 0;
}

/** Runs `stopAll` once on Ctrl-C or SIGTERM, then exits. */
export function stopOnSignals() {
  let stopping = false;
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.on(signal, async () => {
      if (stopping) return;
      stopping = true;
      log("app", `${signal}: stopping everything that was started`);
      await stopAll();
      process.exit(signal === "SIGINT" ? 130 : 143);
    });
  }
}

/** Waits until `url` answers below 500 (or with any status, when the server is up but unhealthy on purpose). */
export async function waitForHttp(url: string, options: { timeoutMs?: number; anyStatus?: boolean } = {}) {
  const timeoutMs = options.timeoutMs ?? 60_000;
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      const response = await fetch(url);
      if (options.anyStatus || response.status < 500) return;
    } catch {
      // not up yet
    }
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms`);
}
