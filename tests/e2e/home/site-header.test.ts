// The site's header in Chromium: the section a page belongs to is marked (by aria-current, as a screen reader
// says it), on a phone too; the account menu lists the links for the roles held, made on the server.
import { describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";

const shots = "/tmp/site-header-screenshots";
const browser = chromiumPerFile();

describe("the site's header", () => {
  it("marks the section of the page shown, and no other, at every size", async () => {
    const { context, page } = await newRecordedPage(browser(), viewports.desktop);
    await page.goto("/machines", { waitUntil: "networkidle" });
    const main = page.getByRole("navigation", { name: "Main" });
    await expect(main.getByRole("link", { name: "Machines" }).getAttribute("aria-current")).resolves.toBe("page");
    await expect(main.locator('[aria-current="page"]').count()).resolves.toBe(1);
    // A page further down the section is still in it; another section's page moves the mark.
    await main.getByRole("link", { name: "How scoring works" }).click();
    await page.waitForURL((url) => url.pathname === "/how-scoring-works");
    await expect.poll(() => main.getByRole("link", { name: "How scoring works" }).getAttribute("aria-current")).toBe("page");
    await expect(main.getByRole("link", { name: "Machines" }).getAttribute("aria-current")).resolves.toBeNull();

    await page.setViewportSize(viewports.phone);
    await page.goto("/machines", { waitUntil: "networkidle" });
    await page.getByRole("button", { name: "Open menu" }).click();
    const menu = page.locator("#mobile-navigation");
    await expect(menu.getByRole("link", { name: "Machines" }).getAttribute("aria-current")).resolves.toBe("page");
    await screenshotAtEachSize(page, shots, "header-menu-open", { part: page.locator("header"), noSidewaysScroll: true });
    await context.close();
  });

  it("lists a seller's own links in the account menu, and no staff ones", async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Oda Brennecke" });
    const { context, page } = await newRecordedPage(browser(), viewports.desktop);
    await signInPage(page, seller.email, seller.password, "/machines");
    await page.waitForURL((url) => url.pathname === "/machines");
    const slot = page.locator('[data-slot="account"]').first();
    await slot.getByText("Oda Brennecke").click();
    for (const name of ["Account settings", "Saved searches", "My listings", "Correction planner"]) {
      await expect(slot.getByRole("link", { name }).isVisible()).resolves.toBe(true);
    }
    await expect(slot.getByRole("link", { name: /^Staff:/ }).count()).resolves.toBe(0);
    await expect(slot.getByRole("link", { name: "Inspection requests" }).count()).resolves.toBe(0);
    await screenshotAtEachSize(page, shots, "header-account-menu");
    await context.close();
  });
});
