// Reports signed before signed credentials existed are hidden until staff re-issue them: `npm run
// reports:reissue` gives each one whose stored JSON still hashes to the hash recorded at signing a credential
// dated that day and marked as re-issued; a row whose columns differ from its JSON stays hidden and is named.
import { execFile } from "node:child_process";
import { randomUUID } from "node:crypto";
import path from "node:path";
import { promisify } from "node:util";
import { eq } from "drizzle-orm";
import pg from "pg";
import { PDFParse } from "pdf-parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { ReportContent } from "~/modules/reports/content";
import { verifyReportCredential, type ReportCredential } from "~/modules/reports/credential";
import { reports } from "~/modules/reports/schema";
import { canonicalJson, sha256Hex } from "~/modules/reports/seal.server";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, "../../..");
const ownerUrl = process.env.TEST_DATABASE_OWNER_URL!;

/** A signed row as the code before credentials wrote it: canonical JSON and its hash, no credential. */
async function legacyRow(owner: pg.Client, good: ReportContent, options: { grade?: string } = {}) {
  const booked = await acceptedBooking();
  const id = randomUUID();
  const signedAt = new Date(Date.now() - 400 * 86_400_000);
  const content: ReportContent = {
    ...structuredClone(good),
    reportId: id,
    booking: { ...good.booking, id: booked.bookingId },
    machine: { ...good.machine, listingId: booked.listing.id, slug: booked.listing.slug },
    inspector: { ...good.inspector, id: booked.inspector.id },
    signedAt: signedAt.toISOString(),
  };
  const canonical = canonicalJson(content);
  // The constraint that every signed row has a credential came with credentials; rows from before lack one.
  await owner.query("begin");
  await owner.query("alter table reports drop constraint reports_signed_has_credential");
  await owner.query(
    `insert into reports (id, booking_id, listing_id, inspector_id, status, profile_key, profile_version, grade, key_figures, measured_on, draft_version, content, canonical_json, content_hash, signed_at)
     values ($1, $2, $3, $4, 'signed', $5, $6, $7, $8, $9, 1, $10, $11, $12, $13)`,
    [id, booked.bookingId, booked.listing.id, booked.inspector.id, content.profile.key, content.profile.version, options.grade ?? content.score.grade, JSON.stringify(content.score.keyFigures), content.measuredOn, canonical, canonical, sha256Hex(canonical), signedAt],
  );
  await owner.query("set constraints all immediate");
  await owner.query(`alter table reports add constraint reports_signed_has_credential check (status = 'draft' or credential is not null) not valid`);
  await owner.query("commit");
  return { id, signedAt, contentHash: sha256Hex(canonical) };
}

async function reissue(...args: string[]) {
  try {
    const { stdout } = await run("npx", ["tsx", "scripts/reissue-credentials.ts", ...args], { cwd: root, env: { ...process.env, APP_ORIGIN: testAppOrigin }, timeout: 120_000 });
    return { code: 0, stdout };
  } catch (error) {
    const failed = error as { code: number; stdout: string; stderr: string };
    return { code: failed.code, stdout: failed.stdout + failed.stderr };
  }
}

