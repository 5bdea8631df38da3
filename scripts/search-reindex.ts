// `npm run search:reindex`: rebuilds the listing index from PostgreSQL — applies the index settings, indexes
// every published listing with its current report, and removes every other document. Sends no alerts.
// Uses DATABASE_URL and MEILISEARCH_* like the app (defaults: the database and stand-in of `npm start`).
import path from "node:path";
import { FILES_STAND_IN_ACCESS_KEY } from "../stand-ins/files/index.ts";
import { secretsForDataFolder } from "./lib/local-secrets.ts";
import { log } from "./lib/output.ts";

const root = path.resolve(import.meta.dirname, "..");
process.env.DATABASE_URL ??= "postgres://app@127.0.0.1:54329/tenthmark";
// Unset secrets are those `npm start` keeps for its data folder (the search stand-in's key among them).
for (const [name, value] of Object.entries(secretsForDataFolder(path.resolve(root, process.env.TENTHMARK_DATA_DIR ?? ".data")))) process.env[name] ||= value;
process.env.S3_ACCESS_KEY_ID ||= FILES_STAND_IN_ACCESS_KEY;
process.env.S3_SECRET_ACCESS_KEY ||= FILES_STAND_IN_ACCESS_KEY;

async function main() {
  const { getDatabase } = await import("../app/db/client.server.ts");
  const { env } = await import("../app/env.server.ts");
  const { reindexAllListings } = await import("../app/modules/search/indexing.server.ts");
  log("search", `re-indexing listings from ${new URL(env().DATABASE_URL).host} into ${env().MEILISEARCH_HOST}`);
  const started = Date.now();
  const { indexed, removed } = await reindexAllListings(getDatabase(), { onProgress: (done) => log("search", `${done} listing(s) indexed so far`) });
  log("search", `done in ${((Date.now() - started) / 1000).toFixed(1)} s: ${indexed} published listing(s) indexed, ${removed} stale document(s) removed`);
  await getDatabase().$client.end();
}

main().catch((error) => {
  console.error(`search:reindex failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
