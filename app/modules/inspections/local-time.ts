// An on-site inspection happens where the machine stands, so pages and e-mails give the visit's time there,
// with UTC beside it (what the inspector offered and what is stored). Countries that span several time
// zones (Australia, Canada, the United States) get UTC alone: the listing does not say which zone.
// Pure: shared by the server and the browser. Zones from the IANA time zone database.

const singleZone: Record<string, string> = {
  AT: "Europe/Vienna", BE: "Europe/Brussels", BG: "Europe/Sofia", CH: "Europe/Zurich", CZ: "Europe/Prague",
  DE: "Europe/Berlin", DK: "Europe/Copenhagen", EE: "Europe/Tallinn", ES: "Europe/Madrid", FI: "Europe/Helsinki",
  FR: "Europe/Paris", GB: "Europe/London", GR: "Europe/Athens", HR: "Europe/Zagreb", HU: "Europe/Budapest",
  IE: "Europe/Dublin", IT: "Europe/Rome", LT: "Europe/Vilnius", LU: "Europe/Luxembourg", LV: "Europe/Riga",
  NL: "Europe/Amsterdam", NO: "Europe/Oslo", NZ: "Pacific/Auckland", PL: "Europe/Warsaw", PT: "Europe/Lisbon",
  RO: "Europe/Bucharest", SE: "Europe/Stockholm", SI: "Europe/Ljubljana", SK: "Europe/Bratislava",
};

export type MachinePlace = { country: string; region?: string | null };

/** The machine's time zone, or null where its country's zone cannot be told from the listing. */
export function machineTimeZone(place: MachinePlace): string | null {
  // The islands keep other clocks than the mainland.
  if (place.country === "ES" && /canar/i.test(place.region ?? "")) return "Atlantic/Canary";
  if (place.country === "PT" && /a[çc]ores|azores/i.test(place.region ?? "")) return "Atlantic/Azores";
  return singleZone[place.country] ?? null;
}

const styles = {
  time: { hour: "2-digit", minute: "2-digit", hourCycle: "h23" },
  day: { weekday: "short", day: "numeric", month: "short", year: "numeric" },
  "long-day": { weekday: "long", day: "numeric", month: "long", year: "numeric" },
  date: { day: "numeric", month: "short", year: "numeric" },
} satisfies Record<string, Intl.DateTimeFormatOptions>;

// Building an Intl.DateTimeFormat costs far more than using one: one per zone and style.
const formats = new Map<string, Intl.DateTimeFormat>();
function formatter(timeZone: string, style: keyof typeof styles) {
  const key = `${timeZone} ${style}`;
  let format = formats.get(key);
  if (!format) formats.set(key, (format = new Intl.DateTimeFormat("en-GB", { ...styles[style], timeZone })));
  return format;
}

/** The zone a visit's time is given in: the machine's where known, else UTC. */
const zoneOf = (place?: MachinePlace | null) => (place && machineTimeZone(place)) ?? null;

/** A visit's time in parts: the day and hours where the machine stands (null where its zone is unknown) and in UTC. */
export function visitParts(startsAt: Date | string, endsAt: Date | string, place?: MachinePlace | null, style: "short" | "long" = "short") {
  const [start, end] = [new Date(startsAt), new Date(endsAt)];
  const dayStyle = style === "long" ? "long-day" : "day";
  const zone = zoneOf(place);
  const hours = (timeZone: string) => `${formatter(timeZone, "time").format(start)}–${formatter(timeZone, "time").format(end)}`;
  return { zone, day: formatter(zone ?? "UTC", dayStyle).format(start), local: zone ? `${hours(zone)} local time` : null, utc: `${hours("UTC")} UTC` };
}

/**
 * A visit's time: "Tue, 2 Feb 2027, 09:00–13:00 local time (08:00–12:00 UTC)" where the machine's zone is
 * known, "Tue, 2 Feb 2027, 08:00–12:00 UTC" otherwise. `style: "long"` writes the day out, for e-mails.
 */
export function formatVisit(startsAt: Date | string, endsAt: Date | string, place?: MachinePlace | null, style: "short" | "long" = "short") {
  const { day, local, utc } = visitParts(startsAt, endsAt, place, style);
  return local ? `${day}, ${local} (${utc})` : `${day}, ${utc}`;
}

/** The visit's day where the machine stands (UTC where its zone is unknown): "2 Feb 2027", for subject lines. */
export function formatVisitDate(startsAt: Date | string, place?: MachinePlace | null) {
  return formatter(zoneOf(place) ?? "UTC", "date").format(new Date(startsAt));
}

/** The calendar day (YYYY-MM-DD) of an instant where the machine stands, or in UTC where its zone is unknown. */
export function dayAtMachine(instant: Date | string, place?: MachinePlace | null): string {
  // en-CA writes dates as YYYY-MM-DD.
  return new Intl.DateTimeFormat("en-CA", { timeZone: zoneOf(place) ?? "UTC", year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date(instant));
}

/** A wall-clock day and time where the machine stands (UTC where its zone is unknown), as an instant. */
export function instantAtMachine(day: string, time: string, place?: MachinePlace | null): Date {
  const zone = zoneOf(place) ?? "UTC";
  const wall = Date.parse(`${day}T${time}:00Z`);
  const parts = new Intl.DateTimeFormat("en-US", { timeZone: zone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" });
  // The zone's offset at an instant: its wall clock read as if it were UTC, minus the instant.
  const offsetAt = (instant: number) => {
    const got = Object.fromEntries(parts.formatToParts(new Date(instant)).map((part) => [part.type, part.value]));
    return Date.UTC(Number(got.year), Number(got.month) - 1, Number(got.day), Number(got.hour), Number(got.minute), Number(got.second)) - instant;
  };
  // Twice, so that a time just across a change of clocks takes the offset that holds then.
  const first = wall - offsetAt(wall);
  return new Date(wall - offsetAt(first));
}
