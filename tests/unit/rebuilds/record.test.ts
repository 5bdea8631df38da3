// Rebuild records: the pairing a buyer reads and the rule that alone lets a signed report confirm the
// as-rebuilt figures (our own rule, docs/decisions/rebuild-records.md).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CONFIRMATION_SLACK, confirmsRebuild, pairResults, type StoredResult } from "~/modules/rebuilds/record";

const result = (code: string, value: number, tolerance = 20): StoredResult => ({ code, title: code, unit: "µm", value, tolerance, pass: Math.abs(value) <= tolerance, ratio: Math.abs(value) / tolerance });

describe("pairing as found with as rebuilt", () => {
  it("gives both values and the change in size, a dash where a set lacks the test", () => {
    const pairs = pairResults([result("A", 50), result("B", -12)], [result("A", 20), result("C", 4)]);
    expect(pairs.map((pair) => [pair.code, pair.before, pair.after, pair.change])).toEqual([
      ["A", 50, 20, -30],
      ["B", -12, null, null],
      ["C", null, 4, null],
    ]);
  });

  it("measures the change in size, so a signed reading that crosses zero improves by its size", () => {
    expect(pairResults([result("A", -30)], [result("A", 10)])[0]!.change).toBe(-20);
  });
});

describe("confirming the as-rebuilt figures", () => {
  const declared = [result("A", 20), result("B", 4, 10)];
  const signed = (values: Record<string, number>, measuredOn = "2026-05-02") => ({ measuredOn, results: Object.entries(values).map(([code, value]) => result(code, value, code === "B" ? 10 : 20)) });

  it("confirms when a signed report measured on or after the rebuild reads every test no worse than declared (plus the slack)", () => {
    expect(confirmsRebuild(declared, "2026-05-01", signed({ A: 18, B: 4 }))).toBe(true);
    expect(confirmsRebuild(declared, "2026-05-02", signed({ A: 20 + CONFIRMATION_SLACK * 20, B: 4 + CONFIRMATION_SLACK * 10 }))).toBe(true);
  });

  it("never confirms without a signed report, with no rebuild date, or with nothing declared", () => {
    expect(confirmsRebuild(declared, "2026-05-01", null)).toBe(false);
    expect(confirmsRebuild(declared, null, signed({ A: 18, B: 4 }))).toBe(false);
    expect(confirmsRebuild([], "2026-05-01", signed({ A: 18, B: 4 }))).toBe(false);
  });

  it("property: whatever is declared, and however well, nothing is confirmed without a signed report", () => {
    const declaredSets = fc.array(
      fc.record({ code: fc.constantFrom("A", "B", "C", "D"), value: fc.double({ min: -500, max: 500, noNaN: true }), tolerance: fc.double({ min: 1, max: 100, noNaN: true }) }),
      { maxLength: 6 },
    );
    fc.assert(
      fc.property(declaredSets, fc.option(fc.constantFrom("2020-01-01", "2026-05-01", "2099-12-31")), (set, on) => {
        const figures = set.map((entry) => result(entry.code, entry.value, entry.tolerance));
        expect(confirmsRebuild(figures, on, null)).toBe(false);
        // A pairing with no signed report carries no signed figure either.
        expect(pairResults(figures, figures).every((pair) => pair.signed === null)).toBe(true);
      }),
    );
  });

  it("does not confirm from a report measured before the rebuild", () => {
    expect(confirmsRebuild(declared, "2026-05-03", signed({ A: 18, B: 4 }))).toBe(false);
  });

  it("does not confirm when the signed report lacks a declared test or reads one worse than declared beyond the slack", () => {
    expect(confirmsRebuild(declared, "2026-05-01", signed({ A: 18 }))).toBe(false);
    expect(confirmsRebuild(declared, "2026-05-01", signed({ A: 20 + CONFIRMATION_SLACK * 20 + 0.1, B: 4 }))).toBe(false);
  });
});
