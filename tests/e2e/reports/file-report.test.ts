// The inspector's second half of the story in Chromium: the accepted booking is made through the
// inspections module (hold, payment on the Stripe stand-in, acceptance) in the setup, not through its pages.
import { readFileSync } from "node:fs";
import { PDFParse } from "pdf-parse";
import { describe, expect, it } from "vitest";
import { signInPage } from "../../support/accounts";
import { newRecordedPage } from "../../support/browser";
import { chromiumPerFile, screenshotAtEachSize, viewports } from "../../support/browser-per-file";
import { acceptedBooking, completeForm, inspectorCookie, saveDraftOverHttp } from "../../support/reports";

const shots = "/tmp/reports-screenshots";
const widths = { tablet: { width: 820, height: 1180 }, phone: { width: 390, height: 844 }, desktop: { width: 1280, height: 900 } };

const browser = chromiumPerFile();

describe("filing an accuracy report on a tablet", () => {
  it("enters readings with a live verdict, fails a mandrel leaning the wrong way by 2 µm, signs, and the listing shows the grade; the PDF carries the key figures", async () => {
    const booked = await acceptedBooking();
    // Most readings were typed earlier on this visit (saved as a draft); the rest are typed here.
    const earlier = completeForm({ "L-SP-PAR-H": undefined, "L-CAR-H": undefined });
    earlier.safetyAcknowledged = false;
    expect((await saveDraftOverHttp(await inspectorCookie(booked.inspector), booked.bookingId, earlier)).status).toBe(200);

    const { context, page } = await newRecordedPage(browser(), viewports.tablet);
    const entryPath = `/inspector/bookings/${booked.bookingId}/report`;
    await signInPage(page, booked.inspector.email, booked.inspector.password, entryPath);
    await page.waitForURL((url) => url.pathname === entryPath);

    // Safety first: the cautions come before the profile and every test.
    const safety = page.getByTestId("safety-cautions");
    await expect(safety.textContent()).resolves.toMatch(/chuck key out.*gloves.*Lock the machine out.*heavy.*manual/s);
    const safetyTop = (await safety.boundingBox())!.y;
    const firstTestTop = (await page.locator("[data-test-code]").first().boundingBox())!.y;
    expect(safetyTop).toBeLessThan(firstTestTop);
    await page.getByLabel(/I have read these cautions/).check();
    await expect(page.getByText(/Suggested: Centre lathe, normal class/).textContent()).resolves.toContain("v1");

    // Straightness of the carriage: pasted from a spreadsheet, then one station added by hand.
    const carriage = page.locator('[data-test-code="L-CAR-H"]');
    await carriage.getByRole("button", { name: "Paste from a spreadsheet or CSV" }).click();
    await carriage.getByLabel(/Two columns, station then reading/).fill("Station\tReading\n0\t0\n250\t2\n500\t3\n750\t1");
    await carriage.getByRole("button", { name: "Use these rows" }).click();
    await expect(carriage.getByRole("status").textContent()).resolves.toContain("4 stations pasted, 1 line skipped");
    await carriage.getByRole("button", { name: "+ Add a station" }).click();
    await expect(carriage.getByLabel("Station 5", { exact: true }).inputValue()).resolves.toBe("1000");
    await carriage.getByLabel("Reading 5", { exact: true }).fill("0");
    await expect(carriage.getByTestId("live-verdict").getAttribute("data-pass")).resolves.toBe("true");

    // Spindle axis, horizontal: the free end 2 µm away from the tool at 1 µm resolution fails however small.
    const horizontal = page.locator('[data-test-code="L-SP-PAR-H"]');
    await horizontal.getByLabel("Instrument", { exact: true }).selectOption("i1");
    await horizontal.getByLabel("Near, spindle at 0°", { exact: true }).fill("0");
    await horizontal.getByLabel("Near, turned 180°", { exact: true }).fill("0");
    await horizontal.getByLabel("Far, spindle at 0°", { exact: true }).fill("-2");
    await horizontal.getByLabel("Far, turned 180°", { exact: true }).fill("−2");
    const verdict = horizontal.getByTestId("live-verdict");
    await expect.poll(() => verdict.getAttribute("data-pass"), { timeout: 15_000 }).toBe("false");
    await expect.poll(() => verdict.textContent(), { timeout: 15_000 }).toMatch(/ratio 0\.13.*Leans the wrong way/s);
    await expect.poll(() => page.getByTestId("preview-bar").textContent(), { timeout: 15_000 }).toMatch(/grade C · 16 of 16 required/);

    // The draft reaches the server; a reload brings every reading back.
    await page.getByTestId("save-status").and(page.locator('[data-state="saved"]')).waitFor();
    await screenshotAtEachSize(page, shots, "entry");
    await page.reload();
    await expect(page.locator('[data-test-code="L-SP-PAR-H"]').getByLabel("Far, turned 180°", { exact: true }).inputValue()).resolves.toBe("−2");
    await expect(page.locator('[data-test-code="L-CAR-H"]').getByLabel("Station 5", { exact: true }).inputValue()).resolves.toBe("1000");

    // A bad connection: typed offline, tab closed, reopened online — the reading is restored from the tablet and saved.
    await context.setOffline(true);
    await page.locator('[data-test-code="L-CTR-HT"]').getByLabel("At the tailstock end", { exact: true }).fill("14");
    await page.getByTestId("save-status").and(page.locator('[data-state="offline"]')).waitFor({ timeout: 10_000 });
    await page.close();
    // Let the closing save fail while still offline before the connection comes back.
    await new Promise((resolve) => setTimeout(resolve, 500));
    await context.setOffline(false);
    const reopened = await context.newPage();
    await reopened.goto(entryPath);
    // Normally the tablet's copy is restored ("Restored unsaved readings from this device."); on a loaded machine the
    // closing save can still slip out as the connection returns, and then the server's copy has the reading.
    // Either way nothing typed is lost, which is what this checks.
    const tailstockEnd = reopened.locator('[data-test-code="L-CTR-HT"]').getByLabel("At the tailstock end", { exact: true });
    await expect.poll(() => tailstockEnd.inputValue(), { timeout: 15_000 }).toBe("14");
    await reopened.getByTestId("save-status").and(reopened.locator('[data-state="saved"]')).waitFor();

    // Submit: the server scores; review; sign.
    await Promise.all([reopened.waitForURL((url) => url.pathname === `${entryPath}/review`), reopened.getByRole("button", { name: "Submit for review" }).click()]);
    await reopened.getByRole("heading", { name: "Sign the report" }).waitFor();
    await reopened.getByLabel("Grade C").first().waitFor();
    await expect(reopened.locator('[data-code="L-SP-PAR-H"]').textContent()).resolves.toMatch(/Wrong way/);
    await screenshotAtEachSize(reopened, shots, "review");
    await reopened.getByLabel(/I took these readings/).check();
    await Promise.all([reopened.waitForURL((url) => url.pathname.startsWith("/reports/")), reopened.getByRole("button", { name: "Sign and publish" }).click()]);
    await reopened.getByText("Signed and published.").waitFor();
    const reportPath = new URL(reopened.url()).pathname;
    const hash = (await reopened.getByTestId("content-hash").textContent())!.trim();
    expect(hash).toMatch(/^[0-9a-f]{64}$/);
    await reopened.getByText("Hash verified").waitFor();
    await expect(reopened.locator('[data-plot="L-BED-V"] svg').count()).resolves.toBe(1);
    await expect(reopened.locator('[data-plot="L-SP-PAR-V"] svg').count()).resolves.toBe(1);
    await screenshotAtEachSize(reopened, shots, "report");

    // The PDF certificate downloads and its text carries the grade, key figures and hash.
    const [download] = await Promise.all([reopened.waitForEvent("download"), reopened.getByRole("link", { name: "Download the certificate (PDF)" }).click()]);
    const pdf = readFileSync((await download.path())!);
    expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
    const parser = new PDFParse({ data: new Uint8Array(pdf) });
    const text = (await parser.getText()).text.replace(/\s+/g, " ");
    await parser.destroy();
    expect(text).toContain("Grade C");
    expect(text).toMatch(/Spindle run-out 4\.0 [µμ]m/);
    expect(text).toMatch(/Spindle axis, horizontal −2\.0 [µμ]m/);
    expect(text).toMatch(/Spindle axis, vertical \+20\.0 [µμ]m/);
    expect(text).toMatch(/Centre height \+14\.0 [µμ]m/);
    expect(text).toMatch(/Bed straightness 5\.0 [µμ]m/);
    expect(text).toContain("chuck key out");
    expect(text.replace(/ /g, "")).toContain(hash);

    // The listing shows the grade with its key figures and the report's date.
    await reopened.goto(`/machines/${booked.listing.slug}`);
    const panel = reopened.getByTestId("accuracy-panel");
    await expect(panel.textContent()).resolves.toMatch(/Verified.*Grade C.*Spindle run-out4\.0 µm.*Measured .* \(this month\)/s);
    await Promise.all([reopened.waitForURL((url) => url.pathname === reportPath), panel.getByRole("link", { name: "Read the full report" }).click()]);
    await context.close();
  });
});
