// Minimum-zone straightness at and beyond the request limit: the whole travel (rotating calipers over the
// convex hull, O(n log n)) and a full bed test with its any-window check (O(n · k)), at 1 000 stations (the
// most a request may hold) and 10 000. Budgets printed met or missed. `npx tsx bench/straightness.ts`.
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { CENTRE_LATHE_NORMAL, evaluateTest, straightnessEvaluation, type ProfilePoint } from "../app/geometry/index.ts";

const BED = CENTRE_LATHE_NORMAL.tests.find((test) => test.code === "L-BED-V")!;
const TRAVEL_MM = 1500;

/** A crowned bed with deterministic noise (a small linear congruential generator). */
function bed(stations: number): ProfilePoint[] {
  let state = stations;
  const noise = () => {
    state = (state * 1_103_515_245 + 12_345) % 2_147_483_648;
    return state / 2_147_483_648 - 0.5;
  };
  return Array.from({ length: stations }, (_, i) => {
    const x = (TRAVEL_MM * i) / (stations - 1);
    return { x, y: 12 * Math.sin((Math.PI * x) / TRAVEL_MM) + noise() };
  });
}

function medianMs(work: () => unknown, budgetMs: number): number {
  const samples = Math.max(5, Math.min(200, Math.floor(200 / Math.max(budgetMs, 1))));
  for (let i = 0; i < 3; i++) work(); // warm up the JIT
  const times: number[] = [];
  for (let s = 0; s < samples; s++) {
    const start = performance.now();
    work();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)]!;
}

interface Row {
  case: string;
  stations: number;
  medianMs: number;
  budgetMs: number;
  met: boolean;
}

export async function runStraightnessBench(): Promise<Row[]> {
  const cases: Array<{ name: string; stations: number; budgetMs: number; work: (points: ProfilePoint[]) => unknown }> = [
    { name: "minimum zone, whole travel", stations: 1_000, budgetMs: 1, work: (points) => straightnessEvaluation(points, "minimum-zone") },
    { name: "minimum zone, whole travel", stations: 10_000, budgetMs: 10, work: (points) => straightnessEvaluation(points, "minimum-zone") },
    {
      name: "bed test with any 250 mm (minimum zone)",
      stations: 1_000,
      budgetMs: 25,
      work: (points) => evaluateTest(BED, { kind: "profile", reference: "minimum-zone", points: points.map((p) => ({ station: p.x, reading: p.y })) }),
    },
    {
      name: "bed test with any 250 mm (minimum zone)",
      stations: 10_000,
      budgetMs: 2_000,
      work: (points) => evaluateTest(BED, { kind: "profile", reference: "minimum-zone", points: points.map((p) => ({ station: p.x, reading: p.y })) }),
    },
  ];
  const rows: Row[] = cases.map(({ name, stations, budgetMs, work }) => {
    const points = bed(stations);
    const medianMsValue = medianMs(() => work(points), budgetMs);
    return { case: name, stations, medianMs: medianMsValue, budgetMs, met: medianMsValue <= budgetMs };
  });

  console.table(
    Object.fromEntries(
      rows.map((row) => [`${row.case}, ${row.stations.toLocaleString("en-GB").replace(/,/g, " ")} stations`, { median: `${row.medianMs.toFixed(2)} ms`, budget: `${row.budgetMs} ms`, result: row.met ? "met" : "MISSED" }]),
    ),
  );
  console.log(
    `Straightness over ${TRAVEL_MM} mm: ${rows.filter((row) => row.met).length} of ${rows.length} budgets met. ` +
      "A request holds 1 000 stations per test at most (app/geometry/limits.ts); 10 000 shows the growth.",
  );
  const folder = path.join(import.meta.dirname, "results");
  mkdirSync(folder, { recursive: true });
  writeFileSync(path.join(folder, "straightness.json"), `${JSON.stringify({ benchmark: "straightness", node: process.version, travelMm: TRAVEL_MM, rows }, null, 2)}\n`);
  return rows;
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  await runStraightnessBench();
}
