// A buyer checks a certificate in the browser: the PDF dropped on the verify page is read there, its embedded
// credential checked against the issuer's public keys; a certificate whose credential was changed is not valid.
import { mkdirSync, writeFileSync } from "node:fs";
import { deflateSync } from "node:zlib";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { embeddedFilesOfPdf } from "~/modules/reports/credential-file";
import { launchBrowser, newRecordedPage } from "../../support/browser";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

const shots = "/tmp/reports-screenshots";
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

/** The certificate with its embedded credential replaced by `credential` (re-compressed, its length fixed). */
function withCredential(pdf: Buffer, credential: string): Buffer {
  const text = pdf.toString("latin1");
  const marker = text.indexOf("/Type /EmbeddedFile");
  const dictionaryStart = text.lastIndexOf("obj", marker);
  const streamStart = text.indexOf("stream\n", marker) + "stream\n".length;
  const length = Number(/\/Length (\d+)/.exec(text.slice(dictionaryStart, streamStart))![1]);
  const replacement = deflateSync(Buffer.from(credential, "utf8"));
  const dictionary = text.slice(dictionaryStart, streamStart).replace(`/Length ${length}`, `/Length ${replacement.length}`);
  return Buffer.concat([pdf.subarray(0, dictionaryStart), Buffer.from(dictionary, "latin1"), replacement, pdf.subarray(streamStart + length)]);
}

async function drop(page: import("playwright-core").Page, name: string, bytes: Buffer) {
  await page.locator("#credential-file").setInputFiles({ name, mimeType: "application/pdf", buffer: bytes });
  await page.getByTestId("credential-result").waitFor();
}

describe("the verify page", () => {
  it("says a dropped certificate is valid, and a tampered one is not, with the reason", async () => {
    const booked = await acceptedBooking();
    const signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    const pdf = Buffer.from(await (await fetch(`${testAppOrigin}/reports/${signed.id}/certificate.pdf`)).arrayBuffer());
    const [embedded] = await embeddedFilesOfPdf(new Uint8Array(pdf));
    expect(new TextDecoder().decode(embedded)).toBe(signed.credential);
    writeFileSync(`${shots}/certificate.pdf`, pdf);

    const { page, context, requests } = await newRecordedPage(browser);
    await page.goto(`${testAppOrigin}/reports/verify`);
    const before = requests.length;
    await drop(page, "certificate.pdf", pdf);
    const result = page.getByTestId("credential-result");
    await expect.poll(() => result.textContent()).toContain("Valid");
    expect(await result.textContent()).not.toContain("Not valid");
    expect(await page.getByTestId("credential-grade").textContent()).toBe("B");
    expect(await result.textContent()).toContain("credential embedded in the certificate");
    for (const name of ["signature", "key-validity", "current"]) expect(await result.locator(`[data-check="${name}"]`).getAttribute("data-state")).toBe("passed");
    expect(await result.textContent()).toContain("asked of Tenthmark's server");
    // The file stays in the browser: only the public keys and the report's status were fetched.
    const fetched = requests.slice(before).map((url) => new URL(url).pathname).filter((path) => !path.startsWith("/assets/") && path !== "/__manifest" && path !== "/favicon.svg");
    expect(fetched.sort()).toEqual(["/.well-known/did.json", `/api/v1/reports/${signed.id}`]);
    await page.setViewportSize({ width: 1280, height: 900 });
    await page.screenshot({ path: `${shots}/verify-valid-desktop.png`, fullPage: true });
    await page.setViewportSize({ width: 390, height: 844 });
    await page.screenshot({ path: `${shots}/verify-valid-phone.png`, fullPage: true });

    // The grade changed inside the embedded credential: the signature no longer matches.
    const tampered = withCredential(pdf, signed.credential!.replace('"grade":"B"', '"grade":"A"'));
    await drop(page, "tampered.pdf", tampered);
    await expect.poll(() => result.textContent()).toContain("Not valid");
    expect(await result.locator('[data-check="signature"]').getAttribute("data-state")).toBe("failed");
    expect(await result.textContent()).toContain("The signature does not match the content");
    await page.setViewportSize({ width: 820, height: 1180 });
    await page.screenshot({ path: `${shots}/verify-tampered-tablet.png`, fullPage: true });

    // A PDF without a credential.
    await drop(page, "other.pdf", Buffer.from("%PDF-1.4\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n"));
    await expect.poll(() => result.textContent()).toContain("carries no embedded credential");
    await context.close();
  });
});
