// A buyer saves a search, then tries to save the same filters again written in inches: the page says which
// saved search already covers it instead of keeping a second copy that would mail them twice.
import { describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize } from "../../support/browser-per-file";

const shots = process.env.SCREENSHOT_DIR ?? "/tmp/alerts-screenshots";

const browser = chromiumPerFile();

describe("a saved search that repeats another", () => {
  it("is refused with the name of the one already kept, whatever units it was written in", { timeout: 90_000 }, async () => {
    const buyer = await createTestUser({ name: "Wanda Kessel" });
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, buyer.email, buyer.password, "/machines?category=centre_lathe&runoutMax=5.08");
    await page.waitForURL((url) => url.pathname === "/machines");
    const saveBox = page.getByTestId("save-search");
    await saveBox.getByLabel("Name of the saved search").fill("Lathes, a fifth of a thou");
    await saveBox.getByRole("button", { name: "Save this search" }).click();
    await saveBox.getByText("Saved as “Lathes, a fifth of a thou”").waitFor();

    // The same limit in inches (what an inch reader's form sends).
    await page.goto("/machines?category=centre_lathe&runoutMaxIn=0.0002");
    await saveBox.getByLabel("Name of the saved search").fill("Lathes again");
    await saveBox.getByRole("button", { name: "Save this search" }).click();
    const warning = saveBox.getByRole("alert");
    await warning.waitFor();
    await expect(warning.textContent()).resolves.toContain("You already keep this search as “Lathes, a fifth of a thou”");
    await screenshotAtEachSize(page, shots, "duplicate-saved-search");

    await page.goto("/account/saved-searches");
    await page.locator('[data-saved-search="Lathes, a fifth of a thou"]').waitFor();
    await expect(page.locator("[data-saved-search]").count()).resolves.toBe(1);
    await context.close();
  });
});
