// The inspector's monthly statements against their ledger: for any movements, each month's statement adds
// up to the ledger's movements of that month, the months together add up to the whole ledger, and each
// month's closing balance is the next month's opening one. The expected values are the ledger's own sums
// (fast-check generates the movements); the CSV is read back with a plain split.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ledgerTotals, monthOf, statementCsv, statementFor, statementMonths, type LedgerEntry, type LedgerKind } from "~/modules/inspections/ledger";

const kinds: LedgerKind[] = ["earned", "held_reversed", "transferred", "transfer_reversed"];
const start = Date.UTC(2025, 0, 1);
const end = Date.UTC(2027, 11, 31);

const entry = fc.record({
  bookingId: fc.constantFrom("b1", "b2", "b3", "b4"),
  reference: fc.constantFrom("IB-AAAA-BBBB", "IB-CCCC-DDDD", "IB-EEEE-FFFF", "=HYPERLINK(1)"),
  at: fc.integer({ min: start, max: end }).map((ms) => new Date(ms)),
  kind: fc.constantFrom(...kinds),
  amountMinor: fc.integer({ min: 0, max: 5_000_000 }),
  currency: fc.constantFrom("EUR", "GBP"),
}) as fc.Arbitrary<LedgerEntry>;

describe("monthly statements", () => {
  it("add up to the ledger: per month, over all months, and balance to balance", () => {
    fc.assert(
      fc.property(fc.array(entry, { maxLength: 60 }), (entries) => {
        for (const total of ledgerTotals(entries)) {
          const months = [...statementMonths(entries.filter((candidate) => candidate.currency === total.currency))].sort();
          let opening = 0;
          const summed = { earned: 0, heldReversed: 0, transferred: 0, transferReversed: 0 };
          for (const month of months) {
            const statement = statementFor(entries, month, total.currency);
            const ofMonth = entries.filter((candidate) => candidate.currency === total.currency && monthOf(candidate.at) === month);
            const sum = (kind: LedgerKind) => ofMonth.filter((candidate) => candidate.kind === kind).reduce((acc, candidate) => acc + candidate.amountMinor, 0);
            expect(statement.lines).toHaveLength(ofMonth.length);
            expect(statement.totals.earned).toBe(sum("earned"));
            expect(statement.totals.heldReversed).toBe(sum("held_reversed"));
            expect(statement.totals.transferred).toBe(sum("transferred"));
            expect(statement.totals.transferReversed).toBe(sum("transfer_reversed"));
            expect(statement.openingHeld).toBe(opening);
            expect(statement.closingHeld).toBe(opening + sum("earned") - sum("held_reversed") - sum("transferred"));
            opening = statement.closingHeld;
            summed.earned += statement.totals.earned;
            summed.heldReversed += statement.totals.heldReversed;
            summed.transferred += statement.totals.transferred;
            summed.transferReversed += statement.totals.transferReversed;
          }
          expect(summed).toEqual({ earned: total.earned, heldReversed: total.heldReversed, transferred: total.transferred, transferReversed: total.transferReversed });
          expect(opening).toBe(total.held);
        }
      }),
    );
  });

  it("the CSV carries the same lines and totals, and no cell reads as a formula", () => {
    fc.assert(
      fc.property(fc.array(entry, { minLength: 1, maxLength: 30 }), (entries) => {
        const month = monthOf(entries[0]!.at);
        const statement = statementFor(entries, month, entries[0]!.currency);
        const rows = statementCsv(statement).trimEnd().split("\r\n");
        expect(rows).toHaveLength(1 + statement.lines.length + 1 + 6);
        const closing = rows.at(-1)!.split(",");
        expect(closing[3]).toBe((statement.closingHeld / 100).toFixed(2));
        for (const row of rows) expect(row.split(",").every((cell) => !/^[=+@]/.test(cell))).toBe(true);
      }),
    );
  });
});
