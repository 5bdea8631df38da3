// Visit times where the machine stands. Offsets from the IANA time zone database and the EU summer-time
// rule (Directive 2000/84/EC: from the last Sunday of March to the last Sunday of October, 01:00 UTC).
import { describe, expect, it } from "vitest";
import { formatVisit, formatVisitDate, machineTimeZone } from "~/modules/inspections/local-time";

describe("the time of an on-site visit", () => {
  it("is given in the machine's zone with UTC beside it: Norway is UTC+1 in winter, UTC+2 in summer", () => {
    expect(formatVisit("2027-01-15T08:00:00Z", "2027-01-15T12:00:00Z", { country: "NO" })).toBe("Fri, 15 Jan 2027, 09:00–13:00 local time (08:00–12:00 UTC)");
    expect(formatVisit("2027-07-15T08:00:00Z", "2027-07-15T12:00:00Z", { country: "NO" })).toBe("Thu, 15 Jul 2027, 10:00–14:00 local time (08:00–12:00 UTC)");
  });

  it("follows the summer-time change on its day: 28 March 2027 is the last Sunday of March", () => {
    // 00:30 UTC is still winter time in Berlin (01:30), 01:30 UTC already summer time (03:30).
    expect(formatVisit("2027-03-28T00:30:00Z", "2027-03-28T01:30:00Z", { country: "DE" })).toBe("Sun, 28 Mar 2027, 01:30–03:30 local time (00:30–01:30 UTC)");
  });

  it("takes the local day, not UTC's: 23:30 UTC is already the next day in Helsinki (UTC+2 in winter)", () => {
    expect(formatVisit("2027-01-15T23:30:00Z", "2027-01-16T02:30:00Z", { country: "FI" })).toMatch(/^Sat, 16 Jan 2027, 01:30–04:30 local time \(23:30–02:30 UTC\)$/);
    expect(formatVisitDate("2027-01-15T23:30:00Z", { country: "FI" })).toBe("16 Jan 2027");
  });

  it("keeps the islands' own clocks: the Canaries are an hour behind Madrid, the Azores two behind Lisbon", () => {
    expect(machineTimeZone({ country: "ES", region: "Canarias" })).toBe("Atlantic/Canary");
    expect(machineTimeZone({ country: "ES", region: "Aragón" })).toBe("Europe/Madrid");
    expect(machineTimeZone({ country: "PT", region: "Açores" })).toBe("Atlantic/Azores");
    expect(formatVisit("2027-01-15T08:00:00Z", "2027-01-15T12:00:00Z", { country: "ES", region: "Canarias" })).toContain("08:00–12:00 local time");
    expect(formatVisit("2027-01-15T08:00:00Z", "2027-01-15T12:00:00Z", { country: "ES" })).toContain("09:00–13:00 local time");
  });

  it("says UTC alone where the listing cannot tell the zone (several zones in one country) or no place is given", () => {
    for (const country of ["US", "CA", "AU"]) {
      expect(formatVisit("2027-01-15T08:00:00Z", "2027-01-15T12:00:00Z", { country })).toBe("Fri, 15 Jan 2027, 08:00–12:00 UTC");
    }
    expect(formatVisit("2027-01-15T08:00:00Z", "2027-01-15T12:00:00Z")).toBe("Fri, 15 Jan 2027, 08:00–12:00 UTC");
    expect(formatVisit("2027-01-15T08:00:00Z", "2027-01-15T12:00:00Z", { country: "GB" }, "long")).toBe("Friday, 15 January 2027, 08:00–12:00 local time (08:00–12:00 UTC)");
  });
});
