// PDFs of money documents (pdfkit): the inspector's monthly statement and the buyer's receipts for a
// payment or a refund. Plain A4 pages in our own type and colours; the figures come from the same pure
// functions as the pages and the CSV.
import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import { formatMoney } from "~/modules/units/format";
import { ledgerKindLabels, type Statement } from "./ledger";
import { formatDate } from "~/modules/units/dates";

const require = createRequire(import.meta.url);
const fonts = {
  regular: require.resolve("@fontsource/manrope/files/manrope-latin-400-normal.woff"),
  bold: require.resolve("@fontsource/manrope/files/manrope-latin-700-normal.woff"),
};
const ink = "#17212b";
const muted = "#4b5d6c";
const rule = "#d7dde2";
const brass = "#9a6512";

type Doc = InstanceType<typeof PDFDocument>;

async function render(info: { title: string; subject: string }, draw: (doc: Doc, left: number, width: number) => void): Promise<Buffer> {
  const doc = new PDFDocument({ size: "A4", margins: { top: 48, bottom: 48, left: 56, right: 56 }, info: { Title: info.title, Author: "Tenthmark", Subject: info.subject } });
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
  doc.font("bold").fontSize(10).fillColor(brass).text("TENTHMARK", left, 48, { characterSpacing: 1.5 });
  doc.moveDown(0.6).font("bold").fontSize(20).fillColor(ink).text(info.title, left);
  doc.moveDown(0.2).font("regular").fontSize(10).fillColor(muted).text(info.subject, left);
  doc.moveTo(left, doc.y + 8).lineTo(left + width, doc.y + 8).strokeColor(rule).lineWidth(0.8).stroke();
  doc.moveDown(1.2);
  draw(doc, left, width);
  doc.end();
  await finished;
  return Buffer.concat(chunks);
}

/** A row of label and amount, the amount right-aligned; bold for totals. */
function row(doc: Doc, left: number, width: number, label: string, amount: string, options: { bold?: boolean; note?: string } = {}) {
  if (doc.y > doc.page.height - doc.page.margins.bottom - 30) doc.addPage();
  const y = doc.y;
  doc.font(options.bold ? "bold" : "regular").fontSize(10).fillColor(ink).text(label, left, y, { width: width - 130 });
  const after = doc.y;
  doc.font(options.bold ? "bold" : "regular").fontSize(10).fillColor(ink).text(amount, left + width - 120, y, { width: 120, align: "right" });
  doc.y = Math.max(after, doc.y);
  if (options.note) doc.font("regular").fontSize(8.5).fillColor(muted).text(options.note, left, doc.y, { width: width - 130 });
  doc.moveDown(0.35);
}

function line(doc: Doc, left: number, width: number) {
  doc.moveTo(left, doc.y + 2).lineTo(left + width, doc.y + 2).strokeColor(rule).lineWidth(0.6).stroke();
  doc.moveDown(0.6);
}

const monthName = (month: string) => new Date(`${month}-01T00:00:00Z`).toLocaleDateString("en-GB", { month: "long", year: "numeric", timeZone: "UTC" });
const day = (date: Date) => formatDate(date);

export function renderStatementPdf(statement: Statement, inspector: { name: string; email: string }): Promise<Buffer> {
  const money = (amount: number) => formatMoney(amount, statement.currency);
  return render({ title: `Statement for ${monthName(statement.month)}`, subject: `${inspector.name} (${inspector.email}) · amounts in ${statement.currency.toUpperCase()} · dates in UTC` }, (doc, left, width) => {
    row(doc, left, width, "Held for you at the start of the month", money(statement.openingHeld), { bold: true });
    line(doc, left, width);
    if (!statement.lines.length) doc.font("regular").fontSize(10).fillColor(muted).text("No movements this month.", left).moveDown(0.6);
    for (const entry of statement.lines) {
      const sign = entry.kind === "earned" || entry.kind === "transferred" ? "" : "-";
      row(doc, left, width, `${day(entry.at)}  ·  ${entry.reference}  ·  ${ledgerKindLabels[entry.kind]}`, `${sign}${money(entry.amountMinor)}`);
    }
    line(doc, left, width);
    row(doc, left, width, "Shares earned", money(statement.totals.earned));
    row(doc, left, width, "Shares reduced by refunds", `-${money(statement.totals.heldReversed)}`);
    row(doc, left, width, "Transferred to your account", money(statement.totals.transferred));
    row(doc, left, width, "Taken back from your account after refunds", `-${money(statement.totals.transferReversed)}`);
    line(doc, left, width);
    row(doc, left, width, "Held for you at the end of the month", money(statement.closingHeld), { bold: true });
    doc.moveDown(1).font("regular").fontSize(8.5).fillColor(muted).text(
      "Your share is the fee less the platform's 15 %. It is held until your payout set-up is finished, then transferred to your own account with the payment provider; a refund to the buyer takes back the same part of the share. Payouts from that account to your bank follow the provider's schedule.",
      left,
      doc.y,
      { width },
    );
  });
}

export type ReceiptInput = {
  kind: "payment" | "refund";
  number: string;
  reference: string;
  at: Date;
  amountMinor: number;
  currency: string;
  buyer: { name: string; email: string };
  what: string;
  visit: string;
  inspectorName: string;
  /** For a refund: why, and whether it has reached the buyer yet. */
  refund?: { reason: string; status: string };
  /** For a payment: the fee and what was refunded of it since. */
  refundedMinor?: number;
};

const refundStatusWords: Record<string, string> = {
  requested: "Being sent to your bank or card issuer",
  pending: "Pending: your bank or card issuer is processing it",
  succeeded: "Refunded",
  failed: "Failed: returned by your bank or card issuer; our staff are in touch",
  canceled: "Cancelled; our staff are in touch",
};

export function renderReceiptPdf(receipt: ReceiptInput): Promise<Buffer> {
  const money = (amount: number) => formatMoney(amount, receipt.currency);
  const title = receipt.kind === "payment" ? "Receipt for your payment" : "Receipt for your refund";
  return render({ title, subject: `Receipt ${receipt.number} · booking ${receipt.reference} · ${day(receipt.at)}` }, (doc, left, width) => {
    row(doc, left, width, "Paid by", `${receipt.buyer.name}`, { note: receipt.buyer.email });
    row(doc, left, width, "For", "", { note: `${receipt.what} — on-site inspection by ${receipt.inspectorName}, ${receipt.visit}` });
    line(doc, left, width);
    if (receipt.kind === "payment") {
      row(doc, left, width, "Inspection fee", money(receipt.amountMinor), { bold: true });
      if (receipt.refundedMinor) row(doc, left, width, "Refunded since", `-${money(receipt.refundedMinor)}`, { note: "Each refund has a receipt of its own on the booking page." });
    } else {
      row(doc, left, width, "Refunded", money(receipt.amountMinor), { bold: true });
      row(doc, left, width, "State", "", { note: refundStatusWords[receipt.refund?.status ?? "succeeded"] ?? receipt.refund?.status });
      if (receipt.refund?.reason) row(doc, left, width, "Reason", "", { note: receipt.refund.reason });
    }
    line(doc, left, width);
    doc.font("regular").fontSize(8.5).fillColor(muted).text(
      "Paid through our payment provider to Tenthmark, which passes the inspector's share on once the report is filed. Keep this receipt for your records.",
      left,
      doc.y,
      { width },
    );
  });
}
