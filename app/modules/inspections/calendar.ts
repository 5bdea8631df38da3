// A visit as an iCalendar file (RFC 5545) that any calendar program imports. Written here rather than with a
// package: one event with UTC times is some forty lines, and the npm packages for it bring a validation
// library along. Pure; the rules it keeps are checked in tests/unit/inspections/calendar.test.ts.

export type CalendarEvent = {
  /** Stable per booking, so a moved visit replaces the old entry instead of adding a second. */
  uid: string;
  /** Bumped when the visit moves (RFC 5545 §3.8.7.4). */
  sequence: number;
  startsAt: Date;
  endsAt: Date;
  stampedAt: Date;
  summary: string;
  location: string;
  description: string;
  url: string;
};

/** Date-time in UTC, "19970714T173000Z" (RFC 5545 §3.3.5, form #2). */
function utc(date: Date): string {
  return date.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}/, "");
}

/** TEXT value: backslash, semicolon and comma escaped, line breaks as "\n" (RFC 5545 §3.3.11). */
export function escapeText(value: string): string {
  return value
    .replace(/\\/g, "\\\\")
    .replace(/;/g, "\\;")
    .replace(/,/g, "\\,")
    .replace(/\r\n|\r|\n/g, "\\n");
}

const encoder = new TextEncoder();

/**
 * Lines longer than 75 octets folded: CRLF then one space (RFC 5545 §3.1). Split between characters, never
 * inside a UTF-8 sequence or a surrogate pair.
 */
export function foldLine(line: string): string {
  const parts: string[] = [];
  let current = "";
  let octets = 0;
  for (const character of line) {
    const size = encoder.encode(character).length;
    // The first line holds 75 octets; each continuation 74, after its leading space.
    const limit = parts.length === 0 ? 75 : 74;
    if (octets + size > limit) {
      parts.push(current);
      current = "";
      octets = 0;
    }
    current += character;
    octets += size;
  }
  parts.push(current);
  return parts.join("\r\n ");
}

export function visitCalendar(event: CalendarEvent): string {
  const lines = [
    "BEGIN:VCALENDAR",
    "VERSION:2.0",
    "PRODID:-//Tenthmark//Inspection visits//EN",
    "CALSCALE:GREGORIAN",
    "METHOD:PUBLISH",
    "BEGIN:VEVENT",
    `UID:${event.uid}`,
    `SEQUENCE:${event.sequence}`,
    `DTSTAMP:${utc(event.stampedAt)}`,
    `DTSTART:${utc(event.startsAt)}`,
    `DTEND:${utc(event.endsAt)}`,
    `SUMMARY:${escapeText(event.summary)}`,
    `LOCATION:${escapeText(event.location)}`,
    `DESCRIPTION:${escapeText(event.description)}`,
    `URL:${event.url}`,
    "STATUS:CONFIRMED",
    "TRANSP:OPAQUE",
    "END:VEVENT",
    "END:VCALENDAR",
  ];
  return lines.map(foldLine).join("\r\n") + "\r\n";
}
