// The correction planner beside the machine: a dealer works out a headstock shim from a mandrel reading
// (docs/correction-planner.md, example 1a), the scraping depths and the bearing back-off, on a desktop, a tablet
// and a phone, in mm and in inches.
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile } from "../../support/browser-per-file";

const browser = chromiumPerFile();

const screenshotDir = process.env.SCREENSHOT_DIR;
async function shoot(page: Page, name: string) {
  if (!screenshotDir) return;
  mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}

async function openPlanner(page: Page) {
  await page.goto("/tools/corrections", { waitUntil: "networkidle" });
  await page.waitForFunction(() => Boolean((window as any).__reactRouterRouteModules));
}

describe("the correction planner", () => {
  for (const [name, viewport] of [
    ["desktop", { width: 1280, height: 900 }],
    ["tablet", { width: 820, height: 1180 }],
    ["phone", { width: 390, height: 844 }],
  ] as const) {
    it(`plans a headstock shim, scraping and a bearing back-off on a ${name}`, async () => {
      const dealer = await createTestUser({ roles: ["seller"] });
      const { context, page } = await newRecordedPage(browser(), viewport);
      await signInPage(page, dealer.email, dealer.password, "/tools/corrections");
      await openPlanner(page);
      await expect(page.getByRole("heading", { name: "Correction planner" }).isVisible()).resolves.toBe(true);

      const tilt = page.locator("#tilt");
      await tilt.getByLabel(/Inclination over the measuring length/).fill("20");
      await tilt.getByLabel(/Distance between the seating pads/).fill("450");
      await expect.poll(() => tilt.getByRole("status").textContent()).toContain("Raise the rear pad by 30 µm");
      expect(await tilt.getByText("c = δ × D ÷ L = 20 × 450 ÷ 300 = 30 µm").count()).toBe(1);
      expect(await tilt.getByTestId("planner-sketch").count()).toBe(1);
      expect(await tilt.getByRole("note").textContent()).toMatch(/Lock out.*Support its weight/);

      // A typo is refused at its field, with nothing computed.
      await tilt.getByLabel(/Distance between the seating pads/).fill("-450");
      await expect.poll(() => tilt.getByRole("alert").textContent()).toContain("greater than 0");
      await tilt.getByLabel(/Distance between the seating pads/).fill("450");

      const scraping = page.locator("#scraping");
      await scraping.getByLabel(/Shim that made the test read true/).fill("40");
      await scraping.getByLabel(/Distance from the shim/).fill("400");
      await scraping.getByLabel(/Pad positions/).fill("0 100 200 300 400");
      await expect.poll(() => scraping.getByRole("status").textContent()).toContain("Pad at 400 mm: scrape 40 µm");

      const bearing = page.locator("#bearing");
      await bearing.getByLabel(/thread pitch/).fill("1,5");
      await bearing.getByLabel(/End float read back/).fill("8");
      await expect.poll(() => bearing.getByTestId("end-float-verdict").textContent()).toContain("back off a further 2.9°");

      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, "the planner scrolls sideways").toBeLessThanOrEqual(0);
      await shoot(page, `correction-planner-${name}`);

      // In inches: the same shim, 0.0008 in over 12 in with the pads 18 in apart (example 1c).
      await page.getByLabel("inches").check();
      await tilt.getByLabel(/Inclination over the measuring length/).fill("0.0008");
      await tilt.getByLabel(/Distance between the seating pads/).fill("18");
      await expect.poll(() => tilt.getByRole("status").textContent()).toContain("Raise the rear pad by 0.0012 in");
      await context.close();
    });
  }

  it("is for sellers and inspectors: a buyer is refused", async () => {
    const buyer = await createTestUser({ roles: ["buyer"] });
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, buyer.email, buyer.password);
    const response = await page.goto("/tools/corrections");
    expect(response?.status()).toBe(403);
    await context.close();
  });
});
