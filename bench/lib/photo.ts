// The 24-megapixel photo: drawn and encoded here (6000 × 4000 with film grain and extra noise, so that it
// compresses like a camera's JPEG), then processed in child processes (bench/lib/photo-worker.ts), once
// with sharp's settings as the app leaves them and once with sharp's operation cache off.
import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import sharp from "sharp";
import { drawLathePhoto } from "../../app/demo/listing-photos.server.ts";
import type { PhotoOutcome } from "./photo-worker.ts";

const root = path.resolve(import.meta.dirname, "../..");

export type { PhotoOutcome };

export async function makeTwentyFourMegapixelJpeg(): Promise<Buffer> {
  const width = 6000;
  const height = 4000;
  const drawn = await drawLathePhoto({ width, height });
  const noise = await sharp({ create: { width, height, channels: 3, background: "#808080", noise: { type: "gaussian", mean: 128, sigma: 24 } } })
    .png({ compressionLevel: 1 })
    .toBuffer();
  return sharp(drawn).composite([{ input: noise, blend: "soft-light" }]).jpeg({ quality: 92 }).toBuffer();
}

function runWorker(file: string, runs: number, env: Record<string, string>): Promise<PhotoOutcome> {
  return new Promise((resolve, reject) => {
    const child = spawn(path.join(root, "node_modules/.bin/tsx"), [path.join(import.meta.dirname, "photo-worker.ts"), file, String(runs)], {
      cwd: root,
      env: { ...process.env, ...env },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    child.on("exit", (code) => {
      const line = stdout.trim().split("\n").at(-1);
      if (code !== 0 || !line) return reject(new Error(`the photo run failed (exit ${code}): ${stderr.trim().slice(-800)}`));
      resolve(JSON.parse(line) as PhotoOutcome);
    });
  });
}

export async function measurePhotoPipeline(runs = 3): Promise<{ appDefaults: PhotoOutcome; cacheOff: PhotoOutcome }> {
  const folder = mkdtempSync(path.join(os.tmpdir(), "tenthmark-bench-photo-"));
  try {
    const file = path.join(folder, "24mp.jpg");
    writeFileSync(file, await makeTwentyFourMegapixelJpeg());
    const appDefaults = await runWorker(file, runs, { BENCH_SHARP_CACHE: "app" });
    const cacheOff = await runWorker(file, runs, { BENCH_SHARP_CACHE: "off" });
    return { appDefaults, cacheOff };
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
