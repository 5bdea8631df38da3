/**
 * The one date style on every page, e-mail and PDF: "4 Dec 2026" (day, short month, year; UTC, since a
 * date stored without a zone means that day). Visit times, which belong to the machine's place, have
 * their own formats in `~/modules/inspections/local-time`. Pure: shared by the server and the browser.
 */
const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

/** "4 Dec 2026" from a Date, an ISO timestamp, or a calendar date ("2026-12-04"). */
export function formatDate(value: Date | string): string {
  const date = typeof value === "string" ? new Date(/^\d{4}-\d{2}-\d{2}$/.test(value) ? `${value}T00:00:00Z` : value) : value;
  return Number.isNaN(date.getTime()) ? String(value) : dateFormat.format(date);
}
