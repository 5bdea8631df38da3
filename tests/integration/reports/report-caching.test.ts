// A signed report never changes: its page and its API answer carry an entity tag, a browser that holds it is
// answered 304 with no body (and no new Content-Security-Policy, whose nonce would not match the stored
// page's scripts), and a correction that supersedes the report changes the tag at once.
import { describe, expect, it } from "vitest";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

const get = (path: string, headers: Record<string, string> = {}) => fetch(`${testAppOrigin}${path}`, { headers, redirect: "manual" });

describe("a signed report's page and API", () => {
  it("answer 304 to the tag they gave, and a new tag once a correction supersedes the report", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const first = await fileAndSign(cookie, booked.bookingId, completeForm());

    for (const path of [`/reports/${first.id}`, `/api/v1/reports/${first.id}`]) {
      const full = await get(path);
      expect(full.status).toBe(200);
      const tag = full.headers.get("etag");
      expect(tag).toMatch(/^W\/".+"$/);
      await full.arrayBuffer();

      const again = await get(path, { "if-none-match": tag! });
      expect(again.status).toBe(304);
      expect(await again.text()).toBe("");
      expect(again.headers.get("etag")).toBe(tag);
      expect(again.headers.get("content-security-policy")).toBeNull();
      // Another tag, another units choice: the whole answer.
      expect((await get(path, { "if-none-match": 'W/"something-else"' })).status).toBe(200);
    }
    const page = await get(`/reports/${first.id}`);
    expect(page.headers.get("cache-control")).toBe("public, max-age=60");
    expect(page.headers.get("vary")).toMatch(/cookie/i);
    const pageTag = page.headers.get("etag")!;
    expect((await get(`/reports/${first.id}?units=inch`, { "if-none-match": pageTag })).status).toBe(200);
    // Signed in, the same page is another answer (the header names the viewer).
    expect((await get(`/reports/${first.id}`, { "if-none-match": pageTag, cookie })).status).toBe(200);
    const apiTag = (await get(`/api/v1/reports/${first.id}`)).headers.get("etag")!;

    await fetch(`${testAppOrigin}/inspector/reports/${first.id}/correct`, { method: "POST", headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
    const second = await fileAndSign(cookie, booked.bookingId, completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "9", "3"], instrumentId: "i1" } }));

    const superseded = await get(`/reports/${first.id}`, { "if-none-match": pageTag });
    expect(superseded.status).toBe(200);
    expect(await superseded.text()).toContain("Superseded");
    const api = await get(`/api/v1/reports/${first.id}`, { "if-none-match": apiTag });
    expect(api.status).toBe(200);
    expect(((await api.json()) as { status: string; supersededBy: { id: string } }).supersededBy.id).toBe(second.id);
  });
});
