// Money in the browser: an inspector sets up payouts through the payments stand-in's hosted onboarding page
// and sees their earnings; a buyer and staff see a refund pending and a refund failed; the statement and the
// receipt are PDFs. Screenshots at phone, tablet and desktop sizes (SCREENSHOT_DIR, or the run's folder).
import { randomUUID } from "node:crypto";
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { acceptBooking, recordReportFiled, refundAsAdmin } from "~/modules/inspections/bookings.server";
import { createTestUser, signInPage } from "../../support/accounts";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { bookingRow, db, paidBooking, standInControl, until } from "../../support/inspections";
import { bookingRefunds, payouts } from "~/modules/inspections/schema";
import { eq } from "drizzle-orm";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const shots = process.env.SCREENSHOT_DIR ?? path.join(process.env.TEST_WORK_DIR ?? "/tmp", "screenshots");
mkdirSync(shots, { recursive: true });
const sizes = [
  { name: "phone", width: 390, height: 844 },
  { name: "tablet", width: 820, height: 1180 },
  { name: "desktop", width: 1280, height: 900 },
];

async function fitsAndShoot(page: import("playwright-core").Page, name: string, size: (typeof sizes)[number]) {
  await page.screenshot({ path: `${shots}/${name}-${size.name}.png`, fullPage: true });
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  if (overflow > 0) {
    const wide = await page.evaluate(() =>
      [...document.querySelectorAll("body *")]
        .filter((element) => element.getBoundingClientRect().right > window.innerWidth + 1)
        .slice(-5)
        .map((element) => `${element.tagName}.${element.className} ${element.textContent?.slice(0, 60)}`),
    );
    console.log(wide.join("\n"));
  }
  expect(overflow, `${name} scrolls sideways on a ${size.name}`).toBeLessThanOrEqual(0);
}

