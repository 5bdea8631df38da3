// The buyer's story by keyboard alone (filters → result → book), checking after every page change where
// focus is and what was announced: in-app navigation to another page puts focus on its main heading and
// says its title; a filter keeps focus where it was; "Show machines" in the tablet's filter drawer puts
// focus on the results heading.
import type { Browser, Locator, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser } from "../../support/accounts";
import { signInContext } from "../../support/axe";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { certifiedInspector } from "../../support/inspections";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { getListingsApi } from "../../support/search";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const isFocused = (target: Locator) => target.evaluate((element) => element === document.activeElement);

/** Presses Tab (or Shift+Tab) until the target has focus, as a keyboard user would; fails if it never does. */
async function tabTo(page: Page, target: Locator, { backwards = false, limit = 120 } = {}) {
  await target.waitFor();
  for (let presses = 0; presses < limit; presses++) {
    if (await isFocused(target)) return;
    await page.keyboard.press(backwards ? "Shift+Tab" : "Tab");
  }
  throw new Error(`Tab never reached ${target}`);
}

/** What has focus, described: tag, heading level and text. */
const focused = (page: Page) => page.evaluate(() => `${document.activeElement?.tagName.toLowerCase()}: ${document.activeElement?.textContent?.trim().slice(0, 80)}`);
const announced = (page: Page) => page.locator("#route-announcer").textContent();

/** A verified lathe in a region of its own, in the index, with a second inspector who has a free slot there. */
async function verifiedLatheToBook() {
  const booking = await acceptedBooking();
  await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
  const word = booking.listing.region!.split(" ").at(-1)!;
  const freeInspector = await certifiedInspector({ region: booking.listing.region! });
  for (let waited = 0; ; waited += 250) {
    const body = (await (await getListingsApi(`q=${word}&verified=1`)).json()) as { totalHits: number };
    if (body.totalHits === 1) break;
    if (waited > 20_000) throw new Error("the verified lathe did not reach the index");
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return { ...booking, word, freeInspector };
}

describe("the buyer's story by keyboard", () => {
  it("filters, opens a result and books an inspection with focus on each new page's heading", { timeout: 180_000 }, async () => {
    const lathe = await verifiedLatheToBook();
    const buyer = await createTestUser({ name: "Tamsin Quell" });
    const { context, page } = await newRecordedPage(browser);
    await signInContext(context, buyer);
    await page.goto("/machines", { waitUntil: "networkidle" });

    // The first Tab reaches the skip link.
    await page.keyboard.press("Tab");
    expect(await focused(page)).toBe("a: Skip to content");

    // Filters: a filter changes the address, not the page, so focus stays on the box.
    const verifiedOnly = page.getByRole("checkbox", { name: /^Verified only/ });
    await tabTo(page, verifiedOnly);
    await page.keyboard.press("Space");
    await page.waitForURL((url) => url.searchParams.get("verified") === "1");
    expect(await isFocused(verifiedOnly)).toBe(true);
    const words = page.getByLabel("Search words");
    await tabTo(page, words, { backwards: true });
    await page.keyboard.type(lathe.word);
    await page.keyboard.press("Enter");
    await page.waitForURL((url) => url.searchParams.get("q") === lathe.word);
    await expect.poll(() => page.getByTestId("result-count").textContent()).toMatch(/^1 machine/);
    expect(await isFocused(words)).toBe(true);

    // The result: its link is named by its title; the card's figures and badges are read as text after it.
    const card = page.locator(`[data-listing-id="${lathe.listing.id}"]`);
    const title = card.getByRole("link", { name: "Tessmar DL 330", exact: true });
    await tabTo(page, title);
    await page.keyboard.press("Enter");
    await page.waitForURL((url) => url.pathname === `/machines/${lathe.listing.slug}`);
    const listingHeading = page.getByRole("heading", { level: 1, name: "Tessmar DL 330" });
    await expect.poll(() => isFocused(listingHeading)).toBe(true);
    await expect.poll(() => announced(page)).toBe(await page.title());

    // Book: the booking page's heading has focus; inspector, slot, the refund rules and payment by keyboard.
    const book = page.getByRole("link", { name: "Book an inspection" }).first();
    await tabTo(page, book);
    await page.keyboard.press("Enter");
    await page.waitForURL((url) => url.pathname === `/machines/${lathe.listing.slug}/book`);
    const bookingHeading = page.getByRole("heading", { level: 1, name: "Book an on-site inspection" });
    await expect.poll(() => isFocused(bookingHeading)).toBe(true);
    await expect.poll(() => announced(page)).toBe(await page.title());
    expect(await page.title()).toContain("Book an inspection");

    // The inspector with a free slot (the one who filed the report has none left); others may serve the region too.
    // Tab enters the group of inspectors; the arrow keys move (and choose) within it, as in any radio group.
    const inspector = page.locator(`input[name="inspectorId"][value="${lathe.freeInspector.publicId}"]`);
    await inspector.waitFor();
    for (let presses = 0; presses < 120 && !(await page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.name === "inspectorId")); presses++) {
      await page.keyboard.press("Tab");
    }
    for (let presses = 0; presses < 40 && !(await isFocused(inspector)); presses++) await page.keyboard.press("ArrowDown");
    expect(await isFocused(inspector)).toBe(true);
    await page.keyboard.press("Space");
    const slot = page.locator('input[name="slotId"]').first();
    await tabTo(page, slot);
    await page.keyboard.press("Space");
    await tabTo(page, page.getByRole("checkbox", { name: "I have read the refund rules" }));
    await page.keyboard.press("Space");
    const pay = page.getByRole("button", { name: "Continue to payment" });
    await tabTo(page, pay);
    await page.keyboard.press("Enter");
    // The payment page is Stripe's (here its stand-in): a page load of its own.
    await page.waitForURL((url) => !url.pathname.startsWith("/machines/"), { timeout: 20_000 });
    await context.close();
  });

  it("on a tablet, Show machines closes the filter drawer and puts focus on the results heading", { timeout: 60_000 }, async () => {
    const { context, page } = await newRecordedPage(browser, { width: 820, height: 1180 });
    await page.goto("/machines", { waitUntil: "networkidle" });
    const toggle = page.getByRole("button", { name: /^Filters/ });
    await tabTo(page, toggle);
    await page.keyboard.press("Enter");
    expect(await toggle.getAttribute("aria-expanded")).toBe("true");
    await tabTo(page, page.getByRole("checkbox", { name: /^Verified only/ }));
    await page.keyboard.press("Space");
    await page.waitForURL((url) => url.searchParams.get("verified") === "1");
    await tabTo(page, page.getByRole("button", { name: "Show machines" }));
    await page.keyboard.press("Enter");
    expect(await toggle.getAttribute("aria-expanded")).toBe("false");
    const heading = page.getByTestId("result-count");
    await expect.poll(() => isFocused(heading)).toBe(true);
    expect(await heading.evaluate((element) => element.tagName)).toBe("H2");
    // Scrolled to where the heading stands once the drawer has closed.
    const inView = () => heading.evaluate((element) => element.getBoundingClientRect().top >= 0 && element.getBoundingClientRect().bottom <= window.innerHeight);
    await expect.poll(inView).toBe(true);
    await context.close();
  });
});
