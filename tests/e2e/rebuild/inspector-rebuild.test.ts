// The inspector booked to visit a reconditioned lathe enters its rebuild record for the seller, on a desktop, a
// tablet and a phone: from the booking's page, instruments listed and chosen per test, readings as found and as
// rebuilt, published. The listing then says the record was entered by that inspector and is not verified.
// Also looks at the correction planner and the rebuild pages at each size.
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking } from "../../support/reports";

const browser = chromiumPerFile();
const shots = "/tmp/rebuild-inspector-screenshots";
const hydrated = (page: Page) => page.waitForFunction(() => Boolean((window as any).__reactRouterRouteModules));

async function mandrel(page: Page, values: [string, string, string, string]) {
  const card = page.locator("#test-L-SP-PAR-V");
  await card.getByLabel(/^Near, spindle at 0°/).fill(values[0]);
  await card.getByLabel(/^Near, turned 180°/).fill(values[1]);
  await card.getByLabel(/^Far, spindle at 0°/).fill(values[2]);
  await card.getByLabel(/^Far, turned 180°/).fill(values[3]);
}

describe("an inspector enters a rebuild record", () => {
  for (const [size, viewport] of Object.entries(viewports)) {
    it(`from the booking's page, with an instrument chosen per test, on a ${size}`, async () => {
      const { inspector, bookingId, listing } = await acceptedBooking();
      const { context, page } = await newRecordedPage(browser(), viewport);
      await signInPage(page, inspector.email, inspector.password, `/inspector/bookings/${bookingId}`);
      await page.goto(`/inspector/bookings/${bookingId}`, { waitUntil: "networkidle" });
      await Promise.all([page.waitForURL((url) => url.pathname === `/sell/listings/${listing.id}/rebuild`), page.getByRole("link", { name: "Enter its rebuild record" }).click()]);
      await page.waitForLoadState("networkidle");
      await hydrated(page);
      // The address changes as the navigation starts: wait for the record's own words, not the booking page's.
      await page.locator("main").getByText(/marked as entered by you/).first().waitFor();
      expect(await page.getByRole("button", { name: "Yes, the same machine" }).count()).toBe(0);

      // The instrument typed on the record is offered in each test's "Instrument" choice.
      await page.getByRole("button", { name: "+ Add an instrument" }).click();
      await page.getByLabel("Make, model, serial").fill("Feldin lever indicator 0.001 mm");
      await page.getByLabel(/^Resolution \(/).first().fill("1");
      const instrumentChoice = page.locator("#test-L-SP-PAR-V").getByLabel("Instrument", { exact: true });
      await expect.poll(() => instrumentChoice.locator("option").allTextContents()).toContain("1. Feldin lever indicator 0.001 mm (1 µm)");
      await instrumentChoice.selectOption({ label: "1. Feldin lever indicator 0.001 mm (1 µm)" });

      const lastMonth = new Date(Date.now() - 30 * 86_400_000).toISOString().slice(0, 10);
      const today = new Date().toISOString().slice(0, 10);
      await page.getByLabel("Measured on").fill(lastMonth);
      await mandrel(page, ["0", "0", "60", "40"]);
      await expect.poll(() => page.locator("#test-L-SP-PAR-V").textContent()).toContain("Fails");
      await page.getByRole("tab", { name: /As rebuilt/ }).click();
      await page.getByLabel("Measured on").fill(today);
      await mandrel(page, ["0", "0", "30", "10"]);
      await page.locator("#test-L-SP-PAR-V").getByLabel("Instrument", { exact: true }).selectOption({ label: "1. Feldin lever indicator 0.001 mm (1 µm)" });
      await expect.poll(() => page.locator("#test-L-SP-PAR-V").textContent()).toContain("Within");
      await page.getByLabel("Headstock shimmed or realigned").check();
      await page.getByLabel("Notes on the work").fill("Rear pad shimmed 75 µm while I watched; readings taken by me.");
      if (size === "tablet") await screenshotAtEachSize(page, shots, "inspector-rebuild-entry", { noSidewaysScroll: true });
      else await page.screenshot({ path: `${shots}/inspector-rebuild-entry-${size}-own.png`, fullPage: true });

      await Promise.all([page.waitForURL((url) => url.pathname === `/machines/${listing.slug}`, { timeout: 30_000 }), page.getByRole("button", { name: "Publish on the listing" }).click()]);
      await page.waitForLoadState("networkidle");
      const standing = await page.locator("#rebuild").getByTestId("rebuild-standing").textContent();
      expect(standing).toContain("Entered by inspector Aldo Verrin.");
      expect(standing).toContain("not verified");
      expect(standing).not.toMatch(/confirmed/i);
      // A phone reads each test as a card; wider screens the table with its plot column.
      expect(await page.getByTestId("rebuild-cards").isVisible()).toBe(size === "phone");
      expect(await page.locator("#rebuild table").isVisible()).toBe(size !== "phone");
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, `the listing scrolls sideways on a ${size}`).toBeLessThanOrEqual(0);
      await page.locator("#rebuild").screenshot({ path: `${shots}/inspector-rebuild-listing-${size}.png` });
      await context.close();
    }, 120_000);
  }

  it("the correction planner fits a tablet and a phone", async () => {
    const { inspector } = await acceptedBooking();
    const { context, page } = await newRecordedPage(browser(), viewports.tablet);
    await signInPage(page, inspector.email, inspector.password, "/tools/corrections");
    await page.goto("/tools/corrections", { waitUntil: "networkidle" });
    await hydrated(page);
    // A result with its sketch and formula in each card, as a rebuilder at the machine would see it.
    const tilt = page.locator("#tilt");
    await tilt.getByLabel(/Inclination over the measuring length/).fill("50");
    await tilt.getByLabel(/Distance between the seating pads/).fill("450");
    await expect.poll(() => tilt.getByRole("status").textContent()).toContain("Raise the rear pad by 75 µm");
    await screenshotAtEachSize(page, shots, "correction-planner", { noSidewaysScroll: true });
    await screenshotAtEachSize(page, shots, "correction-planner-tilt", { part: tilt });
    await context.close();
  }, 120_000);
});
