// The PDF certificate of a published report (pdfkit): the same facts as the report page, the safety note,
// the hash and a QR code to the public verification page.
import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import QRCode from "qrcode";
import { KEY_FIGURE_LABELS, reportAge, type KeyFigureKey } from "./content";
import { DIRECTION_LABELS, formatDeviationBoth, formatRatio, formatReportDate, formatSignedAt, GRADE_MEANING, isSignedValue, observedLabel } from "./format";
import { env } from "~/env.server";
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE } from "./safety";
import { renderReadingsCertificate } from "./certificate-readings.server";
import { fromMemoryNotice, HOW_SCORING_WORKS_SOURCES, makersChartLine, resultSources } from "./sources";
import type { PublicReport } from "./service.server";
import { CREDENTIAL_ATTACHMENT_NAME, CREDENTIAL_MEDIA_TYPE } from "./credential-file";

const require = createRequire(import.meta.url);
const fonts = {
  regular: require.resolve("@fontsource/manrope/files/manrope-latin-400-normal.woff"),
  bold: require.resolve("@fontsource/manrope/files/manrope-latin-700-normal.woff"),
};

const ink = "#17212b";
const muted = "#4b5d6c";
const rule = "#d7dde2";
const brass = "#9a6512";
const within = "#1d7a4a";
const beyond = "#b3261e";

// The embedded Manrope subset is Latin; signs it lacks are written out.
const printable = (text: string) => text.replace(/≤/g, "up to").replace(/≥/g, "at least");

const SIGNED_FIGURES = new Set<KeyFigureKey>(["spindleParallelismVertical", "spindleParallelismHorizontal", "centreHeight"]);

