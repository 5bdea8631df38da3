// The buyer's story in Chromium: filter lathes by verified spindle run-out in µm and in inches, open one and
// read its report, save the search, and get the e-mail when another matching lathe is verified.
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { appOrigin, isLocal, launchBrowser, newRecordedPage } from "../../support/browser";
import { latestEmailTo, linkIn } from "../../support/mailbox";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { getListingsApi } from "../../support/search";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await setSearchLatency(0);
  await browser?.close();
});

// Set SCREENSHOT_DIR to keep phone and desktop screenshots of the search page's states.
const screenshotDir = process.env.SCREENSHOT_DIR;
async function shoot(page: Page, name: string) {
  if (!screenshotDir) return;
  mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}
async function shootOnPhone(url: string, name: string, cookies: Awaited<ReturnType<BrowserContext["cookies"]>>, waitFor: string) {
  const phone = await newRecordedPage(browser, { width: 390, height: 844 });
  await phone.context.addCookies(cookies);
  await phone.page.goto(url, { waitUntil: "networkidle" });
  await phone.page.locator(waitFor).first().waitFor();
  const overflow = await phone.page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow, `${name} scrolls sideways on a phone`).toBeLessThanOrEqual(0);
  await shoot(phone.page, `${name}-phone`);
  await phone.context.close();
}

// The shared search stand-in's latency switch: slower than the app's timeout makes the page fall back.
async function setSearchLatency(ms: number) {
  await fetch(`${process.env.MEILISEARCH_HOST}/_stand-in/latency`, {
    method: "POST",
    headers: { authorization: `Bearer ${process.env.MEILISEARCH_API_KEY}`, "content-type": "application/json" },
    body: JSON.stringify({ ms }),
  });
}

