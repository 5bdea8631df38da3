// Median time to score a full report (every test of the normal-class profile, straightness with 50
// stations) against JSON.parse of the same payload. Target: under 1 ms. `npx tsx bench/scoring.ts`.
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import {
  BUILT_IN_PROFILES,
  CENTRE_LATHE_NORMAL,
  evaluationRequestSchemaFor,
  scoreEvaluation,
  scoreReport,
  type ReportMeasurements,
  type TestMeasurement,
} from "../app/geometry/index.ts";

const TARGET_MS = 1;
const STATIONS = 50;

/** Deterministic jitter (a small linear congruential generator) so every run scores the same payload. */
function jitter(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 1_103_515_245 + 12_345) % 2_147_483_648;
    return state / 2_147_483_648 - 0.5;
  };
}

function travel(length: number, crown: number, seed: number) {
  const next = jitter(seed);
  return Array.from({ length: STATIONS }, (_, i) => {
    const station = (length * i) / (STATIONS - 1);
    return { station, reading: crown * Math.sin((Math.PI * station) / length) + next() };
  });
}

function fullReport(): { profile: { key: string; version: number }; units: "mm"; measurements: ReportMeasurements } {
  const small = (stations: number[], readings: number[]) => stations.map((station, i) => ({ station, reading: readings[i]! }));
  const tests: Record<string, TestMeasurement> = {
    "L-BED-V": { kind: "profile", points: travel(1000, 8, 1), resolution: 0.5 },
    "L-BED-X": { kind: "level", points: small([0, 250, 500, 750, 1000], [10, -5, 5, 0, 8]), resolution: 2 },
    "L-CAR-H": { kind: "profile", points: travel(1000, 5, 2), reference: "minimum-zone", resolution: 0.5 },
    "L-TS-TRAV-V": { kind: "profile", points: small([0, 250, 500, 750, 1000], [0, 3, 5, 7, 8]), resolution: 1 },
    "L-TS-TRAV-H": { kind: "profile", points: small([0, 250, 500, 750, 1000], [0, -2, -4, -5, -6]), resolution: 1 },
    "L-SP-SLIP": { kind: "extremes", max: 3, min: 0, resolution: 1 },
    "L-FP-CAM": { kind: "sweep", readings: [0, 4, 8, 3, 1, 2, 5, 6], resolution: 1 },
    "L-SP-NOSE": { kind: "sweep", readings: [0, 2, 4, 1, 3, 2, 1, 0], resolution: 1 },
    "L-SP-TAP-N": { kind: "extremes", max: 4, min: 0, resolution: 1 },
    "L-SP-TAP-F": { kind: "extremes", max: 8, min: 0, resolution: 1 },
    "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 12, at180: 4 }, resolution: 1 },
    "L-SP-PAR-H": { kind: "mandrel", near: { at0: 1, at180: -1 }, far: { at0: 6, at180: 4 }, resolution: 1 },
    "L-SP-CTR": { kind: "sweep", readings: [0, 5, 3, 2], resolution: 1 },
    "L-TS-SLV-V": { kind: "near-far", near: 0, far: 6, resolution: 1 },
    "L-TS-SLV-H": { kind: "near-far", near: 0, far: 4, resolution: 1 },
    "L-TS-TAP-V": { kind: "near-far", near: 0, far: 12, resolution: 1 },
    "L-TS-TAP-H": { kind: "near-far", near: 0, far: 10, resolution: 1 },
    "L-CTR-HT": { kind: "centre-height", headstockEnd: 0, tailstockEnd: 15, resolution: 1 },
    "L-TOP-PAR": { kind: "profile", points: small([0, 100, 200, 300], [0, 3, 6, 10]), resolution: 1 },
    "L-XS-SQ": { kind: "profile", points: small([0, 100, 200, 300], [0, 2, 4, 6]), resolution: 1 },
    "L-LS-SLIP": { kind: "extremes", max: 5, min: 0, resolution: 1 },
    "L-LS-PITCH": {
      kind: "profile",
      points: small([0, 60, 120, 180, 240, 300, 360, 420, 480, 540, 600], [0, 2, 4, 5, 7, 9, 10, 8, 12, 13, 14]),
      resolution: 1,
    },
    "L-P-ROUND": { kind: "sweep", readings: [0, 2, 4, 3, 1], resolution: 1 },
    "L-P-DIA": { kind: "profile", points: small([0, 100, 200, 300], [0, 4, 7, 10]), resolution: 1 },
    "L-P-FLAT": { kind: "profile", points: small([0, 75, 150, 225, 300], [0, -3, -5, -3, 0]), resolution: 1 },
  };
  return {
    profile: { key: CENTRE_LATHE_NORMAL.key, version: CENTRE_LATHE_NORMAL.version },
    units: "mm",
    measurements: {
      measuredOn: "2025-03-14",
      conditions: { ambientTemperatureC: 20.5, warmUpMinutes: 30, levelled: true },
      tests,
    },
  };
}

