// The entry page carries the whole of one tolerance profile only (the others by name): choosing another loads
// its tests and tolerances, keeps what was typed, and scores the readings against the chosen one.
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking } from "../../support/reports";

const browser = chromiumPerFile();

describe("choosing another tolerance profile on the entry form", () => {
  it("loads the chosen profile, keeps the readings typed, and scores them against its tolerance", async () => {
    const booked = await acceptedBooking();
    const { context, page } = await newRecordedPage(browser(), viewports.tablet);
    const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
    await signInPage(page, booked.inspector.email, booked.inspector.password, entryPath);
    await page.waitForURL((url) => url.pathname === entryPath);

    // 2 µm at the far end of the horizontal spindle-axis test, turned 180° as well.
    const horizontal = page.locator('[data-test-code="L-SP-PAR-H"]');
    await horizontal.getByLabel("Near, spindle at 0°", { exact: true }).fill("0");
    await horizontal.getByLabel("Near, turned 180°", { exact: true }).fill("0");
    await horizontal.getByLabel("Far, spindle at 0°", { exact: true }).fill("6");
    await horizontal.getByLabel("Far, turned 180°", { exact: true }).fill("6");
    const verdict = horizontal.getByTestId("live-verdict");
    await verdict.waitFor();
    const normalText = await verdict.textContent();

    await page.getByLabel("Profile used").selectOption("centre-lathe-precision@2");
    await page.waitForURL((url) => url.searchParams.get("profile") === "centre-lathe-precision@2");
    // The readings stay; the verdict is scored again against the precision class's tighter tolerance.
    await expect(horizontal.getByLabel("Far, turned 180°", { exact: true }).inputValue()).resolves.toBe("6");
    await expect.poll(async () => (await horizontal.getByTestId("live-verdict").textContent()) !== normalText, { timeout: 15_000 }).toBe(true);
    await expect(page.getByLabel("Profile used").inputValue()).resolves.toBe("centre-lathe-precision@2");
    await screenshotAtEachSize(page, "/tmp/reports-screenshots", "entry-profile-choice");
    await context.close();
  });
});
