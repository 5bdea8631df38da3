// Comparing machines: a buyer filters by supply, ticks machines in the search results (a plain GET form, no
// script) or among watched machines, and reads their specifications and verified figures side by side, the
// smaller deviation marked in words; the link is shareable, bounded to four, and shows listings that are no
// longer public as unavailable. At desktop, tablet and phone sizes.
import { mkdirSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings, listingWatches } from "~/modules/listings/schema";
import { signInPage } from "../../support/accounts";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie, type AcceptedBooking } from "../../support/reports";
import { getListingsApi, insertListings, uniqueWord } from "../../support/search";

const db = getDatabase();
let browser: Browser;
const word = uniqueWord("cmp");
let tight: AcceptedBooking;
let loose: AcceptedBooking;
let withdrawnSlug: string;
let draftSlug: string;

const screenshotDir = process.env.SCREENSHOT_DIR;
async function shoot(page: Page, name: string) {
  if (!screenshotDir) return;
  mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}

beforeAll(async () => {
  browser = await launchBrowser();
  tight = await acceptedBooking({ make: word, model: "Tight 330" });
  loose = await acceptedBooking({ make: word, model: "Loose 330" });
  // Only the tight one runs on three-phase 400 V; written before signing, so that the index has it with the report.
  await db.update(listings).set({ supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50 }).where(eq(listings.id, tight.listing.id));
  await db.update(listings).set({ supplyVoltage: 230, supplyPhases: 1, supplyFrequencyHz: 50 }).where(eq(listings.id, loose.listing.id));
  await fileAndSign(await inspectorCookie(tight.inspector), tight.bookingId, completeForm({ "L-SP-SLIP": { kind: "extremes", max: "2", min: "0", instrumentId: "i1" } }));
  await fileAndSign(await inspectorCookie(loose.inspector), loose.bookingId, completeForm({ "L-SP-SLIP": { kind: "extremes", max: "6", min: "0", instrumentId: "i1" } }));
  const [withdrawn, draft] = await insertListings([
    { make: word, model: "Gone 1", status: "withdrawn" },
    { make: word, model: "Hidden 2", status: "draft", publishedAt: null },
  ]);
  withdrawnSlug = withdrawn!.slug;
  draftSlug = draft!.slug;
  // The index has both verified machines once their reports are signed.
  const deadline = Date.now() + 30_000;
  for (;;) {
    const answer = (await (await getListingsApi(`q=${word}&verified=1`)).json()) as { totalHits: number };
    if (answer.totalHits === 2) break;
    if (Date.now() > deadline) throw new Error("the index never showed both verified machines");
    await new Promise((resolve) => setTimeout(resolve, 300));
  }
}, 180_000);

afterAll(async () => {
  await browser?.close();
});

