// The Content-Security-Policy blocks nothing the app itself does: pages hydrate, forms post, photos go to
// the bucket and the report page draws its plots, with no violation reported on the way.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInCookie, signInPage } from "../../support/accounts";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { jpegWithGps } from "../../support/images";
import { createListingAs } from "../../support/listings";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { publicIdOf } from "../../support/inspections";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** A page that records every CSP violation (and every console error) it meets. */
async function watchedPage() {
  const recorded = await newRecordedPage(browser);
  const problems: string[] = [];
  await recorded.context.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (event) => console.error(`CSP violation: ${event.violatedDirective} blocked ${event.blockedURI}`));
  });
  recorded.page.on("console", (message) => {
    if (message.type() === "error" && !/status of 404/.test(message.text())) problems.push(`${recorded.page.url()}: ${message.text().slice(0, 300)}`);
  });
  recorded.page.on("pageerror", (error) => problems.push(`${recorded.page.url()}: ${error.message}`));
  return { ...recorded, problems };
}

async function visitHydrated(page: Page, path: string) {
  const response = await page.goto(path, { waitUntil: "networkidle" });
  expect(response?.status(), path).toBeLessThan(400);
  expect(response?.headers()["content-security-policy"], path).toMatch(/script-src 'self' 'nonce-/);
  // React Router's inline scripts ran: the router exists in the page.
  expect(await page.evaluate(() => Boolean((window as any).__reactRouterContext && (window as any).__reactRouterRouteModules)), `${path} hydrated`).toBe(true);
}

describe("under the Content-Security-Policy", () => {
  it("the public pages, a listing and a signed report hydrate and navigate with no violation", async () => {
    const booking = await acceptedBooking();
    const report = await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
    const { page, context, problems } = await watchedPage();
    for (const path of ["/", "/machines", `/machines/${booking.listing.slug}`, "/inspectors", `/inspectors/${await publicIdOf(booking.inspector.id)}`, "/how-scoring-works", `/reports/${report.id}`, "/sign-in"]) {
      await visitHydrated(page, path);
    }
    // The report page again, now sent from the page cache with this answer's nonce, and its units switched
    // by a client-side navigation (a kept data answer the second time).
    for (let round = 0; round < 2; round += 1) {
      await visitHydrated(page, `/reports/${report.id}`);
      await page.getByRole("group", { name: "Units" }).getByRole("link", { name: "in" }).click();
      await page.waitForURL(/units=inch/);
      await expect.poll(() => page.locator('a[href*="certificate.pdf?units=inch"]').count()).toBe(1);
    }
    // A client-side navigation (fetching `.data`) and a search through the API.
    await page.goto("/", { waitUntil: "networkidle" });
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Machines" }).click();
    await page.waitForURL("**/machines");
    await page.waitForLoadState("networkidle");
    expect(problems).toEqual([]);
    await context.close();
  });

  it("a seller uploads a photo straight to the bucket and goes through their pages with no violation", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const cookie = await signInCookie(seller.email, seller.password);
    const listingId = await createListingAs(cookie);
    const { page, context, problems } = await watchedPage();
    await signInPage(page, seller.email, seller.password, `/sell/listings/${listingId}`);
    await page.waitForLoadState("networkidle");
    await page.locator('#photos input[type="file"]').setInputFiles([{ name: "headstock.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps() }]);
    await page.locator('#photos [data-upload-state="done"]').first().waitFor({ timeout: 30_000 });
    await expect.poll(() => page.locator('ol[aria-label="Photos in gallery order"] img').count()).toBe(1);
    for (const path of ["/sell", "/sell/new", "/account", "/bookings"]) await visitHydrated(page, path);
    expect(problems).toEqual([]);
    await context.close();
  });

  it("an inspector's report entry page and a staff page run with no violation", async () => {
    const booking = await acceptedBooking();
    const { page, context, problems } = await watchedPage();
    await signInPage(page, booking.inspector.email, booking.inspector.password, `/inspector/bookings/${booking.bookingId}/report`);
    await visitHydrated(page, `/inspector/bookings/${booking.bookingId}/report`);
    await visitHydrated(page, "/inspector/profile");
    await context.close();
    const admin = await createTestUser({ roles: ["admin"] });
    const staff = await watchedPage();
    await signInPage(staff.page, admin.email, admin.password, "/admin/payments");
    for (const path of ["/admin/payments", "/admin/users", "/admin/inspector-applications"]) await visitHydrated(staff.page, path);
    expect([...problems, ...staff.problems]).toEqual([]);
    await staff.context.close();
  });
});
