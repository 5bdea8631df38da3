// A machining centre's report in Chromium: the inspector imports the interferometer's table for each axis
// (a chosen file, then pasted tables with a decimal comma), maps its columns, sees the parsed runs previewed
// with the axis's figures, is told the line of a table that does not parse, and signs; the mapping is offered
// again after a reload. A buyer then finds the machine by its X axis's positioning accuracy.
import { randomUUID } from "node:crypto";
import type { Locator, Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { deviationTable, demoAxisRuns } from "~/demo/positioning-runs";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking } from "../../support/reports";

const shots = "/tmp/positioning-screenshots";
const browser = chromiumPerFile();
const screenshots = (page: Page, name: string) => screenshotAtEachSize(page, shots, name, { noSidewaysScroll: true });

// Tolerances of the machining-centre profile up to 800 mm of travel (A 25, R 15, B 10 µm; from memory).
const tolerances = { accuracy: 25, repeatability: 15, reversal: 10 };
const axes = {
  X: demoAxisRuns({ travel: 760, targets: 11, runs: 5, seed: 101, ratio: 0.4, tolerances }),
  Y: demoAxisRuns({ travel: 430, targets: 9, runs: 5, seed: 202, ratio: 0.45, tolerances: { accuracy: 22, repeatability: 12, reversal: 10 } }),
  Z: demoAxisRuns({ travel: 510, targets: 9, runs: 5, seed: 303, ratio: 0.5, tolerances }),
};

