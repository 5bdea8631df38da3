// `npm run search:reindex`: rebuilds the listing index from PostgreSQL — applies the index settings, indexes
// every published listing with its current report, and removes every other document. Sends no alerts.
// Uses DATABASE_URL and MEILISEARCH_* like the app (defaults: the database and stand-in of `npm start`).
import { log } from "./lib/output.ts";

process.env.DATABASE_URL ??= "postgres://app@127.0.0.1:54329/tenthmark";

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
