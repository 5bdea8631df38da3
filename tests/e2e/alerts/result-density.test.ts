// Search results on a phone show at least two machines per screen; on a wide screen the buyer can switch to a
// compact list, kept in the address (a plain link: no script is added to the search page for it).
import { mkdirSync } from "node:fs";
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { queueListingIndexUpdate } from "~/modules/search/indexing.server";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { publishedLathe } from "../../support/inspections";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { getListingsApi } from "../../support/search";

const db = getDatabase();
const shots = process.env.SCREENSHOT_DIR ?? "/tmp/alerts-screenshots";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

async function cardHeights(page: Page) {
  return page.locator("[data-listing-id]").evaluateAll((cards) => cards.map((card) => card.getBoundingClientRect().height));
}

describe("result density", () => {
  it("fits two results on a phone screen and offers a compact list on a wide screen", { timeout: 120_000 }, async () => {
    // One verified lathe (key figures on its card) and two more in the same region, found by its word.
    const booking = await acceptedBooking();
    await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
    const region = booking.listing.region!;
    const word = region.split(" ").at(-1)!;
    for (const _ of [1, 2]) {
      const lathe = await publishedLathe(region);
      await db.update(listings).set({ swingOverBedMm: 330, distanceBetweenCentresMm: 1000 }).where(eq(listings.id, lathe.id));
      await queueListingIndexUpdate(lathe.id);
    }
    await expect
      .poll(async () => ((await (await getListingsApi(`q=${word}`)).json()) as { totalHits: number; hits: { verified: boolean }[] }).hits.filter((hit) => hit.verified).length === 1 &&
        ((await (await getListingsApi(`q=${word}`)).json()) as { totalHits: number }).totalHits, { timeout: 30_000 })
      .toBe(3);

    const phone = await newRecordedPage(browser, { width: 390, height: 844 });
    await phone.page.goto(`/machines?q=${word}`);
    await phone.page.locator(`[data-listing-id="${booking.listing.id}"]`).getByLabel("Key figures of the current report").waitFor();
    const onPhone = await cardHeights(phone.page);
    expect(onPhone).toHaveLength(3);
    // Two whole results and the gap between them within one 844 px screen.
    for (const height of onPhone) expect(height).toBeLessThanOrEqual(410);
    expect(await phone.page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    await phone.page.locator("[data-testid=results]").scrollIntoViewIfNeeded();
    await phone.page.screenshot({ path: `${shots}/results-phone.png` });
    await phone.page.screenshot({ path: `${shots}/results-phone-full.png`, fullPage: true });
    await phone.context.close();

    const tablet = await newRecordedPage(browser, { width: 820, height: 1180 });
    await tablet.page.goto(`/machines?q=${word}`);
    await tablet.page.locator("[data-listing-id]").nth(2).waitFor();
    await tablet.page.screenshot({ path: `${shots}/results-tablet.png`, fullPage: true });
    await tablet.page.getByRole("link", { name: "List view" }).click();
    await tablet.page.waitForURL((url) => url.searchParams.get("view") === "list");
    await tablet.page.screenshot({ path: `${shots}/results-list-tablet.png`, fullPage: true });
    await tablet.context.close();

    const desktop = await newRecordedPage(browser, { width: 1280, height: 900 });
    await desktop.page.goto(`/machines?q=${word}`);
    await desktop.page.locator("[data-listing-id]").nth(2).waitFor();
    await desktop.page.screenshot({ path: `${shots}/results-desktop.png`, fullPage: true });
    await desktop.page.getByRole("link", { name: "List view" }).click();
    await desktop.page.waitForURL((url) => url.searchParams.get("view") === "list");
    await expect.poll(async () => Math.max(...(await cardHeights(desktop.page)))).toBeLessThanOrEqual(160);
    // The list stays a list when the sort changes, and the link goes back to cards.
    await desktop.page.getByLabel("Sort").selectOption("price-ascending");
    await desktop.page.waitForURL((url) => url.searchParams.get("sort") === "price-ascending");
    expect(new URL(desktop.page.url()).searchParams.get("view")).toBe("list");
    await desktop.page.locator('[data-view="list"] [data-listing-id]').nth(2).waitFor();
    await desktop.page.screenshot({ path: `${shots}/results-list-desktop.png`, fullPage: true });
    await desktop.page.getByRole("link", { name: "Card view" }).click();
    await desktop.page.waitForURL((url) => !url.searchParams.has("view"));
    await desktop.page.locator('[data-view="cards"] [data-listing-id]').nth(2).waitFor();
    await desktop.context.close();
  });
});