/** Median over samples of the mean time (ms) of a batch of calls. */
function medianMs(work: () => unknown, samples = 200, batch = 20): number {
  for (let i = 0; i < 200; i++) work(); // warm up the JIT
  const times: number[] = [];
  for (let s = 0; s < samples; s++) {
    const start = performance.now();
    for (let i = 0; i < batch; i++) work();
    times.push((performance.now() - start) / batch);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)]!;
}

export interface ScoringBenchResult {
  benchmark: "scoring";
  node: string;
  payloadBytes: number;
  tests: number;
  stationsPerStraightness: number;
  jsonParseMs: number;
  scoreReportMs: number;
  validateAndScoreMs: number;
  ratioToJsonParse: number;
  targetMs: number;
  targetMet: boolean;
}

export async function runScoringBench(): Promise<ScoringBenchResult> {
  const request = fullReport();
  const payload = JSON.stringify(request);
  const parsed = JSON.parse(payload) as ReturnType<typeof fullReport>;
  if (scoreReport(CENTRE_LATHE_NORMAL, parsed.measurements).results.length !== CENTRE_LATHE_NORMAL.tests.length) {
    throw new Error("the bench payload must cover every test of the profile");
  }

  const jsonParseMs = medianMs(() => JSON.parse(payload));
  const scoreReportMs = medianMs(() => scoreReport(CENTRE_LATHE_NORMAL, parsed.measurements));
  const schema = evaluationRequestSchemaFor(BUILT_IN_PROFILES);
  const validateAndScoreMs = medianMs(() => scoreEvaluation(CENTRE_LATHE_NORMAL, schema.parse(parsed)));

  const result: ScoringBenchResult = {
    benchmark: "scoring",
    node: process.version,
    payloadBytes: Buffer.byteLength(payload),
    tests: CENTRE_LATHE_NORMAL.tests.length,
    stationsPerStraightness: STATIONS,
    jsonParseMs,
    scoreReportMs,
    validateAndScoreMs,
    ratioToJsonParse: scoreReportMs / jsonParseMs,
    targetMs: TARGET_MS,
    targetMet: scoreReportMs < TARGET_MS,
  };

  const µs = (ms: number) => `${(ms * 1000).toFixed(1)} µs`;
  console.table({
    "JSON.parse of the payload": { median: µs(jsonParseMs), "× JSON.parse": "1.0" },
    "scoreReport (full report)": { median: µs(scoreReportMs), "× JSON.parse": result.ratioToJsonParse.toFixed(1) },
    "zod parse + scoreEvaluation": { median: µs(validateAndScoreMs), "× JSON.parse": (validateAndScoreMs / jsonParseMs).toFixed(1) },
  });
  console.log(
    `${result.tests} tests, ${STATIONS} stations per straightness, payload ${result.payloadBytes} bytes. ` +
      `Target under ${TARGET_MS} ms: ${result.targetMet ? "met" : "NOT met"} (${µs(scoreReportMs)}).`,
  );

  const folder = path.join(import.meta.dirname, "results");
  mkdirSync(folder, { recursive: true });
  writeFileSync(path.join(folder, "scoring.json"), `${JSON.stringify(result, null, 2)}\n`);
  return result;
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  await runScoringBench();
}