async function openImport(card: Locator) {
  await card.getByRole("button", { name: /Import the instrument's table|Import another table/ }).click();
  const panel = card.getByTestId("positioning-import");
  await panel.waitFor();
  return panel;
}

describe("a machining centre's positioning tests", () => {
  it("imports each axis's table with a column mapping and a preview, refuses a broken line by its number, signs, and a buyer finds the machine by X-axis positioning accuracy", async () => {
    const word = `Varnholt${randomUUID().slice(0, 6)}`;
    const booked = await acceptedBooking({ category: "machining_centre", make: word, model: "VM 760" });
    const { context, page } = await newRecordedPage(browser(), viewports.tablet);
    const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
    await signInPage(page, booked.inspector.email, booked.inspector.password, entryPath);
    await page.waitForURL((url) => url.pathname === entryPath);
    await page.getByLabel(/I have read these cautions/).check();

    // X: the exported file, chosen from the tablet; its columns are in another order than the default.
    const x = page.locator('[data-test-code="V-X-A"]');
    let panel = await openImport(x);
    const reordered = deviationTable(axes.X)
      .split("\n")
      .map((line) => {
        const [run, direction, target, deviation] = line.split(",");
        return [target, deviation, run, direction, "20.1"].join(",");
      })
      .join("\n");
    await panel.getByLabel("Or choose the exported file").setInputFiles({ name: "x-axis.csv", mimeType: "text/csv", buffer: Buffer.from(reordered) });
    await panel.getByText("Read x-axis.csv.").waitFor();
    await expect(panel.getByTestId("import-first-lines").textContent()).resolves.toContain("Column 5");
    // With the default mapping the direction column holds deviations: refused, naming the line.
    await expect(panel.getByTestId("import-refusal").textContent()).resolves.toMatch(/^Line 2: direction/);
    await panel.getByLabel("Run", { exact: true }).selectOption("2");
    await panel.getByLabel("Direction (+ or −)").selectOption("3");
    await panel.getByLabel("Target position").selectOption("0");
    await panel.getByLabel("Deviation", { exact: true }).selectOption("1");
    const preview = panel.getByTestId("import-preview");
    await expect(preview.textContent()).resolves.toContain("Preview: 11 targets over 760 mm · 5 runs approaching in +, 5 in −");
    await expect(preview.getByTestId("positioning-figures").textContent()).resolves.toMatch(/Accuracy A [\d.]+ µm.*Repeatability R [\d.]+ µm.*Reversal value B [\d.]+ µm.*Systematic deviation E [\d.]+ µm/s);
    await screenshots(page, "import-preview");
    await panel.getByRole("button", { name: "Accept these runs" }).click();
    for (const code of ["V-X-A", "V-X-R", "V-X-B"]) {
      await expect(page.locator(`[data-test-code="${code}"]`).getByTestId("positioning-runs").textContent()).resolves.toContain("11 targets from 0 to 760 mm · 5 runs approaching in +, 5 in −");
    }
    await expect.poll(() => x.getByTestId("live-verdict").getAttribute("data-pass"), { timeout: 15_000 }).toBe("true");

    // Y: pasted from a spreadsheet with a decimal comma; the mapping from X is offered and adjusted.
    const y = page.locator('[data-test-code="V-Y-A"]');
    panel = await openImport(y);
    await expect(panel.getByLabel("Deviation", { exact: true }).inputValue()).resolves.toBe("1");
    for (const [role, column] of [["Run", "0"], ["Direction (+ or −)", "1"], ["Target position", "2"], ["Deviation", "3"]] as const) {
      await panel.getByLabel(role, { exact: true }).selectOption(column);
    }
    await panel.getByLabel("Paste the table").fill(deviationTable(axes.Y, { decimalComma: true }));
    await panel.getByLabel("Decimal comma").check();
    await panel.getByTestId("import-preview").waitFor();
    await panel.getByRole("button", { name: "Accept these runs" }).click();
    await expect(page.locator('[data-test-code="V-Y-B"]').getByTestId("positioning-runs").textContent()).resolves.toContain("9 targets");
    await page.getByTestId("save-status").and(page.locator('[data-state="saved"]')).waitFor({ timeout: 20_000 });

    // After a reload the saved mapping (decimal comma and all) is offered for Z; a broken line is named.
    await page.reload();
    await page.getByLabel(/I have read these cautions/).check();
    const z = page.locator('[data-test-code="V-Z-A"]');
    panel = await openImport(z);
    await expect(panel.getByLabel("Decimal comma").isChecked()).resolves.toBe(true);
    const lines = deviationTable(axes.Z, { decimalComma: true }).split("\n");
    lines[12] = "3;+;two hundred;1,4";
    await panel.getByLabel("Paste the table").fill(lines.join("\n"));
    await expect(panel.getByTestId("import-refusal").textContent()).resolves.toMatch(/^Line 13: the target "two hundred" is not a number/);
    await screenshots(page, "import-refusal");
    await panel.getByLabel("Paste the table").fill(deviationTable(axes.Z, { decimalComma: true }));
    await panel.getByRole("button", { name: "Accept these runs" }).click();
    // The grade is scored in a deferred render after the runs land: wait for it.
    await expect.poll(() => page.getByTestId("preview-bar").textContent(), { timeout: 15_000 }).toMatch(/grade [AB]/i);

    // The optional circular test: its table of radial deviations, read with the same kind of mapping.
    const circle = page.locator('[data-test-code="V-XY-CIRC"]');
    panel = await openImport(circle);
    await panel.getByLabel("Direction (cw or ccw)").selectOption("0");
    await panel.getByLabel("Angle (degrees)").selectOption("1");
    await panel.getByLabel("Deviation", { exact: true }).selectOption("2");
    const angles = Array.from({ length: 36 }, (_, i) => i * 10);
    const radial = ["direction;angle;deviation", ...angles.map((a) => `cw;${a};${(2 * Math.cos((2 * Math.PI * a) / 180)).toFixed(1).replace(".", ",")}`), ...angles.map((a) => `ccw;${a};${(2 * Math.cos((2 * Math.PI * a) / 180) - 1.5).toFixed(1).replace(".", ",")}`)];
    await panel.getByLabel("Paste the table").fill(radial.join("\n"));
    await expect(panel.getByTestId("circular-figures").textContent()).resolves.toMatch(/Circular deviation [\d.]+ µm.*hysteresis 1\.5 µm/s);
    await panel.getByRole("button", { name: "Accept these readings" }).click();
    await expect(circle.getByTestId("circular-readings").textContent()).resolves.toBe("36 readings clockwise, 36 counter-clockwise");
    await page.getByTestId("save-status").and(page.locator('[data-state="saved"]')).waitFor({ timeout: 20_000 });

    await Promise.all([page.waitForURL((url) => url.pathname === `${entryPath}/review`), page.getByRole("button", { name: "Submit for review" }).click()]);
    await page.getByRole("heading", { name: "Sign the report" }).waitFor();
    await page.getByLabel(/I took these readings/).check();
    await Promise.all([page.waitForURL((url) => url.pathname.startsWith("/reports/")), page.getByRole("button", { name: "Sign and publish" }).click()]);
    await page.getByText("Signed and published.").waitFor();
    const figures = page.getByTestId("key-figures").first();
    await expect(figures.textContent()).resolves.toMatch(/X axis, positioning accuracy[\d.]+ µm.*X axis, repeatability[\d.]+ µm.*Z axis, repeatability/s);
    await expect(figures.textContent()).resolves.not.toMatch(/Centre height|Table flatness/);
    const plot = page.locator('[data-plot="V-X-A"]');
    await expect(plot.getByTestId("positioning-figures").textContent()).resolves.toMatch(/Accuracy A [\d.]+ µm/);
    // One plot per axis: its A, R and B share the runs.
    await expect(page.locator('[data-plot^="V-"] [data-testid="positioning-figures"]').count()).resolves.toBe(3);
    await screenshots(page, "positioning-report");
    const accuracy = Number((await figures.textContent())!.match(/X axis, positioning accuracy([\d.]+) µm/)![1]);

    // A buyer filters machining centres by the X axis's positioning accuracy.
    const buyer = await context.newPage();
    const within = `/machines?q=${word}&category=machining_centre&xAccuracyMax=${Math.ceil(accuracy)}`;
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
    await expect(card.textContent()).resolves.toMatch(/X axis, positioning accuracy/);
    await screenshots(buyer, "positioning-search");
    await buyer.goto(`/machines?q=${word}&category=machining_centre&xAccuracyMax=${Math.max(0.1, Math.floor(accuracy) - 1)}`);
    await buyer.getByTestId("empty-results").waitFor();
    await context.close();
  }, 240_000);
});
