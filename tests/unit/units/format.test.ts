import { describe, expect, it } from "vitest";
import { formatLength, lengthsInText, formatMoney, lengthToMillimetres, toMinorUnits } from "~/modules/units/format";
import { formatPower, formatWeight, powerToKilowatts, weightToKilograms } from "~/modules/units/weight-power";

describe("display units", () => {
  it("shows millimetres as stored and inches at 25.4 mm each (NIST SP 811: 1 in = 25.4 mm exactly)", () => {
    expect(formatLength(330, "mm")).toBe("330 mm");
    expect(formatLength(330.2, "inch")).toBe("13 in");
    expect(formatLength(38.1, "inch")).toBe("1.5 in");
    expect(formatLength(1000, "mm")).toBe("1,000 mm");
  });

  it("rounds machine sizes as the trade quotes them, not to a dial gauge's thousandths (common practice)", () => {
    expect(formatLength(250, "inch")).toBe("9.8 in");
    expect(formatLength(1000, "inch")).toBe("39.5 in");
    expect(formatLength(1500, "inch")).toBe("59 in");
    expect(formatLength(3000, "inch")).toBe("118 in");
    expect(formatLength(1016, "inch")).toBe("40 in");
    expect(formatLength(330.4, "mm")).toBe("330 mm");
    expect(formatLength(38.5, "mm")).toBe("38.5 mm");
    for (const mm of [38.1, 101.6, 254, 330.2, 762, 1016, 1524, 2032]) {
      // What an inch seller typed (1.5, 4, 10, 13, 30, 40, 60, 80 in) reads back unchanged.
      expect(formatLength(mm, "inch")).toBe(`${Math.round((mm / 25.4) * 10) / 10} in`);
    }
  });

  it("writes the lengths inside a test's or profile's title in the reader's units", () => {
    expect(lengthsInText("Spindle taper, at 300 mm", "inch")).toBe("Spindle taper, at 12 in");
    expect(lengthsInText("Centre lathe, normal class (swing ≤ 800 mm, between centres ≤ 1500 mm)", "inch")).toBe("Centre lathe, normal class (swing ≤ 31.5 in, between centres ≤ 59 in)");
    expect(lengthsInText("Run-out 5 µm over 300mm", "inch")).toBe("Run-out 5 µm over 12 in");
    expect(lengthsInText("Spindle taper, at 300 mm", "mm")).toBe("Spindle taper, at 300 mm");
  });

  it("turns inches typed into a form into millimetres", () => {
    expect(lengthToMillimetres(13, "inch")).toBe(330.2);
    expect(lengthToMillimetres(40, "inch")).toBe(1016);
    expect(lengthToMillimetres(330, "mm")).toBe(330);
  });

  it("converts weight with 1 lb = 0.45359237 kg exactly (NIST SP 811)", () => {
    expect(formatWeight(1000, "mm")).toBe("1,000 kg");
    expect(formatWeight(1000, "inch")).toBe("2,205 lb");
    expect(weightToKilograms(2205, "inch")).toBe(1000);
  });

  it("converts power with 1 hp = 745.699872 W (NIST SP 811, appendix B)", () => {
    expect(formatPower(5.5, "mm")).toBe("5.5 kW");
    expect(formatPower(7.457, "inch")).toBe("10 hp");
    expect(powerToKilowatts(10, "inch")).toBe(7.457);
  });

  it("keeps prices in minor units and drops cents from whole amounts", () => {
    expect(toMinorUnits(18500.5)).toBe(1850050);
    expect(toMinorUnits(0.29)).toBe(29);
    expect(formatMoney(1850000, "EUR")).toBe("€18,500");
    expect(formatMoney(1850050, "GBP")).toBe("£18,500.50");
    // The formatters are kept per currency and cents: the same currency whole and with cents, in turn.
    expect([formatMoney(1850050, "EUR"), formatMoney(1850000, "EUR"), formatMoney(5, "EUR"), formatMoney(1850000, "GBP")]).toEqual(["€18,500.50", "€18,500", "€0.05", "£18,500"]);
  });
});
