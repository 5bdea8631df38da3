// A seller's tools, each at desktop, tablet and phone sizes: photos keep the order the seller chose them in
// and can be moved by keyboard, the seller's own public page offers "Edit" (nobody else's does).
import { describe, expect, it } from "vitest";
import { createTestUser, signInCookie, signInPage } from "../../support/accounts";
import { appOrigin, newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize } from "../../support/browser-per-file";
import { jpegWithGps } from "../../support/images";
import { createListingAs, listingRow, postForm, uploadFileAs, validListingFields } from "../../support/listings";

const shots = process.env.SCREENSHOT_DIR ?? "/tmp/seller-tools-screenshots";

const browser = chromiumPerFile();

/** A published listing with one photo, made over HTTP as the seller's browser would. */
async function publishedListingOf(seller: { email: string; password: string }, overrides: Record<string, string> = {}) {
  const cookie = await signInCookie(seller.email, seller.password);
  const listingId = await createListingAs(cookie, overrides);
  await uploadFileAs(cookie, listingId, "photos", { bytes: await jpegWithGps({ width: 800, height: 600 }), name: "front.jpg", type: "image/jpeg" });
  const published = await postForm(`/sell/listings/${listingId}`, cookie, { intent: "publish" });
  expect(published.status).toBe(302);
  return { listingId, slug: (await listingRow(listingId)).slug, cookie };
}

