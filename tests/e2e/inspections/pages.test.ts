import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { certifiedInspector, heldBooking } from "../../support/inspections";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const shots = process.env.SCREENSHOT_DIR;
const sizes = [
  { name: "phone", width: 390, height: 844 },
  { name: "desktop", width: 1280, height: 900 },
];

async function visit(user: { email: string; password: string } | null, pages: Array<{ path: string; heading: RegExp; shot: string }>) {
  for (const size of sizes) {
    const { context, page } = await newRecordedPage(browser, size);
    if (user) await signInPage(page, user.email, user.password);
    for (const target of pages) {
      await page.goto(target.path, { waitUntil: "networkidle" });
      await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(target.heading);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, `${target.path} scrolls sideways on a ${size.name}`).toBeLessThanOrEqual(0);
      if (shots) await page.screenshot({ path: `${shots}/${target.shot}-${size.name}.png`, fullPage: true });
    }
    await context.close();
  }
}

describe("inspections pages on phone and desktop", () => {
  it("show inspectors, their profile and the safety cautions to visitors", async () => {
    const inspector = await certifiedInspector();
    await visit(null, [
      { path: "/inspectors", heading: /Certified inspectors/, shot: "inspectors" },
      { path: `/inspectors/${inspector.publicId}`, heading: new RegExp(inspector.name), shot: "inspector-public" },
    ]);
  });

  it("give the inspector their profile, slots and work, and the buyer their bookings", async () => {
    const held = await heldBooking();
    await visit(held.inspector, [
      { path: "/inspector/profile", heading: /Your inspector profile/, shot: "inspector-profile" },
      { path: "/inspector/bookings", heading: /Your inspection work/, shot: "inspector-bookings" },
    ]);
    await visit(held.buyer, [
      { path: "/bookings", heading: /Your inspection bookings/, shot: "buyer-bookings" },
      { path: `/bookings/${held.bookingId}`, heading: /Inspection of the/, shot: "booking" },
      { path: `/bookings/${held.bookingId}/checkout-cancelled`, heading: /Nothing was charged/, shot: "checkout-cancelled" },
    ]);
  });

  it("show staff the payments with their refunds", async () => {
    const admin = await createTestUser({ roles: ["admin"] });
    await visit(admin, [{ path: "/admin/payments", heading: /Payments/, shot: "admin-payments" }]);
  });
});
