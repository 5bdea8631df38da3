import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

const chromiumPath = "/usr/bin/chromium";

/** Debian's Chromium for the browser tests; installed with apt-get when missing and we are root. */
export function ensureChromium(): string {
  if (existsSync(chromiumPath)) return chromiumPath;
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (!isRoot) throw new Error("Chromium was not found at /usr/bin/chromium. Install it with: sudo apt-get install -y chromium");
  for (const args of [["update"], ["install", "-y", "--no-install-recommends", "chromium"]]) {
    const result = spawnSync("apt-get", args, { stdio: "inherit", env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } });
    if (result.status !== 0) throw new Error(`apt-get ${args.join(" ")} failed`);
  }
  return chromiumPath;
}
