// A milling machine's report in Chromium: the inspector pastes the table's grid of heights from a CSV file, sees
// the heights as a colour map with the live verdict, signs; a buyer then finds the mill by table flatness.
import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking, inspectorCookie, millForm, saveDraftOverHttp } from "../../support/reports";

const shots = "/tmp/mill-screenshots";
const widths = { tablet: { width: 820, height: 1180 }, phone: { width: 390, height: 844 }, desktop: { width: 1280, height: 900 } };

const browser = chromiumPerFile();

// Heights in µm as a spreadsheet exports them: a header of x positions, a label per row, a decimal comma.
const CSV = ["y\\x;0;300;600;900", "row 1;0;-2;-3;0", "row 2;1;-4;-5;1", "row 3;0;-2;-2;2"].join("\n");

describe("a milling machine's report", () => {
  it("takes the table's flatness grid pasted from CSV, shows it as a colour map, signs, and a buyer finds the mill by table flatness", async () => {
    const word = `Kessfeld${randomUUID().slice(0, 6)}`;
    const booked = await acceptedBooking({ category: "milling_machine", make: word, model: "KM 3" });
    // Every other test was typed earlier on this visit (saved as a draft).
    expect((await saveDraftOverHttp(await inspectorCookie(booked.inspector), booked.bookingId, { ...millForm(), safetyAcknowledged: false })).status).toBe(200);

    const { context, page } = await newRecordedPage(browser(), viewports.tablet);
    const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
    await signInPage(page, booked.inspector.email, booked.inspector.password, entryPath);
    await page.waitForURL((url) => url.pathname === entryPath);
    await page.getByLabel(/I have read these cautions/).check();

    const table = page.locator('[data-test-code="M-TABLE-FLAT"]');
    await table.getByLabel("Instrument", { exact: true }).selectOption("i1");
    await table.getByRole("button", { name: "Paste the grid from a spreadsheet or CSV" }).click();
    await table.getByLabel(/Paste the grid from a spreadsheet or CSV/).fill(CSV);
    await table.getByRole("button", { name: "Use these rows" }).click();
    await expect(table.getByRole("status").textContent()).resolves.toContain("3 × 4 heights pasted, 1 line skipped");
    await table.getByLabel("Spacing of columns", { exact: true }).fill("300");
    await table.getByLabel("Spacing of rows", { exact: true }).fill("100");
    await expect(table.getByLabel("Height, row 2, column 3", { exact: true }).inputValue()).resolves.toBe("-5");

    const verdict = table.getByTestId("live-verdict");
    await expect.poll(() => verdict.getAttribute("data-pass"), { timeout: 15_000 }).toBe("true");
    const plot = table.getByTestId("surface-plot");
    await plot.waitFor();
    await expect(plot.getByTestId("zone-width").textContent()).resolves.toMatch(/^Zone \d+(\.\d)? µm wide$/);
    await expect.poll(() => page.getByTestId("preview-bar").textContent(), { timeout: 15_000 }).toMatch(/of 11 required|grade [AB]/);
    await page.getByTestId("save-status").and(page.locator('[data-state="saved"]')).waitFor();
    await screenshotAtEachSize(page, shots, "mill-entry");

    // A reload brings the pasted grid back from the saved draft.
    await page.reload();
    await expect(page.locator('[data-test-code="M-TABLE-FLAT"]').getByLabel("Height, row 3, column 4", { exact: true }).inputValue()).resolves.toBe("2");

    await Promise.all([page.waitForURL((url) => url.pathname === `${entryPath}/review`), page.getByRole("button", { name: "Submit for review" }).click()]);
    await page.getByRole("heading", { name: "Sign the report" }).waitFor();
    await page.getByLabel(/I took these readings/).check();
    await Promise.all([page.waitForURL((url) => url.pathname.startsWith("/reports/")), page.getByRole("button", { name: "Sign and publish" }).click()]);
    await page.getByText("Signed and published.").waitFor();
    const figures = page.getByTestId("key-figures").first();
    await expect(figures.textContent()).resolves.toMatch(/Table flatness[\d.]+ µm.*Squareness of travels/s);
    await expect(figures.textContent()).resolves.not.toMatch(/Centre height/);
    const reportPlot = page.locator('[data-plot="M-TABLE-FLAT"]').getByTestId("surface-plot");
    await reportPlot.waitFor();
    await expect(reportPlot.locator("svg title").textContent()).resolves.toContain("heights over the surface");
    await screenshotAtEachSize(page, shots, "mill-report");
    const flatness = Number((await figures.textContent())!.match(/Table flatness([\d.]+) µm/)![1]);

    // A buyer searches by table flatness: the mill is within a limit just above its figure, and not below it.
    const buyer = await context.newPage();
    const within = `/machines?q=${word}&flatnessMax=${Math.ceil(flatness)}`;
    await expect
      .poll(
        async () => {
          await buyer.goto(within);
          return buyer.locator(`[data-listing-id="${booked.listing.id}"]`).count();
        },
        { timeout: 20_000 },
      )
      .toBe(1);
    const card = buyer.locator(`[data-listing-id="${booked.listing.id}"]`);
    await expect(card.textContent()).resolves.toMatch(/Table flatness/);
    await screenshotAtEachSize(buyer, shots, "mill-search");
    await buyer.goto(`/machines?q=${word}&flatnessMax=${Math.max(0.1, Math.floor(flatness) - 1)}`);
    await buyer.getByTestId("empty-results").waitFor();
    await context.close();
  });
});
