// WCAG 2.2 A and AA on the thirteen pages a buyer, a dealer, an inspector and staff use most, checked by
// axe-core in Chromium on a desktop and on a phone: any violation fails, with the elements named.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, type TestUser } from "../../support/accounts";
import { signInContext, wcagViolations } from "../../support/axe";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { certifiedInspector, publishedLathe } from "../../support/inspections";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie, saveDraftOverHttp } from "../../support/reports";
import { getListingsApi } from "../../support/search";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const VIEWPORTS = [
  { name: "desktop", width: 1280, height: 900 },
  { name: "phone", width: 390, height: 844 },
];

/** Visits each page as the person given (or nobody) and collects the violations on each. */
async function audit(pages: Array<{ name: string; path: string; as?: TestUser; ready?: string }>) {
  const found: string[] = [];
  for (const viewport of VIEWPORTS) {
    for (const visit of pages) {
      const { context, page } = await newRecordedPage(browser, viewport);
      if (visit.as) await signInContext(context, visit.as);
      const response = await page.goto(visit.path, { waitUntil: "networkidle" });
      expect(response?.status(), `${visit.name} (${visit.path})`).toBeLessThan(400);
      if (visit.ready) await page.locator(visit.ready).first().waitFor();
      for (const line of await wcagViolations(page)) found.push(`${visit.name}, ${viewport.name}: ${line}`);
      await context.close();
    }
  }
  return found;
}

describe("WCAG 2.2 AA, by axe-core", () => {
  it("the public pages: home, search plain and verified, a listing, a report, sign-in, sign-up, inspectors", { timeout: 240_000 }, async () => {
    // A verified lathe, so that the verified search shows a card with its figures and grade.
    const booking = await acceptedBooking();
    const report = await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
    const word = booking.listing.region!.split(" ").at(-1)!;
    for (let waited = 0; ; waited += 250) {
      const body = (await (await getListingsApi(`q=${word}&verified=1`)).json()) as { totalHits: number };
      if (body.totalHits === 1) break;
      if (waited > 20_000) throw new Error("the verified lathe did not reach the index");
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
    const violations = await audit([
      { name: "home", path: "/" },
      { name: "search", path: "/machines", ready: "[data-listing-id]" },
      { name: "search, verified", path: "/machines?verified=1", ready: "[data-listing-id] [data-grade]" },
      { name: "listing", path: `/machines/${booking.listing.slug}` },
      { name: "report", path: `/reports/${report.id}`, ready: "[data-plot]" },
      { name: "sign-in", path: "/sign-in" },
      { name: "sign-up", path: "/sign-up" },
      { name: "inspectors", path: "/inspectors" },
    ]);
    expect(violations).toEqual([]);
  });

  it("the signed-in pages: booking, new listing, report entry, account, staff applications", { timeout: 240_000 }, async () => {
    const inspector = await certifiedInspector();
    const lathe = await publishedLathe(inspector.region);
    const buyer = await createTestUser({ name: "Wenke Aldous" });
    const dealer = await createTestUser({ roles: ["seller"], name: "Harth Machine Sales" });
    const admin = await createTestUser({ roles: ["admin"] });
    await createTestUser({ inspectorStatus: "pending", name: "Oswin Tarrant" });
    // An inspector's entry form part filled, so that its reading tables, ± and × buttons are on the page.
    const visit = await acceptedBooking();
    const draft = await saveDraftOverHttp(await inspectorCookie(visit.inspector), visit.bookingId, completeForm());
    expect(draft.status).toBeLessThan(300);
    const violations = await audit([
      { name: "booking", path: `/machines/${lathe.slug}/book`, as: buyer },
      { name: "new listing", path: "/sell/new", as: dealer },
      { name: "report entry", path: `/inspector/bookings/${visit.bookingId}/report`, as: visit.inspector, ready: "[id^='test-']" },
      { name: "account", path: "/account", as: buyer },
      { name: "staff applications", path: "/admin/inspector-applications", as: admin },
    ]);
    expect(violations).toEqual([]);
  });
});