describe("re-issuing reports signed before credentials", () => {
  let owner: pg.Client;
  let legacy: Awaited<ReturnType<typeof legacyRow>>;
  let changed: Awaited<ReturnType<typeof legacyRow>>;

  beforeAll(async () => {
    owner = new pg.Client({ connectionString: ownerUrl });
    await owner.connect();
    const booked = await acceptedBooking();
    const signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    const good = JSON.parse(signed.canonicalJson!) as ReportContent;
    legacy = await legacyRow(owner, good);
    // Its grade column says A though the signed JSON says B.
    changed = await legacyRow(owner, good, { grade: good.score.grade === "A" ? "B" : "A" });
  }, 120_000);
  afterAll(async () => {
    await owner?.end();
  });

  it("hides them until re-issued, then shows them with a credential dated the re-issue that verifies and says so", { timeout: 180_000 }, async () => {
    expect((await fetch(`${testAppOrigin}/reports/${legacy.id}`)).status).toBe(409);

    const dry = await reissue("--dry-run");
    expect(dry.stdout).toContain(`would re-issue ${legacy.id}`);
    const [untouched] = await db.select({ credential: reports.credential }).from(reports).where(eq(reports.id, legacy.id));
    expect(untouched!.credential).toBeNull();

    const before = Date.now();
    const done = await reissue();
    expect(done.stdout).toContain(`re-issued ${legacy.id}`);
    expect(done.stdout).toMatch(new RegExp(`left hidden ${changed.id}: The stored columns \\(grade\\) differ from the signed JSON`));
    expect(done.code).toBe(2);

    // The page and the certificate show it now, saying it was re-issued.
    const page = await fetch(`${testAppOrigin}/reports/${legacy.id}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Credential re-issued");
    const credentialText = await (await fetch(`${testAppOrigin}/api/v1/reports/${legacy.id}/credential`)).text();
    const credential = JSON.parse(credentialText) as ReportCredential;
    expect(credential.credentialSubject.signedAt).toBe(legacy.signedAt.toISOString());
    expect(credential.credentialSubject.content.sha256).toBe(legacy.contentHash);
    expect(Date.parse(credential.proof!.created)).toBeGreaterThanOrEqual(before - 1000);
    expect(credential.credentialSubject.reissued?.on).toBe(credential.proof!.created);
    expect(credential.validFrom).toBe(credential.proof!.created);

    const did = await (await fetch(`${testAppOrigin}/.well-known/did.json`)).json();
    const verified = await verifyReportCredential(credential, did);
    expect(verified.valid).toBe(true);
    expect(verified.checks.find((check) => check.name === "content")!.detail).toMatch(/re-issued by Tenthmark on \d{4}-\d{2}-\d{2}/);
    // Any changed byte still fails.
    expect((await verifyReportCredential(JSON.parse(credentialText.replace(`"grade":"${credential.credentialSubject.grade}"`, '"grade":"A+"')), did)).valid).toBe(false);
    // A re-issue date moved back to the original signing is refused even if someone could re-sign it.
    const backdated = structuredClone(credential);
    backdated.credentialSubject.reissued!.on = credential.credentialSubject.signedAt;
    expect((await verifyReportCredential(backdated, did)).valid).toBe(false);

    const pdf = await fetch(`${testAppOrigin}/reports/${legacy.id}/certificate.pdf`);
    expect(pdf.status).toBe(200);
    const parser = new PDFParse({ data: new Uint8Array(await pdf.arrayBuffer()) });
    const text = (await parser.getText()).text.replace(/\s+/g, " ");
    await parser.destroy();
    expect(text).toMatch(/Credential re-issued on \d+ \w+ \d{4}/);
    expect(text).toContain("not the inspector's original one");

    // The row whose column differs from its JSON stays hidden.
    expect((await fetch(`${testAppOrigin}/reports/${changed.id}`)).status).toBe(409);

    // Once set, the credential is as immutable as the rest: the app role cannot replace it, and a second run leaves it.
    const app = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await app.connect();
    try {
      await expect(app.query(`update reports set credential = $1 where id = $2`, [credentialText.replace("Tenthmark", "Someone"), legacy.id])).rejects.toThrow(/cannot be changed/);
      await expect(app.query(`update reports set credential = null where id = $1`, [legacy.id])).rejects.toThrow();
    } finally {
      await app.end();
    }
    const again = await reissue();
    expect(again.stdout).not.toContain(`re-issued ${legacy.id}`);
    const [kept] = await db.select({ credential: reports.credential }).from(reports).where(eq(reports.id, legacy.id));
    expect(kept!.credential).toBe(credentialText);
  });
});
