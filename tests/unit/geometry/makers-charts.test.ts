// A maker's own acceptance chart, scoped to a make and model (and optionally serial numbers), is suggested
// before the general class for a machine it fits. The chart here is invented test data.
import { describe, expect, it } from "vitest";
import { BUILT_IN_PROFILES, CENTRE_LATHE_NORMAL, makerChartFits, sourceLabel, suggestProfile, toleranceProfileSchema, type ToleranceProfile } from "~/geometry";

const chart: ToleranceProfile = {
  ...CENTRE_LATHE_NORMAL,
  key: "maker-orvald-tl-360",
  version: 1,
  title: "Orvald TL-360, maker's acceptance chart",
  scope: {
    ...CENTRE_LATHE_NORMAL.scope,
    maker: { make: "Orvald", model: "TL-360", serialFrom: "S-900", serialTo: "S-1400", chart: "Orvald TL-360 acceptance test chart, form 12" },
    source: { confidence: "manufacturer", document: "Orvald TL-360 acceptance test chart, form 12" },
  },
};

const machine = (make: string, model: string, serialNumber: string | null) => ({
  category: "centre-lathe" as const,
  dimensions: { swingOverBedMm: 360, distanceBetweenCentresMm: 1000 },
  make,
  model,
  serialNumber,
});

describe("makers' charts", () => {
  it("validates with the one profile schema", () => {
    expect(toleranceProfileSchema.safeParse(chart).success).toBe(true);
    expect(sourceLabel(chart.scope.source)).toBe("maker's chart: Orvald TL-360 acceptance test chart, form 12");
  });

  it("fits the same make and model, in any case, inside the serial range (digits compared as numbers)", () => {
    expect(makerChartFits(chart, machine("orvald", "tl-360", "S-1200"))).toBe(true);
    expect(makerChartFits(chart, machine("Orvald", "TL-360", "S-950"))).toBe(true);
    expect(makerChartFits(chart, machine("Orvald", "TL-360", "S-1500"))).toBe(false);
    expect(makerChartFits(chart, machine("Orvald", "TL-360", null))).toBe(false);
    expect(makerChartFits(chart, machine("Orvald", "TL-400", "S-1200"))).toBe(false);
  });

  it("is suggested first for a matching machine, and the class otherwise", () => {
    const offered = [...BUILT_IN_PROFILES, chart];
    expect(suggestProfile(offered, machine("Orvald", "TL-360", "S-1000"))).toBe(chart);
    expect(suggestProfile(offered, machine("Other", "TL-360", "S-1000"))).toBe(CENTRE_LATHE_NORMAL);
  });

  it("refuses a serial range that runs backwards, at its field", () => {
    const parsed = toleranceProfileSchema.safeParse({ ...chart, scope: { ...chart.scope, maker: { ...chart.scope.maker, serialFrom: "S-1400", serialTo: "S-900" } } });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0]!.path).toEqual(["scope", "maker", "serialTo"]);
  });
});
