// A buyer watches a machine, finds it under "Watched machines" in the account menu, gets the daily e-mail when
// its price drops, stops the e-mail with one click, and takes the machine off the list.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { sendWatchDigests } from "~/modules/listings/watchlist.server";
import { createTestUser, signInPage } from "../../support/accounts";
import { appOrigin, newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize } from "../../support/browser-per-file";
import { latestEmailTo, linkIn } from "../../support/mailbox";

const db = getDatabase();
const shots = process.env.SCREENSHOT_DIR ?? "/tmp/alerts-screenshots";

const browser = chromiumPerFile();

describe("the watchlist", () => {
  it("watches a machine, lists it, e-mails its price drop once, unsubscribes and unwatches", { timeout: 120_000 }, async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Krahn Werkzeugmaschinen" });
    const [lathe] = await db
      .insert(listings)
      .values({
        sellerId: seller.id,
        slug: `watch-story-${randomUUID().slice(0, 8)}`,
        status: "published",
        category: "centre_lathe",
        make: "Orvelt",
        model: "TL 280",
        year: 1988,
        city: "Kessenbrück",
        country: "DE",
        priceMinor: 860_000,
        currency: "EUR",
        condition: "used",
        description: "A toolroom lathe kept in a heated shop.",
        publishedAt: new Date(),
      })
      .returning();
    const buyer = await createTestUser({ name: "Selma Undset-Hart" });
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, buyer.email, buyer.password, `/machines/${lathe!.slug}`);
    await page.getByRole("heading", { level: 1, name: "Orvelt TL 280" }).waitFor();
    await page.getByRole("button", { name: "☆ Watch this machine" }).click();
    await page.getByRole("button", { name: "★ Watching — stop" }).waitFor();

    // The account menu leads to the list.
    await page.locator("header [data-slot=account] summary").first().click();
    await page.getByRole("link", { name: "Watched machines" }).first().click();
    await page.waitForURL((url) => url.pathname === "/account/watched");
    const row = page.locator('[data-watched="Orvelt TL 280"]');
    await row.waitFor();
    await expect(row.textContent()).resolves.toMatch(/€8,600.*For sale.*Not yet verified/);
    await screenshotAtEachSize(page, shots, "watched-machines", { noSidewaysScroll: true });

    // The price drops; the daily digest says so (run here, a month ahead, instead of waiting for 07:00).
    await db.update(listings).set({ priceMinor: 790_000 }).where(eq(listings.id, lathe!.id));
    await sendWatchDigests(db, new Date(Date.now() + 30 * 24 * 60 * 60 * 1000));
    const digest = await latestEmailTo(buyer.email, { waitMs: 20_000, matching: (message) => message.tag === "watch-digest" });
    expect(digest.text).toContain("Price down from €8,600 to €7,900.");
    await page.goto(linkIn(digest, `${appOrigin}/watched/unsubscribe?token=`));
    await page.getByRole("button", { name: "Stop these e-mails" }).click();
    await page.getByRole("heading", { name: "Daily e-mail stopped" }).waitFor();
    await screenshotAtEachSize(page, shots, "watch-unsubscribed", { noSidewaysScroll: true });

    await page.goto("/account/watched");
    await page.getByRole("button", { name: "Turn the daily e-mail on" }).waitFor();
    await row.getByRole("button", { name: "Stop watching Orvelt TL 280" }).click();
    await page.getByRole("heading", { name: "You watch no machines yet" }).waitFor();
    await context.close();
  });
});
