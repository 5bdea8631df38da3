// The stand-in's hosted test payment page in Chromium: Stripe's documented test cards
// (docs.stripe.com/testing: 4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined), the way back
// to the success and cancel URLs, and a layout that fits a phone.
import { mkdirSync } from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isLocal, launchBrowser, newRecordedPage } from "../../support/browser";
import { startPaymentsHarness, waitFor, type PaymentsHarness } from "../../support/payments";

const screenshots = path.resolve(import.meta.dirname, "../../../test-results/payments");

let browser: Browser;
let harness: PaymentsHarness;

beforeAll(async () => {
  browser = await launchBrowser();
  harness = await startPaymentsHarness();
  // The app's pages the payment page sends people back to.
  harness.receiver.page = (request, response) => {
    const url = new URL(request.url ?? "/", harness.receiver.origin);
    const title = url.pathname.endsWith("/paid") ? "Booking paid" : "Booking not paid yet";
    response.writeHead(200, { "Content-Type": "text/html; charset=utf-8" });
    response.end(`<!doctype html><title>${title}</title><h1>${title}</h1><p id="session">${url.searchParams.get("session") ?? ""}</p>`);
  };
  mkdirSync(screenshots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await harness?.stop();
});

async function newSession() {
  const bookingId = `bk_${randomUUID()}`;
  const session = await harness.client.createCheckoutSession({
    bookingId,
    amountMinor: 18_500,
    currency: "eur",
    description: "On-site geometry check of a centre lathe",
    platformFeeMinor: 2_775,
    successUrl: `${harness.receiver.origin}/bookings/${bookingId}/paid?session={CHECKOUT_SESSION_ID}`,
    cancelUrl: `${harness.receiver.origin}/bookings/${bookingId}`,
    customerEmail: "buyer@example.test",
  });
  return { ...session, url: session.url!, bookingId };
}

async function fillCard(page: Page, number: string) {
  await page.getByLabel("Card number").fill(number);
  await page.getByLabel("Expiry (MM / YY)").fill("12 / 34");
  await page.getByLabel("CVC").fill("123");
}

describe("the hosted test payment page", () => {
  it("shows what is paid, says it is a test page, and pays with 4242 4242 4242 4242 back to the success URL", async () => {
    const session = await newSession();
    const { context, page, requests } = await newRecordedPage(browser);
    await page.goto(session.url);
    await expect(page.getByText("Test payment page — local stand-in").isVisible()).resolves.toBe(true);
    await expect(page.locator("#amount").textContent()).resolves.toBe("€185.00");
    await expect(page.getByText("On-site geometry check of a centre lathe").isVisible()).resolves.toBe(true);
    await expect(page.getByText("Amount due · EUR").isVisible()).resolves.toBe(true);
    await page.screenshot({ path: path.join(screenshots, "checkout-desktop.png"), fullPage: true });

    await fillCard(page, "4242 4242 4242 4242");
    await page.getByRole("button", { name: "Pay €185.00" }).click();
    await page.waitForURL(`${harness.receiver.origin}/bookings/${session.bookingId}/paid?session=${session.id}`);
    await expect(page.getByRole("heading", { name: "Booking paid" }).isVisible()).resolves.toBe(true);
    await expect(page.locator("#session").textContent()).resolves.toBe(session.id);

    await expect(harness.client.retrieveCheckoutSession(session.id)).resolves.toMatchObject({ status: "complete", paymentStatus: "paid" });
    await waitFor(
      () => harness.receiver.received.find((webhook) => webhook.event.type === "checkout.session.completed" && webhook.event.data.object.id === session.id),
      { what: "checkout.session.completed" },
    );
    // Back on the page, the session is closed for good.
    await page.goto(session.url);
    await expect(page.getByRole("heading", { name: "Already paid" }).isVisible()).resolves.toBe(true);
    expect(requests.filter((url) => !isLocal(url))).toEqual([]);
    await context.close();
  });

  it("shows the decline of 4000 0000 0000 0002 and keeps the session open", async () => {
    const session = await newSession();
    const { context, page } = await newRecordedPage(browser);
    await page.goto(session.url);
    await fillCard(page, "4000 0000 0000 0002");
    await page.getByRole("button", { name: /^Pay / }).click();
    await expect(page.getByRole("alert").textContent()).resolves.toBe("Your card was declined.");
    expect(page.url()).toBe(session.url);
    await expect(page.getByLabel("Card number").getAttribute("aria-invalid")).resolves.toBe("true");
    await expect(harness.client.retrieveCheckoutSession(session.id)).resolves.toMatchObject({ status: "open", paymentStatus: "unpaid" });

    // A second try with the good card goes through.
    await fillCard(page, "4242424242424242");
    await page.getByRole("button", { name: /^Pay / }).click();
    await page.waitForURL(/\/paid\?session=/);
    await context.close();
  });

  it("leads back to the cancel URL without paying", async () => {
    const session = await newSession();
    const { context, page } = await newRecordedPage(browser);
    await page.goto(session.url);
    await page.getByRole("link", { name: "Cancel and go back" }).click();
    await page.waitForURL(`${harness.receiver.origin}/bookings/${session.bookingId}`);
    await expect(harness.client.retrieveCheckoutSession(session.id)).resolves.toMatchObject({ status: "open", paymentStatus: "unpaid" });
    await context.close();
  });

  it("fits a phone screen without sideways scrolling", async () => {
    const session = await newSession();
    const { context, page } = await newRecordedPage(browser, { width: 390, height: 844 });
    await page.goto(session.url);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    const pay = await page.getByRole("button", { name: /^Pay / }).boundingBox();
    expect(pay!.width).toBeGreaterThan(300);
    await page.screenshot({ path: path.join(screenshots, "checkout-phone.png"), fullPage: true });
    await fillCard(page, "4000 0000 0000 0002");
    await page.getByRole("button", { name: /^Pay / }).click();
    await page.getByRole("alert").waitFor();
    await page.screenshot({ path: path.join(screenshots, "checkout-phone-declined.png"), fullPage: true });
    await context.close();
  });

  it("refuses an expired session's page", async () => {
    const session = await newSession();
    await harness.client.expireCheckoutSession(session.id);
    const { context, page } = await newRecordedPage(browser);
    const response = await page.goto(session.url);
    expect(response?.status()).toBe(410);
    await expect(page.getByRole("heading", { name: "This payment link has expired" }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole("button", { name: /^Pay / }).count()).resolves.toBe(0);
    await context.close();
  });
});
