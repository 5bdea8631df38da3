// Runs the demo seed in a process of its own, against the DATABASE_URL and stand-ins in its environment
// (the app's modules read them once per process, so a seed into another database needs its own process).
import { seedDemoDataIfEmpty } from "../../../scripts/lib/seed.ts";

const databaseUrl = process.env.DATABASE_URL;
if (!databaseUrl) throw new Error("run-seed needs DATABASE_URL");
const started = Date.now();
const loaded = await seedDemoDataIfEmpty(databaseUrl);
const { getDatabase } = await import("../../../app/db/client.server.ts");
await getDatabase().$client.end();
console.log(`SEED-RESULT ${JSON.stringify({ loaded, seconds: (Date.now() - started) / 1000 })}`);
process.exit(0);
