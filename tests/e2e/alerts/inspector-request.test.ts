// A buyer finds no inspector for a machine's region, asks for one from the booking page, and staff see the
// region among the open demand.
import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize } from "../../support/browser-per-file";
import { publishedLathe } from "../../support/inspections";

const shots = process.env.SCREENSHOT_DIR ?? "/tmp/alerts-screenshots";

const browser = chromiumPerFile();

describe("asking for an inspector", () => {
  it("is one click from the booking page where nobody serves, and shows on the staff page", { timeout: 90_000 }, async () => {
    const region = `Fennmoor ${randomUUID().slice(0, 6)}`;
    const lathe = await publishedLathe(region);
    const buyer = await createTestUser({ name: "Petra Voss" });
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, buyer.email, buyer.password, `/machines/${lathe.slug}/book`);
    await page.getByText("No certified inspector serves this machine's region yet").waitFor();
    await screenshotAtEachSize(page, shots, "inspector-request-ask", { noSidewaysScroll: true });
    await page.getByRole("button", { name: "Ask for an inspector" }).click();
    const recorded = page.getByTestId("inspector-requested");
    await recorded.waitFor();
    await expect(recorded.textContent()).resolves.toContain(`Your request for an inspector in ${region}, Germany is recorded`);
    await screenshotAtEachSize(page, shots, "inspector-request-recorded", { noSidewaysScroll: true });
    // Coming back later: the page remembers the request.
    await page.reload();
    await expect(page.getByTestId("inspector-requested").textContent()).resolves.toContain(`You asked for an inspector in ${region}, Germany on `);
    await context.close();

    const staff = await createTestUser({ roles: ["admin"], name: "Staff Demand" });
    const admin = await newRecordedPage(browser());
    await signInPage(admin.page, staff.email, staff.password, "/admin/inspector-demand");
    const row = admin.page.locator(`[data-region="${region}"]`);
    await row.waitFor();
    await expect(row.textContent()).resolves.toMatch(new RegExp(`${region}Germany1`));
    await screenshotAtEachSize(admin.page, shots, "inspector-demand-staff", { noSidewaysScroll: true });
    await admin.context.close();
  });
});
