import { randomUUID } from "node:crypto";
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Cookie, Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { drawLathePhoto, paints } from "~/demo/listing-photos.server";
import { createTestUser, signInPage } from "../../support/accounts";
import { appOrigin, isLocal, newRecordedPage } from "../../support/browser";
import { chromiumPerFile } from "../../support/browser-per-file";
import { latestEmailTo, linkIn } from "../../support/mailbox";

const browser = chromiumPerFile();

// Set SCREENSHOT_DIR to keep phone and desktop screenshots of each page the story passes.
const screenshotDir = process.env.SCREENSHOT_DIR;
async function shoot(page: Page, name: string) {
  if (!screenshotDir) return;
  mkdirSync(screenshotDir, { recursive: true });
  await page.evaluate(() => window.scrollTo(0, 0));
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}
async function shootOnPhone(url: string, name: string, cookies: Cookie[]) {
  if (!screenshotDir) return;
  const phone = await newRecordedPage(browser(), { width: 390, height: 844 });
  await phone.context.addCookies(cookies);
  await phone.page.goto(url, { waitUntil: "networkidle" });
  const overflow = await phone.page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow, `${name} scrolls sideways on a phone`).toBeLessThanOrEqual(0);
  await shoot(phone.page, `${name}-phone`);
  await phone.context.close();
}

