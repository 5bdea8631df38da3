// Bad input, generated: for every action and API route, payloads that are wrong in one way each (wrong
// types, missing fields, huge strings, negative/NaN/Infinity numbers, unknown enum values, malformed JSON,
// wrong content types), sent over HTTP as the user who may use the route. Each must get a 4xx with a
// message, never a 500, and change no row that belongs to this file's people and objects.
import { randomUUID } from "node:crypto";
import { sql } from "drizzle-orm";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { createTestUser, signInCookie, testAppOrigin, type TestUser } from "../../support/accounts";
import { createListingAs, tradeSpecFields, validListingFields } from "../../support/listings";
import { acceptedBooking, completeForm, inspectorCookie, submitOverHttp } from "../../support/reports";

const db = getDatabase();
// 401: a sign-in that names no account; 409: a state that forbids the step; 415: a body that is not a form.
// 429 too: repeated wrong passwords for one address are refused by the sign-in limit, with its message.
const ACCEPTED = new Set([400, 401, 403, 404, 405, 409, 413, 415, 422, 429]);
const RUNS = Number(process.env.BAD_INPUT_RUNS ?? 12);

type Person = "visitor" | "buyer" | "seller" | "inspector" | "admin";
type Payload = { form?: Record<string, string>; json?: string; raw?: string; contentType?: string; query?: string; method?: string };
type Target = { route: string; path: () => string; as: Person; payloads: fc.Arbitrary<Payload> };

let people: Record<Exclude<Person, "visitor">, TestUser>;
let cookies: Partial<Record<Person, string>>;
let listingId: string;
let slug: string;
let bookingId: string;
let bookedListingId: string;
let ownedIds: string[];

beforeAll(async () => {
  const filed = await acceptedBooking();
  people = { buyer: filed.buyer, seller: filed.seller, inspector: filed.inspector, admin: await createTestUser({ roles: ["admin"] }) };
  cookies = {};
  for (const [role, person] of Object.entries(people)) cookies[role as Person] = await signInCookie(person.email, person.password);
  listingId = await createListingAs(cookies.seller!);
  slug = filed.listing.slug;
  bookingId = filed.bookingId;
  bookedListingId = filed.listing.id;
  // A scored draft, so that the review page (and its signing form) is there to be sent bad input.
  const submitted = await submitOverHttp(await inspectorCookie(filed.inspector), bookingId, completeForm());
  if (submitted.status !== 302) throw new Error(`submitting the fixture report answered ${submitted.status}`);
  ownedIds = [...Object.values(people).map((person) => person.id), listingId, filed.listing.id, bookingId];
}, 60_000);

// ————— What must not change: every row of the public schema that names one of our ids —————

async function ownedRows(): Promise<Record<string, string>> {
  const columns = await db.execute<{ table_name: string; column_name: string }>(sql`
    select table_name, column_name from information_schema.columns
    where table_schema = 'public' and (column_name = 'id' or column_name like '%\_id') and data_type in ('text', 'uuid')
    order by table_name, column_name`);
  const byTable = new Map<string, string[]>();
  for (const { table_name, column_name } of columns.rows) byTable.set(table_name, [...(byTable.get(table_name) ?? []), column_name]);
  const snapshot: Record<string, string> = {};
  for (const [table, names] of byTable) {
    const matches = sql.join(
      names.map((name) => sql`${sql.identifier(name)}::text in ${ownedIds}`),
      sql` or `,
    );
    const result = await db.execute<{ rows: number; digest: string | null }>(
      sql`select count(*)::int as rows, md5(string_agg(t::text, '|' order by t::text)) as digest from ${sql.identifier(table)} t where ${matches}`,
    );
    snapshot[table] = `${result.rows[0]!.rows}:${result.rows[0]!.digest ?? ""}`;
  }
  return snapshot;
}

// ————— Generators of wrongness —————

// Text that is wrong whatever the field: a control character (NUL most often) inside it. A form body carries
// these as they are; lone surrogates it cannot carry (URL encoding turns them into U+FFFD), so those are sent
// where JSON takes text (loneSurrogateText).
const CONTROL_CHARACTERS = ["\u0000", "\u0000", "\u0000", "\u0001", "\u0007", "\u0008", "\u000E", "\u001B", "\u007F", "\u0085", "\u009F"];
const junkText = fc
  .tuple(fc.oneof(fc.constantFrom("", "NaN", "<script>alert(1)</script>", "'; drop table listings; --", "💥"), fc.string({ maxLength: 12 })), fc.constantFrom(...CONTROL_CHARACTERS), fc.string({ maxLength: 12 }))
  .map(([before, control, after]) => `${before}${control}${after}`);
const loneSurrogateText = fc
  .tuple(fc.string({ maxLength: 12 }), fc.oneof(fc.integer({ min: 0xd800, max: 0xdbff }), fc.integer({ min: 0xdc00, max: 0xdfff })), fc.constantFrom("", "x", " tail"))
  .map(([before, unit, after]) => `${before}${String.fromCharCode(unit)}${after}`);
/** A name with nothing to see: white space, zero-width and format characters, fillers. */
const invisibleText = fc
  .array(fc.constantFrom("\u200B", "\u200C", "\u200D", "\u2060", "\uFEFF", "\u00AD", "\u3164", "\u115F", "\u202E", "\u2800", " "), { minLength: 1, maxLength: 6 })
  .map((parts) => `\u200B${parts.join("")}`);
