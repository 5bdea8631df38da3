import { spawn, type ChildProcess } from "node:child_process";
import { createWriteStream } from "node:fs";
import { log } from "./output.ts";

const children = new Set<ChildProcess>();
const cleanups: Array<() => void | Promise<void>> = [];

type ChildOutput = {
  /** Every line the child writes goes here, each with the time it arrived (the console stays readable). */
  logFile?: string;
  /** Which of the child's streams are also shown on the console, prefixed with its name. */
  echo?: "all" | "stderr" | "none";
};

/** Starts a long-running child whose output is prefixed with `name`; it is stopped by `stopAll`. */
export function startChild(name: string, command: string, args: string[], env: NodeJS.ProcessEnv = process.env, output: ChildOutput = {}) {
  const echo = output.echo ?? "all";
  const logStream = output.logFile ? createWriteStream(output.logFile, { flags: "a" }) : undefined;
  const child = spawn(command, args, { env, stdio: ["ignore", "pipe", "pipe"], detached: false });
  children.add(child);
  const forward = (stream: "stdout" | "stderr") => (chunk: Buffer) => {
    const text = chunk.toString().replace(/\n$/, "");
    if (logStream) {
      const time = new Date().toISOString();
      logStream.write(text.split("\n").map((line) => `${time} ${stream === "stderr" ? "!" : " "} ${line}\n`).join(""));
    }
    if (echo === "all" || (echo === "stderr" && stream === "stderr")) log(name, text);
  };
  child.stdout?.on("data", forward("stdout"));
  child.stderr?.on("data", forward("stderr"));
  child.on("exit", () => {
    children.delete(child);
    logStream?.end();
  });
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
