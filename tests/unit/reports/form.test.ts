import canonicalize from "canonicalize";
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { CENTRE_LATHE_NORMAL, scoreReport } from "~/geometry";
import { checkTestEntry, emptyTestEntry, newReportForm, parseStationTable, parseTypedNumber, previewReport } from "~/modules/reports/form";

describe("numbers as an inspector types them", () => {
  it("reads signs, the Unicode minus and a decimal comma, and refuses the rest", () => {
    expect(parseTypedNumber("-2")).toBe(-2);
    expect(parseTypedNumber("\u22122")).toBe(-2);
    expect(parseTypedNumber("+3")).toBe(3);
    expect(parseTypedNumber("0,0004")).toBe(0.0004);
    expect(parseTypedNumber(".5")).toBe(0.5);
    expect(parseTypedNumber("  ")).toBeUndefined();
    expect(parseTypedNumber("1.2.3")).toBe("invalid");
    expect(parseTypedNumber("12 µm")).toBe("invalid");
    expect(parseTypedNumber("Infinity")).toBe("invalid");
  });

  it("pastes station tables from a spreadsheet (tabs, decimal comma) or CSV, skipping headers", () => {
    expect(parseStationTable("Station\tReading\n0\t0\n100\t-4,5\n\n200\t2")).toEqual({
      points: [
        { station: "0", reading: "0" },
        { station: "100", reading: "-4,5" },
        { station: "200", reading: "2" },
      ],
      skipped: 1,
    });
    expect(parseStationTable("x,y\n0,0\n250,3\r\n500,5").points).toHaveLength(3);
    expect(parseStationTable("0;1,5\n10;2").points[0]).toEqual({ station: "0", reading: "1,5" });
  });
});

describe("a test's entry", () => {
  it("is empty, incomplete or complete, and complete entries pass the engine's schema", () => {
    const entry = emptyTestEntry("mandrel");
    expect(checkTestEntry(entry).state).toBe("empty");
    expect(checkTestEntry({ ...entry, near0: "0", near180: "0", far0: "30" }).state).toBe("incomplete");
    const complete = checkTestEntry({ ...entry, near0: "0", near180: "0", far0: "30", far180: "10" });
    expect(complete.state).toBe("complete");
    expect(complete.measurement).toEqual({ kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 30, at180: 10 } });
  });

  it("names a station read twice at its field, with the engine schema's message", () => {
    const entry = { ...emptyTestEntry("profile"), points: [{ station: "0", reading: "0" }, { station: "0", reading: "2" }, { station: "100", reading: "1" }] };
    const check = checkTestEntry(entry);
    expect(check.state).toBe("invalid");
    expect(check.errors["points.1.station"]?.[0]).toMatch(/given twice/);
  });

  it("takes the resolution from the instrument that reads that kind of value", () => {
    const instruments = [
      { id: "i1", kind: "dial-indicator" as const, description: "", resolution: "1", calibrationDue: "" },
      { id: "i2", kind: "precision-level" as const, description: "", resolution: "20", calibrationDue: "" },
    ];
    const sweep = { ...emptyTestEntry("sweep"), readings: ["0", "3"], instrumentId: "i1" };
    expect(checkTestEntry(sweep, instruments).measurement?.resolution).toBe(1);
    // A level's µm/m is no resolution for a height profile.
    const heights = { ...emptyTestEntry("profile"), points: [{ station: "0", reading: "0" }, { station: "100", reading: "1" }], instrumentId: "i2" };
    expect(checkTestEntry(heights, instruments).measurement?.resolution).toBeUndefined();
  });
});

describe("the live preview", () => {
  it("scores exactly as the engine does on the complete tests, and fails a mandrel 2 µm the wrong way at 1 µm resolution", () => {
    const form = newReportForm({ profileKey: "centre-lathe-normal", profileVersion: 1, units: "mm", measuredOn: "2026-03-02" });
    form.tests["L-SP-PAR-H"] = { ...emptyTestEntry("mandrel"), near0: "0", near180: "0", far0: "-2", far180: "-2", instrumentId: "i1" };
    form.tests["L-SP-NOSE"] = { ...emptyTestEntry("extremes"), max: "4", min: "" };
    const preview = previewReport(form, CENTRE_LATHE_NORMAL)!;
    const horizontal = preview.tests.find((test) => test.test.code === "L-SP-PAR-H")!;
    // GEOMETRY.md direction rule: a one-way test fails on any deviation the other way beyond the resolution.
    expect(horizontal.result).toMatchObject({ value: -2, pass: false, direction: { pass: false, against: 2 } });
    expect(preview.tests.find((test) => test.test.code === "L-SP-NOSE")!.check.state).toBe("incomplete");
    expect(preview.score).toEqual(
      scoreReport(CENTRE_LATHE_NORMAL, { measuredOn: "2026-03-02", conditions: {}, tests: { "L-SP-PAR-H": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: -2, at180: -2 }, resolution: 1 } } }),
    );
    expect(preview.score!.grade).toBe("incomplete");
  });
});

describe("the seal", () => {
  it("canonicalizes as RFC 8785 does: sorted keys, no spaces, shortest numbers", () => {
    // RFC 8785 §3.2.2 / ECMAScript number serialisation: 1e+30 and 4.5; keys sorted by UTF-16 code units.
    expect(canonicalize({ b: 4.50, a: 1e30, c: [true, null, "\u20ac"] })).toBe('{"a":1e+30,"b":4.5,"c":[true,null,"€"]}');
    // SHA-256 test vector (FIPS 180-2, appendix B.1).
    expect(createHash("sha256").update("abc", "utf8").digest("hex")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });
});