/** Too long, but within the 16 KB a request line may have (Node answers 431 beyond it). */
const longInQuery = (over: number) => fc.integer({ min: over + 1, max: over + 4_000 }).map((length) => "x".repeat(length));
const huge = (over: number) => fc.integer({ min: over + 1, max: over + 50_000 }).map((length) => "x".repeat(length));
const notANumber = fc.oneof(fc.constantFrom("abc", "NaN", "1,2,3", "twelve", "0x", "--1", "1e", "[]", "{}"), fc.string({ minLength: 1, maxLength: 8 }).filter((value) => Number.isNaN(Number(value)) && value.trim() !== ""));
const badNumber = (min: number, max: number) =>
  fc.oneof(
    notANumber,
    fc.constantFrom("Infinity", "-Infinity", "1e309", "-1e309"),
    fc.double({ noNaN: true, max: min - 1e-3, min: -1e12 }).map(String),
    fc.double({ noNaN: true, min: max + 1, max: 1e15 }).map((value) => String(Math.ceil(value))),
  );
const unknownOf = (known: string[]) => fc.oneof(fc.constant("definitely-not-a-choice"), fc.string({ minLength: 1, maxLength: 16 }).filter((value) => !known.includes(value) && !known.includes(value.trim())));
const notAUuid = fc.oneof(fc.constantFrom("", "1", "../../etc/passwd", "00000000-0000-0000-0000-00000000000g", "null"), fc.string({ maxLength: 40 }).filter((value) => !/^[0-9a-f-]{36}$/i.test(value)));

type Breakers = Record<string, fc.Arbitrary<string | undefined>>;

/** A valid form with one field broken (or dropped): the field's own wrongness, never a value it accepts. */
function oneFieldBroken(valid: Record<string, string>, breakers: Breakers): fc.Arbitrary<Payload> {
  const names = Object.keys(breakers);
  return fc.constantFrom(...names).chain((name) =>
    breakers[name]!.map((value) => {
      const form = { ...valid };
      if (value === undefined) delete form[name];
      else form[name] = value;
      return { form };
    }),
  );
}

/** The same valid form, sent as something a form action cannot read. */
function wrongContentType(valid: Record<string, string>): fc.Arbitrary<Payload> {
  return fc.constantFrom<Payload>(
    { raw: JSON.stringify(valid), contentType: "application/json" },
    { raw: new URLSearchParams(valid).toString(), contentType: "text/plain" },
    { raw: "<form/>", contentType: "application/xml" },
    { raw: "--x\r\nbroken", contentType: "multipart/form-data" },
    { raw: "--nope\r\n\r\n", contentType: "multipart/form-data; boundary=elsewhere" },
  );
}

const missing = fc.constant(undefined);
const requiredText = (max: number) => fc.oneof(missing, fc.constantFrom("", "   "), huge(max), junkText);
/** A name or title: also refused when nothing in it is visible. */
const requiredName = (max: number) => fc.oneof(requiredText(max), invisibleText);
const optionalText = (max: number) => fc.oneof(huge(max), junkText);

const listingBreakers: Breakers = {
  units: unknownOf(["mm"]),
  category: fc.oneof(missing, unknownOf(["centre_lathe"])),
  make: requiredName(80),
  model: requiredName(80),
  year: fc.oneof(notANumber, fc.constantFrom("1849", "99999", "1987.5", "-1987", "Infinity")),
  serialNumber: optionalText(60),
  swingOverBed: badNumber(50, 5_000),
  distanceBetweenCentres: badNumber(100, 25_000),
  spindleBore: badNumber(5, 1_000),
  spindleNose: optionalText(60),
  supplyVoltage: fc.oneof(notANumber, fc.constantFrom("23", "1001", "400.5", "-400", "Infinity", "1e309", "0x190")),
  supplyPhases: unknownOf(["1", "3"]),
  supplyFrequency: unknownOf(["50", "60"]),
  spindleSpeedMin: badNumber(1, 100_000),
  spindleSpeedMax: badNumber(1, 100_000),
  tailstockTaper: optionalText(40),
  threadPitchMin: badNumber(0.05, 200),
  threadPitchMax: badNumber(0.05, 200),
  threadTpiMin: badNumber(0.5, 400),
  threadTpiMax: badNumber(0.5, 400),
  swingOverCrossSlide: badNumber(20, 4_000),
  footprintLength: badNumber(200, 40_000),
  footprintWidth: badNumber(200, 10_000),
  motorPower: badNumber(0.05, 500),
  weight: badNumber(10, 250_000),
  city: requiredName(80),
  region: optionalText(80),
  country: fc.oneof(missing, unknownOf([])).filter((value) => value === undefined || !/^[A-Z]{2}$/.test(value)),
  price: fc.oneof(missing, notANumber, fc.constantFrom("-1", "0", "1.234", "1e309", "60000000", "-Infinity", "0x10", "1e4", "0b101", "+5", "1 000")),
  currency: fc.oneof(missing, unknownOf(["EUR", "USD", "GBP", "CHF", "SEK", "NOK", "DKK", "PLN", "CZK"])),
  condition: fc.oneof(missing, unknownOf(["new", "used", "reconditioned", "for_parts", "rebuilt", "as_is"])),
  toolingIncluded: optionalText(2_000),
  description: fc.oneof(missing, fc.constantFrom("", "Too short.", "                                   "), huge(10_000), junkText.map((text) => `A lathe with a reground bed and new bearings. ${text}`)),
};

