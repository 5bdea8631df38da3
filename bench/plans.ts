// The PostgreSQL search's query plans: seeds the bench's listings (BENCH_LISTINGS, default 50 000), runs each
// search shape as the API does with the search service out of reach, and prints `EXPLAIN (ANALYZE, BUFFERS)`
// of every statement it sent. Plans are read from the database's own counters, so the shared load of the
// machine moves their times a little but not their shape or buffer counts. `npx tsx bench/plans.ts`
// (`-- --full` prints whole plans, otherwise the top of each). See docs/benchmarks.md.
import path from "node:path";
import { pathToFileURL } from "node:url";
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { startBenchServices, stopBenchEnvironment } from "./lib/environment.ts";
import { seedBenchData } from "./lib/seed.ts";

/** The shapes a buyer's search takes: the bench's query, browsing, words, sorts, facets and a deep page. */
export const PLAN_SHAPES: { name: string; params: string; follow?: number }[] = [
  { name: "bench query (verified lathes, run-out ≤ 5 µm, best accuracy)", params: "category=centre_lathe&category=toolroom_lathe&verified=1&runoutMax=5&sort=best-accuracy" },
  { name: "browse, newest first", params: "" },
  { name: "one word", params: "q=brevholt" },
  { name: "two words, cheapest first", params: "q=kessling%20gap&sort=price-ascending" },
  { name: "country and grade, price range", params: "country=DE&grade=A&grade=B&currency=EUR&priceMin=1000&priceMax=40000" },
  { name: "page 40, newest first", params: "page=40" },
  { name: "page 40 by cursor (keyset), newest first", params: "", follow: 39 },
  { name: "page 40 by cursor (keyset), bench query", params: "category=centre_lathe&category=toolroom_lathe&verified=1&runoutMax=5&sort=best-accuracy", follow: 39 },
  { name: "nothing matches (widen-this-filter counts)", params: "category=centre_lathe&verified=1&runoutMax=0.1&axialSlipMax=0.1" },
];

type Statement = { sql: string; params: unknown[] };

async function main() {
  const full = process.argv.includes("--full");
  const listings = Number(process.env.BENCH_LISTINGS ?? 50_000);
  try {
    const environment = await startBenchServices();
    const seeded = await seedBenchData(environment.ownerUrl, { listings, reports: Math.min(3_000, listings), seed: 20_260_501 });
    console.log(`seeded ${seeded.listings} listings, ${seeded.reports} signed reports`);
    const { searchMachines } = await import("../app/modules/search/service.server.ts");
    const { parseListingSearchParams } = await import("../app/modules/search/search-params.server.ts");
    const { SearchUnavailableError } = await import("../app/modules/search/search.server.ts");
    const schema = await import("../app/db/schema.ts");
    const pool = new pg.Pool({ connectionString: environment.databaseUrl, max: 4 });
    let captured: Statement[] = [];
    const db = drizzle(pool, { schema, logger: { logQuery: (sql, params) => void captured.push({ sql, params }) } });
    const down = () => {
      throw new SearchUnavailableError("unreachable", "the plans run without the search service");
    };
    const search = { searchListings: down, searchListingsTogether: down } as never;
    for (const shape of PLAN_SHAPES) {
      const parsed = parseListingSearchParams(new URLSearchParams(shape.params));
      if (!parsed.success) throw new Error(`${shape.name}: ${JSON.stringify(parsed.errors)}`);
      // A page reached by following `nextCursor`: the statements of the last one are explained.
      let after: typeof parsed.after = null;
      for (let step = 0; step < (shape.follow ?? 0); step++) {
        const previous = await searchMachines(db as never, parsed.query, { search, after });
        const next = parseListingSearchParams(new URLSearchParams(`${shape.params}&after=${encodeURIComponent(previous.nextCursor ?? "")}`));
        if (!next.success) throw new Error(`${shape.name}: ${JSON.stringify(next.errors)}`);
        parsed.query = next.query;
        after = next.after;
      }
      captured = [];
      const started = performance.now();
      const answer = await searchMachines(db as never, parsed.query, { search, after });
      const ms = performance.now() - started;
      const statements = captured;
      captured = [];
      console.log(`\n## ${shape.name}  (?${shape.params})\n${answer.totalHits} hits, ${statements.length} statements, ${ms.toFixed(1)} ms for the whole search (first run)`);
      for (const [position, statement] of statements.entries()) {
        const client = await pool.connect();
        try {
          const { rows } = await client.query(`explain (analyze, buffers) ${statement.sql}`, statement.params);
          const lines = rows.map((row) => String(row["QUERY PLAN"]));
          const time = ["Planning Time", "Execution Time"].map((label) => lines.find((line) => line.startsWith(label)) ?? "").join(" · ");
          console.log(`\n### statement ${position + 1}: ${time}`);
          if (full) console.log(statement.sql);
          console.log((full ? lines : lines.slice(0, 14)).join("\n"));
        } finally {
          client.release();
        }
      }
    }
    await pool.end();
  } finally {
    await stopBenchEnvironment();
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) await main();
