import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { canonicalJson, sha256Hex } from "~/modules/reports/seal.server";
import { reports } from "~/modules/reports/schema";
import { bookings } from "~/modules/inspections/schema";
import { currentReportForListing } from "~/modules/reports/service.server";
import { testAppOrigin } from "../../support/accounts";
import { latestEmailTo } from "../../support/mailbox";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie, reportRows, saveDraftOverHttp, signOverHttp, submitOverHttp } from "../../support/reports";

async function verify(hash: string) {
  const response = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${hash}`);
  return { status: response.status, body: (await response.json()) as { match: boolean; intact?: boolean; report?: { id: string; status: string } } };
}

describe("a signed report", () => {
  it("is sealed with the SHA-256 of its RFC 8785 JSON, moves the booking on and e-mails buyer and seller", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const signed = await fileAndSign(cookie, booked.bookingId, completeForm());
    expect(signed.status).toBe("signed");
    expect(signed.contentHash).toMatch(/^[0-9a-f]{64}$/);
    // Recomputed here from the stored JSON with the same two well-known steps.
    expect(sha256Hex(signed.canonicalJson!)).toBe(signed.contentHash);
    expect(canonicalJson(JSON.parse(signed.canonicalJson!))).toBe(signed.canonicalJson);
    expect(JSON.parse(signed.canonicalJson!).signedAt).toBe(signed.signedAt!.toISOString());

    const [booking] = await db.select().from(bookings).where(eq(bookings.id, booked.bookingId));
    expect(["report_filed", "closed"]).toContain(booking!.status);
    expect(booking!.reportId).toBe(signed.id);
    expect((await currentReportForListing(db, booked.listing.id))?.id).toBe(signed.id);

    for (const person of [booked.buyer, booked.seller]) {
      const mail = await latestEmailTo(person.email, { matching: (message) => message.tag === "report-signed" });
      expect(mail.subject).toContain("grade B");
      expect(mail.text).toContain(`${testAppOrigin}/reports/${signed.id}`);
      expect(mail.text).toMatch(/Spindle run-out: 4\.0 µm/);
    }

    const api = await fetch(`${testAppOrigin}/api/v1/reports/${signed.id}`);
    expect(api.status).toBe(200);
    const json = (await api.json()) as { contentHash: string; content: unknown };
    expect(sha256Hex(canonicalJson(json.content))).toBe(json.contentHash);
  });

  it("cannot be changed through any action or API: every attempt gets a 4xx and the hash still verifies", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const form = completeForm();
    const signed = await fileAndSign(cookie, booked.bookingId, form);
    const hash = signed.contentHash!;
    const changed = completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "1"], instrumentId: "i1" } });

    const attempts: Array<[string, Promise<Response>]> = [
      ["save a draft", saveDraftOverHttp(cookie, booked.bookingId, changed)],
      ["submit again", submitOverHttp(cookie, booked.bookingId, changed)],
      ["sign again", signOverHttp(cookie, booked.bookingId, signed.id)],
      ["presign a photo", postPhotoStep(cookie, booked.bookingId)],
      ["PUT the report", fetch(`${testAppOrigin}/api/v1/reports/${signed.id}`, { method: "PUT", headers: { "content-type": "application/json", cookie }, body: JSON.stringify({ grade: "A" }) })],
      ["PATCH the report", fetch(`${testAppOrigin}/api/v1/reports/${signed.id}`, { method: "PATCH", headers: { "content-type": "application/json", cookie }, body: "{}" })],
      ["DELETE the report", fetch(`${testAppOrigin}/api/v1/reports/${signed.id}`, { method: "DELETE", headers: { cookie } })],
      ["POST to the report page", fetch(`${testAppOrigin}/reports/${signed.id}`, { method: "POST", headers: { cookie, origin: testAppOrigin }, body: new FormData(), redirect: "manual" })],
      ["POST to the verify API", fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${hash}`, { method: "POST", headers: { cookie } })],
    ];
    for (const [what, attempt] of attempts) {
      const response = await attempt;
      expect(response.status, what).toBeGreaterThanOrEqual(400);
      expect(response.status, what).toBeLessThan(500);
    }

    // Beneath the app, the database itself refuses.
    await expect(db.update(reports).set({ grade: "A" }).where(eq(reports.id, signed.id))).rejects.toThrow();
    await expect(db.execute(sql`update reports set canonical_json = '{}' where id = ${signed.id}`)).rejects.toThrow();
    await expect(db.delete(reports).where(eq(reports.id, signed.id))).rejects.toThrow();

    const [after] = await db.select().from(reports).where(eq(reports.id, signed.id));
    expect(after!.contentHash).toBe(hash);
    expect(after!.canonicalJson).toBe(signed.canonicalJson);
    expect(after!.grade).toBe("B");
    const verified = await verify(hash);
    expect(verified.body).toMatchObject({ match: true, intact: true, report: { id: signed.id, status: "signed" } });
  });

  it("is corrected by a new revision that supersedes it; the old stays readable, marked, and its hash still verifies", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const first = await fileAndSign(cookie, booked.bookingId, completeForm());
    const correct = await fetch(`${testAppOrigin}/inspector/reports/${first.id}/correct`, { method: "POST", headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
    expect(correct.status).toBe(302);
    expect(correct.headers.get("location")).toBe(`/inspector/bookings/${booked.bookingId}/report`);

    const second = await fileAndSign(cookie, booked.bookingId, completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "9", "3"], instrumentId: "i1" } }));
    expect(second.revision).toBe(2);
    expect(second.supersedesId).toBe(first.id);
    expect(JSON.parse(second.canonicalJson!).supersedes).toEqual({ reportId: first.id, contentHash: first.contentHash });

    const rows = await reportRows(booked.bookingId);
    expect(rows.map((row) => row.status)).toEqual(["superseded", "signed"]);
    expect(rows[0]!.contentHash).toBe(first.contentHash);
    expect((await currentReportForListing(db, booked.listing.id))?.id).toBe(second.id);

    const oldPage = await fetch(`${testAppOrigin}/reports/${first.id}`);
    expect(oldPage.status).toBe(200);
    expect(await oldPage.text()).toContain("Superseded");
    expect((await verify(first.contentHash!)).body).toMatchObject({ match: true, intact: true, report: { status: "superseded" } });
  });
});

function postPhotoStep(cookie: string, bookingId: string) {
  const body = new FormData();
  body.set("intent", "presign");
  body.set("testCode", "L-SP-NOSE");
  body.set("fileName", "setup.jpg");
  body.set("size", "1000");
  body.set("contentType", "image/jpeg");
  return fetch(`${testAppOrigin}/inspector/bookings/${bookingId}/report/photos`, { method: "POST", body, headers: { cookie, origin: testAppOrigin } });
}
