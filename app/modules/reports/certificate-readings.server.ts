// The certificate of a signed report whose numbers cannot be scored or drawn (see stored-readings.ts): the
// machine, the notice, every test's readings as signed, the safety note and the seal, without results.
import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import QRCode from "qrcode";
import { formatReportDate, formatSignedAt } from "./format";
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE } from "./safety";
import type { PublicReport } from "./service.server";
import { storedReadings } from "./stored-readings";

const require = createRequire(import.meta.url);
const fonts = {
  regular: require.resolve("@fontsource/manrope/files/manrope-latin-400-normal.woff"),
  bold: require.resolve("@fontsource/manrope/files/manrope-latin-700-normal.woff"),
};

const ink = "#17212b";
const muted = "#4b5d6c";
const caution = "#8a5a00";

export async function renderReadingsCertificate(report: PublicReport & { notice: string }): Promise<Buffer> {
  const { content } = report;
  const qr = await QRCode.toBuffer(report.verificationUrl, { type: "png", margin: 1, width: 240, errorCorrectionLevel: "M" });
  const doc = new PDFDocument({
    size: "A4",
    margins: { top: 48, bottom: 48, left: 48, right: 48 },
    info: { Title: `Readings as signed: ${content.machine.title}`, Author: "Tenthmark", Subject: `Report ${report.id}, revision ${content.revision}` },
  });
  const chunks: Buffer[] = [];
  doc.on("data", (chunk: Buffer) => chunks.push(chunk));
  const finished = new Promise<void>((resolve, reject) => {
    doc.on("end", () => resolve());
    doc.on("error", reject);
  });
  doc.registerFont("regular", fonts.regular);
  doc.registerFont("bold", fonts.bold);
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  // The embedded Manrope subset is Latin; signs it lacks are written out.
  const printable = (text: string) => text.replace(/≤/g, "up to").replace(/≥/g, "at least").replace(/±/g, "+/-");
  const heading = (text: string) => doc.moveDown(0.8).font("bold").fontSize(12).fillColor(ink).text(text, left, doc.y, { width });
  const line = (text: string, options: { font?: "regular" | "bold"; colour?: string; size?: number } = {}) =>
    doc.font(options.font ?? "regular").fontSize(options.size ?? 9).fillColor(options.colour ?? ink).text(printable(text), left, doc.y, { width });

  doc.font("bold").fontSize(20).fillColor(ink).text("Tenthmark", left, 48);
  line("Geometric accuracy report: readings as signed", { colour: muted, size: 10 });
  doc.moveDown(0.6);
  line(content.machine.title, { font: "bold", size: 16 });
  line(`Report ${report.id} · revision ${content.revision} · ${report.status}`, { colour: muted });
  doc.moveDown(0.6);
  line(report.notice, { font: "bold", colour: caution, size: 10 });

  heading("Machine and inspection");
  for (const [term, value] of [
    ["Machine", [content.machine.make, content.machine.model, content.machine.year ? `(${content.machine.year})` : ""].filter(Boolean).join(" ")],
    ["Location", content.machine.location],
    ["Inspector", content.inspector.name],
    ["Date of the tests", formatReportDate(content.measuredOn)],
    ["Signed", formatSignedAt(report.signedAt)],
    ["Tolerance profile", `${content.profile.key} v${content.profile.version}: ${content.profile.title}`],
  ] as Array<[string, string]>) {
    line(`${term}: ${value}`);
  }

  heading("Readings");
  line(`Stations in ${content.entryUnits === "inch" ? "inches" : "mm"}, readings in ${content.entryUnits === "inch" ? "inches" : "micrometres"} (level tilts in µm/m), as typed.`, { colour: muted });
  for (const test of storedReadings(content)) {
    doc.moveDown(0.4);
    line(`${test.code} ${test.title}`, { font: "bold" });
    for (const entry of test.lines) line(entry, { size: 8.5 });
  }
  if (content.notes) {
    heading("Inspector's notes");
    line(content.notes);
  }

  heading("Safety");
  for (const cautionText of SAFETY_CAUTIONS) line(`• ${cautionText}`, { size: 8.5 });
  line(SAFETY_DEFERENCE, { font: "bold", size: 8.5 });

  heading("Verification");
  if (doc.y + 130 > doc.page.height - doc.page.margins.bottom) doc.addPage();
  const qrY = doc.y;
  doc.image(qr, left, qrY, { width: 110 });
  doc.font("bold").fontSize(9).fillColor(ink).text("SHA-256 content hash", left + 125, qrY);
  doc.font("regular").fontSize(8.5).fillColor(ink).text(report.contentHash, left + 125, doc.y, { width: width - 125 });
  doc.font("regular").fontSize(8.5).fillColor(ink).text(report.verificationUrl, left + 125, doc.y, { width: width - 125, link: report.verificationUrl });

  doc.end();
  await finished;
  return Buffer.concat(chunks);
}
