// A signed report stored before readings were bounded can hold a number no page can draw: ±1e308, or a
// result that overflowed to Infinity and was stored as null. Signed reports never change, so such a report
// is not repaired in place: its page, JSON and certificate show the readings as signed with a notice, and
// none of them answers 500. The row is written here directly, as the old code stored it.
import { PDFParse } from "pdf-parse";
import { describe, expect, it } from "vitest";
import type { ReportContent } from "~/modules/reports/content";
import { canonicalJson, sha256Hex } from "~/modules/reports/seal.server";
import { testAppOrigin } from "../../support/accounts";
import { signedReportAsStoredBeforeTheLimits } from "../../support/reports";

describe("a signed report that holds a number no page can draw", () => {
  it("shows its readings and a notice on its page, in its JSON and on its certificate, and never answers 500", async () => {
    const { id, canonical, broken, signedGood } = await signedReportAsStoredBeforeTheLimits();

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