describe("a seller's tools", () => {
  it("keeps the photos in the order chosen, whichever upload ends first, and moves them by keyboard", { timeout: 180_000 }, async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Brekke Maskin" });
    const cookie = await signInCookie(seller.email, seller.password);
    const listingId = await createListingAs(cookie);
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, seller.email, seller.password, `/sell/listings/${listingId}`);

    // The first file chosen is the largest, so it finishes last.
    const files = [
      { name: "1-whole-machine.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps({ width: 3200, height: 2400, tint: "#7a5230" }) },
      { name: "2-headstock.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps({ width: 400, height: 300, tint: "#2d5a7a" }) },
      { name: "3-nameplate.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps({ width: 400, height: 300, tint: "#3a7a2d" }) },
    ];
    await page.locator('#photos input[type="file"]').setInputFiles(files);
    await page.locator('#photos [data-upload-state="done"]').nth(2).waitFor({ timeout: 60_000 });
    const gallery = page.locator('ol[aria-label="Photos in gallery order"] > li');
    await expect.poll(() => gallery.count(), { timeout: 20_000 }).toBe(3);
    const order = () => gallery.locator("img").evaluateAll((images) => images.map((image) => (image as HTMLImageElement).alt.replace(/^Photo \d+: /, "")));
    expect(await order()).toEqual(files.map((file) => file.name));
    expect(await gallery.first().textContent()).toContain("Cover");

    // Keyboard only: focus "Make cover" on the third photo and press Enter; then move the new second one later.
    await gallery.nth(2).getByRole("button", { name: "Make cover" }).focus();
    await page.keyboard.press("Enter");
    await expect.poll(order, { timeout: 15_000 }).toEqual(["3-nameplate.jpg", "1-whole-machine.jpg", "2-headstock.jpg"]);
    expect(await gallery.first().textContent()).toContain("Cover");
    await page.getByRole("button", { name: "Move photo 2 later" }).focus();
    await page.keyboard.press("Enter");
    await expect.poll(order, { timeout: 15_000 }).toEqual(["3-nameplate.jpg", "2-headstock.jpg", "1-whole-machine.jpg"]);
    await page.locator("#photos").scrollIntoViewIfNeeded();
    await screenshotAtEachSize(page, shots, "photo-order", { noSidewaysScroll: true });
    await context.close();
  });

  it("offers the seller an Edit link on their own public page, and nobody else", { timeout: 120_000 }, async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Brekke Maskin" });
    const { listingId, slug } = await publishedListingOf(seller);
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, seller.email, seller.password, `/machines/${slug}`);
    const edit = page.getByRole("link", { name: "Edit", exact: true });
    await edit.waitFor();
    await screenshotAtEachSize(page, shots, "own-listing-edit", { noSidewaysScroll: true });
    await edit.click();
    await page.waitForURL((url) => url.pathname === `/sell/listings/${listingId}`);
    await context.close();

    // Another seller, a buyer and a visitor: no link, and the edit address is nowhere in the page.
    const otherSeller = await createTestUser({ roles: ["seller"] });
    const buyer = await createTestUser();
    for (const viewer of [otherSeller, buyer, null]) {
      const visit = await newRecordedPage(browser());
      if (viewer) await signInPage(visit.page, viewer.email, viewer.password, `/machines/${slug}`);
      else await visit.page.goto(`/machines/${slug}`);
      await visit.page.getByRole("heading", { level: 1 }).waitFor();
      expect(await visit.page.getByRole("link", { name: "Edit", exact: true }).count()).toBe(0);
      expect(await visit.page.content()).not.toContain("/sell/listings/");
      await visit.context.close();
    }
  });

  it("shows each listing's verification, booking, views, watchers and questions on the dashboard, newest first", { timeout: 150_000 }, async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Brekke Maskin" });
    const older = await publishedListingOf(seller, { model: "ML 190" });
    const newer = await publishedListingOf(seller, { model: "ML 450" });
    // The older one changed last: the list is still newest first, by when each was listed.
    await postForm(`/sell/listings/${older.listingId}`, older.cookie, { ...validListingFields({ model: "ML 190" }), price: "8800" });

    // A buyer's visit counts; the seller's own visit and a crawler's do not.
    const buyer = await createTestUser();
    const visit = await newRecordedPage(browser());
    // Headless Chromium names itself in its user agent, and is rightly taken for a robot: this buyer's does not.
    await visit.context.setExtraHTTPHeaders({ "user-agent": "Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/130.0 Safari/537.36" });
    await signInPage(visit.page, buyer.email, buyer.password, `/machines/${newer.slug}`);
    await visit.page.getByRole("heading", { level: 1 }).waitFor();
    await visit.page.getByRole("button", { name: "☆ Watch this machine" }).click();
    await visit.page.getByRole("button", { name: "★ Watching — stop" }).waitFor();
    await visit.context.close();
    await fetch(`${appOrigin}/machines/${newer.slug}`, { headers: { "user-agent": "Mozilla/5.0 (compatible; Googlebot/2.1; +http://www.google.com/bot.html)" } });
    await fetch(`${appOrigin}/machines/${newer.slug}`, { headers: { cookie: newer.cookie, "user-agent": "Mozilla/5.0 (X11; Linux x86_64) Chrome/130.0" } });

    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, seller.email, seller.password, "/sell");
    const rows = page.locator("tbody tr[data-listing-id]");
    await rows.first().waitFor();
    // Views are written in batches every few seconds: reload until the buyer's visit is in.
    const viewsColumn = (await page.locator("thead th").allTextContents()).findIndex((text) => text.startsWith("Views"));
    const viewsOfNewest = page.locator(`tr[data-listing-id="${newer.listingId}"] td`).nth(viewsColumn);
    for (let attempt = 0; attempt < 30 && (await viewsOfNewest.textContent()) !== "1"; attempt++) {
      await page.waitForTimeout(1_000);
      await page.reload();
      await rows.first().waitFor();
    }
    expect(await rows.evaluateAll((found) => found.map((row) => row.getAttribute("data-listing-id")))).toEqual([newer.listingId, older.listingId]);
    const newest = page.locator(`tr[data-listing-id="${newer.listingId}"]`);
    const cells = await newest.locator("td").allTextContents();
    const header = await page.locator("thead th").allTextContents();
    const cell = (name: string) => cells[header.findIndex((text) => text.startsWith(name))];
    expect(cell("Verification")).toBe("Not yet verified");
    expect(cell("Inspection")).toContain("None booked");
    expect(cell("Views")).toBe("1");
    expect(cell("Watching")).toBe("1");
    expect(cell("Questions")).toBe("0");
    await screenshotAtEachSize(page, shots, "dashboard", { noSidewaysScroll: true });
    await newest.getByRole("link", { name: /Book an inspection/ }).click();
    await page.waitForURL((url) => url.pathname === `/machines/${newer.slug}/book`);
    await context.close();
  });

  it("links Offered by to the seller's public page: name, town, machines and how many are verified, no e-mail or account id", { timeout: 120_000 }, async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Brekke Maskin" });
    const first = await publishedListingOf(seller, { model: "ML 190", city: "Tindvik" });
    await publishedListingOf(seller, { model: "ML 450", city: "Tindvik" });
    const { context, page } = await newRecordedPage(browser());
    await page.goto(`/machines/${first.slug}`);
    await page.getByRole("link", { name: "Brekke Maskin" }).click();
    await page.waitForURL((url) => /^\/sellers\/[0-9a-f-]{36}$/.test(url.pathname));
    await page.getByRole("heading", { level: 1, name: "Brekke Maskin" }).waitFor();
    expect(await page.getByText("Tindvik, Vestmark, Norway").count()).toBe(1);
    expect(await page.getByTestId("seller-counts").textContent()).toBe("2 machines on show, 0 verified by a certified inspector");
    expect(await page.getByRole("list", { name: "Machines offered by Brekke Maskin" }).getByRole("listitem").count()).toBe(2);
    const html = await page.content();
    expect(html).not.toContain(seller.email);
    expect(html).not.toContain(seller.id);
    expect(page.url()).not.toContain(seller.id);
    await screenshotAtEachSize(page, shots, "seller-page", { noSidewaysScroll: true });
    expect((await page.goto("/sellers/00000000-0000-4000-8000-000000000000"))?.status()).toBe(404);
    await context.close();
  });

  it("lets the seller caption a photo, and a buyer open it full screen and zoom by keyboard alone", { timeout: 120_000 }, async () => {
    const seller = await createTestUser({ roles: ["seller"], name: "Brekke Maskin" });
    const { listingId, slug } = await publishedListingOf(seller);
    const { context, page } = await newRecordedPage(browser());
    await signInPage(page, seller.email, seller.password, `/sell/listings/${listingId}`);
    await page.getByLabel("Caption of photo 1", { exact: true }).fill("Bed ways at the chuck end, after regrinding");
    await page.getByRole("button", { name: "Save the caption of photo 1" }).focus();
    await page.keyboard.press("Enter");
    await expect.poll(() => page.getByLabel("Caption of photo 1", { exact: true }).inputValue(), { timeout: 15_000 }).toBe("Bed ways at the chuck end, after regrinding");
    // A caption with a control character is refused with a message, and the saved one stays.
    await page.getByLabel("Caption of photo 1", { exact: true }).fill("Bed\u0007 ways");
    await page.getByRole("button", { name: "Save the caption of photo 1" }).click();
    await page.getByRole("alert").filter({ hasText: "caption" }).waitFor();
    await context.close();

    const visit = await newRecordedPage(browser());
    await visit.page.goto(`/machines/${slug}`);
    await visit.page.getByText("Bed ways at the chuck end, after regrinding").waitFor();
    await screenshotAtEachSize(visit.page, shots, "photo-caption", { noSidewaysScroll: true });
    await visit.page.getByRole("button", { name: "Enlarge and zoom" }).focus();
    await visit.page.keyboard.press("Enter");
    const zoomIn = visit.page.getByRole("button", { name: "Zoom in" });
    await zoomIn.waitFor({ timeout: 20_000 });
    expect(await visit.page.locator(".yarl__slide_description").first().textContent()).toBe("Bed ways at the chuck end, after regrinding");
    await zoomIn.focus();
    await visit.page.keyboard.press("Enter");
    await expect.poll(() => visit.page.getByRole("button", { name: "Zoom out" }).isEnabled(), { timeout: 10_000 }).toBe(true);
    await screenshotAtEachSize(visit.page, shots, "photo-lightbox", { noSidewaysScroll: true });
    await visit.page.keyboard.press("Escape");
    await expect.poll(() => zoomIn.count(), { timeout: 10_000 }).toBe(0);
    await visit.context.close();
  });
});
