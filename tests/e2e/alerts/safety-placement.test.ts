// Safety cautions stand, in full, where inspection work is described (the inspector's pages, the report
// form's review, how scoring works) and nowhere else: not on the home page, the search, a listing, its
// booking page, the public inspector pages or a published report.
import { mkdirSync } from "node:fs";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE } from "~/modules/reports/safety";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile } from "../../support/browser-per-file";
import { acceptedBooking } from "../../support/reports";

const shots = process.env.SCREENSHOT_DIR ?? "/tmp/alerts-screenshots";
const widths = { desktop: { width: 1280, height: 900 }, tablet: { width: 820, height: 1180 }, phone: { width: 390, height: 844 } };

const browser = chromiumPerFile();
mkdirSync(shots, { recursive: true });

async function cautionsOn(page: Page, path: string, ready: string) {
  await page.goto(path);
  await page.locator(ready).first().waitFor();
  return page.getByTestId("safety-cautions").allTextContents();
}

describe("where safety cautions appear", () => {
  it("shows them in full where the work is described and drops them elsewhere", { timeout: 90_000 }, async () => {
    const booking = await acceptedBooking();
    const { context, page } = await newRecordedPage(browser());

    // In full: every caution and the deference to the manual, local rules and licensed practice.
    const full = (texts: string[]) => {
      expect(texts).toHaveLength(1);
      for (const caution of [...SAFETY_CAUTIONS, SAFETY_DEFERENCE]) expect(texts[0]).toContain(caution);
    };
    full(await cautionsOn(page, "/how-scoring-works", "h1"));
    for (const [label, size] of Object.entries(widths)) {
      await page.setViewportSize(size);
      await page.getByTestId("safety-cautions").screenshot({ path: `${shots}/safety-how-scoring-works-${label}.png` });
    }
    await page.setViewportSize(widths.desktop);

    // Public pages a buyer reads: none.
    for (const [path, ready] of [
      ["/", "h1"],
      ["/machines", "h1"],
      [`/machines/${booking.listing.slug}`, "h1"],
      [`/machines/${booking.listing.slug}/book`, "h1"],
      ["/inspectors", "h1"],
    ] as const) {
      expect(await cautionsOn(page, path, ready), path).toEqual([]);
    }

    // The inspector's own pages: in full.
    await signInPage(page, booking.inspector.email, booking.inspector.password, "/inspector/bookings");
    await page.waitForURL((url) => url.pathname === "/inspector/bookings");
    full(await cautionsOn(page, "/inspector/bookings", "h1"));
    full(await cautionsOn(page, `/inspector/bookings/${booking.bookingId}`, "h1"));
    full(await cautionsOn(page, "/inspector/profile", "h1"));
    await context.close();
  });
});
