// The seal covers every figure shown. The app's database role cannot change a signed report; the owner role
// can (it owns the tables), but then every page and API refuses to show the changed figure and says why.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";
import { databaseKeepingNoSearchAnswers } from "../../support/search";
import { currentReportForListing } from "~/modules/reports/service.server";
import { loadSearchableListings, searchListingsInDatabase } from "~/modules/search/listing-source.server";
import { sha256Hex } from "~/modules/reports/seal.server";
import { reports, type ReportRow } from "~/modules/reports/schema";

// The columns listings and search read (checked on every list read); the rest are checked where the whole report is read.
const LIST_COLUMNS = new Set(["grade", "key_figures", "measured_on", "signed_at", "content_hash", "credential", "listing_id", "profile_key", "profile_version"]);

const appClient = () => new pg.Client({ connectionString: process.env.DATABASE_URL });
const ownerUrl = process.env.TEST_DATABASE_OWNER_URL!;

async function expectRefused(client: pg.Client, statement: string, message: RegExp) {
  await client.query("savepoint attempt");
  await expect(client.query(statement)).rejects.toThrow(message);
  await client.query("rollback to savepoint attempt");
}

describe("the app's database role", () => {
  let signed: ReportRow;
  beforeAll(async () => {
    const booked = await acceptedBooking();
    signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
  });

  it("is not a superuser and owns no table", async () => {
    const client = appClient();
    await client.connect();
    try {
      const { rows } = await client.query(`select rolsuper, rolbypassrls, rolcreaterole from pg_roles where rolname = current_user`);
      expect(rows[0]).toEqual({ rolsuper: false, rolbypassrls: false, rolcreaterole: false });
      const owned = await client.query(`select c.relname from pg_class c join pg_namespace n on n.oid = c.relnamespace where n.nspname in ('public', 'drizzle') and c.relowner = (select oid from pg_roles where rolname = current_user)`);
      expect(owned.rows).toEqual([]);
    } finally {
      await client.end();
    }
  });

  it("cannot ALTER, TRUNCATE, UPDATE or DELETE a signed report, disable the trigger, or mark it superseded without a successor", async () => {
    const client = appClient();
    await client.connect();
    try {
      await client.query("begin");
      await expectRefused(client, `alter table reports disable trigger all`, /must be owner/);
      await expectRefused(client, `alter table reports disable trigger reports_immutable_after_signing`, /must be owner/);
      await expectRefused(client, `set session_replication_role = replica`, /permission denied/);
      await expectRefused(client, `truncate reports cascade`, /permission denied/);
      await expectRefused(client, `update reports set grade = 'D' where id = '${signed.id}'`, /signed and cannot be changed/);
      await expectRefused(client, `update reports set credential = null where id = '${signed.id}'`, /signed and cannot be changed/);
      await expectRefused(client, `update reports set status = 'superseded' where id = '${signed.id}'`, /only be superseded by a signed correction/);
      await expectRefused(client, `delete from reports where id = '${signed.id}'`, /permission denied/);
      await expectRefused(client, `update report_signing_keys set valid_until = now()`, /permission denied/);
      await expectRefused(client, `insert into report_signing_keys (id, public_key_multibase, valid_from) values ('key-x', 'zx', now())`, /permission denied/);
      await client.query("rollback");
    } finally {
      await client.end();
    }
    const [row] = await db.select().from(reports).where(eq(reports.id, signed.id));
    expect(row).toMatchObject({ grade: signed.grade, status: "signed", credential: signed.credential });
  });
});