const malformedJson = fc.oneof(fc.constantFrom("{", "[1,", "{'form': 1}", "undefined", "\u0000", '{"form": }', "NaN"), fc.string({ maxLength: 20 }).filter((value) => {
  try {
    JSON.parse(value);
    return false;
  } catch {
    return true;
  }
}));
const wrongJsonShapes = fc.oneof(
  fc.constantFrom("null", "[]", "42", '"text"', "true", '{"form": null}', '{"form": []}', '{"form": {"units": "furlong"}}', '{"form": {"tests": {"L-SP-NOSE": {"kind": "sweep", "readings": ["NaN", "Infinity"]}}}}'),
  fc.jsonValue({ maxDepth: 2 }).map((value) => JSON.stringify({ form: value })).filter((text) => !text.includes('"profile"')),
);

const draft = () => `/inspector/bookings/${bookingId}/report`;

const targets: Target[] = [
  { route: "sell/new", path: () => "/sell/new", as: "seller", payloads: fc.oneof({ weight: 6, arbitrary: oneFieldBroken(validListingFields(tradeSpecFields), listingBreakers) }, wrongContentType(validListingFields())) },
  {
    route: "sell/listings/:listingId",
    path: () => `/sell/listings/${listingId}`,
    as: "seller",
    payloads: fc.oneof(
      { weight: 4, arbitrary: oneFieldBroken(validListingFields({ make: "Unchanged" }), listingBreakers) },
      oneFieldBroken({ intent: "photo-delete", photoId: randomUUID() }, { intent: unknownOf(["photo-delete", "photo-earlier", "photo-later", "photo-cover", "save", "publish", "withdraw", "mark-sold", "delete", "document-delete"]), photoId: notAUuid }),
      oneFieldBroken({ intent: "document-delete", documentId: randomUUID() }, { documentId: notAUuid }),
      oneFieldBroken({ intent: "photo-caption", photoId: randomUUID(), caption: "Bed ways at the chuck end" }, { caption: optionalText(160), photoId: notAUuid }),
      wrongContentType({ intent: "publish" }),
    ),
  },
  ...(["photos", "documents"] as const).map(
    (kind): Target => ({
      route: `sell/listings/:listingId/${kind}`,
      path: () => `/sell/listings/${listingId}/${kind}`,
      as: "seller",
      payloads: fc.oneof(
        oneFieldBroken(
          { intent: "presign", fileName: kind === "photos" ? "front.jpg" : "manual.pdf", size: "120000", contentType: kind === "photos" ? "image/jpeg" : "application/pdf" },
          {
            intent: unknownOf(["presign", "confirm"]),
            fileName: requiredText(255),
            size: fc.oneof(missing, notANumber, fc.constantFrom("-1", "0", "1e309", "99999999999", "1.5")),
            contentType: fc.oneof(missing, fc.constantFrom("image/svg+xml", "text/html", "application/x-msdownload", "image/gif", ""), huge(200)),
          },
        ),
        oneFieldBroken({ intent: "confirm", fileName: "front.jpg", uploadKey: `uploads/${randomUUID()}` }, { uploadKey: fc.oneof(missing, fc.constantFrom("", "../../../etc/passwd", "listings/other/photo.jpg", `uploads/${randomUUID()}`), huge(200)) }),
        wrongContentType({ intent: "presign", fileName: "a.jpg", size: "10", contentType: "image/jpeg" }),
      ),
    }),
  ),
  {
    route: "account",
    path: () => "/account",
    as: "buyer",
    payloads: fc.oneof(
      oneFieldBroken({ intent: "profile", name: "Mira Holt", displayUnits: "mm" }, { intent: unknownOf(["profile", "password", "seller"]), name: requiredName(100), displayUnits: fc.oneof(missing, unknownOf(["mm", "inch"])) }),
      oneFieldBroken(
        { intent: "password", currentPassword: "wrong-current-password", newPassword: "a new long password", confirmPassword: "a different one" },
        { newPassword: fc.oneof(missing, fc.constantFrom("", "short"), huge(128)), confirmPassword: fc.constant("does not match") },
      ),
      wrongContentType({ intent: "profile", name: "Mira Holt", displayUnits: "mm" }),
    ),
  },
  {
    route: "account/inspector",
    path: () => "/account/inspector",
    as: "buyer",
    payloads: fc.oneof(
      oneFieldBroken({ qualifications: "Toolmaker for twenty years", regions: "Westmarch", categories: "centre_lathe" }, { qualifications: requiredText(4_000), regions: fc.oneof(missing, fc.constantFrom("", ",,,"), huge(5_000)), categories: fc.oneof(missing, unknownOf(["centre_lathe", "milling_machine"])) }),
      wrongContentType({ qualifications: "x" }),
    ),
  },
  {
    route: "sign-up",
    path: () => "/sign-up",
    as: "visitor",
    payloads: oneFieldBroken(
      { name: "New person", email: `new-${randomUUID()}@example.test`, password: "a long enough password" },
      { name: requiredName(100), email: fc.oneof(missing, fc.constantFrom("", "no-at-sign", "a@", "@b", "a b@c.d"), huge(320), huge(1_000_000), junkText.map((text) => `a${text}@example.test`)), password: fc.oneof(missing, fc.constantFrom("", "short"), huge(128)) },
    ),
  },
  {
    route: "sign-in",
    path: () => "/sign-in",
    as: "visitor",
    payloads: oneFieldBroken(
      { email: "someone@example.test", password: "whatever it is" },
      { email: fc.oneof(missing, fc.constantFrom("", "not-an-address"), huge(320), huge(1_000_000), junkText.map((text) => `a${text}@example.test`)), password: fc.oneof(missing, fc.constant(""), huge(200)) },
    ),
  },
  { route: "forgot-password", path: () => "/forgot-password", as: "visitor", payloads: oneFieldBroken({ email: "x@example.test" }, { email: fc.oneof(missing, fc.constantFrom("", "nope", "a@"), huge(320)) }) },
  {
    route: "reset-password",
    path: () => "/reset-password",
    as: "visitor",
    payloads: oneFieldBroken({ token: "forged-token", password: "a new long password", confirmPassword: "a new long password" }, { token: fc.oneof(missing, fc.constant("")), password: fc.oneof(fc.constantFrom("", "short"), huge(128)) }),
  },
  {
    route: "machines/:slug",
    path: () => `/machines/${slug}`,
    as: "buyer",
    payloads: fc.oneof(
      oneFieldBroken({ intent: "watch", listingId: randomUUID() }, { intent: unknownOf(["watch", "unwatch", "inquire"]), listingId: notAUuid }),
      oneFieldBroken({ intent: "inquire", listingId: randomUUID(), message: "Is the quill free of play?" }, { message: fc.oneof(missing, fc.constantFrom("", "short"), huge(4_000), junkText.map((text) => `Is the quill free of play? ${text}`)), phone: fc.oneof(huge(40), junkText), listingId: notAUuid }),
    ),
  },
  {
    route: "account/saved-searches",
    path: () => "/account/saved-searches",
    as: "buyer",
    payloads: fc.oneof(
      oneFieldBroken({ intent: "save", name: "Long beds", queryString: "q=lathe" }, { intent: unknownOf(["save", "delete", "alerts"]), name: requiredName(120), queryString: fc.oneof(missing, huge(2_000), junkText) }),
      oneFieldBroken({ intent: "alerts", savedSearchId: randomUUID(), enabled: "on" }, { savedSearchId: notAUuid, enabled: fc.oneof(missing, unknownOf(["on", "off"])) }),
      fc.constant<Payload>({ form: { intent: "delete", savedSearchId: randomUUID() } }),
    ),
  },
  {
    route: "account/watched",
    path: () => "/account/watched",
    as: "buyer",
    payloads: fc.oneof(
      oneFieldBroken({ intent: "unwatch", listingId: randomUUID() }, { intent: unknownOf(["unwatch", "digest"]), listingId: notAUuid }),
      oneFieldBroken({ intent: "digest", enabled: "off" }, { enabled: fc.oneof(missing, unknownOf(["on", "off"])) }),
    ),
  },
  {
    route: "machines/:slug/book",
    path: () => `/machines/${slug}/book`,
    as: "buyer",
    payloads: oneFieldBroken({ inspectorId: `nobody-${randomUUID()}`, slotId: randomUUID(), acceptTerms: "on" }, { inspectorId: fc.oneof(missing, fc.constantFrom("", "nobody"), huge(100), junkText), slotId: fc.oneof(notAUuid, junkText), acceptTerms: fc.oneof(missing, fc.constantFrom("off", "")) }),
  },
  { route: "bookings/:bookingId", path: () => `/bookings/${bookingId}`, as: "buyer", payloads: fc.oneof(fc.oneof(huge(1_000), junkText).map((reason): Payload => ({ form: { reason } })), wrongContentType({ reason: "x" })) },
  {
    route: "bookings/:bookingId/visit",
    path: () => `/bookings/${bookingId}/visit`,
    as: "seller",
    payloads: fc.oneof(
      unknownOf(["site", "reschedule", "decide"]).map((intent): Payload => ({ form: { intent } })),
      oneFieldBroken(
        { intent: "site", streetAddress: "Quellweg 12, 15234 Brennwald", contactName: "Jo Ulm", contactPhone: "+49 30 1234 567", accessNotes: "Gate 2" },
        { streetAddress: requiredName(300), contactName: requiredName(120), contactPhone: fc.oneof(requiredName(40), fc.constantFrom("call me", "++", "0")), accessNotes: optionalText(1_000) },
      ),
      wrongContentType({ intent: "site", streetAddress: "Quellweg 12, 15234 Brennwald", contactName: "Jo Ulm", contactPhone: "+49 30 1234 567" }),
    ),
  },
  {
    route: "bookings/:bookingId/visit",
    path: () => `/bookings/${bookingId}/visit`,
    as: "buyer",
    payloads: fc.oneof(
      // A day long past, so that even the fields left whole are refused.
      oneFieldBroken(
        { intent: "reschedule", date: "2020-01-06", startTime: "09:00", durationMinutes: "240", reason: "" },
        { date: fc.oneof(missing, fc.constantFrom("", "2031-13-01", "tomorrow")), startTime: fc.oneof(missing, fc.constantFrom("25:00", "9", "")), durationMinutes: badNumber(120, 480), reason: optionalText(500) },
      ),
      oneFieldBroken({ intent: "decide", requestId: randomUUID(), decision: "accept" }, { requestId: fc.oneof(notAUuid, junkText), decision: fc.oneof(missing, unknownOf(["accept", "decline", "withdraw"])) }),
      wrongContentType({ intent: "reschedule", date: "2020-01-06", startTime: "09:00", durationMinutes: "240" }),
    ),
  },
  {
    route: "inspector/bookings/:bookingId",
    path: () => `/inspector/bookings/${bookingId}`,
    as: "inspector",
    payloads: fc.oneof(
      unknownOf(["accept", "decline"]).map((intent): Payload => ({ form: { intent } })),
      fc.oneof(missing, fc.constantFrom("", "no", "    "), huge(1_000), junkText).map((reason): Payload => ({ form: { intent: "decline", ...(reason === undefined ? {} : { reason }) } })),
      wrongContentType({ intent: "decline", reason: "Cannot travel that week" }),
    ),
  },
  {
    route: "inspector/profile",
    path: () => "/inspector/profile",
    as: "inspector",
    payloads: fc.oneof(
      unknownOf(["profile", "add-slot", "remove-slot", "certificate"]).map((intent): Payload => ({ form: { intent } })),
      oneFieldBroken({ intent: "add-slot", date: "2031-02-30", start: "25:00", hours: "4", repeatWeeks: "0" }, { date: fc.constantFrom("", "yesterday", "2031-13-01", "0000-00-00"), hours: badNumber(1, 12) }),
      oneFieldBroken({ intent: "remove-slot", slotId: randomUUID() }, { slotId: fc.oneof(notAUuid, junkText) }),
      fc.constant<Payload>({ form: { intent: "certificate" } }),
      oneFieldBroken({ intent: "profile", headline: "x", bio: "y" }, { headline: fc.oneof(huge(200), junkText, invisibleText), bio: fc.oneof(huge(5_000), junkText) }),
    ),
  },
  {
    route: "admin/payments",
    path: () => "/admin/payments",
    as: "admin",
    payloads: oneFieldBroken({ bookingId: randomUUID(), amount: "10", reason: "Goodwill" }, { amount: fc.oneof(missing, notANumber, fc.constantFrom("-10", "1e309", "10000000", "1.234", "Infinity", "0x10")), reason: fc.oneof(missing, fc.constant(""), huge(1_000), junkText) }),
  },
  {
    route: "admin/inspector-applications",
    path: () => "/admin/inspector-applications",
    as: "admin",
    payloads: fc.oneof(
      oneFieldBroken({ applicationId: randomUUID(), decision: "approve" }, { applicationId: fc.oneof(notAUuid, junkText), decision: fc.oneof(missing, unknownOf(["approve", "reject"])) }),
      junkText.map((reason): Payload => ({ form: { applicationId: randomUUID(), decision: "reject", reason: `Not enough ${reason}` } })),
    ),
  },
  {
    route: "admin/users",
    path: () => "/admin/users",
    as: "admin",
    payloads: fc.oneof(junkText, longInQuery(100)).map((q): Payload => ({ method: "GET", query: `?${new URLSearchParams({ q })}` })),
  },
  {
    route: "inspectors",
    path: () => "/inspectors",
    as: "visitor",
    payloads: fc.oneof(junkText, longInQuery(80)).map((region): Payload => ({ method: "GET", query: `?${new URLSearchParams({ region })}` })),
  },
  {
    route: "sell/listings/:listingId/rebuild",
    path: () => `/sell/listings/${listingId}/rebuild`,
    as: "seller",
    payloads: fc.oneof(
      malformedJson.map((form): Payload => ({ form: { intent: "save", form } })),
      wrongJsonShapes.map((body): Payload => ({ form: { intent: "publish", form: JSON.stringify((JSON.parse(body) as { form?: unknown } | null)?.form ?? null) } })),
      fc.constant<Payload>({ form: { intent: "save", form: JSON.stringify({ units: "mm", profile: { key: "centre-lathe-normal", version: 1 }, asFound: { tests: { "L-SP-NOSE": { kind: "sweep", readings: ["1e999", "0"] } } }, asRebuilt: {}, notes: "\u0000" }) } }),
      oneFieldBroken({ intent: "confirm-machine", otherListingId: randomUUID() }, { intent: unknownOf(["save", "publish", "confirm-machine", "refuse-machine", "split-machine"]), otherListingId: notAUuid }),
      wrongContentType({ intent: "save", form: "{}" }),
    ),
  },
  {
    // The inspector booked to visit the machine enters its rebuild record, instruments included.
    route: "sell/listings/:listingId/rebuild (the booked inspector)",
    path: () => `/sell/listings/${bookedListingId}/rebuild`,
    as: "inspector",
    payloads: fc.oneof(
      malformedJson.map((form): Payload => ({ form: { intent: "save", form } })),
      fc
        .record({ description: fc.oneof(junkText, loneSurrogateText, huge(400)), resolution: fc.oneof(junkText, fc.constantFrom("1e999", "-1", "NaN", "Infinity")), id: fc.oneof(junkText, huge(60)) })
        .chain((broken) =>
          fc.constantFrom<Array<keyof typeof broken>>(["description"], ["resolution"], ["id"]).map((fields): Payload => {
            const instrument: Record<string, string> = { id: "i1", kind: "dial-indicator", description: "Bench indicator", resolution: "1", calibrationDue: "" };
            for (const field of fields) instrument[field] = broken[field];
            return {
              form: {
                intent: "save",
                form: JSON.stringify({ units: "mm", profile: { key: "centre-lathe-normal", version: 1 }, instruments: [instrument], asFound: { tests: { "L-SP-NOSE": { kind: "sweep", readings: ["0", "4"], instrumentId: "i1" } } }, asRebuilt: {} }),
              },
            };
          }),
        ),
      fc.constant<Payload>({ form: { intent: "save", form: JSON.stringify({ units: "mm", profile: { key: "centre-lathe-normal", version: 1 }, instruments: Array.from({ length: 31 }, (_, i) => ({ id: `i${i}`, kind: "dial-indicator" })), asFound: {}, asRebuilt: {} }) } }),
      fc.constant<Payload>({ form: { intent: "save", form: JSON.stringify({ units: "mm", profile: { key: "centre-lathe-normal", version: 1 }, asFound: { tests: { "L-SP-NOSE": { kind: "sweep", readings: ["0", "4"], instrumentId: "nowhere" } } }, asRebuilt: {} }) } }),
      wrongContentType({ intent: "save", form: "{}" }),
    ),
  },
  {
    route: "inspector/bookings/:bookingId/report",
    path: draft,
    as: "inspector",
    payloads: fc.oneof(
      malformedJson.map((form): Payload => ({ form: { intent: "submit", form } })),
      wrongJsonShapes.map((body): Payload => ({ form: { intent: "submit", form: JSON.stringify((JSON.parse(body) as { form?: unknown } | null)?.form ?? null) } })),
      fc.constant<Payload>({ form: { intent: "submit", form: JSON.stringify({ ...completeForm(), units: "furlong" }) } }),
      wrongContentType({ intent: "submit", form: "{}" }),
    ),
  },
  {
    route: "inspector/bookings/:bookingId/report/draft",
    path: () => `${draft()}/draft`,
    as: "inspector",
    payloads: fc.oneof(
      malformedJson.map((json): Payload => ({ json })),
      wrongJsonShapes.map((json): Payload => ({ json })),
      fc.constant<Payload>({ raw: "form=1", contentType: "application/x-www-form-urlencoded" }),
      fc.constant<Payload>({ json: JSON.stringify({ form: { ...completeForm(), profile: { key: "no-such-profile", version: 99, reason: "" } } }) }),
      // Hostile text in each kind of text a draft holds; JSON carries lone surrogates as they are.
      fc
        .tuple(fc.oneof(junkText, loneSurrogateText, huge(2_000)), fc.constantFrom("notes", "conditions", "instrument", "reason", "testNotes", "testCode"))
        .map(([text, where]): Payload => {
          const form = completeForm() as ReturnType<typeof completeForm> & Record<string, unknown>;
          if (where === "notes") form.notes = text;
          else if (where === "conditions") form.conditions = { ...form.conditions, notes: text };
          else if (where === "instrument") form.instruments = [{ ...form.instruments[0]!, description: text }];
          else if (where === "reason") form.profile = { ...form.profile, reason: text };
          else if (where === "testNotes") form.tests = { ...form.tests, "L-SP-NOSE": { ...form.tests["L-SP-NOSE"], notes: text } };
          else form.tests = { ...form.tests, [text]: { kind: "sweep", readings: ["1"] } };
          return { json: JSON.stringify({ form }) };
        }),
      fc.constant<Payload>({ json: `{"form": ${JSON.stringify({ ...completeForm(), tests: {} }).replace('"tests":{}', '"tests":{"__proto__":{"kind":"sweep","readings":["1"]}}')}}` }),
      // Imported interferometer runs: a number too large for a double, text for a number, more targets than a report takes.
      fc
        .constantFrom(
          '{"targets":[0,1e400],"forward":[[0,1],[0,1]],"reverse":[[0,1],[0,1]]}',
          '{"targets":["0","100"],"forward":[[0,1],[0,1]],"reverse":[[0,1],[0,1]]}',
          `{"targets":[${Array.from({ length: 201 }, (_, i) => i).join(",")}],"forward":[],"reverse":[]}`,
          `{"targets":[0,1],"forward":[${Array.from({ length: 21 }, () => "[0,1]").join(",")}],"reverse":[[0,1],[0,1]]}`,
        )
        .map((runs): Payload => ({ json: `{"form": ${JSON.stringify({ ...completeForm(), tests: { "L-SP-NOSE": "RUNS" } }).replace('"RUNS"', `{"kind":"positioning","runs":${runs}}`)}}` })),
      // Imported radial deviations: a number too large for a double, more readings than a report takes.
      fc
        .constantFrom('{"clockwise":[{"angle":0,"deviation":1e400}],"counterClockwise":[]}', `{"clockwise":[${Array.from({ length: 721 }, (_, i) => `{"angle":${i / 2},"deviation":0}`).join(",")}],"counterClockwise":[]}`)
        .map((radial): Payload => ({ json: `{"form": ${JSON.stringify({ ...completeForm(), tests: { "L-SP-NOSE": "RADIAL" } }).replace('"RADIAL"', `{"kind":"circular","radial":${radial}}`)}}` })),

    ),
  },
  {
    route: "inspector/column-mapping",
    path: () => "/inspector/column-mapping",
    as: "inspector",
    payloads: fc.oneof(
      malformedJson.map((json): Payload => ({ json })),
      fc.jsonValue({ maxDepth: 2 }).map((value): Payload => ({ json: JSON.stringify(value) })),
      // One field of a good mapping made wrong: out of range, not an integer, a string, an unknown unit, too large for a double.
      fc
        .tuple(
          fc.constantFrom("run", "direction", "target", "deviation", "targetUnit", "deviationUnit", "decimalComma", "header", "extra"),
          fc.constantFrom<unknown>(-1, 50, 1.5, "2", null, "furlong", "\u0000", [], {}, "x".repeat(5_000)),
        )
        .map(([field, value]): Payload => ({ json: JSON.stringify({ run: 0, direction: 1, target: 2, deviation: 3, targetUnit: "mm", deviationUnit: "um", decimalComma: false, header: true, [field]: value }) })),
      fc.constant<Payload>({ json: '{"run": 1e400, "direction": 1, "target": 2, "deviation": 3, "targetUnit": "mm", "deviationUnit": "um", "decimalComma": false, "header": true}' }),
      fc.constant<Payload>({ raw: "run=0", contentType: "application/x-www-form-urlencoded" }),
    ),
  },
  {
    route: "inspector/bookings/:bookingId/report/photos",
    path: () => `${draft()}/photos`,
    as: "inspector",
    payloads: fc.oneof(
      oneFieldBroken(
        { intent: "presign", testCode: "L-SP-NOSE", fileName: "setup.jpg", size: "100000", contentType: "image/jpeg" },
        { intent: unknownOf(["presign", "confirm"]), testCode: fc.oneof(missing, fc.constant(""), huge(40)), size: fc.oneof(notANumber, fc.constantFrom("-5", "1e309", "99999999999")), contentType: fc.constantFrom("image/svg+xml", "text/html", "") },
      ),
      oneFieldBroken({ intent: "confirm", testCode: "L-SP-NOSE", uploadKey: `uploads/${randomUUID()}` }, { uploadKey: fc.oneof(fc.constantFrom("", "../../x", `uploads/${randomUUID()}`), huge(200)) }),
      wrongContentType({ intent: "presign" }),
    ),
  },
  {
    route: "inspector/bookings/:bookingId/report/review",
    path: () => `${draft()}/review`,
    as: "inspector",
    payloads: oneFieldBroken({ intent: "sign", reportId: randomUUID(), attest: "on" }, { intent: unknownOf(["sign"]), reportId: notAUuid, attest: fc.oneof(missing, fc.constantFrom("off", "yes", "")) }),
  },
  {
    route: "api/v1/evaluations",
    path: () => "/api/v1/evaluations",
    as: "visitor",
    payloads: fc.oneof(
      malformedJson.map((json): Payload => ({ json })),
      fc.oneof(
        fc.constantFrom("null", "[]", "42", '"x"', "{}", '{"profile": "centre-lathe-normal"}', '{"profile": {"key": "centre-lathe-normal", "version": 1}, "measurements": [{"code": "L-SP-NOSE", "readings": [NaN]}]}'),
        fc.jsonValue({ maxDepth: 3 }).map((value) => JSON.stringify(value)),
      ).map((json): Payload => ({ json })),
      fc.constant<Payload>({ raw: "profile=x", contentType: "application/x-www-form-urlencoded" }),
      fc
        .oneof(junkText, loneSurrogateText, fc.constant("__proto__"))
        .map((code): Payload => ({ json: `{"profile": {"key": "centre-lathe-normal", "version": 1}, "units": "mm", "measurements": {"tests": {${JSON.stringify(code)}: {"kind": "sweep", "readings": [0, 2]}}}}` })),
      fc.constant<Payload>({ json: "{}", method: "PUT" }),
      fc.constant<Payload>({ json: "{}", method: "DELETE" }),
    ),
  },
  {
    route: "api/v1/listings",
    path: () => "/api/v1/listings",
    as: "visitor",
    payloads: fc.oneof(
      fc.tuple(fc.constantFrom("q", "region"), fc.oneof(junkText, longInQuery(200))).map(([name, value]): Payload => ({ method: "GET", query: `?${new URLSearchParams({ [name]: value })}` })),
      fc
      .tuple(
        fc.constantFrom("priceMin", "priceMax", "swingMin", "swingMax", "runoutMax", "page", "sort", "category", "grade", "units", "verified", "after", "supply"),
        // Long, but within the 16 KB a request line may have (Node answers 431 beyond it).
        fc.oneof(notANumber, fc.constantFrom("-1", "Infinity", "NaN", "1e309", "unknown-value", "-0.5"), fc.integer({ min: 2_001, max: 8_000 }).map((length) => "9".repeat(length))),
      )
      .map(([name, value]): Payload => ({ method: "GET", query: `?${new URLSearchParams({ [name]: value })}` })),
    ),
  },
  {
    route: "compare",
    path: () => "/compare",
    as: "visitor",
    payloads: fc.oneof(
      // A machine's address that is not one: control characters, capitals, paths, too long.
      fc.oneof(junkText, longInQuery(120), fc.constantFrom("", "   ", "Halvorsen-ML", "../../etc/passwd", "a b", "slug--x", "-lead")).map((m): Payload => ({ method: "GET", query: `?${new URLSearchParams({ m })}` })),
      // More than four machines, or a flood of them.
      fc.integer({ min: 5, max: 60 }).map((count): Payload => ({ method: "GET", query: `?${Array.from({ length: count }, (_, n) => `m=machine-${n}`).join("&")}` })),
    ),
  },
  {
    route: "api/v1/reports/verify",
    path: () => "/api/v1/reports/verify",
    as: "visitor",
    payloads: fc.oneof(fc.constantFrom("", "abc", "zz".repeat(32), "A".repeat(65), "' or 1=1 --"), fc.integer({ min: 65, max: 8_000 }).map((length) => "a".repeat(length))).map((hash): Payload => ({ method: "GET", query: `?hash=${encodeURIComponent(hash)}` })),
  },
  {
    route: "api/webhooks/stripe",
    path: () => "/api/webhooks/stripe",
    as: "visitor",
    payloads: fc.oneof(malformedJson, fc.jsonValue({ maxDepth: 2 }).map((value) => JSON.stringify(value))).chain((json) =>
      fc.constantFrom<Payload>({ json }, { json, contentType: "application/json; stripe-signature=t=1,v1=forged" }),
    ),
  },
];

