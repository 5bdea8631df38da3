// The report page is kept rendered for visitors without a session (app/modules/http/page-cache.server.ts).
// These tests try to make it send what it must not: a page whose row was changed behind the app's back, a
// superseded report without its notice, one units choice's page for the other, a signed-in visitor's page to
// somebody else (or the shared page to a signed-in visitor), a nonce twice or not the header's, a cookie.
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie, type AcceptedBooking } from "../../support/reports";
import type { ReportRow } from "~/modules/reports/schema";

const get = (path: string, headers: Record<string, string> = {}, method = "GET") => fetch(`${testAppOrigin}${path}`, { method, headers, redirect: "manual" });

/** Every nonce the page's scripts carry, and the one its Content-Security-Policy allows. */
function noncesOf(html: string, response: Response) {
  const inPage = [...html.matchAll(/\snonce="([^"]*)"/g)].map((match) => match[1]);
  const policy = /'nonce-([^']+)'/.exec(response.headers.get("content-security-policy") ?? "")?.[1];
  return { inPage, policy };
}

/** The page without its nonces: what must be the same from one answer to the next. */
const withoutNonces = (html: string) => html.replace(/\snonce="[^"]*"/g, ' nonce=""');

describe("the report page kept for visitors without a session", () => {
  let booked: AcceptedBooking;
  let cookie: string;
  let first: ReportRow;

  beforeAll(async () => {
    booked = await acceptedBooking();
    cookie = await inspectorCookie(booked.inspector);
    first = await fileAndSign(cookie, booked.bookingId, completeForm());
  });

  it("sends the same page with a fresh nonce each time, matching the policy header, and no cookie", async () => {
    const answers = [];
    for (let round = 0; round < 3; round += 1) {
      const response = await get(`/reports/${first.id}`);
      expect(response.status).toBe(200);
      expect(response.headers.get("set-cookie")).toBeNull();
      expect(response.headers.get("cache-control")).toBe("public, max-age=60");
      expect(response.headers.get("vary")).toMatch(/cookie/i);
      expect(response.headers.get("x-frame-options")).toBe("DENY");
      const html = await response.text();
      const { inPage, policy } = noncesOf(html, response);
      expect(policy).toMatch(/^[A-Za-z0-9+/]{24}$/);
      expect(inPage.length).toBeGreaterThan(0);
      expect(new Set(inPage)).toEqual(new Set([policy]));
      answers.push({ html, policy });
    }
    expect(new Set(answers.map((answer) => answer.policy)).size).toBe(3);
    expect(withoutNonces(answers[1].html)).toBe(withoutNonces(answers[0].html));
    expect(withoutNonces(answers[2].html)).toBe(withoutNonces(answers[0].html));
  });

  it("answers HEAD and a held tag from the kept page, without a body or a new policy", async () => {
    const full = await get(`/reports/${first.id}`);
    const tag = full.headers.get("etag")!;
    await full.arrayBuffer();
    const head = await get(`/reports/${first.id}`, {}, "HEAD");
    expect(head.status).toBe(200);
    expect(head.headers.get("etag")).toBe(tag);
    expect(head.headers.get("content-type")).toMatch(/^text\/html/);
    expect(await head.text()).toBe("");
    const held = await get(`/reports/${first.id}`, { "if-none-match": tag });
    expect(held.status).toBe(304);
    expect(held.headers.get("content-security-policy")).toBeNull();
    expect(await held.text()).toBe("");
  });

  it("never gives one units choice the other's page", async () => {
    const pages: Record<string, string> = {};
    // Twice over, alternating, so that the second round comes from the kept pages.
    for (let round = 0; round < 2; round += 1) {
      for (const units of ["inch", "mm", ""]) {
        const response = await get(`/reports/${first.id}${units ? `?units=${units}` : ""}`);
        expect(response.status).toBe(200);
        const html = await response.text();
        const certificate = /certificate\.pdf\?units=(\w+)/.exec(html)?.[1];
        expect(certificate).toBe(units || "mm");
        if (round === 1) expect(withoutNonces(html)).toBe(pages[units]);
        pages[units] = withoutNonces(html);
      }
    }
    expect(pages.inch).not.toBe(pages.mm);
  });

  it("gives a signed-in visitor their own page, and never that page to anybody else", async () => {
    expect((await get(`/reports/${first.id}`)).status).toBe(200);
    const signedIn = await get(`/reports/${first.id}`, { cookie });
    expect(signedIn.headers.get("cache-control")).toBe("private, no-cache");
    const own = await signedIn.text();
    expect(own).toContain(booked.inspector.name);
    expect(own).toContain("Start a correction");
    // And the other way round: the next visitor without a session gets the shared page.
    const anonymous = await (await get(`/reports/${first.id}`)).text();
    expect(anonymous).not.toContain(booked.inspector.email);
    expect(anonymous).not.toContain("Start a correction");
    expect(anonymous).not.toContain("Sign out");
  });

  it("answers a client-side navigation's data request with data, and the page with HTML after it", async () => {
    for (let round = 0; round < 2; round += 1) {
      const data = await get(`/reports/${first.id}.data`);
      expect(data.status).toBe(200);
      expect(data.headers.get("content-type")).not.toMatch(/html/);
      const body = await data.text();
      expect(body).not.toContain("<html");
      expect(body).toContain(first.id);
      expect(data.headers.get("content-security-policy")).toBeTruthy();
      const routes = await get(`/reports/${first.id}.data?_routes=routes%2Freports%2Freport`);
      expect(routes.status).toBe(200);
      expect(await routes.text()).not.toContain("<html");
    }
    const page = await get(`/reports/${first.id}`);
    expect(page.headers.get("content-type")).toMatch(/^text\/html/);
    expect(await page.text()).toContain("<html");
  });

  it("renders an address with other parameters each time", async () => {
    const response = await get(`/reports/${first.id}?units=inch&signed=1`);
    expect(response.status).toBe(200);
    const html = await response.text();
    const { inPage, policy } = noncesOf(html, response);
    expect(new Set(inPage)).toEqual(new Set([policy]));
  });
});