describe("a signed report changed by the owner role", () => {
  const unkept = databaseKeepingNoSearchAnswers();
  let owner: pg.Client;
  let signed: ReportRow;
  let listingSlug: string;
  let listingId: string;
  let otherListingId: string;
  let otherUserId: string;

  beforeAll(async () => {
    owner = new pg.Client({ connectionString: ownerUrl });
    await owner.connect();
    const booked = await acceptedBooking();
    signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    listingSlug = booked.listing.slug;
    listingId = booked.listing.id;
    const other = await acceptedBooking();
    otherListingId = other.listing.id;
    otherUserId = (await createTestUser({ name: "Oda Pell" })).id;
  });
  afterAll(async () => {
    await owner.end();
    await unkept.end();
  });

  /** As the owner: the trigger off, one column changed, the trigger on again; returns a function that undoes it. */
  async function tamper(column: string, value: unknown) {
    const { rows } = await owner.query(`select ${column}::text as value from reports where id = $1`, [signed.id]);
    const original = rows[0].value as string | null;
    const write = async (next: unknown) => {
      await owner.query("begin");
      await owner.query(`alter table reports disable trigger user`);
      await owner.query(`update reports set ${column} = $1 where id = $2`, [next, signed.id]);
      await owner.query(`alter table reports enable trigger user`);
      await owner.query("commit");
    };
    await write(value);
    return () => write(original);
  }

  const mutations: Array<[string, () => unknown, string]> = [
    ["grade", () => "A", "grade"],
    ["key_figures", () => JSON.stringify({ ...(signed.keyFigures as object), spindleRunOut: 0.5 }), "key_figures"],
    ["measured_on", () => "2020-01-01", "measured_on"],
    ["signed_at", () => new Date("2025-01-01T00:00:00Z"), "signed_at"],
    ["content_hash", () => sha256Hex(randomUUID()), "content_hash"],
    ["canonical_json", () => signed.canonicalJson!.replace('"grade":"B"', '"grade":"A"'), "canonical_json"],
    ["content", () => JSON.stringify({ ...(JSON.parse(signed.canonicalJson!) as object), notes: "Changed later." }), "content"],
    ["credential", () => signed.credential!.replace('"grade":"B"', '"grade":"A"'), "credential"],
    ["revision", () => 7, "revision"],
    ["profile_key", () => "centre-lathe-precision", "profile_key"],
    ["profile_version", () => 9, "profile_version"],
    ["listing_id", () => otherListingId, "listing_id"],
  ];

  // The PostgreSQL search's page of these two listings, whatever their status: the report each result shows. Read
  // by a client that keeps no answers: a write past the triggers does not move the search generation, so the app's
  // client would give its kept answer (the report as verified before the change) until the next write.
  const searchedReports = async () =>
    (await searchListingsInDatabase(unkept.db, { ids: [listingId, otherListingId], statuses: ["draft", "published", "sold", "withdrawn"], hitsPerPage: 5 })).hits.map((hit) => hit.reportId);

  it.each(mutations)("%s: the API, the verification and the pages refuse it and name the column", async (column, value, named) => {
    // The search has verified the credential before the change (it then reads only the credential's digest).
    expect(await searchedReports()).toContain(signed.id);
    const undo = await tamper(column, value());
    try {
      const api = await fetch(`${testAppOrigin}/api/v1/reports/${signed.id}`);
      expect(api.status).toBe(409);
      const body = (await api.json()) as { intact: boolean; mismatched: string[] };
      expect(body.intact).toBe(false);
      expect(body.mismatched).toContain(named);

      const hash = column === "content_hash" ? ((await owner.query(`select content_hash from reports where id = $1`, [signed.id])).rows[0].content_hash as string) : signed.contentHash!;
      const verification = (await (await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${hash}`)).json()) as { match: boolean; intact: boolean; report: unknown; mismatched: string[] };
      expect(verification).toMatchObject({ match: true, intact: false, report: null });
      expect(verification.mismatched).toContain(named);

      const page = await fetch(`${testAppOrigin}/reports/${signed.id}`);
      expect(page.status).toBe(409);
      expect(await page.text()).toContain("no longer matches what its inspector signed");
      expect((await fetch(`${testAppOrigin}/reports/${signed.id}/certificate.pdf`)).status).toBe(409);

      if (LIST_COLUMNS.has(column)) {
        // A column that listings and search read: they show no figure of the report, neither changed nor signed.
        for (const id of [listingId, otherListingId]) expect((await currentReportForListing(db, id))?.id).not.toBe(signed.id);
        const searchable = await loadSearchableListings(db, [listingId, otherListingId]);
        for (const source of searchable.values()) expect(source.report?.id).not.toBe(signed.id);
        expect(await searchedReports()).not.toContain(signed.id);
        const listingPage = await (await fetch(`${testAppOrigin}/machines/${listingSlug}`)).text();
        expect(listingPage).not.toContain(`/reports/${signed.id}`);
        expect(listingPage).not.toContain('data-testid="accuracy-panel"');
      } else {
        // A column lists do not read: they keep showing the figures as the credential seals them.
        const credential = JSON.parse(signed.credential!) as { credentialSubject: { grade: string; keyFigures: unknown; measuredOn: string } };
        expect(await currentReportForListing(db, listingId)).toMatchObject({ grade: credential.credentialSubject.grade, keyFigures: credential.credentialSubject.keyFigures, measuredOn: credential.credentialSubject.measuredOn });
      }
    } finally {
      await undo();
    }
    // Put back as signed, it is shown again.
    expect((await currentReportForListing(db, listingId))?.id).toBe(signed.id);
    expect(await searchedReports()).toContain(signed.id);
    expect((await fetch(`${testAppOrigin}/api/v1/reports/${signed.id}`)).status).toBe(200);
  });

  it("shows the figures from the credential when all agree", async () => {
    const current = await currentReportForListing(db, listingId);
    const credential = JSON.parse(signed.credential!) as { credentialSubject: { grade: string; measuredOn: string; signedAt: string } };
    expect(current).toMatchObject({ id: signed.id, grade: credential.credentialSubject.grade, measuredOn: credential.credentialSubject.measuredOn, signedAt: credential.credentialSubject.signedAt });
  });
});
