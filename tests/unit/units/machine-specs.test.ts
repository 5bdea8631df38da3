import { describe, expect, it } from "vitest";
import { listingFormSchema } from "~/modules/listings/validation";
import { formatFootprint, formatSpeedRange, formatSupply, formatThreadRange } from "~/modules/units/machine-specs";

const threads = { threadPitchMinMm: 0.25, threadPitchMaxMm: 7, threadTpiMin: 4, threadTpiMax: 56 };

describe("a machine's trade specification as the reader reads it", () => {
  it("writes the supply as voltage, phases and frequency", () => {
    expect(formatSupply({ supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50 })).toBe("400 V three-phase, 50 Hz");
    expect(formatSupply({ supplyVoltage: 240, supplyPhases: 1, supplyFrequencyHz: null })).toBe("240 V single-phase");
    expect(formatSupply({ supplyVoltage: null, supplyPhases: null, supplyFrequencyHz: null })).toBeNull();
  });

  it("writes speeds in whole rpm, a single speed once", () => {
    expect(formatSpeedRange(30, 2000)).toBe("30–2,000 rpm");
    expect(formatSpeedRange(2850, 2850)).toBe("2,850 rpm");
    expect(formatSpeedRange(null, 2000)).toBeNull();
  });

  it("keeps metric pitches in mm and inch threads in threads per inch for every reader, the reader's own system first (common practice)", () => {
    expect(formatThreadRange(threads, "mm")).toBe("Metric 0.25–7 mm pitch; 4–56 threads per inch");
    expect(formatThreadRange(threads, "inch")).toBe("4–56 threads per inch; metric 0.25–7 mm pitch");
    expect(formatThreadRange({ ...threads, threadTpiMin: null, threadTpiMax: null }, "inch")).toBe("Metric 0.25–7 mm pitch");
  });

  it("rounds the footprint as machine sizes are quoted (1 in = 25.4 mm, NIST SP 811)", () => {
    expect(formatFootprint(2100, 950, "mm")).toBe("2,100 × 950 mm");
    expect(formatFootprint(2100, 950, "inch")).toBe("82.5 × 37.5 in");
    expect(formatFootprint(2100, null, "mm")).toBeNull();
  });
});

describe("the listing form's trade figures", () => {
  const base = {
    units: "mm", category: "centre_lathe", make: "Halvorsen", model: "ML 280", swingOverBed: "280", distanceBetweenCentres: "750",
    city: "Eskerud", country: "NO", price: "9400", currency: "EUR", condition: "used",
    description: "Reground bed and new spindle bearings in 2024; runs quietly through all speeds.",
  };
  const errorsOf = (fields: Record<string, string | undefined>) => {
    const result = listingFormSchema("mm").safeParse({ ...base, ...fields });
    return result.success ? {} : Object.fromEntries(result.error.issues.map((issue) => [issue.path.join("."), issue.message]));
  };

  it("accepts a whole set", () => {
    expect(errorsOf({ supplyVoltage: "400", supplyPhases: "3", supplyFrequency: "50", spindleSpeedMin: "30", spindleSpeedMax: "2000", threadPitchMin: "0.25", threadPitchMax: "7", swingOverCrossSlide: "170", footprintLength: "1800", footprintWidth: "800", tailstockTaper: "Morse taper 3" })).toEqual({});
  });

  it("refuses half a supply, reversed ranges, a cross-slide swing above the bed's and numbers that are not finite", () => {
    expect(errorsOf({ supplyVoltage: "400" })).toHaveProperty("supplyPhases");
    expect(errorsOf({ supplyPhases: "2" })).toHaveProperty("supplyPhases", "Choose single-phase or three-phase.");
    expect(errorsOf({ spindleSpeedMin: "2000", spindleSpeedMax: "30" })).toHaveProperty("spindleSpeedMax", "The highest spindle speed must be at least the lowest.");
    expect(errorsOf({ threadTpiMin: "4" })).toHaveProperty("threadTpiMax");
    expect(errorsOf({ swingOverCrossSlide: "300" })).toHaveProperty("swingOverCrossSlide");
    expect(errorsOf({ supplyVoltage: "Infinity", supplyPhases: "3" })).toHaveProperty("supplyVoltage");
    expect(errorsOf({ spindleSpeedMax: "1e309", spindleSpeedMin: "1" })).toHaveProperty("spindleSpeedMax");
    expect(errorsOf({ footprintLength: "1800" })).toHaveProperty("footprintWidth");
    expect(errorsOf({ tailstockTaper: "MT\u00003" })).toHaveProperty("tailstockTaper");
  });
});
