// The entry form in Chromium: the date of the tests against today and the booked visit, the message when a
// level is chosen for heights, and the straightness plot's reference line through the end points.
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking } from "../../support/reports";

const shots = "/tmp/reports-screenshots";

const browser = chromiumPerFile();

const isoDay = (offsetDays: number) => new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);

describe("the report entry form", () => {
  it("refuses a future date, warns on one before the visit, names the level's tilt, and draws the end-point line through the end points", async () => {
    const booked = await acceptedBooking();
    const { context, page } = await newRecordedPage(browser(), viewports.tablet);
    const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
    await signInPage(page, booked.inspector.email, booked.inspector.password, entryPath);
    await page.waitForURL((url) => url.pathname === entryPath);

    const date = page.getByLabel("Date of the tests", { exact: true });
    // The visit is booked a week ahead, so today is before it: said aloud, not refused.
    await expect(page.getByTestId("date-warning").textContent()).resolves.toMatch(/is before the booked visit/);
    await date.fill(isoDay(3));
    await expect.poll(() => page.locator("body").textContent()).toMatch(/The date of the tests is in the future/);
    await date.fill(isoDay(-2));
    await expect(page.getByTestId("date-warning").textContent()).resolves.toMatch(new RegExp(`${isoDay(-2)} is before the booked visit`));
    await screenshotAtEachSize(page, shots, "entry-date-warning", { part: page.getByTestId("date-warning").locator("..") });

    // Bed, vertical plane: heights in µm from a level — choosing the level says why its µm/m step does not apply.
    const bed = page.locator('[data-test-code="L-BED-V"]');
    for (const [i, [station, reading]] of [[0, 0], [250, 3], [500, 5], [750, 4], [1000, 1]].entries()) {
      if (i > 0) await bed.getByRole("button", { name: "+ Add a station" }).click();
      await bed.getByLabel(`Station ${i + 1}`, { exact: true }).fill(String(station));
      await bed.getByLabel(`Reading ${i + 1}`, { exact: true }).fill(String(reading));
    }
    await bed.getByLabel("Instrument", { exact: true }).selectOption("i2");
    await expect.poll(() => bed.getByTestId("live-verdict").textContent()).toMatch(/The level reads tilt \(µm\/m\), not steps of the heights entered here/);
    await expect(bed.getByTestId("live-verdict").textContent()).resolves.not.toMatch(/No instrument resolution given/);

    // The end-point reference line starts at the first reading and ends at the last.
    const line = bed.locator('[data-plot="reference-line"]');
    await line.waitFor();
    const ends = await line.evaluate((element) => ["x1", "y1", "x2", "y2"].map((name) => Number(element.getAttribute(name))));
    const dots = await bed.locator('[data-plot="reading"]').evaluateAll((elements) => elements.map((element) => [Number(element.getAttribute("cx")), Number(element.getAttribute("cy"))]));
    expect(ends[0]).toBeCloseTo(dots[0]![0]!, 3);
    expect(ends[1]).toBeCloseTo(dots[0]![1]!, 3);
    expect(ends[2]).toBeCloseTo(dots.at(-1)![0]!, 3);
    expect(ends[3]).toBeCloseTo(dots.at(-1)![1]!, 3);
    await expect(bed.textContent()).resolves.toContain("reference line (end points)");
    await screenshotAtEachSize(page, shots, "entry-bed-level", { part: bed });
    await context.close();
  });
});
