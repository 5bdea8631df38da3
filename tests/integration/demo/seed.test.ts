// The demo scenario `npm start` loads, run whole into a fresh database of this test's own (and a search
// stand-in of its own, so that its re-index touches no other test's index): counts of what a first start
// must show, and that a second run leaves a database with accounts alone.
import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort } from "../../../scripts/lib/ports.ts";
import { runMigrations } from "../../../scripts/lib/migrate.ts";
import { roleOf } from "../../../scripts/lib/database-roles.ts";
import { registerKey } from "../../../scripts/lib/signing-key.ts";
import { startSearchStandIn, type SearchStandIn } from "../../../search/stand-in/index.ts";

const root = path.resolve(import.meta.dirname, "../../..");
const databaseName = `demo_${randomBytes(5).toString("hex")}`;
// The owner role makes the database and runs the migrations; the seed, like the app, connects as the app's role.
const adminUrl = process.env.TEST_DATABASE_OWNER_URL!;
const inDemoDatabase = (base: string) => {
  const url = new URL(base);
  url.pathname = `/${databaseName}`;
  return url.toString();
};
const demoOwnerUrl = inDemoDatabase(adminUrl);
const demoUrl = inDemoDatabase(process.env.DATABASE_URL!);

let search: SearchStandIn;
let searchDir: string;
let client: pg.Client;
let firstRun: { loaded: boolean; seconds: number; output: string };

function runSeed(): Promise<{ loaded: boolean; seconds: number; output: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(path.join(root, "node_modules/.bin/tsx"), ["tests/integration/demo/run-seed.ts"], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: demoUrl, ...search.env },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let output = "";
    child.stdout.on("data", (chunk) => (output += chunk));
    child.stderr.on("data", (chunk) => (output += chunk));
    child.on("error", reject);
    child.on("exit", (code) => {
      const line = output.split("\n").find((candidate) => candidate.startsWith("SEED-RESULT "));
      if (code !== 0 || !line) return reject(new Error(`the seed exited with ${code}:\n${output}`));
      resolve({ ...JSON.parse(line.slice("SEED-RESULT ".length)), output });
    });
  });
}

const rows = async <T = Record<string, unknown>>(sql: string) => (await client.query(sql)).rows as T[];

beforeAll(async () => {
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  await admin.query(`CREATE DATABASE ${databaseName}`);
  await admin.end();
  await runMigrations(demoOwnerUrl, roleOf(demoUrl));
  await registerKey(demoOwnerUrl, process.env.REPORT_SIGNING_KEY!, { coverPastDays: 800 });
  searchDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-demo-search-"));
  search = await startSearchStandIn({ port: await freePort(), dataDir: searchDir });
  firstRun = await runSeed();
  client = new pg.Client({ connectionString: demoUrl });
  await client.connect();
}, 240_000);

