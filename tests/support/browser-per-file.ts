// What every browser test file repeats: one Chromium per file, and screenshots at the three sizes a flow is
// looked at. Kept apart from browser.ts, which the bench imports outside Vitest.
import { mkdirSync } from "node:fs";
import type { Browser, Locator, Page } from "playwright-core";
import { afterAll, beforeAll, expect } from "vitest";
import { launchBrowser } from "./browser";

/** The sizes every user-facing flow is looked at: desktop, tablet and phone. */
export const viewports = {
  desktop: { width: 1280, height: 900 },
  tablet: { width: 820, height: 1180 },
  phone: { width: 390, height: 844 },
} as const;

/** One Chromium for the test file: launched before its tests, closed after them. Call at the top level. */
export function chromiumPerFile(): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error("Chromium is not running: call chromiumPerFile() at the top level of the test file");
    return browser;
  };
}

/**
 * The page (or one part of it) at desktop, tablet and phone sizes, as `<folder>/<name>-<size>.png`, then back
 * at the size it had. `noSidewaysScroll` fails the test where the page scrolls sideways at a size.
 */
export async function screenshotAtEachSize(
  page: Page,
  folder: string,
  name: string,
  options: { part?: Locator; noSidewaysScroll?: boolean } = {},
) {
  mkdirSync(folder, { recursive: true });
  const original = page.viewportSize();
  for (const [label, size] of Object.entries(viewports)) {
    await page.setViewportSize(size);
    await page.waitForTimeout(150);
    if (options.noSidewaysScroll) {
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, `${name} scrolls sideways at ${label} size`).toBeLessThanOrEqual(0);
    }
    const file = `${folder}/${name}-${label}.png`;
    if (options.part) await options.part.screenshot({ path: file });
    else await page.screenshot({ path: file, fullPage: true });
  }
  if (original) await page.setViewportSize(original);
}
