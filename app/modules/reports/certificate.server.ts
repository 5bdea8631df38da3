// The PDF certificate of a published report (pdfkit), in the reader's units: page 1 holds the grade, key
// figures, machine, inspector, date and a QR code to the public verification page; then the results, the
// plots as vector graphics (certificate-plots.server.ts), the sources, the safety note and the signature block.
import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import QRCode from "qrcode";
import { KEY_FIGURE_LABELS, keyFigureNamesFor, latheSizeRows, reportAge, SIGNED_KEY_FIGURES } from "./content";
import { DIRECTION_LABELS, formatDeviation, formatRatio, formatReportDate, formatSignedAt, GRADE_MEANING, isSignedValue, observedLabel } from "./format";
import { formatLength, lengthsInText, type DisplayUnits } from "~/modules/units/format";
import { plotsOfReport, type PdfPlot } from "./certificate-plots.server";
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


export interface CertificateOptions {
  /** The reader's units: deviations in µm or inches, lengths in mm or inches. */
  units: DisplayUnits;
  /** The app's public origin, for the links printed on the certificate. */
  origin: string;
  now?: Date;
}

export async function renderCertificate(report: PublicReport, options: CertificateOptions): Promise<Buffer> {
  if (report.notice) return renderReadingsCertificate({ ...report, notice: report.notice });
  const { content } = report;
  const { units, origin } = options;
  const now = options.now ?? new Date();
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

  const heading = (text: string, keepWith = 60) => {
    ensureSpace(keepWith);
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
    const heightOf = (cells: string[], font: "bold" | "regular") =>
      Math.max(...cells.map((cell, i) => doc.font(font).fontSize(8).heightOfString(cell, { width: columns[i]!.width - 6 }))) + 6;
    const labels = columns.map((column) => column.label);
    const draw = (cells: string[], font: "bold" | "regular", colours?: string[]) => {
      const height = heightOf(cells, font);
      const page = doc.page;
      ensureSpace(height);
      // A table that runs onto a new page repeats its header there, so each page's columns are named.
      if (font === "regular" && doc.page !== page) draw(labels, "bold");
      const y = doc.y;
      let x = left;
      cells.forEach((cell, i) => {
        doc.font(font).fontSize(8).fillColor(colours?.[i] ?? ink).text(cell, x + 3, y + 3, { width: columns[i]!.width - 6 });
        x += columns[i]!.width;
      });
      doc.y = y + height;
      doc.moveTo(left, doc.y).lineTo(left + width, doc.y).strokeColor(rule).lineWidth(0.5).stroke();
    };
    ensureSpace(heightOf(labels, "bold") + heightOf(rows[0]?.cells.map(printable) ?? labels, "regular"));
    draw(labels, "bold");
    for (const row of rows) draw(row.cells.map(printable), "regular", row.colour);
  };

  // Title block
  doc.font("bold").fontSize(20).fillColor(ink).text("Tenth", left, 48, { continued: true }).fillColor(brass).text("mark");
  doc.font("regular").fontSize(10).fillColor(muted).text("Geometric accuracy certificate", left);
  doc.moveDown(0.6);
  doc.font("bold").fontSize(16).fillColor(ink).text(printable(content.machine.title), left);
  doc.font("regular").fontSize(9).fillColor(muted).text(`Report ${report.id} · revision ${content.revision} · ${report.status === "superseded" ? "SUPERSEDED" : "signed"}`);
  if (report.reissuedOn) {
    doc.font("regular").fontSize(8.5).fillColor(muted).text(`Credential re-issued on ${formatReportDate(report.reissuedOn)} for a report signed before signed credentials existed (see Signature).`, left, doc.y + 2, { width });
  }
  if (report.status === "superseded") {
    doc.moveDown(0.4).font("bold").fontSize(10).fillColor(beyond).text(`This revision is superseded${report.supersededBy ? ` by revision ${report.supersededBy.revision}` : ""}; read the current one before relying on it.`);
  }

    // Page 1 holds what a reader needs at a glance: grade, key figures, machine, inspector, date and the QR code.
  const age = reportAge(content.measuredOn, now);
  const panelTop = doc.y + 10;
  const qrSize = 118;
  const qrX = left + width - qrSize - 10;
  const summaryWidth = qrX - left - 30;
  doc.font("bold").fontSize(40).fillColor(ink).text(content.score.grade === "incomplete" ? "—" : content.score.grade, left + 12, panelTop + 10, { width: 60, lineBreak: false });
  doc.font("bold").fontSize(11).fillColor(ink).text(`Grade ${content.score.grade}`, left + 80, panelTop + 14, { width: summaryWidth - 80 });
  doc.font("regular").fontSize(8.5).fillColor(muted).text(GRADE_MEANING[content.score.grade] ?? "", left + 80, doc.y + 1, { width: summaryWidth - 80 });
  doc.font("regular").fontSize(8.5).fillColor(ink).text(`Tests on ${formatReportDate(content.measuredOn)} by ${content.inspector.name}`, left + 80, doc.y + 2, { width: summaryWidth - 80 });
  if (age.expired) {
    doc.font("regular").fontSize(8).fillColor(beyond).text(`Measured more than 12 months before this certificate was made (${formatReportDate(now.toISOString())}): the machine may have changed since.`, left + 80, doc.y + 2, { width: summaryWidth - 80 });
  }
  doc.y = Math.max(doc.y, panelTop + 62) + 6;
  const shownFigures = keyFigureNamesFor(content.machine.category).filter((name) => content.score.keyFigures[name] !== undefined);
  const measuredFigures = shownFigures.filter((name) => content.score.keyFigures[name] !== null);
  doc.font("bold").fontSize(8.5).fillColor(muted).text("Key figures", left + 12, doc.y, { width: summaryWidth });
  for (const name of measuredFigures) {
    const y = doc.y + 1;
    doc.font("regular").fontSize(9).fillColor(ink).text(KEY_FIGURE_LABELS[name], left + 12, y, { width: 150, lineBreak: false });
    doc.font("bold").fontSize(9).fillColor(ink).text(formatDeviation(content.score.keyFigures[name]!, units, { signed: SIGNED_KEY_FIGURES.has(name) }), left + 170, y, { width: summaryWidth - 170 });
  }
  const unmeasured = shownFigures.filter((name) => content.score.keyFigures[name] === null);
  if (!measuredFigures.length) doc.font("regular").fontSize(8).fillColor(muted).text("None of the key figures applies to, or was measured on, this machine; the results follow.", left + 12, doc.y + 2, { width: summaryWidth });
  else if (unmeasured.length) doc.font("regular").fontSize(8).fillColor(muted).text(`Not measured: ${unmeasured.map((name) => KEY_FIGURE_LABELS[name].toLowerCase()).join(", ")}.`, left + 12, doc.y + 2, { width: summaryWidth });
  // The QR code as vector squares: sharp at any print size, no image in the archive.
  const qr = QRCode.create(report.verificationUrl, { errorCorrectionLevel: "M" });
  const cells = qr.modules.size;
  const cell = qrSize / (cells + 2);
  doc.save().rect(qrX, panelTop + 8, qrSize, qrSize).fill("#ffffff");
  for (let row = 0; row < cells; row += 1) {
    for (let column = 0; column < cells; column += 1) {
      if (qr.modules.get(row, column)) doc.rect(qrX + (column + 1) * cell, panelTop + 8 + (row + 1) * cell, cell + 0.05, cell + 0.05);
    }
  }
  doc.fill(ink).restore();
  doc.font("bold").fontSize(7.5).fillColor(ink).text("Check this certificate", qrX - 6, panelTop + qrSize + 12, { width: qrSize + 12, align: "center" });
  doc.font("regular").fontSize(6.5).fillColor(muted).text("Scan the code, or drop this PDF on the verification page: the signature is checked in your browser.", qrX - 6, doc.y + 1, { width: qrSize + 12, align: "center" });
  const panelBottom = Math.max(doc.y, panelTop + qrSize + 20) + 8;
  doc.roundedRect(left, panelTop, width, panelBottom - panelTop, 4).lineWidth(0.8).strokeColor(rule).stroke();
  doc.y = panelBottom;
  doc.x = left;

  heading("Machine and inspection");
  facts([
    ["Machine", [content.machine.make, content.machine.model, content.machine.year ? `(${content.machine.year})` : ""].filter(Boolean).join(" ")],
    ["Serial number", content.machine.serialNumber ?? "not given"],
    ...latheSizeRows(content.machine, (mm) => formatLength(mm, units)),
    ["Location", content.machine.location],
    ["Inspector", content.inspector.name],
    ["Booking", content.booking.reference],
    ["Date of the tests", formatReportDate(content.measuredOn)],
    ["Signed", formatSignedAt(content.signedAt ?? report.signedAt)],
    ["Tolerance profile", `${content.profile.key} v${content.profile.version}: ${lengthsInText(content.profile.title, units)}`],
    ["Why this profile", content.profile.reason],
    ["Units", units === "inch" ? "readings in inches, lengths in inches (as chosen by the reader; the signed credential holds µm and mm)" : "readings in µm, lengths in mm (as chosen by the reader; the signed credential holds µm and mm)"],
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
        instrument.resolution === null ? "—" : formatDeviation(instrument.resolution, units, { unit: instrument.resolutionUnit ?? "µm" }),
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
          `${result.code} ${lengthsInText(result.title, units)}${result.required ? "" : " (optional)"}`,
          formatDeviation(result.value, units, { signed, unit }),
          `${formatDeviation(result.tolerance, units, { unit })}${result.measuringLength ? ` over ${formatLength(result.measuringLength, units)}` : ""}`,
          formatRatio(result.ratio),
          `${DIRECTION_LABELS[result.direction.allowed]}${observed && result.direction.allowed !== "any" ? `; read ${observed}` : ""}${result.direction.pass ? "" : ` — ${formatDeviation(result.direction.against, units, { unit })} the wrong way`}`,
          result.pass ? "within" : "beyond",
        ],
        colour: [ink, ink, ink, ink, result.direction.pass ? ink : beyond, result.pass ? within : beyond],
      };
    }),
  );
  if (content.score.missing.length) {
    doc.moveDown(0.4).font("regular").fontSize(8.5).fillColor(beyond).text(`Required tests without a reading: ${content.score.missing.join(", ")}.`, left, doc.y, { width });
  }

  const plots = plotsOfReport(content, units);
  if (plots.length) {
    heading("Plots", Math.max(...plots.slice(0, 2).map((plot) => plot.height)) + 110);
    // Full-width plots one to a row; half-width ones (run-out, mandrel) two to a row.
    const rows: PdfPlot[][] = [];
    for (const plot of plots) {
      const last = rows.at(-1);
      if (plot.span === "half" && last?.length === 1 && last[0]!.span === "half") last.push(plot);
      else rows.push([plot]);
    }
    const gap = 18;
    for (const row of rows) {
      const cellWidth = row[0]!.span === "half" ? (width - gap) / 2 : width;
      const captionHeight = Math.max(...row.map((plot) => doc.font("regular").fontSize(7.5).heightOfString(printable(plot.caption), { width: cellWidth })));
      const titleHeight = Math.max(...row.map((plot) => doc.font("bold").fontSize(9).heightOfString(printable(`${plot.code} ${lengthsInText(plot.title, units)}`), { width: cellWidth })));
      const drawingHeight = Math.max(...row.map((plot) => plot.height));
      ensureSpace(titleHeight + drawingHeight + captionHeight + 20);
      const top = doc.y;
      row.forEach((plot, i) => {
        const x = left + i * (cellWidth + gap);
        doc.font("bold").fontSize(9).fillColor(ink).text(printable(`${plot.code} ${lengthsInText(plot.title, units)}`), x, top, { width: cellWidth });
        plot.draw(doc, { x, y: top + titleHeight + 4, width: cellWidth });
        doc.font("regular").fontSize(7.5).fillColor(muted).text(printable(plot.caption), x, top + titleHeight + 4 + drawingHeight + 4, { width: cellWidth });
      });
      doc.x = left;
      doc.y = top + titleHeight + drawingHeight + captionHeight + 22;
    }
  }

  heading("Where the tolerances come from");
  const chartLine = makersChartLine(content.profile);
  const recalled = fromMemoryNotice(content.score);
  for (const note of [chartLine, recalled ? `${recalled} How scoring works: ${origin}${HOW_SCORING_WORKS_SOURCES}` : null]) {
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

  heading("Signature");
  const keyId = report.keyId;
  facts([
    ["Signed by", `${content.inspector.name} (inspector), issued by Tenthmark`],
    ["Signing time", formatSignedAt(report.signedAt)],
    ...(report.reissuedOn
      ? ([["Re-issued", `${formatSignedAt(report.reissuedOn)}: this report was signed before signed credentials existed; the credential was issued on this date by Tenthmark, over the content whose hash was recorded at the signing. The signature below is Tenthmark's of that date, not the inspector's original one.`]] as Array<[string, string]>)
      : []),
    ["Signature", "Ed25519, W3C Data Integrity eddsa-jcs-2022 (RFC 8785 JSON, SHA-256)"],
    ["Key", `${keyId} — public keys and their periods at /.well-known/did.json`],
    ["Content hash (SHA-256)", report.contentHash],
    ["Credential", `embedded in this PDF as ${CREDENTIAL_ATTACHMENT_NAME}; drop this file on the verification page to check it in your browser`],
    ["Verification page", report.verificationUrl],
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