describe("payouts and refunds in the browser", () => {
  it("the inspector sets up payouts through the hosted page, is told what is missing, then finishes and sees the share transferred", async () => {
    const held = await paidBooking();
    await acceptBooking(db, held.inspector, held.bookingId);
    await recordReportFiled(db, { bookingId: held.bookingId, reportId: randomUUID(), inspectorId: held.inspector.id });
    await until(async () => (await db.select().from(payouts).where(eq(payouts.bookingId, held.bookingId)))[0]?.status === "held", "the share held");

    const { context, page } = await newRecordedPage(browser, sizes[2]);
    await signInPage(page, held.inspector.email, held.inspector.password, "/inspector/profile");
    await expect(page.getByTestId("payout-state").textContent()).resolves.toMatch(/not set up yet/);
    await page.goto(`/inspector/bookings/${held.bookingId}`);
    await expect(page.getByTestId("share").textContent()).resolves.toMatch(/held until your payout set-up is finished/);
    await page.goto("/inspector/profile");

    // First time: leave requirements due.
    await Promise.all([page.waitForURL(/\/connect\/onboarding\//), page.getByRole("button", { name: "Set up payouts" }).click()]);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(/Set up payouts/);
    await page.screenshot({ path: `${shots}/onboarding-page-desktop.png`, fullPage: true });
    await Promise.all([page.waitForURL(/\/inspector\/profile\?payouts=returned/), page.getByRole("button", { name: "Leave requirements due" }).click()]);
    await expect(page.getByTestId("payout-state").textContent()).resolves.toMatch(/still needs some details/);
    await expect(page.getByText("a photo of an identity document")).toBeTruthy();
    await page.getByText("a photo of an identity document").waitFor();

    // Then finish it.
    await Promise.all([page.waitForURL(/\/connect\/onboarding\//), page.getByRole("button", { name: "Continue payout set-up" }).click()]);
    await Promise.all([page.waitForURL(/\/inspector\/profile\?payouts=returned/), page.getByRole("button", { name: "Complete set-up" }).click()]);
    await expect(page.getByTestId("payout-state").textContent()).resolves.toMatch(/Payouts are set up/);
    await until(async () => (await bookingRow(held.bookingId)).status === "closed", "the transfer after set-up", 20_000);
    await context.close();

    for (const size of sizes) {
      const { context: sized, page: view } = await newRecordedPage(browser, size);
      await signInPage(view, held.inspector.email, held.inspector.password, "/inspector/earnings");
      await view.screenshot({ path: `${shots}/earnings-signin-${size.name}.png` });
      await view.getByRole("heading", { level: 1, name: /Your earnings/ }).waitFor();
      await view.getByText("Transferred", { exact: true }).first().waitFor();
      await fitsAndShoot(view, "earnings", size);
      if (size.name === "desktop") {
        const month = new Date().toISOString().slice(0, 7);
        const [download] = await Promise.all([view.waitForEvent("download"), view.locator(`a[href$="${month}-eur.pdf"]`).click()]);
        await download.saveAs(`${shots}/statement-${month}.pdf`);
        const csv = await view.evaluate(async (href) => (await fetch(href)).text(), `/inspector/earnings/statements/${month}-eur.csv`);
        expect(csv).toContain(held.booking.reference);
        expect(csv).toContain("Transferred to your account");
      }
      await sized.close();
    }
  });

  it("the buyer and staff see a refund pending, then one failed with staff notified; the buyer downloads the receipts", async () => {
    const held = await paidBooking("4000 0000 0000 7726");
    const admin = await createTestUser({ roles: ["admin"] });
    await refundAsAdmin(db, admin, held.bookingId, 10_000, "Part of the fee back after a short visit");
    await refundAsAdmin(db, admin, held.bookingId, 5_000, "A second part");
    const refunds = await db.select().from(bookingRefunds).where(eq(bookingRefunds.bookingId, held.bookingId)).orderBy(bookingRefunds.createdAt);
    await standInControl(`refunds/${refunds[1]!.stripeRefundId}/settle`, { outcome: "failed" });
    await until(async () => (await db.select().from(bookingRefunds).where(eq(bookingRefunds.id, refunds[1]!.id)))[0]!.status === "failed", "refund.failed");

    for (const size of sizes) {
      const { context, page } = await newRecordedPage(browser, size);
      await signInPage(page, held.buyer.email, held.buyer.password, `/bookings/${held.bookingId}`);
      // The URL leaves /sign-in before the booking page has rendered: wait for its refunds.
      await page.getByTestId("refund").nth(1).waitFor();
      const states = await page.getByTestId("refund").allTextContents();
      expect(states.join(" | ")).toMatch(/Refund pending/);
      expect(states.join(" | ")).toMatch(/Refund failed — staff notified/);
      await fitsAndShoot(page, "buyer-refunds", size);
      if (size.name === "desktop") {
        const [receipt] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Receipt for your payment (PDF)" }).click()]);
        await receipt.saveAs(`${shots}/receipt-payment.pdf`);
        const [refundReceipt] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Receipt (PDF)" }).first().click()]);
        await refundReceipt.saveAs(`${shots}/receipt-refund.pdf`);
        // Someone else's receipt is not theirs to read.
        const stranger = await page.evaluate(async (href) => (await fetch(href)).status, `/bookings/${randomUUID()}/receipts/payment.pdf`);
        expect(stranger).toBe(404);
      }
      await context.close();
    }

    const { context, page } = await newRecordedPage(browser, sizes[2]);
    await signInPage(page, admin.email, admin.password, "/admin/payments");
    await page.getByTestId("staff-refund").first().waitFor();
    const staffView = (await page.getByTestId("staff-refund").allTextContents()).join(" | ");
    expect(staffView).toMatch(/Refund pending/);
    expect(staffView).toMatch(/Refund failed — staff notified/);
    await page.getByRole("alert").filter({ hasText: "Needs attention" }).waitFor();
    await fitsAndShoot(page, "staff-payments", sizes[2]);
    await context.close();
  });
});
