// The visit's calendar file against RFC 5545's rules (each rule's section named beside its check).
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { escapeText, foldLine, visitCalendar } from "~/modules/inspections/calendar";
import { instantAtMachine } from "~/modules/inspections/local-time";

const event = {
  uid: "b-1@tenthmark",
  sequence: 1,
  startsAt: new Date("2027-02-02T08:00:00Z"),
  endsAt: new Date("2027-02-02T12:00:00Z"),
  stampedAt: new Date("2026-12-04T21:00:00Z"),
  summary: "Machine inspection: Tessmar DL 330 (IB-GPTS-H2HC)",
  location: "Werkstraße 4, Hof 2; 15234 Brennwald",
  description: "Contact: Jo Ulm, +49 30 1234 567.\nAccess: loading dock at the back, 07:00–15:00; ask at the gate. Ünïcödé über alles — a long line to fold across the seventy-five octet limit",
  url: "https://tenthmark.example/bookings/b-1",
};

const unfold = (text: string) => text.replace(/\r\n[ \t]/g, "");

describe("the visit's calendar file (RFC 5545)", () => {
  const file = visitCalendar(event);

  it("ends every line with CRLF and no line is longer than 75 octets (§3.1)", () => {
    expect(file.endsWith("\r\n")).toBe(true);
    expect(file.replace(/\r\n/g, "")).not.toMatch(/[\r\n]/);
    for (const line of file.split("\r\n")) expect(new TextEncoder().encode(line).length).toBeLessThanOrEqual(75);
  });

  it("is one VCALENDAR with VERSION 2.0 and a PRODID, holding one VEVENT (§3.4, §3.6, §3.7.3, §3.7.4)", () => {
    const lines = unfold(file).trimEnd().split("\r\n");
    expect(lines[0]).toBe("BEGIN:VCALENDAR");
    expect(lines.at(-1)).toBe("END:VCALENDAR");
    expect(lines).toContain("VERSION:2.0");
    expect(lines.some((line) => line.startsWith("PRODID:"))).toBe(true);
    expect(lines.filter((line) => line === "BEGIN:VEVENT")).toHaveLength(1);
  });

  it("gives the event exactly one UID and DTSTAMP, and UTC times with DTSTART before DTEND (§3.6.1, §3.3.5)", () => {
    const lines = unfold(file).split("\r\n");
    expect(lines.filter((line) => line.startsWith("UID:"))).toEqual(["UID:b-1@tenthmark"]);
    expect(lines.filter((line) => line.startsWith("DTSTAMP:"))).toEqual(["DTSTAMP:20261204T210000Z"]);
    expect(lines).toContain("DTSTART:20270202T080000Z");
    expect(lines).toContain("DTEND:20270202T120000Z");
    expect(lines).toContain("SEQUENCE:1");
  });

  it("escapes backslash, semicolon, comma and line breaks in TEXT values (§3.3.11)", () => {
    expect(escapeText("a\\b;c,d\ne")).toBe("a\\\\b\\;c\\,d\\ne");
    expect(unfold(file)).toContain("LOCATION:Werkstraße 4\\, Hof 2\\; 15234 Brennwald");
    expect(unfold(file)).toContain("DESCRIPTION:Contact: Jo Ulm\\, +49 30 1234 567.\\nAccess:");
  });

  it("folds any text so that unfolding gives it back, never splitting a character (§3.1)", () => {
    fc.assert(
      fc.property(fc.string({ unit: "grapheme", maxLength: 400 }), (text) => {
        const line = `DESCRIPTION:${escapeText(text)}`;
        const folded = foldLine(line);
        expect(unfold(folded)).toBe(line);
        for (const part of folded.split("\r\n")) expect(new TextEncoder().encode(part).length).toBeLessThanOrEqual(75);
        expect(folded).not.toContain("\uFFFD");
      }),
    );
  });
});

describe("a proposed time where the machine stands", () => {
  it("reads the wall clock in the machine's zone (IANA time zone database)", () => {
    // Berlin is UTC+1 in winter and UTC+2 in summer.
    expect(instantAtMachine("2027-02-02", "09:00", { country: "DE" }).toISOString()).toBe("2027-02-02T08:00:00.000Z");
    expect(instantAtMachine("2027-07-02", "09:00", { country: "DE" }).toISOString()).toBe("2027-07-02T07:00:00.000Z");
    // Where the zone is unknown (several zones in the country), the time is UTC.
    expect(instantAtMachine("2027-07-02", "09:00", { country: "US" }).toISOString()).toBe("2027-07-02T09:00:00.000Z");
  });
});