function hasText(value: unknown): boolean {
  if (typeof value === "string") return value.trim().length > 0;
  if (Array.isArray(value)) return value.some(hasText);
  if (value && typeof value === "object") return Object.values(value).some(hasText);
  return false;
}

/** A message the sender can read: JSON `errors`/`error`/`message`, a field error or error page on a page, or text. */
function carriesMessage(response: Response, text: string): boolean {
  const type = response.headers.get("content-type") ?? "";
  if (type.includes("json")) {
    try {
      const body = JSON.parse(text);
      if (typeof body === "string") return hasText(body);
      return hasText(body?.errors) || hasText(body?.error) || hasText(body?.message) || hasText(body?.formResult?.error) || hasText(body?.problem);
    } catch {
      return false;
    }
  }
  if (type.includes("html")) return shownOnPage(text) || inActionData(text);
  return text.trim().length > 0;
}

/** A field error (role="alert") or the error page's heading and explanation. */
function shownOnPage(html: string) {
  const main = /<main[^>]*>([\s\S]*?)<\/main>/.exec(html)?.[1] ?? "";
  return /role="alert"/.test(main) || /<h1[^>]*>[^<]*<\/h1><p class="mt-4[^"]*">[^<]{8,}<\/p>/.test(main);
}

/** The action's answer, streamed into the page, names the problem (the page may not show it: see hidden). */
function inActionData(html: string) {
  const stream = [...html.matchAll(/streamController\.enqueue\(("(?:[^"\\]|\\.)*")\)/g)].map((match) => JSON.parse(match[1]!) as string).join("");
  return /"actionData"/.test(stream) && /"(errors|error|formErrors|problem|message)"/.test(stream) && /"[A-Z][a-z]+ [^"]{3,}"/.test(stream);
}

/** Pages that answered a 4xx whose message is in the action data but nowhere on screen: for the owners to show. */
const hidden = new Map<string, number>();

async function send(target: Target, payload: Payload) {
  const cookie = cookies[target.as];
  const headers: Record<string, string> = { origin: testAppOrigin, accept: "text/html,application/json;q=0.9", ...(cookie ? { cookie } : {}) };
  let body: BodyInit | undefined;
  if (payload.form) {
    headers["content-type"] = "application/x-www-form-urlencoded";
    body = new URLSearchParams(payload.form);
  } else if (payload.json !== undefined) {
    headers["content-type"] = payload.contentType ?? "application/json";
    body = payload.json;
  } else if (payload.raw !== undefined) {
    headers["content-type"] = payload.contentType ?? "text/plain";
    body = payload.raw;
  }
  const method = payload.method ?? "POST";
  const response = await fetch(`${testAppOrigin}${target.path()}${payload.query ?? ""}`, { method, headers, body: method === "GET" ? undefined : body, redirect: "manual" });
  return { response, text: await response.text() };
}

const sent = { total: 0 };
afterAll(() => {
  console.log(`bad input: ${sent.total} payloads sent`);
  if (hidden.size) console.log(`answered with a message the page does not show: ${[...hidden].map(([route, count]) => `${route} (${count})`).join(", ")}`);
});

describe("bad input", () => {
  it.each(targets.map((target) => [target.route, target] as const))("%s: every wrong payload gets a 4xx with a message and changes nothing", async (_route, target) => {
    const before = await ownedRows();
    const problems: string[] = [];
    await fc.assert(
      fc.asyncProperty(target.payloads, async (payload) => {
        sent.total += 1;
        const { response, text } = await send(target, payload);
        const shown = `${JSON.stringify(payload).slice(0, 160)} → ${response.status} ${response.headers.get("location") ?? ""}`;
        if (!ACCEPTED.has(response.status)) problems.push(`${shown}: ${text.replace(/<[^>]+>/g, " ").replace(/\s+/g, " ").slice(0, 200)}`);
        else if (!carriesMessage(response, text)) problems.push(`${shown}: no message in ${response.headers.get("content-type")}: ${text.slice(0, 120)}`);
        else if ((response.headers.get("content-type") ?? "").includes("html") && !shownOnPage(text)) hidden.set(target.route, (hidden.get(target.route) ?? 0) + 1);
      }),
      { numRuns: RUNS, seed: Number(process.env.BAD_INPUT_SEED ?? Date.now() % 1_000_000) },
    );
    expect(problems).toEqual([]);
    expect(await ownedRows()).toEqual(before);
  });

  it("sent a few hundred payloads in all", () => {
    expect(sent.total).toBeGreaterThanOrEqual(300);
  });
});