describe("what changes a kept report page", () => {
  let owner: pg.Client;
  beforeAll(async () => {
    owner = new pg.Client({ connectionString: process.env.TEST_DATABASE_OWNER_URL! });
    await owner.connect();
  });
  afterAll(async () => {
    await owner.end();
  });

  it("a row changed behind the app's back is not sent from memory: the page says it fails verification", async () => {
    const booked = await acceptedBooking();
    const signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    for (let round = 0; round < 2; round += 1) expect((await get(`/reports/${signed.id}`)).status).toBe(200);
    const kept = await (await get(`/reports/${signed.id}?units=inch`)).text();
    expect(kept).toContain("Signature and hash verified");
    const write = async (grade: string) => {
      await owner.query("begin");
      await owner.query(`alter table reports disable trigger user`);
      await owner.query(`update reports set grade = $1 where id = $2`, [grade, signed.id]);
      await owner.query(`alter table reports enable trigger user`);
      await owner.query("commit");
    };
    await write(signed.grade === "A" ? "B" : "A");
    try {
      for (const path of [`/reports/${signed.id}`, `/reports/${signed.id}?units=inch`]) {
        const page = await get(path);
        expect(page.status).toBe(409);
        expect(await page.text()).toContain("no longer matches what its inspector signed");
      }
      expect((await get(`/reports/${signed.id}`, {}, "HEAD")).status).toBe(409);
    } finally {
      await write(signed.grade);
    }
    // Put back as signed, it is shown again (rendered anew: the kept page was dropped at the first changed read).
    const again = await get(`/reports/${signed.id}?units=inch`);
    expect(again.status).toBe(200);
    const html = await again.text();
    expect(html).toContain("Signature and hash verified");
    expect(html.length).toBeGreaterThan(kept.length * 0.9);
  });

  it("a correction shows on the superseded revision at once, and on every earlier one", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const first = await fileAndSign(cookie, booked.bookingId, completeForm());
    for (let round = 0; round < 2; round += 1) {
      const page = await (await get(`/reports/${first.id}`)).text();
      expect(page).not.toContain('data-testid="superseded-banner"');
    }

    await fetch(`${testAppOrigin}/inspector/reports/${first.id}/correct`, { method: "POST", headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
    const second = await fileAndSign(cookie, booked.bookingId, completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "9", "3"], instrumentId: "i1" } }));
    const superseded = await (await get(`/reports/${first.id}`)).text();
    expect(superseded).toContain('data-testid="superseded-banner"');
    expect(superseded).toContain(`href="/reports/${second.id}"`);
    for (let round = 0; round < 2; round += 1) expect(await (await get(`/reports/${second.id}`)).text()).not.toContain('data-testid="superseded-banner"');

    // A third revision changes neither the first's row nor its successor's id, yet its list of revisions.
    await fetch(`${testAppOrigin}/inspector/reports/${second.id}/correct`, { method: "POST", headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
    const third = await fileAndSign(cookie, booked.bookingId, completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "8", "3"], instrumentId: "i1" } }));
    const firstAgain = await (await get(`/reports/${first.id}`)).text();
    expect(firstAgain).toContain(`href="/reports/${third.id}"`);
    const secondAgain = await (await get(`/reports/${second.id}`)).text();
    expect(secondAgain).toContain('data-testid="superseded-banner"');
    expect(secondAgain).toContain(`href="/reports/${third.id}"`);
  });
});
