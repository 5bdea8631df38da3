// Re-issue for reports signed before signed credentials existed. Such a row has the canonical JSON and the
// SHA-256 recorded when its inspector signed, but no credential, so every page hides it (sealed-read.server.ts).
// Staff run `npm run reports:reissue`: each row whose stored JSON still hashes to its recorded hash, and whose
// copied columns still say what that JSON says, gets a credential signed now with the current key, stating
// that it was re-issued on this date and that the signature is Tenthmark's, not the inspector's original one.
// A row that fails a check is left hidden and named, for staff to look into; nothing is re-scored or changed.
import { and, eq, inArray, isNull } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { queueListingIndexUpdate } from "~/modules/search/indexing.server";
import type { ReportContent } from "./content";
import { buildReportCredential, didWebOf } from "./credential";
import { reports } from "./schema";
import { canonicalJson, sealHolds } from "./seal.server";
import { currentKeyFragment, reportSigningKey, signCredential, SigningKeyError } from "./signing.server";

export interface ReissueOutcome {
  reissued: Array<{ id: string; signedAt: string }>;
  refused: Array<{ id: string; reason: string }>;
}

/** Why a stored signed row without a credential cannot be re-issued, or null when it can. */
export function reissueRefusal(row: {
  id: string;
  grade: string;
  keyFigures: unknown;
  measuredOn: string;
  signedAt: Date | null;
  revision: number;
  canonicalJson: string | null;
  contentHash: string | null;
}): string | null {
  if (!row.canonicalJson || !row.contentHash) return "No canonical JSON or hash was recorded at signing.";
  if (!sealHolds(row.canonicalJson, row.contentHash)) return "The stored JSON no longer hashes to the hash recorded at signing.";
  const content = JSON.parse(row.canonicalJson) as ReportContent;
  const mismatched: string[] = [];
  if (content.reportId !== row.id) mismatched.push("id");
  if (content.revision !== row.revision) mismatched.push("revision");
  if (content.score?.grade !== row.grade) mismatched.push("grade");
  if (canonicalJson(content.score?.keyFigures ?? null) !== canonicalJson(row.keyFigures ?? null)) mismatched.push("key figures");
  if (content.measuredOn !== row.measuredOn) mismatched.push("date of the tests");
  if (!row.signedAt) mismatched.push("signing time");
  else if (content.signedAt && content.signedAt !== row.signedAt.toISOString()) mismatched.push("signing time");
  return mismatched.length ? `The stored columns (${mismatched.join(", ")}) differ from the signed JSON.` : null;
}

/** Issues a credential, signed now, for every signed or superseded report that has none and passes the checks. */
export async function reissueCredentials(db: Database, origin: string, options: { dryRun?: boolean; now?: Date } = {}): Promise<ReissueOutcome> {
  const now = options.now ?? new Date();
  const rows = await db
    .select()
    .from(reports)
    .where(and(inArray(reports.status, ["signed", "superseded"]), isNull(reports.credential)))
    .orderBy(reports.signedAt);
  const outcome: ReissueOutcome = { reissued: [], refused: [] };
  if (!rows.length) return outcome;
  const key = reportSigningKey();
  const fragment = await currentKeyFragment(db, key.publicKeyMultibase);
  if (!fragment) throw new SigningKeyError("The report signing key is not registered as the current key: run `npm run signing-key -- register` first.");
  for (const row of rows) {
    const refusal = reissueRefusal(row);
    if (refusal) {
      outcome.refused.push({ id: row.id, reason: refusal });
      continue;
    }
    const signedAt = row.signedAt!.toISOString();
    if (options.dryRun) {
      outcome.reissued.push({ id: row.id, signedAt });
      continue;
    }
    const content = { ...(JSON.parse(row.canonicalJson!) as ReportContent), signedAt };
    const reissuedAt = now.toISOString();
    const unsigned = buildReportCredential(content, row.contentHash!, origin, { reissuedAt });
    const credential = canonicalJson(await signCredential(unsigned, key, `${didWebOf(origin)}#${fragment}`, reissuedAt));
    // Only a row still without a credential: a second run, or two at once, never replaces one.
    const updated = await db
      .update(reports)
      .set({ credential, updatedAt: now })
      .where(and(eq(reports.id, row.id), isNull(reports.credential)))
      .returning({ id: reports.id, listingId: reports.listingId });
    if (!updated.length) continue;
    outcome.reissued.push({ id: row.id, signedAt });
    await queueListingIndexUpdate(updated[0]!.listingId);
  }
  return outcome;
}