describe("the dealer's story", () => {
  it("signs up as a seller, lists a centre lathe with two photos, publishes it and finds it on the browse and public pages", async () => {
    const { context, page, requests } = await newRecordedPage(browser());
    const email = `dealer-${randomUUID().slice(0, 8)}@example.test`;
    const model = `ML ${Math.floor(Math.random() * 900 + 100)}`;

    // Sign up through the accounts pages, choosing "I sell machines", and confirm the address from the mailbox.
    await page.goto("/sell");
    await page.getByRole("link", { name: "Create a seller account" }).click();
    await page.waitForURL((url) => url.pathname === "/sign-up");
    await page.getByText("I sell machines").click({ trial: true });
    await page.locator('input[data-role="seller"]').check();
    await page.getByLabel("Your name").fill("Halvorsen Verktøymaskiner");
    await page.getByLabel("E-mail address").fill(email);
    await page.getByLabel("Password").fill("a bed reground to a tenth");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForURL((url) => url.pathname === "/verify-email");
    const message = await latestEmailTo(email, { matching: (candidate) => candidate.tag === "verify-email" });
    await page.goto(linkIn(message, `${appOrigin}/verify-email?token=`));
    await page.waitForURL((url) => url.pathname !== "/verify-email");

    // An empty dashboard, then the new-listing form.
    await page.goto("/sell");
    await page.getByRole("heading", { name: "No listings yet" }).waitFor();
    await page.getByRole("link", { name: "New listing" }).click();
    await page.waitForURL((url) => url.pathname === "/sell/new");
    await page.getByLabel("Kind of machine").selectOption({ label: "Centre lathe" });
    await page.getByLabel("Condition").selectOption({ label: "Reconditioned" });
    await page.getByLabel("Make").fill("Halvorsen");
    await page.getByLabel("Model").fill(model);
    await page.getByLabel("Year of manufacture").fill("1986");
    await page.getByLabel("Swing over bed (mm)").fill("280");
    await page.getByLabel("Distance between centres (mm)").fill("750");
    await page.getByLabel("Spindle bore (mm)").fill("38");
    await page.getByLabel("Spindle nose").fill("D1-4 camlock");
    await page.getByLabel("Main motor power (kW)").fill("2.2");
    await page.getByLabel("Weight (kg)").fill("780");
    await page.getByLabel("Town or city").fill("Eskerud");
    await page.getByLabel("Country").selectOption({ label: "Norway" });
    await page.getByLabel("Asking price").fill("9400");
    await page.getByLabel("Currency").selectOption("EUR");
    await page.getByLabel("Description", { exact: true }).fill("Reground bed, new spindle bearings, gearbox opened and cleaned. Runs quietly through all speeds.");
    await shoot(page, "form-desktop");
    await page.getByRole("button", { name: "Save draft and add photos" }).click();
    await page.waitForURL((url) => /^\/sell\/listings\/[0-9a-f-]{36}$/.test(url.pathname));
    await page.getByText("Draft saved. Add photos next").waitFor();

    // Two real JPEGs, sent over a throttled uplink so that the progress bars visibly move.
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.enable");
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 400 * 1024 });
    await page.evaluate(() => {
      const seen: number[] = ((window as any).progressSeen = []);
      new MutationObserver(() => {
        for (const bar of document.querySelectorAll('#photos [role="progressbar"]')) seen.push(Number(bar.getAttribute("aria-valuenow")));
      }).observe(document.body, { subtree: true, attributes: true, childList: true });
    });
    const photos = await Promise.all([0, 1].map(async (view) => ({ name: `lathe-${view + 1}.jpg`, mimeType: "image/jpeg", buffer: await drawLathePhoto({ paint: paints[0], view }) })));
    expect(photos.every((photo) => photo.buffer.length > 200_000)).toBe(true);
    await page.locator('#photos input[type="file"]').setInputFiles(photos);
    await page.locator('#photos [data-upload-state="done"]').nth(1).waitFor({ timeout: 30_000 });
    const progressSeen: number[] = await page.evaluate(() => (window as any).progressSeen);
    expect(progressSeen.some((value) => value > 0 && value < 100), `progress values seen: ${progressSeen.join(",")}`).toBe(true);
    expect(progressSeen).toContain(100);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });

    // The thumbnails made on the server appear in the gallery order, the first one as the cover.
    const thumbnails = page.locator('ol[aria-label="Photos in gallery order"] img');
    await expect.poll(() => thumbnails.count()).toBe(2);
    await expect
      .poll(() => thumbnails.evaluateAll((images) => images.every((image) => (image as HTMLImageElement).complete && (image as HTMLImageElement).naturalWidth === 480)))
      .toBe(true);
    await shoot(page, "edit-desktop");
    const editUrl = page.url();

    await page.getByRole("button", { name: "Publish" }).click();
    await page.getByText("Published. Buyers can find it").waitFor();

    await page.goto("/sell");
    await page.getByRole("link", { name: `Halvorsen ${model}` }).waitFor();
    await shoot(page, "dashboard-desktop");

    // Buyers find it on the browse page, newest first, and open the public page.
    // The search index is updated through the job queue a moment after publishing (other tests keep the
    // queue busy meanwhile): reload the browse page as a person would, for up to half a minute.
    const card = page.getByRole("link", { name: new RegExp(`Halvorsen ${model}`) }).first();
    for (const deadline = Date.now() + 30_000; ; ) {
      await page.goto("/machines");
      if (await card.waitFor({ timeout: 3_000 }).then(() => true, () => false)) break;
      if (Date.now() > deadline) throw new Error(`Halvorsen ${model} did not appear on /machines within 30 s of publishing`);
    }
    await shoot(page, "browse-desktop");
    await card.click();
    await page.waitForURL((url) => url.pathname.startsWith("/machines/halvorsen-ml-"));
    await page.getByRole("heading", { level: 1, name: `Halvorsen ${model}` }).waitFor();
    await page.getByText("Not yet verified").first().waitFor();
    await page.getByRole("link", { name: "Book an inspection" }).waitFor();
    await expect(page.locator("dl").first().textContent()).resolves.toMatch(/Swing over bed280 mm.*Distance between centres750 mm/);
    // Safety cautions live where the work is described (report form, inspectors' pages, how scoring works), not here.
    await expect(page.getByTestId("safety-cautions").count()).resolves.toBe(0);
    const galleryLoaded = await page.locator('img[alt*="photo 1 of 2"]').evaluate((image) => (image as HTMLImageElement).naturalWidth > 0);
    expect(galleryLoaded).toBe(true);
    await shoot(page, "public-desktop");
    const publicUrl = page.url();

    // Phone screenshots of the same pages (and a check that none scrolls sideways).
    const cookies = await context.cookies();
    await shootOnPhone("/sell", "dashboard", cookies);
    await shootOnPhone("/sell/new", "form", cookies);
    await shootOnPhone(editUrl, "edit", cookies);
    await shootOnPhone("/machines", "browse", []);
    await shootOnPhone(publicUrl, "public", []);

    expect(requests.filter((url) => !isLocal(url))).toEqual([]);
    await context.close();

    // A buyer watches the machine and writes to the seller, who gets the question by e-mail.
    const buyer = await createTestUser({ name: "Ilka Brenner" });
    const visit = await newRecordedPage(browser());
    await signInPage(visit.page, buyer.email, buyer.password, new URL(publicUrl).pathname);
    await visit.page.getByRole("button", { name: "☆ Watch this machine" }).click();
    await visit.page.getByRole("button", { name: "★ Watching — stop" }).waitFor();
    await visit.page.getByLabel("Your question").fill("Could I see it cutting next week? Is the leadscrew original?");
    await visit.page.getByRole("button", { name: "Send to the seller" }).click();
    await visit.page.getByText("Sent. The seller has your message").waitFor();
    await shoot(visit.page, "public-buyer-desktop");
    const inquiry = await latestEmailTo(email, { matching: (candidate) => candidate.tag === "listing-inquiry" });
    expect(inquiry.replyTo).toBe(buyer.email);
    await visit.context.close();
  });
});
