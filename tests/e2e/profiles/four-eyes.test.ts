// Staff change a tolerance table without a release: one staff member drafts a new version of a maker's chart
// and tightens one tolerance, sees the difference, a second staff member publishes it, and the inspector's
// next report on a machine of that make is offered the new version. The chart and make are invented test data.
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { publishedMakersChart, twoStaff } from "../../support/profiles";
import { acceptedBooking } from "../../support/reports";

const shots = "/tmp/profiles-screenshots";

const browser = chromiumPerFile();

describe("publishing a new profile version with four eyes", () => {
  it("drafts, changes one tolerance, shows the difference, is published by a second staff member and used by the next report", async () => {
    const staff = await twoStaff();
    const chart = await publishedMakersChart(staff);
    const booked = await acceptedBooking({ make: chart.make, model: chart.model });

    // The author drafts version 2 and tightens the spindle nose from 10 to 6 µm.
    const author = await newRecordedPage(browser(), viewports.desktop);
    await signInPage(author.page, staff.author.email, staff.author.password, "/admin/profiles");
    const group = author.page.locator(`[data-profile="${chart.key}"]`);
    await Promise.all([author.page.waitForURL(`**/admin/profiles/${chart.key}/2`), group.getByRole("button", { name: /Draft version 2 from v1/ }).click()]);
    await expect(author.page.getByRole("button", { name: /Publish version/ }).count()).resolves.toBe(0);
    await Promise.all([author.page.waitForURL(`**/tests/L-SP-NOSE`), author.page.getByRole("link", { name: "Edit L-SP-NOSE" }).click()]);

    // A bad value gets its message at the field, and nothing is saved.
    const tolerance = author.page.getByLabel(/^Tolerance \(µm\)/);
    await tolerance.fill("-6");
    await author.page.getByRole("button", { name: "Save the test" }).click();
    await author.page.getByText(/The tolerance must be greater than 0/).first().waitFor();
    await tolerance.fill("6");
    await Promise.all([author.page.waitForURL(`**/admin/profiles/${chart.key}/2`), author.page.getByRole("button", { name: "Save the test" }).click()]);

    const diff = author.page.locator('[data-diff="L-SP-NOSE"]');
    const changed = diff.locator('tr[data-changed="yes"]');
    await changed.first().waitFor({ timeout: 15_000 });
    await expect(changed.count()).resolves.toBe(1);
    await expect(changed.textContent()).resolves.toMatch(/Tolerance.*changed.*10 µm.*6 µm/);
    await screenshotAtEachSize(author.page, shots, "draft-diff");
    await author.context.close();

    // A second staff member reads the difference and publishes.
    const reviewer = await newRecordedPage(browser(), viewports.tablet);
    await signInPage(reviewer.page, staff.reviewer.email, staff.reviewer.password, `/admin/profiles/${chart.key}/2`);
    await reviewer.page.locator('[data-diff="L-SP-NOSE"] tr[data-changed="yes"]').first().waitFor();
    await expect(reviewer.page.locator('[data-diff="L-SP-NOSE"] tr[data-changed="yes"]').count()).resolves.toBe(1);
    await reviewer.page.getByRole("button", { name: "Publish version 2" }).click();
    await reviewer.page.getByText(/Published: new reports are offered this version/).waitFor();
    await screenshotAtEachSize(reviewer.page, shots, "published");
    await reviewer.context.close();

    // The inspector's next report on a machine of that make is offered version 2, named as the maker's chart.
    const inspector = await newRecordedPage(browser(), viewports.tablet);
    const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
    await signInPage(inspector.page, booked.inspector.email, booked.inspector.password, entryPath);
    const suggestion = inspector.page.getByTestId("profile-suggestion");
    await expect(suggestion.textContent()).resolves.toMatch(/maker's chart.*\(v2\)/s);
    await expect(inspector.page.getByLabel("Profile used").inputValue()).resolves.toBe(`${chart.key}@2`);
    await inspector.context.close();
  });
});
