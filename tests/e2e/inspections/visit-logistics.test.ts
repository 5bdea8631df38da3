// Meeting at the machine in Chromium: the seller gives the site, the buyer reads it and takes the calendar
// file, proposes another time, and the inspector accepts it.
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking } from "../../support/reports";

const shots = "/tmp/inspections-screenshots";

const browser = chromiumPerFile();

describe("meeting at the machine", () => {
  it("the seller gives the site, the buyer reads it with a calendar file and proposes a time, the inspector accepts", async () => {
    const booked = await acceptedBooking();
    const path = `/bookings/${booked.bookingId}`;

    const seller = await newRecordedPage(browser(), viewports.tablet);
    await signInPage(seller.page, booked.seller.email, booked.seller.password, path);
    await seller.page.waitForURL((url) => url.pathname === path);
    const form = seller.page.getByRole("form", { name: "Machine's address and contact" });
    await form.getByLabel("Street address").fill("Quellweg 12, Hof 2\n15234 Brennwald");
    await form.getByLabel("Contact on site").fill("Jo Ulm");
    await form.getByLabel("Phone").fill("+49 30 1234 567");
    await form.getByLabel("Access notes").fill("Loading dock at the back; 07:00–15:00, ask at the gate.");
    await form.getByRole("button", { name: "Save the site details" }).click();
    await form.getByRole("status").filter({ hasText: "Saved." }).waitFor();
    await screenshotAtEachSize(seller.page, shots, "visit-seller", { part: seller.page.getByTestId("visit-card") });
    await seller.context.close();

    const buyer = await newRecordedPage(browser(), viewports.desktop);
    await signInPage(buyer.page, booked.buyer.email, booked.buyer.password, path);
    await buyer.page.waitForURL((url) => url.pathname === path);
    const site = buyer.page.getByTestId("visit-site");
    await expect(site.textContent()).resolves.toMatch(/Quellweg 12, Hof 2.*Jo Ulm.*\+49 30 1234 567.*Loading dock/s);
    await expect(site.getByRole("link", { name: "+49 30 1234 567" }).getAttribute("href")).resolves.toBe("tel:+49301234567");
    const calendarHref = await buyer.page.getByTestId("visit-calendar").getAttribute("href");
    const calendar = await buyer.page.request.get(calendarHref!);
    expect(calendar.status()).toBe(200);
    expect(await calendar.text()).toMatch(/BEGIN:VEVENT[\s\S]*LOCATION:Quellweg 12\\, Hof 2\\, 15234 Brennwald/);

    const day = new Date(Date.now() + 20 * 86_400_000).toISOString().slice(0, 10);
    await buyer.page.getByText("Propose another time").click();
    await buyer.page.getByLabel("Day").fill(day);
    await buyer.page.getByLabel("Start (at the machine)").fill("09:00");
    await buyer.page.getByTestId("visit-card").getByLabel("Reason (optional)").fill("The machine is rewired that week.");
    await buyer.page.getByRole("button", { name: "Send the request" }).click();
    await expect.poll(() => buyer.page.getByTestId("reschedule-request").textContent().catch(() => "")).toMatch(/You asked to move the visit to .*09:00/);
    await screenshotAtEachSize(buyer.page, shots, "visit-buyer-request", { part: buyer.page.getByTestId("visit-card") });
    await buyer.context.close();

    const inspector = await newRecordedPage(browser(), viewports.phone);
    const inspectorPath = `/inspector/bookings/${booked.bookingId}`;
    await signInPage(inspector.page, booked.inspector.email, booked.inspector.password, inspectorPath);
    await inspector.page.waitForURL((url) => url.pathname === inspectorPath);
    const request = inspector.page.getByTestId("reschedule-request");
    await expect(request.textContent()).resolves.toMatch(/The buyer asks to move the visit to.*The machine is rewired that week/s);
    await screenshotAtEachSize(inspector.page, shots, "visit-inspector-answer", { part: inspector.page.getByTestId("visit-card") });
    await request.getByRole("button", { name: "Accept the new time" }).click();
    await request.waitFor({ state: "detached" });
    const [y, m, d] = day.split("-").map(Number);
    const dayWords = new Date(Date.UTC(y!, m! - 1, d!)).toLocaleDateString("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
    await expect.poll(() => inspector.page.locator("dl").first().textContent()).toContain(dayWords);
    await expect(inspector.page.getByText("Visit moved to the new time").count()).resolves.toBe(1);
    await inspector.context.close();
  });
});
