// One photo through the files module's image pipeline — the checks of `inspectPhoto` and the WebP
// variants of `makePhotoVariants`, the two steps `acceptUploadedPhoto` runs between reading the upload
// from the bucket and writing the variants — in a process of its own, so that its peak memory (VmHWM)
// is the pipeline's and nothing else's. argv[2]: the JPEG's path; argv[3]: how many timed runs.
import { readFileSync } from "node:fs";
import sharp from "sharp";
import { inspectPhoto, makePhotoVariants } from "../../app/modules/files/images.server.ts";

export type PhotoOutcome = {
  width: number;
  height: number;
  inputBytes: number;
  runs: number;
  firstRunMs: number;
  medianMs: number;
  rssBeforeMiB: number;
  peakRssMiB: number;
  peakAboveBeforeMiB: number;
  sharp: { cacheDisabled: boolean; concurrency: number; cache: unknown; libvips: string };
  variants: { thumbnailBytes: number; largeBytes: number; largeWidth: number; largeHeight: number };
};

const MiB = 1024 * 1024;

function highWaterMarkBytes(): number {
  const match = /VmHWM:\s+(\d+) kB/.exec(readFileSync("/proc/self/status", "utf8"));
  return match ? Number(match[1]) * 1024 : 0;
}

const file = process.argv[2]!;
const runs = Number(process.argv[3] ?? 3);
const cacheDisabled = process.env.BENCH_SHARP_CACHE === "off";
if (cacheDisabled) sharp.cache(false);

// Load libvips' JPEG and WebP code once on a small photo, so that the timed runs measure the work.
const small = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#7a7f84" } }).jpeg().toBuffer();
await makePhotoVariants(small);

const bytes = readFileSync(file);
const rssBefore = process.memoryUsage().rss;
let peak = rssBefore;
const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 5);
const times: number[] = [];
let variants: Awaited<ReturnType<typeof makePhotoVariants>> | undefined;
let size = { width: 0, height: 0 };
for (let run = 0; run < runs; run++) {
  const started = performance.now();
  size = await inspectPhoto(bytes);
  variants = await makePhotoVariants(bytes);
  times.push(performance.now() - started);
}
clearInterval(sampler);
peak = Math.max(peak, process.memoryUsage().rss, highWaterMarkBytes());
const sorted = [...times].sort((a, b) => a - b);
const outcome: PhotoOutcome = {
  width: size.width,
  height: size.height,
  inputBytes: bytes.length,
  runs,
  firstRunMs: times[0]!,
  medianMs: sorted[Math.floor(sorted.length / 2)]!,
  rssBeforeMiB: rssBefore / MiB,
  peakRssMiB: peak / MiB,
  peakAboveBeforeMiB: (peak - rssBefore) / MiB,
  sharp: { cacheDisabled, concurrency: sharp.concurrency(), cache: sharp.cache(), libvips: sharp.versions.vips },
  variants: {
    thumbnailBytes: variants!.thumbnail.length,
    largeBytes: variants!.large.length,
    largeWidth: variants!.width,
    largeHeight: variants!.height,
  },
};
process.stdout.write(`${JSON.stringify(outcome)}\n`);
