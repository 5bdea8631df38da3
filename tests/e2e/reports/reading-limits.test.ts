// Readings no instrument of these tests can give, in Chromium: the entry form says so at the field as it is
// typed, and a signed report stored before such readings were refused opens with its readings and a notice.
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking, signedReportAsStoredBeforeTheLimits } from "../../support/reports";

const shots = "/tmp/reports-screenshots";

const browser = chromiumPerFile();

describe("readings beyond what the tests can read", () => {
  it("are flagged at the field as typed, and the server refuses to store them", async () => {
    const booked = await acceptedBooking();
    const { context, page } = await newRecordedPage(browser(), viewports.tablet);
    const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
    await signInPage(page, booked.inspector.email, booked.inspector.password, entryPath);
    await page.waitForURL((url) => url.pathname === entryPath);

    const mandrel = page.locator('[data-test-code="L-SP-PAR-V"]');
    await mandrel.getByLabel("Far, spindle at 0°", { exact: true }).fill("1e308");
    await expect.poll(() => mandrel.textContent()).toMatch(/Must lie within ±100 000 µm \(100 mm\)/);
    await page.getByTestId("save-status").and(page.locator('[data-state="refused"]')).waitFor({ timeout: 10_000 });
    await expect(page.getByTestId("save-status").textContent()).resolves.toMatch(/beyond what these tests can read/);
    await screenshotAtEachSize(page, shots, "reading-limit-entry");
    await mandrel.screenshot({ path: `${shots}/reading-limit-entry-field.png` });
    await context.close();
  });

  it("stored in a signed report before they were refused: the page shows the readings and a notice", async () => {
    const { id } = await signedReportAsStoredBeforeTheLimits();
    const { context, page } = await newRecordedPage(browser(), viewports.desktop);
    const response = await page.goto(`/reports/${id}`);
    expect(response?.status()).toBe(200);
    const stored = page.getByTestId("stored-readings");
    await expect(stored.textContent()).resolves.toMatch(/cannot be scored or drawn.*L-SP-NOSE.*1e\+308/s);
    await expect(page.getByText("Hash verified").count()).resolves.toBe(1);
    await screenshotAtEachSize(page, shots, "report-readings-as-signed");
    await context.close();
  });
});
