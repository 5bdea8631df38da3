import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInPage } from "../../support/accounts";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { bookingRow, certifiedInspector, publishedLathe } from "../../support/inspections";
import { latestEmailTo, linkIn } from "../../support/mailbox";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const shots = process.env.SCREENSHOT_DIR;

describe("booking a certified inspector for a lathe", () => {
  it("the buyer pays on the checkout page and returns to a confirmed booking; the inspector accepts it from the e-mail", async () => {
    const inspector = await certifiedInspector({ feeMinor: 39_500 });
    const lathe = await publishedLathe(inspector.region);
    const buyer = await createTestUser({ name: "Ilka Demir" });

    const { context, page } = await newRecordedPage(browser);
    await signInPage(page, buyer.email, buyer.password);
    await page.goto(`/machines/${lathe.slug}`);
    await page.getByRole("link", { name: "Book an inspection" }).click();
    await page.waitForURL(`**/machines/${lathe.slug}/book`);
    await expect(page.getByTestId("refund-rules").textContent()).resolves.toMatch(/whole fee is refunded/);
    await expect(page.getByTestId("fee").textContent()).resolves.toContain("395");
    await page.getByRole("radio", { name: new RegExp(inspector.name) }).check();
    await page.getByRole("radio").nth(1).check();
    await page.getByLabel("I have read the refund rules").check();
    if (shots) await page.screenshot({ path: `${shots}/book-desktop.png`, fullPage: true });
    await page.getByRole("button", { name: "Continue to payment" }).click();

    // The payments stand-in's hosted checkout page.
    await page.waitForURL((url) => url.pathname.startsWith("/pay/"));
    await page.getByLabel("Card number").fill("4242 4242 4242 4242");
    await page.getByLabel("Expiry (MM / YY)").fill("12 / 34");
    await page.getByLabel("CVC").fill("123");
    await page.getByRole("button", { name: /^Pay/ }).click();

    await page.waitForURL((url) => url.pathname.endsWith("/paid"));
    await page.getByText("Booking confirmed").waitFor({ timeout: 20_000 });
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(/booked and paid/);
    if (shots) await page.screenshot({ path: `${shots}/paid-desktop.png`, fullPage: true });
    const bookingId = new URL(page.url()).pathname.split("/")[2]!;
    expect((await bookingRow(bookingId)).status).toBe("paid");
    await context.close();

    // The inspector follows the link in the notice of the new request and accepts.
    const notice = await latestEmailTo(inspector.email, { matching: (message) => message.subject.startsWith("New inspection request") });
    const link = linkIn(notice, `${process.env.TEST_APP_ORIGIN}/inspector/bookings/`);
    const inspectorSession = await newRecordedPage(browser, { width: 390, height: 844 });
    await signInPage(inspectorSession.page, inspector.email, inspector.password, new URL(link).pathname);
    await inspectorSession.page.waitForURL((url) => url.pathname === new URL(link).pathname);
    if (shots) await inspectorSession.page.screenshot({ path: `${shots}/request-phone.png`, fullPage: true });
    await inspectorSession.page.getByRole("button", { name: "Accept this inspection" }).click();
    await inspectorSession.page.getByText("Accepted. The buyer and the seller have been told.").waitFor();
    expect((await bookingRow(bookingId)).status).toBe("accepted");
    const accepted = await latestEmailTo(buyer.email, { matching: (message) => message.subject.includes("accepted") });
    expect(accepted.text).toContain(inspector.name);
    await inspectorSession.context.close();
  });
});
