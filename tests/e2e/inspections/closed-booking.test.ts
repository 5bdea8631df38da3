// The buyer's closed booking in Chromium: the report linked, no payout lines or transfer ids, a history that
// does not repeat itself, a reference that stays on one line, and the report's plots in the results' order.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { bookingEvents, bookings } from "~/modules/inspections/schema";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";

const shots = "/tmp/inspections-screenshots";

const browser = chromiumPerFile();

describe("the buyer's closed booking", () => {
  it("links the report, keeps payouts out, says each step once and plots in the results' order", async () => {
    const booked = await acceptedBooking();
    const report = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    // The inspector's share transferred: what the payout job records when it closes the booking.
    await db.update(bookings).set({ status: "closed" }).where(eq(bookings.id, booked.bookingId));
    await db.insert(bookingEvents).values({ bookingId: booked.bookingId, kind: "payout_recorded", fromStatus: "report_filed", toStatus: "closed", note: "transfer tr_e2e_hidden_4411" });

    const { context, page } = await newRecordedPage(browser(), viewports.desktop);
    const path = `/bookings/${booked.bookingId}`;
    await signInPage(page, booked.buyer.email, booked.buyer.password, path);
    await page.waitForURL((url) => url.pathname === path);
    await page.getByTestId("booking-report-link").waitFor();

    const body = (await page.locator("main, body").first().textContent())!;
    expect(body).not.toMatch(/tr_e2e_hidden_4411|Inspector's share|transferred/);
    const history = await page.getByTestId("history-entry").allTextContents();
    expect(history.some((entry) => /Inspection completed/.test(entry))).toBe(true);
    expect(history.some((entry) => /Report filed\s*→\s*Report filed/.test(entry))).toBe(false);
    const reference = page.locator("dd .font-mono").first();
    await expect(reference.evaluate((element) => getComputedStyle(element).whiteSpace)).resolves.toBe("nowrap");
    await screenshotAtEachSize(page, shots, "closed-booking-buyer");

    // A phone keeps the reference on one line.
    await page.setViewportSize(viewports.phone);
    const box = (await reference.boundingBox())!;
    const lineHeight = await reference.evaluate((element) => parseFloat(getComputedStyle(element).lineHeight));
    expect(box.height).toBeLessThan(lineHeight * 1.5);

    await page.setViewportSize(viewports.desktop);
    await Promise.all([page.waitForURL((url) => url.pathname === `/reports/${report.id}`), page.getByTestId("booking-report-link").click()]);
    await page.locator("[data-plot]").first().waitFor();
    const tableOrder = await page.locator("tr[data-code]").evaluateAll((rows) => rows.map((row) => row.getAttribute("data-code")));
    const plotOrder = await page.locator("[data-plot^='L-']").evaluateAll((cards) => cards.map((card) => card.getAttribute("data-plot")));
    expect(plotOrder.length).toBeGreaterThan(2);
    expect(plotOrder).toEqual(tableOrder.filter((code) => plotOrder.includes(code)));
    await context.close();
  });
});
