// Units as the reader sees them, read from the rendered text (CSS text-transform included): no heading that
// carries a unit is upper-cased (Chromium draws "µm" upper-cased as a Greek capital Mu, which reads "MM",
// a factor-1000 trap over boxes that take micrometres), machine sizes are quoted as the trade does, test
// titles give their lengths in the reader's units, countries are named and dates have one style.
import { mkdirSync } from "node:fs";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

const shots = "/tmp/units-screenshots";
const sizes = { desktop: { width: 1280, height: 900 }, tablet: { width: 820, height: 1180 }, phone: { width: 390, height: 844 } };
const GREEK_CAPITAL_MU = "\u039C";
const oneDateStyle = /\b\d{1,2} (Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec) \d{4}\b/;

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

/** The page's text as drawn: innerText applies text-transform, textContent does not. */
const renderedText = (page: Page) => page.evaluate(() => document.body.innerText);

async function shoot(page: Page, name: string) {
  for (const [label, size] of Object.entries(sizes)) {
    await page.setViewportSize(size);
    await page.waitForTimeout(100);
    await page.screenshot({ path: `${shots}/${name}-${label}.png`, fullPage: label !== "desktop" ? false : true });
  }
}

function expectNoUpperCasedUnit(text: string) {
  expect(text).not.toContain(GREEK_CAPITAL_MU);
  expect(text).not.toMatch(/\((MM|IN|ΜM|MM\/M)\)/);
}

describe("units as the reader sees them", () => {
  it("the report form's reading headers say µm (or in) as written, in millimetres and in inches", { timeout: 120_000 }, async () => {
    for (const inspectorUnits of ["mm", "inch"] as const) {
      const booked = await acceptedBooking({ inspectorUnits });
      const { context, page } = await newRecordedPage(browser, sizes.tablet);
      const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
      await signInPage(page, booked.inspector.email, booked.inspector.password, entryPath);
      await page.waitForURL((url) => url.pathname === entryPath);
      await page.locator('[data-test-code="L-CAR-H"]').waitFor();
      const text = await renderedText(page);
      expectNoUpperCasedUnit(text);
      if (inspectorUnits === "mm") {
        expect(text).toMatch(/Reading \(µm\)/i);
        expect(text).toContain("Spindle taper, at 300 mm");
      } else {
        expect(text).toMatch(/Reading \(in\)/i);
        // 300 mm is 11.8 in, quoted as 12 in; no length in millimetres is left in a test's title.
        expect(text).toContain("Spindle taper, at 12 in");
        // The profile's title and why it was suggested, too: 800 mm swing is 31.5 in.
        expect(text).toMatch(/Suggested: Centre lathe, normal class \(swing ≤ 31\.5 in/);
        expect(text).toMatch(/with 13 in swing and 39\.5 in between centres/);
      }
      if (inspectorUnits === "inch") await shoot(page, "entry-inch");
      await context.close();
    }
  });

  it("an inch reader sees trade-rounded sizes, titles in inches, the country by name and one date style", { timeout: 120_000 }, async () => {
    const booked = await acceptedBooking();
    const signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    const reader = await createTestUser({ name: "Orrin Castell", displayUnits: "inch" });
    const { context, page } = await newRecordedPage(browser, sizes.desktop);
    await signInPage(page, reader.email, reader.password, `/machines/${booked.listing.slug}`);
    await page.waitForURL((url) => url.pathname === `/machines/${booked.listing.slug}`);
    await page.getByRole("heading", { level: 1 }).waitFor();
    let text = await renderedText(page);
    expectNoUpperCasedUnit(text);
    // 330 mm swing and 1000 mm between centres: 12.992 in and 39.370 in exactly, quoted 13 in and 39.5 in.
    expect(text).toMatch(/Swing over bed\s*13 in/);
    expect(text).toMatch(/Distance between centres\s*39\.5 in/);
    expect(text).not.toMatch(/\d\.\d{3} in\b/);
    expect(text).toContain("Germany");
    expect(text).not.toMatch(/, DE\b/);
    expect(text).toMatch(oneDateStyle);
    await shoot(page, "listing-inch");

    await page.goto(`/reports/${signed.id}`);
    await page.getByRole("heading", { level: 1 }).waitFor();
    text = await renderedText(page);
    expectNoUpperCasedUnit(text);
    expect(text).toContain("Spindle taper, at 12 in");
    expect(text).not.toMatch(/at \d+ mm/);
    expect(text).toMatch(/Brennwald, Oderland [0-9a-f]{6}, Germany/);
    expect(text).toMatch(new RegExp(`Date of the tests\\s*${oneDateStyle.source}`));
    expect(text).not.toMatch(/\b\d{4}-\d{2}-\d{2}\b/);
    // Plot ticks fall on round inch values: stations along the 1000 mm bed in whole inches, readings in
    // whole ten-thousandths (never 9.843 or a converted 2.5 µm).
    const bedPlot = page.locator('figure svg[aria-label^="L-BED-V"]');
    const stationTicks = await bedPlot.locator('[data-plot="x-tick"]').allTextContents();
    expect(stationTicks.length).toBeGreaterThan(2);
    for (const tick of stationTicks) expect(Number(tick) % 1).toBe(0);
    const readingTicks = await bedPlot.locator('[data-plot="y-tick"]').allTextContents();
    expect(readingTicks.length).toBeGreaterThan(2);
    for (const tick of readingTicks) expect(Math.abs(Number(tick) * 1e5) % 1).toBeLessThan(1e-6);
    // The twist (a level's tilts, µm/m whatever the units) has its stations in inches too.
    const twistPlot = page.locator('figure svg[aria-label^="L-BED-X"]');
    for (const tick of await twistPlot.locator('[data-plot="x-tick"]').allTextContents()) expect(Number(tick) % 1).toBe(0);
    await expect(page.getByRole("img", { name: /^L-BED-X/ }).locator("..").locator("..").textContent()).resolves.toContain("Station (in)");
    await shoot(page, "report-inch");
    await context.close();
  });
});