/** A lathe with a signed report (spindle run-out 4 µm, grade B), indexed by the app's worker. */
async function verifiedLathe() {
  const booking = await acceptedBooking();
  await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
  // The region ends in a word of its own ("Oderland 3f9a1c"), and region is searchable text.
  const word = booking.listing.region!.split(" ").at(-1)!;
  for (let waited = 0; ; waited += 250) {
    const body = (await (await getListingsApi(`q=${word}&verified=1`)).json()) as { totalHits: number };
    if (body.totalHits === 1) break;
    if (waited > 20_000) throw new Error("the verified lathe did not reach the index");
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return { ...booking, word };
}

describe("the buyer's story", () => {
  it("filters verified lathes by spindle run-out, opens one, reads the report, saves the search and gets an alert", { timeout: 180_000 }, async () => {
    const lathe = await verifiedLathe();
    const buyer = await createTestUser({ name: "Ilka Brandt" });
    const { context, page, requests } = await newRecordedPage(browser);
    await signInPage(page, buyer.email, buyer.password, "/machines");
    await page.waitForURL((url) => url.pathname === "/machines");
    // Set on the document: a full page load would lose it.
    await page.evaluate(() => Object.assign(window, { __stillTheSamePage: true }));

    // A box's name carries its count ("Centre lathe 3").
    await page.getByRole("checkbox", { name: /^Centre lathe/ }).check();
    await page.waitForURL((url) => url.searchParams.get("category") === "centre_lathe");
    await page.getByRole("checkbox", { name: /^Verified only/ }).check();
    await page.waitForURL((url) => url.searchParams.get("verified") === "1");
    await page.getByLabel("Spindle run-out at most (µm)").fill("5");
    await page.getByLabel("Spindle run-out at most (µm)").press("Enter");
    await page.waitForURL((url) => url.searchParams.get("runoutMax") === "5");
    await page.getByTestId("result-count").getByText("Centre lathe · verified · spindle run-out ≤ 5 µm").waitFor();

    // Save this search (every verified centre lathe with run-out ≤ 5 µm) before narrowing it to the one lathe.
    const saveBox = page.getByTestId("save-search");
    await saveBox.getByLabel("Name of the saved search").fill("Verified lathes, run-out ≤ 5 µm");
    await saveBox.getByRole("button", { name: "Save this search" }).click();
    await saveBox.getByText("Saved as “Verified lathes, run-out ≤ 5 µm”").waitFor();

    await page.getByLabel("Search words").fill(lathe.word);
    await page.getByLabel("Search words").press("Enter");
    await page.waitForURL((url) => url.searchParams.get("q") === lathe.word);
    // Other tests' verified lathes were in the result before the words; the words leave this one.
    await expect.poll(() => page.getByTestId("result-count").textContent()).toMatch(/^1 machine ·/);
    const card = page.locator(`[data-listing-id="${lathe.listing.id}"]`);
    await card.waitFor();
    await expect(card.getByLabel("Grade B").count()).resolves.toBe(1);
    await expect(card.getByLabel("Key figures of the current report").textContent()).resolves.toMatch(/Spindle run-out4 µm.*Axial slip3 µm/);
    await expect(page.evaluate(() => (window as unknown as { __stillTheSamePage?: boolean }).__stillTheSamePage)).resolves.toBe(true);
    await shoot(page, "search-results-desktop");
    const resultsUrl = page.url();

    // The back button returns to the search before the words, with the form to match.
    await page.goBack();
    await page.waitForURL((url) => !url.searchParams.has("q") && url.searchParams.get("runoutMax") === "5");
    await expect.poll(() => page.getByLabel("Search words").inputValue()).toBe("");
    await page.goForward();
    await page.waitForURL((url) => url.searchParams.get("q") === lathe.word);
    await expect.poll(() => page.getByLabel("Search words").inputValue()).toBe(lathe.word);

    // Too tight a limit: the page says which filter to widen, and how far.
    await page.getByLabel("Spindle run-out at most (µm)").fill("2");
    await page.getByLabel("Spindle run-out at most (µm)").press("Enter");
    await page.getByTestId("empty-results").waitFor();
    await expect(page.getByTestId("empty-results").textContent()).resolves.toContain("No machines with spindle run-out ≤ 2 µm");
    await shoot(page, "search-empty-desktop");
    const emptyUrl = page.url();
    await page.getByRole("link", { name: "1 machine with spindle run-out ≤ 4 µm" }).click();
    await page.waitForURL((url) => url.searchParams.get("runoutMax") === "4");
    await card.waitFor();
    await expect(page.evaluate(() => (window as unknown as { __stillTheSamePage?: boolean }).__stillTheSamePage)).resolves.toBe(true);

    // Open the lathe, then its report.
    await card.getByRole("link", { name: /Tessmar DL 330/ }).click();
    await page.waitForURL((url) => url.pathname === `/machines/${lathe.listing.slug}`);
    await page.getByRole("heading", { level: 1, name: "Tessmar DL 330" }).waitFor();
    await page.getByRole("link", { name: "Read the full report" }).click();
    await page.waitForURL((url) => url.pathname.startsWith("/reports/"));
    await page.getByRole("heading", { level: 1, name: "Accuracy report: Tessmar DL 330" }).waitFor();

    // Phone screenshots of the results and the empty state.
    const cookies = await context.cookies();
    await shootOnPhone(resultsUrl, "search-results", cookies, `[data-listing-id="${lathe.listing.id}"]`);
    await shootOnPhone(emptyUrl, "search-empty", cookies, '[data-testid="empty-results"]');

    // Another matching lathe is verified: the saved search's alert arrives and links to it.
    const second = await verifiedLathe();
    const alert = await latestEmailTo(buyer.email, {
      waitMs: 30_000,
      matching: (message) => message.tag === "saved-search-alert" && message.text.includes(`/machines/${second.listing.slug}`),
    });
    expect(alert.subject).toBe("Now verified: Tessmar DL 330 matches “Verified lathes, run-out ≤ 5 µm”");
    await page.goto(linkIn(alert, `${appOrigin}/machines/${second.listing.slug}`));
    await page.getByRole("heading", { level: 1, name: "Tessmar DL 330" }).waitFor();

    // One click from the e-mail stops the alerts; the saved search stays on the account page until deleted.
    await page.goto(linkIn(alert, `${appOrigin}/saved-searches/unsubscribe?token=`));
    await page.getByRole("button", { name: "Stop these alerts" }).click();
    await page.getByRole("heading", { name: "Alerts stopped" }).waitFor();
    await page.goto("/account/saved-searches");
    const saved = page.locator('[data-saved-search="Verified lathes, run-out ≤ 5 µm"]');
    await saved.getByText("Alerts off").waitFor();
    await expect(saved.textContent()).resolves.toContain("Centre lathe · verified · spindle run-out ≤ 5 µm");
    await shoot(page, "saved-searches-desktop");
    await saved.getByRole("button", { name: "Delete Verified lathes, run-out ≤ 5 µm" }).click();
    await page.getByRole("heading", { name: "No saved searches yet" }).waitFor();

    expect(requests.filter((url) => !isLocal(url))).toEqual([]);
    await context.close();
  });

  it("takes the same limit in inches from an inch user, 0.0002 in, and shows figures in inches", { timeout: 120_000 }, async () => {
    const lathe = await verifiedLathe();
    const buyer = await createTestUser({ name: "Wade Pellham", displayUnits: "inch" });
    const { context, page } = await newRecordedPage(browser);
    await signInPage(page, buyer.email, buyer.password, `/machines?q=${lathe.word}&category=centre_lathe&verified=1`);
    await page.waitForURL((url) => url.pathname === "/machines");
    await page.getByLabel("Spindle run-out at most (in)").fill("0.0002");
    await page.getByLabel("Spindle run-out at most (in)").press("Enter");
    // 0.0002 in = 5.08 µm: the address keeps µm, so a millimetre reader opening the link sees 5.08 µm.
    await page.waitForURL((url) => url.searchParams.get("runoutMax") === "5.08");
    const card = page.locator(`[data-listing-id="${lathe.listing.id}"]`);
    await card.waitFor();
    await expect(card.getByLabel("Key figures of the current report").textContent()).resolves.toMatch(/Spindle run-out0\.00016 in/);
    // 330 mm swing is 12.992 in, quoted as the trade does: 13 in.
    await expect(card.textContent()).resolves.toContain("13 in swing");
    await page.getByLabel("Spindle run-out at most (in)").fill("0.0001");
    await page.getByLabel("Spindle run-out at most (in)").press("Enter");
    await page.getByRole("link", { name: "1 machine with spindle run-out ≤ 0.0002 in" }).waitFor();

    // A limit the search cannot use is not dropped in silence: the message is at the field.
    await page.getByLabel("Spindle run-out at most (in)").fill("0");
    await page.getByLabel("Spindle run-out at most (in)").press("Enter");
    const field = page.getByLabel("Spindle run-out at most (in)");
    await expect.poll(() => field.getAttribute("aria-invalid")).toBe("true");
    await expect(page.getByRole("alert").filter({ hasText: "Spindle run-out" }).first().textContent()).resolves.toMatch(/must be more than 0/);
    await context.close();
  });

  it("falls back to the database when the search service is slow, says so, and still lists the lathe", { timeout: 120_000 }, async () => {
    const lathe = await verifiedLathe();
    const { context, page } = await newRecordedPage(browser);
    try {
      await setSearchLatency(2_000);
      const url = `/machines?q=${lathe.word}&category=centre_lathe&verified=1&runoutMax=5`;
      await page.goto(url);
      await page.getByTestId("search-notice").waitFor();
      await expect(page.getByTestId("search-notice").textContent()).resolves.toMatch(/^Results may be incomplete/);
      await page.locator(`[data-listing-id="${lathe.listing.id}"]`).waitFor();
      await shoot(page, "search-fallback-desktop");
      await shootOnPhone(url, "search-fallback", [], '[data-testid="search-notice"]');
    } finally {
      await setSearchLatency(0);
    }
    // Back to normal: the next search comes from the index, without the notice.
    await page.getByLabel("Spindle run-out at most (µm)").fill("4");
    await page.getByLabel("Spindle run-out at most (µm)").press("Enter");
    await page.waitForURL((url) => url.searchParams.get("runoutMax") === "4");
    await page.locator('section[aria-label="Results"][aria-busy="false"]').waitFor();
    await page.locator(`[data-listing-id="${lathe.listing.id}"]`).waitFor();
    await expect.poll(() => page.getByTestId("search-notice").count()).toBe(0);
    await context.close();
  });
});
