import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isLocal, launchBrowser, newRecordedPage } from "../../support/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("home page", () => {
  it("speaks to dealers, buyers and inspectors, set in the bundled Manrope, with no request leaving localhost", async () => {
    const { context, page, requests } = await newRecordedPage(browser);
    await page.goto("/", { waitUntil: "networkidle" });
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(/used lathe/i);
    for (const audience of ["dealers", "buyers", "inspectors"]) {
      await expect(page.locator(`[data-audience="${audience}"]`).count()).resolves.toBe(1);
    }
    const fontLoaded = await page.evaluate(async () => {
      await document.fonts.ready;
      return document.fonts.check('700 16px "Manrope"') && [...document.fonts].some((font) => font.family.includes("Manrope") && font.status === "loaded");
    });
    expect(fontLoaded).toBe(true);
    const fontRequests = requests.filter((url) => /manrope.*\.woff2?/i.test(url));
    expect(fontRequests.length).toBeGreaterThan(0);
    expect(requests.filter((url) => !isLocal(url))).toEqual([]);
    await context.close();
  });

  it("fits a phone screen without sideways scrolling and opens its menu", async () => {
    const { context, page } = await newRecordedPage(browser, { width: 390, height: 844 });
    await page.goto("/", { waitUntil: "networkidle" });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await page.getByRole("button", { name: "Open menu" }).click();
    await expect(page.locator("#mobile-navigation").isVisible()).resolves.toBe(true);
    await context.close();
  });
});
