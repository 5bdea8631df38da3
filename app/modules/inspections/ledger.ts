// The inspector's money, as a ledger of dated movements per booking, and the monthly statement drawn from
// it. Pure, so the statement's totals are checked against the ledger in a property test
// (tests/unit/inspections/ledger.test.ts) and the page, the CSV and the PDF show the same figures.
//
// Two balances move: what we hold for the inspector (their share until it is transferred) and what was
// transferred to their own account. A refund takes back part of the share: from what we hold if it was not
// transferred yet, else from their account (a transfer reversal).

export type LedgerKind = "earned" | "held_reversed" | "transferred" | "transfer_reversed";

export type LedgerEntry = {
  bookingId: string;
  reference: string;
  at: Date;
  kind: LedgerKind;
  amountMinor: number;
  currency: string;
};

export const ledgerKindLabels: Record<LedgerKind, string> = {
  earned: "Share earned (report filed)",
  held_reversed: "Share reduced by a refund",
  transferred: "Transferred to your account",
  transfer_reversed: "Taken back after a refund",
};

export type LedgerTotals = {
  currency: string;
  earned: number;
  heldReversed: number;
  transferred: number;
  transferReversed: number;
  /** Still with us: earned, less what refunds took back of it, less what was transferred. */
  held: number;
  /** In the inspector's account: transferred, less what refunds took back of it. */
  paidNet: number;
};

const zero = (currency: string): LedgerTotals => ({ currency, earned: 0, heldReversed: 0, transferred: 0, transferReversed: 0, held: 0, paidNet: 0 });

function add(totals: LedgerTotals, entry: LedgerEntry) {
  switch (entry.kind) {
    case "earned":
      totals.earned += entry.amountMinor;
      totals.held += entry.amountMinor;
      break;
    case "held_reversed":
      totals.heldReversed += entry.amountMinor;
      totals.held -= entry.amountMinor;
      break;
    case "transferred":
      totals.transferred += entry.amountMinor;
      totals.held -= entry.amountMinor;
      totals.paidNet += entry.amountMinor;
      break;
    case "transfer_reversed":
      totals.transferReversed += entry.amountMinor;
      totals.paidNet -= entry.amountMinor;
      break;
  }
}

/** Totals per currency over the entries given. */
export function ledgerTotals(entries: readonly LedgerEntry[]): LedgerTotals[] {
  const byCurrency = new Map<string, LedgerTotals>();
  for (const entry of entries) {
    const totals = byCurrency.get(entry.currency) ?? zero(entry.currency);
    add(totals, entry);
    byCurrency.set(entry.currency, totals);
  }
  return [...byCurrency.values()].sort((a, b) => a.currency.localeCompare(b.currency));
}

/** "2026-11" for a date, in UTC (statements are by calendar month in UTC). */
export function monthOf(date: Date): string {
  return date.toISOString().slice(0, 7);
}

export const monthPattern = /^\d{4}-(0[1-9]|1[0-2])$/;

/** The months that have movements, newest first. */
export function statementMonths(entries: readonly LedgerEntry[]): string[] {
  return [...new Set(entries.map((entry) => monthOf(entry.at)))].sort().reverse();
}

export type Statement = {
  month: string;
  currency: string;
  /** What we held for the inspector when the month began. */
  openingHeld: number;
  lines: LedgerEntry[];
  totals: LedgerTotals;
  closingHeld: number;
};

/** One month's movements in one currency, with the balance held at its start and end. */
export function statementFor(entries: readonly LedgerEntry[], month: string, currency: string): Statement {
  const ofCurrency = entries.filter((entry) => entry.currency === currency);
  const before = ofCurrency.filter((entry) => monthOf(entry.at) < month);
  const lines = ofCurrency.filter((entry) => monthOf(entry.at) === month).sort((a, b) => a.at.getTime() - b.at.getTime() || a.reference.localeCompare(b.reference));
  const openingHeld = ledgerTotals(before)[0]?.held ?? 0;
  const totals = ledgerTotals(lines)[0] ?? zero(currency);
  return { month, currency, openingHeld, lines, totals, closingHeld: openingHeld + totals.held };
}

/** A spreadsheet cell: quoted, and never read as a formula. */
function cell(value: string | number): string {
  const text = String(value);
  const numeric = /^-?\d+(\.\d+)?$/.test(text);
  const safe = !numeric && /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return /[",\n\r]/.test(safe) || safe !== text ? `"${safe.replace(/"/g, '""')}"` : safe;
}

const decimal = (amountMinor: number) => (amountMinor / 100).toFixed(2);

/** The statement as CSV (amounts in major units with two decimals, signed by their effect on you). */
export function statementCsv(statement: Statement): string {
  const rows: Array<Array<string | number>> = [["date", "booking", "movement", "amount", "currency"]];
  for (const line of statement.lines) {
    const sign = line.kind === "earned" || line.kind === "transferred" ? 1 : -1;
    rows.push([line.at.toISOString().slice(0, 10), line.reference, ledgerKindLabels[line.kind], decimal(sign * line.amountMinor), line.currency.toUpperCase()]);
  }
  rows.push([]);
  rows.push(["", "", "Held at the start of the month", decimal(statement.openingHeld), statement.currency.toUpperCase()]);
  rows.push(["", "", "Shares earned", decimal(statement.totals.earned), statement.currency.toUpperCase()]);
  rows.push(["", "", "Shares reduced by refunds", decimal(-statement.totals.heldReversed), statement.currency.toUpperCase()]);
  rows.push(["", "", "Transferred to your account", decimal(statement.totals.transferred), statement.currency.toUpperCase()]);
  rows.push(["", "", "Taken back after refunds", decimal(-statement.totals.transferReversed), statement.currency.toUpperCase()]);
  rows.push(["", "", "Held at the end of the month", decimal(statement.closingHeld), statement.currency.toUpperCase()]);
  return rows.map((row) => row.map(cell).join(",")).join("\r\n") + "\r\n";
}