afterAll(async () => {
  await client?.end();
  await search?.stop();
  if (searchDir) rmSync(searchDir, { recursive: true, force: true });
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS ${databaseName} WITH (FORCE)`);
  await admin.end();
}, 60_000);

describe("the demo scenario on a fresh database", () => {
  it("loads in well under a minute", () => {
    expect(firstRun.loaded).toBe(true);
    expect(firstRun.seconds).toBeLessThan(60);
  });

  it("has about forty listings of every category from five dealers and a private seller, photos on each published one", async () => {
    const [{ total }] = await rows<{ total: number }>("select count(*)::int as total from listings");
    expect(total).toBe(43);
    const categories = await rows<{ category: string }>("select distinct category from listings");
    expect(categories.map((row) => row.category).sort()).toEqual(["centre_lathe", "cnc_lathe", "machining_centre", "milling_machine", "other", "surface_grinder", "toolroom_lathe"]);
    const statuses = Object.fromEntries((await rows<{ status: string; n: number }>("select status, count(*)::int as n from listings group by status")).map((row) => [row.status, row.n]));
    expect(statuses.published).toBeGreaterThanOrEqual(30);
    for (const status of ["draft", "sold", "withdrawn"]) expect(statuses[status], status).toBeGreaterThan(0);
    const [{ sellers }] = await rows<{ sellers: number }>("select count(distinct seller_id)::int as sellers from listings");
    expect(sellers).toBe(6);
    const unphotographed = await rows("select l.model from listings l where l.status = 'published' and not exists (select 1 from listing_photos p where p.listing_id = l.id)");
    expect(unphotographed).toEqual([]);
    const [{ most }] = await rows<{ most: number }>("select max(n)::int as most from (select count(*) as n from listing_photos group by listing_id) counts");
    expect(most).toBeLessThanOrEqual(4);
    const [{ currencies }] = await rows<{ currencies: number }>("select count(distinct currency)::int as currencies from listings");
    expect(currencies).toBeGreaterThanOrEqual(3);
  });

  it("has a rebuilt lathe with its rebuild record, linked by its dealer to the earlier listing of the same machine and its signed report", async () => {
    const records = await rows<{ model: string; status: string; author_is_seller: boolean; found: number; rebuilt: number; work: number }>(
      "select l.model, r.status, r.author_id = l.seller_id as author_is_seller, jsonb_array_length(r.results -> 'asFound')::int as found, jsonb_array_length(r.results -> 'asRebuilt')::int as rebuilt, jsonb_array_length(r.work_done)::int as work from rebuild_records r join listings l on l.id = r.listing_id",
    );
    expect(records).toEqual([{ model: "OL-400", status: "published", author_is_seller: true, found: 4, rebuilt: 4, work: 5 }]);
    const linked = await rows<{ model: string; status: string; signed: number }>(
      "select l.model, l.status, (select count(*)::int from reports p where p.listing_id = l.id and p.status = 'signed') as signed from machine_listings m join listings l on l.id = m.listing_id order by l.model",
    );
    expect(linked).toEqual([
      { model: "OL 400", status: "sold", signed: 1 },
      { model: "OL-400", status: "published", signed: 0 },
    ]);
  });

  it("has twenty-three signed reports across every grade (mills, grinders and CNC machines among them), one past twelve months, and a corrected revision", async () => {
    const signed = await rows<{ grade: string; measured_on: string }>("select grade, measured_on::text from reports where status = 'signed'");
    expect(signed).toHaveLength(23);
    const tables = await rows<{ profile_key: string; count: number; flat: number; positioned: number }>(
      "select profile_key, count(*)::int as count, count(key_figures ->> 'tableFlatness')::int as flat, count(key_figures ->> 'xPositioningAccuracy')::int as positioned from reports where status = 'signed' and profile_key not like 'centre-lathe%' group by profile_key order by profile_key",
    );
    expect(tables).toEqual([
      { profile_key: "cnc-lathe-normal", count: 1, flat: 0, positioned: 1 },
      { profile_key: "knee-mill-normal", count: 3, flat: 3, positioned: 0 },
      { profile_key: "surface-grinder-normal", count: 2, flat: 2, positioned: 0 },
      { profile_key: "vertical-machining-centre-normal", count: 2, flat: 0, positioned: 2 },
    ]);
    expect([...new Set(signed.map((row) => row.grade))].sort()).toEqual(["A", "B", "C", "D", "incomplete"]);
    const [{ old }] = await rows<{ old: number }>("select count(*)::int as old from reports where status = 'signed' and measured_on < current_date - interval '12 months'");
    expect(old).toBeGreaterThanOrEqual(1);
    const superseded = await rows<{ grade: string; successor_grade: string; revision: number }>(
      "select old.grade, new.grade as successor_grade, new.revision from reports old join reports new on new.supersedes_id = old.id where old.status = 'superseded'",
    );
    expect(superseded).toEqual([{ grade: "C", successor_grade: "B", revision: 2 }]);
    const [{ unsealed }] = await rows<{ unsealed: number }>("select count(*)::int as unsealed from reports where status in ('signed', 'superseded') and (content_hash is null or canonical_json is null)");
    expect(unsealed).toBe(0);
  });

  it("has bookings in every state, refunds in full and in part, and payouts for the filed reports", async () => {
    const statuses = new Set((await rows<{ status: string }>("select distinct status from bookings")).map((row) => row.status));
    for (const status of ["awaiting_payment", "paid", "accepted", "report_filed", "closed", "refunded", "cancelled", "expired"]) expect(statuses, status).toContain(status);
    const refunds = await rows<{ fee: number; refunded: number }>("select fee_minor::int as fee, refunded_minor::int as refunded from bookings where status = 'refunded' order by refunded_minor desc");
    expect(refunds.some((row) => row.refunded === row.fee)).toBe(true);
    expect(refunds.some((row) => row.refunded > 0 && row.refunded < row.fee)).toBe(true);
    const [{ closed, paidOut }] = await rows<{ closed: number; paidOut: number }>(
      `select count(*)::int as closed, (select count(*)::int from payouts) as "paidOut" from bookings where status = 'closed'`,
    );
    expect(closed).toBe(22);
    expect(paidOut).toBe(22);
  });

  it("keeps the demo buyer's saved searches, and every published listing is in the index", async () => {
    const searches = await rows<{ name: string }>("select s.name from saved_searches s join \"user\" u on u.id = s.user_id where u.email = 'buyer@example.test'");
    expect(searches.length).toBeGreaterThanOrEqual(3);
    expect(searches.map((row) => row.name)).toContain("Verified centre lathes, spindle run-out ≤ 5 µm");
    const [{ published }] = await rows<{ published: number }>("select count(*)::int as published from listings where status = 'published'");
    const stats = (await (await fetch(`${search.env.MEILISEARCH_HOST}/indexes/listings/stats`, { headers: { authorization: `Bearer ${search.env.MEILISEARCH_API_KEY}` } })).json()) as { numberOfDocuments: number };
    expect(stats.numberOfDocuments).toBe(published);
  });

  it("leaves a database that has accounts alone", async () => {
    const second = await runSeed();
    expect(second.loaded).toBe(false);
    const [{ total }] = await rows<{ total: number }>("select count(*)::int as total from listings");
    expect(total).toBe(43);
  }, 120_000);
});