describe("comparing machines", () => {
  it("filters by supply, then ticks machines in the results and compares them, the smaller deviation marked in words", async () => {
    const { context, page } = await newRecordedPage(browser);
    await page.goto(`/machines?q=${word}`);
    await expect.poll(() => page.getByTestId("result-count").innerText()).toContain("2 machines");
    await page.getByLabel("Runs on").selectOption("3x400");
    await expect.poll(() => page.getByTestId("result-count").innerText(), { timeout: 15_000 }).toContain("1 machine");
    expect(page.url()).toContain("supply=3x400");
    expect(await page.getByTestId("results").innerText()).toContain("Tight 330");
    await page.getByLabel("Runs on").selectOption("");
    await expect.poll(() => page.getByTestId("result-count").innerText(), { timeout: 15_000 }).toContain("2 machines");

    await page.getByLabel(`Compare ${word} Tight 330`).check();
    await page.getByLabel(`Compare ${word} Loose 330`).check();
    await shoot(page, "compare-search-results-desktop");
    await Promise.all([page.waitForURL((url) => url.pathname === "/compare"), page.getByRole("button", { name: "compare the ticked machines" }).click()]);
    const compared = new URL(page.url()).searchParams.getAll("m");
    expect(new Set(compared)).toEqual(new Set([tight.listing.slug, loose.listing.slug]));

    const table = page.getByTestId("comparison");
    const slipRow = table.locator("tr", { has: page.locator("th", { hasText: /^Axial slip$/ }) });
    const tightColumn = compared.indexOf(tight.listing.slug);
    const cells = slipRow.locator("td");
    expect(await cells.nth(tightColumn).innerText()).toContain("Best of these");
    expect(await cells.nth(1 - tightColumn).innerText()).not.toContain("Best of these");
    expect(await cells.nth(tightColumn).innerText()).toMatch(/report of \d{1,2} \w{3} \d{4}/);
    const text = await table.innerText();
    expect(text).toContain("400 V three-phase, 50 Hz");
    expect(text).toContain("230 V single-phase, 50 Hz");
    expect(text).toMatch(/Grade [A-D], measured/);
    expect(await page.getByText("lower is better", { exact: false }).first().isVisible()).toBe(true);
    await context.close();
  }, 120_000);

  it("keeps the compare boxes usable in the phone rows, the tablet cards and the desktop list view", async () => {
    for (const size of [
      { name: "phone", width: 390, height: 844, query: "" },
      { name: "tablet", width: 820, height: 1180, query: "" },
      { name: "desktop-list", width: 1280, height: 900, query: "&view=list" },
    ]) {
      const { context, page } = await newRecordedPage(browser, size);
      await page.goto(`/machines?q=${word}${size.query}`);
      const box = page.getByLabel(`Compare ${word} Tight 330`);
      await box.check();
      expect(await box.isChecked()).toBe(true);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, `the search page scrolls sideways at ${size.name} size`).toBeLessThanOrEqual(0);
      await shoot(page, `compare-search-results-${size.name}`);
      await context.close();
    }
  }, 90_000);

  it("is a shareable link: public machines for anyone, unavailable for withdrawn and unpublished ones, at three sizes", async () => {
    const link = `/compare?m=${tight.listing.slug}&m=${loose.listing.slug}&m=${withdrawnSlug}&m=${draftSlug}`;
    for (const size of [
      { name: "desktop", width: 1280, height: 900 },
      { name: "tablet", width: 820, height: 1180 },
      { name: "phone", width: 390, height: 844 },
    ]) {
      const { context, page } = await newRecordedPage(browser, size);
      const response = await page.goto(link);
      expect(response?.status()).toBe(200);
      const table = page.getByTestId("comparison");
      expect(await table.locator("thead th").count()).toBe(4);
      expect(await table.getByText("Unavailable", { exact: true }).count()).toBe(2);
      // Nothing of the draft leaks: not its model, not its seller.
      expect(await page.content()).not.toContain("Hidden 2");
      await shoot(page, `compare-${size.name}`);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      const wide = await page.evaluate(() =>
        [...document.querySelectorAll("body *")]
          .filter((element) => element.getBoundingClientRect().right > window.innerWidth + 1 && !element.closest("[data-testid=comparison] table"))
          .slice(0, 6)
          .map((element) => `${element.tagName}.${element.className} ${Math.round(element.getBoundingClientRect().right)}`),
      );
      expect(overflow, `the page scrolls sideways at ${size.name} size: ${wide.join(" | ")}`).toBeLessThanOrEqual(0);
      await context.close();
    }
  }, 120_000);

  it("refuses more than four machines and malformed addresses with a message", async () => {
    const { context, page } = await newRecordedPage(browser);
    const five = await page.goto(`/compare?${["a-1", "b-2", "c-3", "d-4", "e-5"].map((slug) => `m=${slug}`).join("&")}`);
    expect(five?.status()).toBe(400);
    expect(await page.locator("main, body").first().innerText()).toContain("Compare at most 4 machines");
    const malformed = await page.goto(`/compare?m=${encodeURIComponent("../../etc/passwd")}`);
    expect(malformed?.status()).toBe(400);
    await context.close();
  }, 60_000);

  it("compares watched machines", async () => {
    await db.insert(listingWatches).values([
      { listingId: tight.listing.id, userId: tight.buyer.id },
      { listingId: loose.listing.id, userId: tight.buyer.id },
    ]);
    const { context, page } = await newRecordedPage(browser, { width: 390, height: 844 });
    await signInPage(page, tight.buyer.email, tight.buyer.password, "/account/watched");
    await page.getByLabel(`Compare ${word} Tight 330`).check();
    await page.getByLabel(`Compare ${word} Loose 330`).check();
    await shoot(page, "compare-watched-phone");
    await Promise.all([page.waitForURL((url) => url.pathname === "/compare"), page.getByRole("button", { name: "Compare the ticked machines" }).click()]);
    expect(new Set(new URL(page.url()).searchParams.getAll("m"))).toEqual(new Set([tight.listing.slug, loose.listing.slug]));
    await context.close();
  }, 60_000);
});
