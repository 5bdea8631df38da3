// A signed report stored before readings were bounded can hold a number no page can draw: ±1e308, or a
// result that overflowed to Infinity and was stored as null. Signed reports never change, so such a report
// is not repaired in place: its page, JSON and certificate show the readings as signed with a notice, and
// none of them answers 500. The row is written here directly, as the old code stored it.
import { randomUUID } from "node:crypto";
import { PDFParse } from "pdf-parse";
import { describe, expect, it } from "vitest";
import type { ReportContent } from "~/modules/reports/content";
import { reports } from "~/modules/reports/schema";
import { canonicalJson, sha256Hex } from "~/modules/reports/seal.server";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";

/** A good signed report's content, turned into what the old code stored for a sweep of ±1e308 and a bed read at 1e308. */
function asStoredBeforeTheLimits(good: ReportContent, reportId: string, bookingId: string): ReportContent {
  const content = structuredClone(good);
  content.reportId = reportId;
  content.booking = { ...content.booking, id: bookingId };
  for (const measurements of [content.measurements, content.measurementsAsEntered]) {
    measurements.tests["L-SP-NOSE"] = { kind: "sweep", readings: [1e308, -1e308] };
    measurements.tests["L-BED-V"] = { kind: "profile", points: [{ station: 0, reading: 0 }, { station: 500, reading: 1e308 }, { station: 1000, reading: -1e308 }] };
  }
  const results = content.score.results as unknown as Array<Record<string, unknown>>;
  const nose = results.find((result) => result.code === "L-SP-NOSE")!;
  // Infinity, as JSON stores it.
  Object.assign(nose, { value: null, ratio: null, pass: false });
  const bed = results.find((result) => result.code === "L-BED-V")!;
  Object.assign(bed, { value: 1.5e308, ratio: 7.5e306, pass: false });
  (content.score as unknown as Record<string, unknown>).worstRatio = null;
  content.score.keyFigures.spindleRunOut = null;
  content.score.keyFigures.bedStraightness = 1.5e308;
  content.score.grade = "D";
  return content;
}

describe("a signed report that holds a number no page can draw", () => {
  it("shows its readings and a notice on its page, in its JSON and on its certificate, and never answers 500", async () => {
    const good = await acceptedBooking();
    const signedGood = await fileAndSign(await inspectorCookie(good.inspector), good.bookingId, completeForm());

    const broken = await acceptedBooking();
    const id = randomUUID();
    const signedAt = new Date();
    const content = { ...asStoredBeforeTheLimits(JSON.parse(signedGood.canonicalJson!) as ReportContent, id, broken.bookingId), signedAt: signedAt.toISOString() };
    content.machine = { ...content.machine, listingId: broken.listing.id, slug: broken.listing.slug };
    const canonical = canonicalJson(content);
    await db.insert(reports).values({
      id,
      bookingId: broken.bookingId,
      listingId: broken.listing.id,
      inspectorId: broken.inspector.id,
      status: "signed",
      profileKey: content.profile.key,
      profileVersion: content.profile.version,
      grade: "D",
      keyFigures: content.score.keyFigures,
      measuredOn: content.measuredOn,
      draftVersion: 1,
      content: JSON.parse(canonical),
      canonicalJson: canonical,
      contentHash: sha256Hex(canonical),
      signedAt,
    });

    const page = await fetch(`${testAppOrigin}/reports/${id}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("cannot be scored or drawn");
    expect(html).toContain("L-SP-NOSE");
    expect(html).toContain("1e+308");
    expect(html).toContain(sha256Hex(canonical));

    const api = await fetch(`${testAppOrigin}/api/v1/reports/${id}`);
    expect(api.status).toBe(200);
    const json = (await api.json()) as { notice: string | null; content: ReportContent; contentHash: string };
    expect(json.notice).toMatch(/cannot be scored or drawn/);
    expect(sha256Hex(canonicalJson(json.content))).toBe(json.contentHash);

    const pdf = await fetch(`${testAppOrigin}/reports/${id}/certificate.pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    const parser = new PDFParse({ data: new Uint8Array(await pdf.arrayBuffer()) });
    const text = (await parser.getText()).text.replace(/\s+/g, " ");
    await parser.destroy();
    expect(text).toMatch(/cannot be scored or drawn/);
    expect(text).toContain("1e+308");

    for (const url of [`/machines/${broken.listing.slug}`, `/api/v1/reports/${id}/credential`, `/api/v1/reports/verify?hash=${sha256Hex(canonical)}`, `/reports/${id}?units=inch`]) {
      const response = await fetch(`${testAppOrigin}${url}`);
      expect(response.status, url).toBeLessThan(500);
    }

    // A good report keeps its results and no notice.
    const goodJson = (await (await fetch(`${testAppOrigin}/api/v1/reports/${signedGood.id}`)).json()) as { notice: string | null };
    expect(goodJson.notice).toBeNull();
  });
});
