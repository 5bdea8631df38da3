// The trade's figures on a listing: a seller enters supply, speeds, lathe details and footprint on the form
// (the lathe's card hides for other kinds of machine), and the listing shows them in the reader's units, at
// desktop, tablet and phone sizes.
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { createTestUser, signInCookie, signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile } from "../../support/browser-per-file";
import { createListingAs, tradeSpecFields } from "../../support/listings";

const browser = chromiumPerFile();

const screenshotDir = process.env.SCREENSHOT_DIR;
async function shoot(page: Page, name: string) {
  if (!screenshotDir) return;
  mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}

const sizes = [
  { name: "desktop", width: 1280, height: 900 },
  { name: "tablet", width: 820, height: 1180 },
  { name: "phone", width: 390, height: 844 },
];

describe("the trade's specification of a listing", () => {
  it("is entered on the form, with the lathe's details for lathes only", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, seller.email, seller.password, "/sell/new");
    await page.waitForURL((url) => url.pathname === "/sell/new");
    const latheCard = page.getByTestId("lathe-details");
    await page.getByLabel("Kind of machine").selectOption("milling_machine");
    await expect.poll(() => latheCard.isHidden()).toBe(true);
    await page.getByLabel("Kind of machine").selectOption("centre_lathe");
    await expect.poll(() => latheCard.isVisible()).toBe(true);

    await page.getByLabel("Condition").selectOption("used");
    await page.getByLabel("Make", { exact: true }).fill("Halvorsen");
    await page.getByLabel("Model", { exact: true }).fill("ML 330");
    await page.getByLabel("Swing over bed (mm)").fill("330");
    await page.getByLabel("Distance between centres (mm)").fill("1000");
    await page.getByLabel("Voltage (V)").fill("400");
    await page.getByLabel("Phases").selectOption("3");
    await page.getByLabel("Frequency").selectOption("50");
    await page.getByLabel("Lowest spindle speed (rpm)").fill("2000");
    await page.getByLabel("Highest spindle speed (rpm)").fill("30");
    await page.getByLabel("Swing over the cross-slide (mm)").fill("200");
    await page.getByLabel("Tailstock taper").fill("Morse taper 4");
    await page.getByLabel("Finest metric pitch (mm)").fill("0.25");
    await page.getByLabel("Coarsest metric pitch (mm)").fill("7");
    await page.getByLabel(`Footprint length (mm)`).fill("2100");
    await page.getByLabel(`Footprint width (mm)`).fill("950");
    await page.getByLabel("Town or city").fill("Eskerud");
    await page.getByLabel("Country").selectOption("NO");
    await page.getByLabel("Asking price").fill("12500");
    await page.getByLabel("Description", { exact: true }).fill("Reground bed, new spindle bearings; runs quietly through all twelve speeds.");
    await page.getByRole("button", { name: "Save draft and add photos" }).click();
    // The reversed speed range is refused at its field, and nothing is saved.
    await expect.poll(() => page.getByText("The highest spindle speed must be at least the lowest.").isVisible()).toBe(true);
    expect(new URL(page.url()).pathname).toBe("/sell/new");
    await shoot(page, "trade-specs-form-error-desktop");

    await page.getByLabel("Lowest spindle speed (rpm)").fill("30");
    await page.getByLabel("Highest spindle speed (rpm)").fill("2000");
    await Promise.all([page.waitForURL((url) => url.pathname.startsWith("/sell/listings/")), page.getByRole("button", { name: "Save draft and add photos" }).click()]);
    // The edit form keeps every figure as typed.
    expect(await page.getByLabel("Tailstock taper").inputValue()).toBe("Morse taper 4");
    expect(await page.getByLabel("Phases").inputValue()).toBe("3");
    expect(await page.getByLabel("Highest spindle speed (rpm)").inputValue()).toBe("2000");
    await page.getByRole("link", { name: "Preview the public page" }).click();
    await page.waitForURL((url) => url.pathname.startsWith("/machines/"));
    const specification = page.locator("section[aria-labelledby=specification]");
    await expect.poll(() => specification.innerText()).toContain("400 V three-phase, 50 Hz");
    const text = await specification.innerText();
    expect(text).toContain("30–2,000 rpm");
    expect(text).toContain("Morse taper 4");
    expect(text).toContain("Metric 0.25–7 mm pitch");
    expect(text).toContain("200 mm");
    expect(text).toContain("2,100 × 950 mm");
    await context.close();
  }, 120_000);

  it("is shown in an inch reader's units, as the trade rounds them, at desktop, tablet and phone sizes", async () => {
    const seller = await createTestUser({ roles: ["seller"], displayUnits: "inch" });
    const cookie = await signInCookie(seller.email, seller.password);
    const inches = { units: "inch", swingOverBed: "13", distanceBetweenCentres: "40", spindleBore: "1.5", weight: "1720", motorPower: "3", swingOverCrossSlide: "8", footprintLength: "82.7", footprintWidth: "37.4" };
    const listingId = await createListingAs(cookie, { ...tradeSpecFields, ...inches });
    for (const size of sizes) {
      const { context, page } = await newRecordedPage(browser(), { width: size.width, height: size.height });
      await signInPage(page, seller.email, seller.password, `/sell/listings/${listingId}`);
      await page.getByRole("link", { name: "Preview the public page" }).click();
      await page.waitForURL((url) => url.pathname.startsWith("/machines/"));
      const specification = page.locator("section[aria-labelledby=specification]");
      const text = await specification.innerText();
      expect(text).toContain("400 V three-phase, 50 Hz");
      expect(text).toContain("40–2,000 rpm");
      // Inch threads first for an inch reader; pitches stay in mm; the footprint to the half inch.
      expect(text).toContain("4–56 threads per inch; metric 0.25–7 mm pitch");
      expect(text).toContain("82.5 × 37.5 in");
      expect(text).toMatch(/Swing over the cross-slide\s+8 in/);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, `the listing scrolls sideways at ${size.name} size`).toBeLessThanOrEqual(0);
      await specification.scrollIntoViewIfNeeded();
      await shoot(page, `trade-specs-listing-${size.name}`);
      await context.close();
    }
  }, 180_000);
});
