// A buyer finds no inspector for a machine's region, asks for one from the booking page, and staff see the
// region among the open demand.
import { mkdirSync } from "node:fs";
import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { publishedLathe } from "../../support/inspections";

const shots = process.env.SCREENSHOT_DIR ?? "/tmp/alerts-screenshots";
const widths = { desktop: { width: 1280, height: 900 }, tablet: { width: 820, height: 1180 }, phone: { width: 390, height: 844 } };

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

async function screenshots(page: Page, name: string) {
  const original = page.viewportSize()!;
  for (const [label, size] of Object.entries(widths)) {
    await page.setViewportSize(size);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow, `${name} scrolls sideways at ${label}`).toBeLessThanOrEqual(0);
    await page.screenshot({ path: `${shots}/${name}-${label}.png`, fullPage: true });
  }
  await page.setViewportSize(original);
}

describe("asking for an inspector", () => {
  it("is one click from the booking page where nobody serves, and shows on the staff page", { timeout: 90_000 }, async () => {
    const region = `Fennmoor ${randomUUID().slice(0, 6)}`;
    const lathe = await publishedLathe(region);
    const buyer = await createTestUser({ name: "Petra Voss" });
    const { context, page } = await newRecordedPage(browser);
    await signInPage(page, buyer.email, buyer.password, `/machines/${lathe.slug}/book`);
    await page.getByText("No certified inspector serves this machine's region yet").waitFor();
    await screenshots(page, "inspector-request-ask");
    await page.getByRole("button", { name: "Ask for an inspector" }).click();
    const recorded = page.getByTestId("inspector-requested");
    await recorded.waitFor();
    await expect(recorded.textContent()).resolves.toContain(`Your request for an inspector in ${region}, Germany is recorded`);
    await screenshots(page, "inspector-request-recorded");
    // Coming back later: the page remembers the request.
    await page.reload();
    await expect(page.getByTestId("inspector-requested").textContent()).resolves.toContain(`You asked for an inspector in ${region}, Germany on `);
    await context.close();

    const staff = await createTestUser({ roles: ["admin"], name: "Staff Demand" });
    const admin = await newRecordedPage(browser);
    await signInPage(admin.page, staff.email, staff.password, "/admin/inspector-demand");
    const row = admin.page.locator(`[data-region="${region}"]`);
    await row.waitFor();
    await expect(row.textContent()).resolves.toMatch(new RegExp(`${region}Germany1`));
    await screenshots(admin.page, "inspector-demand-staff");
    await admin.context.close();
  });
});