export async function renderCertificate(report: PublicReport, now = new Date()): Promise<Buffer> {
  if (report.notice) return renderReadingsCertificate({ ...report, notice: report.notice });
  const { content } = report;
  const qr = await QRCode.toBuffer(report.verificationUrl, { type: "png", margin: 1, width: 240, errorCorrectionLevel: "M" });
  // PDF/A-3b (ISO 19005-3): fonts embedded (Manrope from the start, never a standard font), sRGB output
  // intent and XMP metadata from pdfkit, and the signed credential as an associated file, so the certificate
  // can be checked offline years later with nothing but the issuer's public keys.
  const doc = new PDFDocument({
    size: "A4",
    margins: { top: 48, bottom: 60, left: 48, right: 48 },
    subset: "PDF/A-3b",
    pdfVersion: "1.7",
    lang: "en-GB",
    font: fonts.regular,
    bufferPages: true,
    info: {
      Title: `Accuracy certificate: ${content.machine.title}`,
      Author: "Tenthmark",
      Subject: `Report ${report.id}, revision ${content.revision}`,
      CreationDate: now,
      ModDate: now,
    },
  });
  const signedAt = new Date(report.signedAt);
  // `relationship` (AFRelationship, required by PDF/A-3) is pdfkit's, missing from its type definitions.
  doc.file(Buffer.from(report.credential, "utf8"), {
    name: CREDENTIAL_ATTACHMENT_NAME,
    type: CREDENTIAL_MEDIA_TYPE,
    description: "The report as a W3C Verifiable Credential with its eddsa-jcs-2022 proof (Ed25519). Check it at the verification page or with any Data Integrity verifier.",
    relationship: "Source",
    creationDate: signedAt,
    modifiedDate: signedAt,
  } as PDFKit.Mixins.PDFAttachmentOptions);
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

  const heading = (text: string) => {
    ensureSpace(60);
    doc.moveDown(0.8).font("bold").fontSize(12).fillColor(ink).text(text, left);
    doc.moveTo(left, doc.y + 2).lineTo(left + width, doc.y + 2).strokeColor(rule).lineWidth(0.7).stroke();
    doc.moveDown(0.5);
  };
  const ensureSpace = (needed: number) => {
    if (doc.y + needed > doc.page.height - doc.page.margins.bottom) doc.addPage();
  };
  const facts = (rows: Array<[string, string]>) => {
    for (const [term, value] of rows) {
      ensureSpace(16);
      const y = doc.y;
      doc.font("bold").fontSize(9).fillColor(muted).text(term, left, y, { width: 150 });
      doc.font("regular").fontSize(9).fillColor(ink).text(printable(value), left + 160, y, { width: width - 160 });
      doc.moveDown(0.25);
    }
  };
  const table = (columns: Array<{ label: string; width: number }>, rows: Array<{ cells: string[]; colour?: string[] }>) => {
    const draw = (cells: string[], font: "bold" | "regular", colours?: string[]) => {
      const heights = cells.map((cell, i) => doc.font(font).fontSize(8).heightOfString(cell, { width: columns[i]!.width - 6 }));
      const height = Math.max(...heights) + 6;
      ensureSpace(height);
      const y = doc.y;
      let x = left;
      cells.forEach((cell, i) => {
        doc.font(font).fontSize(8).fillColor(colours?.[i] ?? ink).text(cell, x + 3, y + 3, { width: columns[i]!.width - 6 });
        x += columns[i]!.width;
      });
      doc.y = y + height;
      doc.moveTo(left, doc.y).lineTo(left + width, doc.y).strokeColor(rule).lineWidth(0.5).stroke();
    };
    draw(columns.map((column) => column.label), "bold");
    for (const row of rows) draw(row.cells.map(printable), "regular", row.colour);
  };

  // Title block
  doc.font("bold").fontSize(20).fillColor(ink).text("Tenth", left, 48, { continued: true }).fillColor(brass).text("mark");
  doc.font("regular").fontSize(10).fillColor(muted).text("Geometric accuracy certificate", left);
  doc.moveDown(0.6);
  doc.font("bold").fontSize(16).fillColor(ink).text(printable(content.machine.title), left);
  doc.font("regular").fontSize(9).fillColor(muted).text(`Report ${report.id} · revision ${content.revision} · ${report.status === "superseded" ? "SUPERSEDED" : "signed"}`);
  if (report.status === "superseded") {
    doc.moveDown(0.4).font("bold").fontSize(10).fillColor(beyond).text(`This revision is superseded${report.supersededBy ? ` by revision ${report.supersededBy.revision}` : ""}; read the current one before relying on it.`);
  }

  // Grade and key figures
  const age = reportAge(content.measuredOn, now);
  heading("Grade and key figures");
  const gradeY = doc.y;
  doc.font("bold").fontSize(36).fillColor(ink).text(content.score.grade === "incomplete" ? "—" : content.score.grade, left, gradeY, { width: 70 });
  doc.font("bold").fontSize(10).fillColor(ink).text(`Grade ${content.score.grade}`, left + 80, gradeY + 4);
  doc.font("regular").fontSize(9).fillColor(muted).text(GRADE_MEANING[content.score.grade] ?? "", left + 80, doc.y, { width: width - 80 });
  doc
    .font("regular")
    .fontSize(9)
    .fillColor(age.expired ? beyond : muted)
    .text(`Measured ${formatReportDate(content.measuredOn)}${age.expired ? ` — more than 12 months before this certificate was made (${formatReportDate(now.toISOString())}): the machine may have changed since.` : ""}`, left + 80, doc.y, { width: width - 80 });
  doc.y = Math.max(doc.y, gradeY + 46);
  doc.moveDown(0.4);
  table(
    [
      { label: "Key figure", width: 200 },
      { label: "Value", width: width - 200 },
    ],
    (Object.keys(KEY_FIGURE_LABELS) as KeyFigureKey[]).map((name) => {
      const value = content.score.keyFigures[name];
      return { cells: [KEY_FIGURE_LABELS[name], value === null ? "not measured" : formatDeviationBoth(value, { signed: SIGNED_FIGURES.has(name) })] };
    }),
  );

  heading("Machine and inspection");
  facts([
    ["Machine", [content.machine.make, content.machine.model, content.machine.year ? `(${content.machine.year})` : ""].filter(Boolean).join(" ")],
    ["Serial number", content.machine.serialNumber ?? "not given"],
    ["Swing over bed", content.machine.swingOverBedMm ? `${content.machine.swingOverBedMm} mm` : "not given"],
    ["Distance between centres", content.machine.distanceBetweenCentresMm ? `${content.machine.distanceBetweenCentresMm} mm` : "not given"],
    ["Location", content.machine.location],
    ["Inspector", content.inspector.name],
    ["Booking", content.booking.reference],
    ["Date of the tests", formatReportDate(content.measuredOn)],
    ["Signed", formatSignedAt(content.signedAt ?? report.signedAt)],
    ["Tolerance profile", `${content.profile.key} v${content.profile.version}: ${content.profile.title}`],
    ["Why this profile", content.profile.reason],
  ]);

  heading("Conditions");
  facts([
    ["Ambient temperature", content.conditions.ambientTemperatureC === null ? "not recorded" : `${content.conditions.ambientTemperatureC} °C (reference 20 °C, ISO 1:2016)`],
    ["Warm-up run", content.conditions.warmUpMinutes === null ? "not recorded" : `${content.conditions.warmUpMinutes} min`],
    ["Levelled before the tests", content.conditions.levelled === null ? "not recorded" : content.conditions.levelled ? "yes" : "no"],
    ...(content.conditions.notes ? ([["Notes", content.conditions.notes]] as Array<[string, string]>) : []),
  ]);

  heading("Instruments");
  table(
    [
      { label: "Instrument", width: 150 },
      { label: "Description", width: width - 330 },
      { label: "Resolution", width: 90 },
      { label: "Calibration due", width: 90 },
    ],
    content.instruments.map((instrument) => ({
      cells: [
        instrument.kindLabel,
        instrument.description || "—",
        instrument.resolution === null ? "—" : formatDeviationBoth(instrument.resolution, { unit: instrument.resolutionUnit ?? "µm" }),
        instrument.calibrationDue ? `${formatReportDate(instrument.calibrationDue)}${instrument.calibrationOverdue ? " (overdue)" : ""}` : "not given",
      ],
      colour: [ink, ink, ink, instrument.calibrationOverdue ? beyond : ink],
    })),
  );

  heading("Results");
  table(
    [
      { label: "Test", width: 150 },
      { label: "Value", width: 82 },
      { label: "Tolerance (at length)", width: 100 },
      { label: "Ratio", width: 40 },
      { label: "Direction", width: width - 150 - 82 - 100 - 40 - 50 },
      { label: "Verdict", width: 50 },
    ],
    content.score.results.map((result) => {
      const signed = isSignedValue(result.method);
      const observed = observedLabel(result.direction.observed);
      const unit = result.unit;
      return {
        cells: [
          `${result.code} ${result.title}${result.required ? "" : " (optional)"}`,
          formatDeviationBoth(result.value, { signed, unit }),
          `${formatDeviationBoth(result.tolerance, { unit })}${result.measuringLength ? ` over ${Math.round(result.measuringLength * 10) / 10} mm` : ""}`,
          formatRatio(result.ratio),
          `${DIRECTION_LABELS[result.direction.allowed]}${observed && result.direction.allowed !== "any" ? `; read ${observed}` : ""}${result.direction.pass ? "" : ` — ${formatDeviationBoth(result.direction.against)} the wrong way`}`,
          result.pass ? "within" : "beyond",
        ],
        colour: [ink, ink, ink, ink, result.direction.pass ? ink : beyond, result.pass ? within : beyond],
      };
    }),
  );
  if (content.score.missing.length) {
    doc.moveDown(0.4).font("regular").fontSize(8.5).fillColor(beyond).text(`Required tests without a reading: ${content.score.missing.join(", ")}.`, left, doc.y, { width });
  }

  heading("Where the tolerances come from");
  const chartLine = makersChartLine(content.profile);
  const recalled = fromMemoryNotice(content.score);
  for (const note of [chartLine, recalled ? `${recalled} How scoring works: ${env().APP_ORIGIN}${HOW_SCORING_WORKS_SOURCES}` : null]) {
    if (note) doc.font("bold").fontSize(8.5).fillColor(ink).text(printable(note), left, doc.y, { width }).moveDown(0.2);
  }
  for (const result of content.score.results) {
    const sources = resultSources(result);
    const parts = [`tolerance: ${sources.tolerance.label} (${sources.tolerance.confidenceLabel})`];
    if (sources.local) parts.push(`local: ${sources.local.label} (${sources.local.confidenceLabel})`);
    parts.push(`direction: ${sources.direction.label} (${sources.direction.confidenceLabel})`);
    ensureSpace(20);
    doc.font("regular").fontSize(8).fillColor(ink).text(printable(`${result.code} — ${parts.join("; ")}`), left, doc.y, { width });
  }
  if (content.notes) {
    heading("Inspector's notes");
    doc.font("regular").fontSize(9).fillColor(ink).text(printable(content.notes), left, doc.y, { width });
  }

  heading("Safety");
  for (const caution of SAFETY_CAUTIONS) {
    ensureSpace(24);
    doc.font("regular").fontSize(8.5).fillColor(ink).text(`• ${caution}`, left, doc.y, { width });
  }
  doc.font("bold").fontSize(8.5).fillColor(ink).text(SAFETY_DEFERENCE, left, doc.y + 2, { width });

  heading("Verification");
  ensureSpace(130);
  const qrY = doc.y;
  doc.image(qr, left, qrY, { width: 110 });
  doc.font("bold").fontSize(9).fillColor(ink).text("SHA-256 content hash", left + 125, qrY);
  doc.font("regular").fontSize(8.5).fillColor(ink).text(report.contentHash, left + 125, doc.y, { width: width - 125 });
  doc.moveDown(0.4).font("regular").fontSize(8.5).fillColor(muted).text("The hash is taken over the RFC 8785 canonical JSON of the report (GET /api/v1/reports/" + report.id + "). Scan the code or open:", left + 125, doc.y, { width: width - 125 });
  doc.font("regular").fontSize(8.5).fillColor(ink).text(report.verificationUrl, left + 125, doc.y, { width: width - 125, link: report.verificationUrl });
  doc.y = Math.max(doc.y, qrY + 115);

  heading("Signature");
  const keyId = report.keyId;
  facts([
    ["Signed by", `${content.inspector.name} (inspector), issued by Tenthmark`],
    ["Signing time", formatSignedAt(report.signedAt)],
    ["Signature", "Ed25519, W3C Data Integrity eddsa-jcs-2022 (RFC 8785 JSON, SHA-256)"],
    ["Key", `${keyId} — public keys and their periods at /.well-known/did.json`],
    ["Content hash (SHA-256)", report.contentHash],
    ["Credential", `embedded in this PDF as ${CREDENTIAL_ATTACHMENT_NAME}; drop this file on the verification page to check it in your browser`],
  ]);

  // "Page X of Y" on every page, once the page count is known.
  const range = doc.bufferedPageRange();
  for (let index = range.start; index < range.start + range.count; index += 1) {
    doc.switchToPage(index);
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc
      .font("regular")
      .fontSize(7.5)
      .fillColor(muted)
      .text(`Tenthmark accuracy certificate · report ${report.id} · revision ${content.revision} · page ${index - range.start + 1} of ${range.count}`, left, doc.page.height - 36, { width, align: "center", lineBreak: false });
    doc.page.margins.bottom = bottom;
  }
  doc.end();
  await finished;
  return Buffer.concat(chunks);
}
