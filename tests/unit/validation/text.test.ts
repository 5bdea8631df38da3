// The shared text schema: what hostile text it refuses, with a message, and what ordinary text it keeps.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decimalAmount, fileSize, formId, hasHostileCharacters, safeName, safeText } from "~/modules/validation/text";

const make = safeText({ label: "make", max: 80 });
const notes = safeText({ label: "notes", max: 2_000, multiline: true });
const name = safeName({ label: "name", max: 80 });

function message(result: { success: boolean; error?: { issues: { message: string }[] } }) {
  return result.success ? undefined : result.error!.issues[0]!.message;
}

describe("safeText", () => {
  it("trims and NFC-normalises", () => {
    expect(make.parse("  Cafe\u0301 Works  ")).toBe("Café Works");
  });

  it("refuses NUL and other control characters with a message naming the field", () => {
    for (const value of ["Weiler\u0000", "a\u0007b", "a\u001Bb", "a\u007Fb", "a\u0085b", "two\nlines"]) {
      expect(message(make.safeParse(value))).toMatch(/make.*control characters/);
    }
  });

  it("keeps line breaks and tabs in multi-line text, refuses NUL there too", () => {
    expect(notes.parse("first line\r\nsecond\tline")).toBe("first line\r\nsecond\tline");
    expect(message(notes.safeParse("before\u0000after"))).toMatch(/notes.*NUL/);
  });

  it("refuses lone surrogates, high or low, keeps paired ones", () => {
    expect(message(make.safeParse("ab\uD800"))).toMatch(/broken character/);
    expect(message(make.safeParse("\uDC00ab"))).toMatch(/broken character/);
    expect(message(make.safeParse("a\uDBFFb"))).toMatch(/broken character/);
    expect(make.parse("Lathe 💥")).toBe("Lathe 💥");
  });

  it("holds the maximum, also for a megabyte", () => {
    expect(message(make.safeParse("x".repeat(1_000_000)))).toBe("Keep the make to 80 characters.");
    expect(make.parse("x".repeat(80))).toHaveLength(80);
  });

  it("any string either parses to well-formed text within bounds or fails with a message (property)", () => {
    fc.assert(
      fc.property(fc.oneof(fc.string({ unit: "binary", maxLength: 120 }), fc.string({ unit: "grapheme", maxLength: 120 })), (value) => {
        const result = make.safeParse(value);
        if (result.success) {
          expect(hasHostileCharacters(result.data)).toBe(false);
          expect(result.data.length).toBeLessThanOrEqual(80);
          expect(result.data).toBe(result.data.normalize("NFC"));
        } else expect(result.error.issues[0]!.message.length).toBeGreaterThan(5);
      }),
    );
  });
});

describe("safeName", () => {
  it("refuses names made only of invisible characters", () => {
    for (const value of ["\u200B\u200B", "\u200D", "\u2060\uFEFF", "\u3164", "\u115F\u1160", "\u202E", "\u00AD", "\u0301", "\u2800", " \u200C "]) {
      expect(message(name.safeParse(value)), JSON.stringify(value)).toMatch(/name/);
    }
  });

  it("keeps names with something to see, zero-width joiners inside included", () => {
    expect(name.parse("Mira Holt")).toBe("Mira Holt");
    expect(name.parse("👩\u200D🔧 Workshop")).toBe("👩\u200D🔧 Workshop");
    expect(name.parse("Ünal Ağaç")).toBe("Ünal Ağaç");
  });
});

describe("decimalAmount", () => {
  const price = decimalAmount({ label: "asking price" });

  it("reads decimal digits only", () => {
    expect(price.parse("18500")).toBe(18_500);
    expect(price.parse("18500.5")).toBe(18_500.5);
    expect(price.parse("18500,50")).toBe(18_500.5);
  });

  it("reads a minus, for the caller's range to refuse with its own words", () => {
    expect(price.parse("-5")).toBe(-5);
  });

  it("refuses what Number() would read kindly: hex, exponents, a plus sign, Infinity", () => {
    for (const value of ["0x10", "1e3", "-0x10", "+5", "--5", "Infinity", "1 000", "0b11", "0o7", "1.234", "", " "]) {
      expect(price.safeParse(value).success, value).toBe(false);
    }
  });
});

describe("fileSize", () => {
  it("takes a whole number of bytes above nothing, and refuses zero, negatives and fractions with a message", () => {
    expect(fileSize().parse("2048")).toBe(2048);
    for (const bad of ["0", "-5", "1.5", "1e3", ""]) {
      const result = fileSize().safeParse(bad);
      expect(result.success, bad).toBe(false);
      expect(result.error?.issues[0]?.message, bad).toMatch(/\w/);
    }
  });
});

describe("formId", () => {
  it("accepts a UUID and refuses anything else with a message", () => {
    const slot = formId("slot");
    expect(slot.safeParse("3f2b8a8e-3c1e-4b7e-9a55-0c7f6f1d2a10").success).toBe(true);
    expect(message(slot.safeParse("\u0000"))).toBe("Choose a slot from the list.");
  });
});
