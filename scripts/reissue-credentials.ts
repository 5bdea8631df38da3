// `npm run reports:reissue [-- --dry-run]`: issues a signed credential, dated today and marked as re-issued,
// for every report signed before signed credentials existed (pages hide those until then). A report whose
// stored JSON no longer hashes to the hash recorded at signing, or whose columns differ from that JSON, is
// named and left hidden. Uses DATABASE_URL, APP_ORIGIN and REPORT_SIGNING_KEY like the app (defaults: those
// of `npm start`'s data folder); the key must be the registered current one.
import path from "node:path";
import { FILES_STAND_IN_ACCESS_KEY } from "../stand-ins/files/index.ts";
import { secretsForDataFolder } from "./lib/local-secrets.ts";
import { log } from "./lib/output.ts";

const root = path.resolve(import.meta.dirname, "..");
process.env.DATABASE_URL ??= "postgres://app@127.0.0.1:54329/tenthmark";
process.env.APP_ORIGIN ??= `http://localhost:${process.env.PORT ?? 3000}`;
for (const [name, value] of Object.entries(secretsForDataFolder(path.resolve(root, process.env.TENTHMARK_DATA_DIR ?? ".data")))) process.env[name] ||= value;
process.env.S3_ACCESS_KEY_ID ||= FILES_STAND_IN_ACCESS_KEY;
process.env.S3_SECRET_ACCESS_KEY ||= FILES_STAND_IN_ACCESS_KEY;

async function main() {
  const dryRun = process.argv.includes("--dry-run");
  const { getDatabase } = await import("../app/db/client.server.ts");
  const { env } = await import("../app/env.server.ts");
  const { stopQueue } = await import("../app/modules/jobs/queue.server.ts");
  const { reissueCredentials } = await import("../app/modules/reports/reissue.server.ts");
  const outcome = await reissueCredentials(getDatabase(), env().APP_ORIGIN, { dryRun });
  for (const report of outcome.reissued) log("reports", `${dryRun ? "would re-issue" : "re-issued"} ${report.id} (signed ${report.signedAt})`);
  for (const report of outcome.refused) log("reports", `left hidden ${report.id}: ${report.reason}`);
  log("reports", `${outcome.reissued.length} report(s) ${dryRun ? "to re-issue" : "re-issued"}, ${outcome.refused.length} left hidden`);
  await stopQueue();
  await getDatabase().$client.end();
  if (outcome.refused.length) process.exitCode = 2;
}

main().catch((error) => {
  console.error(`reports:reissue failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
