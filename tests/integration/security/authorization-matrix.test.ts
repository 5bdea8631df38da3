// Who may read and change what, for every route in app/routes.ts and every role. The table below is the
// specification: a route with no row fails the test, so a new route cannot land without saying who may use it.
//
// Outcomes: a number is the exact status; "sign-in" is a redirect to /sign-in; "→/path" is a redirect whose
// location starts with /path. Every refused change (403, 404, 405, 409, 4xx on someone else's object, or
// "sign-in") is also checked to have changed nothing: the rows it aimed at are read before and after.
import { randomUUID } from "node:crypto";
import { addDays, addHours } from "date-fns";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import routeConfig from "~/routes";
import { getDatabase } from "~/db/client.server";
import { acceptBooking, createBooking } from "~/modules/inspections/bookings.server";
import { bookings, inspectorSlots, machineSites } from "~/modules/inspections/schema";
import { listingDocuments, listingPhotos, listings, sellerPages } from "~/modules/listings/schema";
import { deviationColumnMappings, reportDrafts, reports } from "~/modules/reports/schema";
import { savedSearches } from "~/modules/search/saved-searches/schema";
import { createTestUser, signInCookie, testAppOrigin, type TestUser } from "../../support/accounts";
import { certifiedInspector, publicIdOf } from "../../support/inspections";
import { rebuildRecords } from "~/modules/rebuilds/schema";
import { machineListings, machineMatchRefusals } from "~/modules/machines/schema";
import { jpegWithGps } from "../../support/images";
import { createListingAs, uploadFileAs, validListingFields } from "../../support/listings";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

const db = getDatabase();

const ROLES = ["visitor", "buyer", "sellerA", "sellerB", "inspectorA", "inspectorB", "admin"] as const;
type Role = (typeof ROLES)[number];
type Outcome = number | "sign-in" | `→${string}`;
type PerRole = Record<Role, Outcome>;

/** Outcomes per role: `rest` fills every role not named. */
function by(outcomes: Partial<Record<Role | "rest", Outcome>>): PerRole {
  return Object.fromEntries(ROLES.map((role) => [role, outcomes[role] ?? outcomes.rest])) as PerRole;
}
const everyone = (outcome: Outcome) => by({ rest: outcome });

// ————— Fixtures: who the roles are, and the objects they own —————

type Fixture = {
  people: Record<Exclude<Role, "visitor">, TestUser>;
  cookies: Partial<Record<Role, string>>;
  publishedSlug: string;
  publishedListingId: string;
  draftListingId: string;
  draftSlug: string;
  draftPhotoId: string;
  photoKey: string;
  bookingId: string; // buyer's booking of inspector A on seller A's lathe, accepted: the report is being filed
  reportBookingId: string; // a second booking of the same three, with a signed report
  reportId: string;
  savedSearchId: string;
  freeSlotId: string; // inspector A's
  inspectorAPublicId: string;
  sellerAPageId: string;
};
let fx: Fixture;

async function waitForBookingStatus(bookingId: string, status: string) {
  const deadline = Date.now() + 10_000;
  while ((await db.select({ status: bookings.status }).from(bookings).where(eq(bookings.id, bookingId)))[0]?.status !== status) {
    if (Date.now() > deadline) throw new Error(`booking ${bookingId} did not reach ${status}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

// Slots of this file, five hours apart from three weeks out, so that no two overlap.
let slotsMade = 0;
async function newSlot(inspectorId: string) {
  const startsAt = addHours(addDays(new Date(), 21), 5 * slotsMade++);
  const [slot] = await db.insert(inspectorSlots).values({ inspectorId, startsAt, endsAt: addHours(startsAt, 4) }).returning();
  return slot!.id;
}

/** A booking by the buyer of inspector A for seller A's lathe, still awaiting payment (cancellable at no cost). */
async function heldBookingOfBuyer() {
  const slotId = await newSlot(fx.people.inspectorA.id);
  const { bookingId } = await createBooking(db, { booker: fx.people.buyer, listingSlug: fx.publishedSlug, inspectorId: fx.people.inspectorA.id, slotId });
  return bookingId;
}

async function paidAndAccepted(booker: TestUser, inspector: TestUser, slug: string) {
  const slotId = await newSlot(inspector.id);
  const { bookingId } = await createBooking(db, { booker, listingSlug: slug, inspectorId: inspector.id, slotId });
  const [booking] = await db.select().from(bookings).where(eq(bookings.id, bookingId));
  const pay = await fetch(`${process.env.STRIPE_STAND_IN_URL}/__stand-in/sessions/${booking!.checkoutSessionId}/pay`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ card_number: "4242 4242 4242 4242", expiry: "12/34", cvc: "123" }),
  });
  if (pay.status !== 200) throw new Error(`paying on the stand-in answered ${pay.status}`);
  await waitForBookingStatus(bookingId, "paid");
  await acceptBooking(db, inspector, bookingId);
  return bookingId;
}

beforeAll(async () => {
  const filed = await acceptedBooking();
  const people = {
    buyer: filed.buyer,
    sellerA: filed.seller,
    sellerB: await createTestUser({ roles: ["seller"], name: "Other dealer" }),
    inspectorA: filed.inspector,
    inspectorB: await certifiedInspector(),
    admin: await createTestUser({ roles: ["admin"], name: "Staff member" }),
  };
  const cookies: Partial<Record<Role, string>> = {};
  for (const [role, person] of Object.entries(people)) cookies[role as Role] = await signInCookie(person.email, person.password);

  const draftListingId = await createListingAs(cookies.sellerA!);
  const upload = await uploadFileAs(cookies.sellerA!, draftListingId, "photos", { bytes: await jpegWithGps(), name: "headstock.jpg", type: "image/jpeg" });
  if (upload.status !== 200) throw new Error(`fixture photo upload answered ${upload.status}`);
  const [photo] = await db.select().from(listingPhotos).where(eq(listingPhotos.listingId, draftListingId));
  const [draft] = await db.select().from(listings).where(eq(listings.id, draftListingId));

  const reportBookingId = await paidAndAccepted(people.buyer, people.inspectorA, filed.listing.slug);
  const report = await fileAndSign(await inspectorCookie(people.inspectorA), reportBookingId, completeForm());
  const [saved] = await db.insert(savedSearches).values({ userId: people.buyer.id, name: "Long beds", queryString: "betweenCentresMin=1000" }).returning();

  fx = {
    people,
    cookies,
    inspectorAPublicId: await publicIdOf(people.inspectorA.id),
    sellerAPageId: (await db.insert(sellerPages).values({ userId: people.sellerA.id }).onConflictDoUpdate({ target: sellerPages.userId, set: { userId: people.sellerA.id } }).returning())[0]!.publicId,
    publishedSlug: filed.listing.slug,
    publishedListingId: filed.listing.id,
    draftListingId,
    draftSlug: draft!.slug,
    draftPhotoId: photo!.id,
    photoKey: photo!.thumbnailKey,
    bookingId: filed.bookingId,
    reportBookingId,
    reportId: report.id,
    savedSearchId: saved!.id,
    freeSlotId: await newSlot(people.inspectorA.id),
  };
}, 120_000);

// ————— Snapshots of what a refused request must not change —————

const rowsOf = {
  listing: (id: string) => db.select().from(listings).where(eq(listings.id, id)),
  photos: (listingId: string) => db.select().from(listingPhotos).where(eq(listingPhotos.listingId, listingId)),
  documents: (listingId: string) => db.select().from(listingDocuments).where(eq(listingDocuments.listingId, listingId)),
  booking: (id: string) => db.select().from(bookings).where(eq(bookings.id, id)),
  reports: (bookingId: string) => db.select().from(reports).where(eq(reports.bookingId, bookingId)),
  drafts: (bookingId: string) => db.select().from(reportDrafts).where(eq(reportDrafts.bookingId, bookingId)),
  savedSearch: (id: string) => db.select().from(savedSearches).where(eq(savedSearches.id, id)),
  slot: (id: string) => db.select().from(inspectorSlots).where(eq(inspectorSlots.id, id)),
  site: (bookingId: string) =>
    db.select({ site: machineSites }).from(machineSites).innerJoin(bookings, eq(bookings.listingId, machineSites.listingId)).where(eq(bookings.id, bookingId)),
};

// ————— The table —————

type Params = Record<string, string>;
type Body = { form?: Record<string, string>; json?: unknown; raw?: string; contentType?: string };

type ActionRow = {
  /** What the request asks for (the form's intent, or what it is). */
  intent: string;
  body: (role: Role, params: Params) => Body | Promise<Body>;
  expect: PerRole;
  /** Other ids than the route's defaults, per role (e.g. a fresh object for a role allowed to destroy one). */
  params?: (role: Role) => Promise<Params> | Params;
  /** The rows a refused request must leave alone. */
  unchanged?: (params: Params) => Promise<unknown>;
  /** Signs the role in again first, for actions that end the session. */
  freshSession?: boolean;
  method?: "POST" | "PUT" | "PATCH" | "DELETE";
  query?: string;
};

type RouteRow = {
  get: PerRole;
  /** Other ids than the defaults for the GET, per role. */
  getParams?: (role: Role) => Params;
  query?: string;
  /** Routes with no action answer every POST with 405; "as above" is a second reading of a route whose actions have their row. */
  actions: ActionRow[] | "none" | "as above";
  /** What this row could not check as fully as it should, and why. */
  unverified?: string;
};

const allowedToEditListing = (role: Role) => role === "sellerA" || role === "admin";
const freshDraftFor = async (role: Role): Promise<Params> => (allowedToEditListing(role) ? { listingId: await createListingAs(fx.cookies.sellerA!) } : {});
const randomId = () => randomUUID();

const REFUSED_LISTING_EDIT = { visitor: "sign-in", buyer: 403, sellerB: 403, inspectorA: 403, inspectorB: 403 } as const;
const INSPECTOR_ONLY = { visitor: "sign-in", buyer: 403, sellerA: 403, sellerB: 403, admin: 403 } as const;
const STAFF_ONLY = { visitor: "sign-in", rest: 403, admin: 200 } as const;

const table: Record<string, RouteRow> = {
  "/": { get: everyone(200), actions: "none" },
  "how-scoring-works": { get: everyone(200), actions: "none" },

  // Accounts
  "sign-up": {
    get: by({ visitor: 200, rest: "→/account" }),
    actions: [{ intent: "sign up with a bad address", body: () => ({ form: { name: "Someone", email: "not-an-address", password: "long enough password" } }), expect: by({ visitor: 422, rest: "→/account" }) }],
  },
  "sign-in": {
    get: by({ visitor: 200, rest: "→/account" }),
    actions: [{ intent: "wrong password", body: () => ({ form: { email: `nobody-${randomId()}@example.test`, password: "not the password" } }), expect: by({ visitor: 401, rest: "→/account" }) }],
  },
  "sign-out": {
    get: everyone("→/"),
    actions: [{ intent: "sign out", body: () => ({ form: {} }), expect: everyone("→/"), freshSession: true }],
  },
  "forgot-password": {
    get: everyone(200),
    actions: [{ intent: "bad address", body: () => ({ form: { email: "nope" } }), expect: everyone(422) }],
  },
  "reset-password": {
    get: everyone(200),
    actions: [{ intent: "forged token", body: () => ({ form: { token: "forged", password: "a new long password", confirmPassword: "a new long password" } }), expect: everyone(400) }],
  },
  "verify-email": {
    get: by({ visitor: 200, rest: "→/account" }),
    actions: [{ intent: "send a new link", body: () => ({ form: {} }), expect: by({ visitor: "sign-in", rest: "→/account" }) }],
  },
  account: {
    get: by({ visitor: "sign-in", rest: 200 }),
    actions: [
      {
        intent: "profile (own name, unchanged)",
        body: (role) => ({ form: { intent: "profile", name: fx.people[role as Exclude<Role, "visitor">]?.name ?? "Visitor", displayUnits: "mm" } }),
        expect: by({ visitor: "sign-in", rest: 200 }),
      },
    ],
  },
  "account/inspector": {
    get: by({ visitor: "sign-in", rest: 200 }),
    actions: [{ intent: "apply with nothing filled in", body: () => ({ form: {} }), expect: by({ visitor: "sign-in", rest: 422 }) }],
  },

  // Staff
  "admin/users": { get: by(STAFF_ONLY), actions: "none" },
  "admin/inspector-applications": {
    get: by(STAFF_ONLY),
    actions: [{ intent: "decide with nothing chosen", body: () => ({ form: {} }), expect: by({ ...STAFF_ONLY, admin: 422 }) }],
  },

  "admin/inspector-demand": { get: by(STAFF_ONLY), actions: "none" },

  // Tolerance profiles: staff only; a published version cannot be edited (409), only drafted from.
  "admin/profiles": {
    get: by(STAFF_ONLY),
    actions: [{ intent: "draft from nothing chosen", body: () => ({ form: {} }), expect: by({ ...STAFF_ONLY, admin: 422 }) }],
  },
  "admin/profiles/:key/:version": {
    get: by(STAFF_ONLY),
    getParams: () => ({ key: "centre-lathe-normal", version: "1" }),
    actions: [
      {
        intent: "retire with no reason",
        params: () => ({ key: "centre-lathe-normal", version: "1" }),
        body: () => ({ form: { intent: "retire" } }),
        expect: by({ ...STAFF_ONLY, admin: 422 }),
      },
    ],
  },
  "admin/profiles/:key/:version/settings": {
    get: by({ ...STAFF_ONLY, admin: 409 }),
    getParams: () => ({ key: "centre-lathe-normal", version: "1" }),
    actions: [
      {
        intent: "change a published version's settings",
        params: () => ({ key: "centre-lathe-normal", version: "1" }),
        body: () => ({ form: {} }),
        expect: by({ ...STAFF_ONLY, admin: 409 }),
      },
    ],
  },
  "admin/profiles/:key/:version/tests/:code": {
    get: by({ ...STAFF_ONLY, admin: 409 }),
    getParams: () => ({ key: "centre-lathe-normal", version: "1", code: "L-SP-NOSE" }),
    actions: [
      {
        intent: "change a published version's test",
        params: () => ({ key: "centre-lathe-normal", version: "1", code: "L-SP-NOSE" }),
        body: () => ({ form: {} }),
        expect: by({ ...STAFF_ONLY, admin: 409 }),
      },
    ],
  },

  // Search
  machines: { get: everyone(200), query: "?verified=1&runoutMax=10", actions: "none" },
  "account/saved-searches": {
    get: by({ visitor: "sign-in", rest: 200 }),
    actions: [
      { intent: "save", body: () => ({ form: { intent: "save", name: "Matrix search", queryString: "q=lathe" } }), expect: by({ visitor: "sign-in", rest: 200 }) },
      {
        intent: "delete the buyer's saved search",
        params: async (role): Promise<Params> => (role === "buyer" ? { savedSearchId: (await db.insert(savedSearches).values({ userId: fx.people.buyer.id, name: "Spare", queryString: "" }).returning())[0]!.id } : {}),
        body: (_role, params) => ({ form: { intent: "delete", savedSearchId: params.savedSearchId ?? fx.savedSearchId } }),
        expect: by({ visitor: "sign-in", buyer: 200, rest: 404 }),
        unchanged: (params) => rowsOf.savedSearch(params.savedSearchId ?? fx.savedSearchId),
      },
      {
        intent: "alerts on, on the buyer's saved search",
        body: () => ({ form: { intent: "alerts", savedSearchId: fx.savedSearchId, enabled: "on" } }),
        expect: by({ visitor: "sign-in", buyer: 200, rest: 404 }),
        unchanged: () => rowsOf.savedSearch(fx.savedSearchId),
      },
    ],
  },
  "saved-searches/unsubscribe": {
    // A forged token finds nothing: the page says the link does not work, as a 404.
    get: everyone(404),
    query: "?token=forged",
    actions: [{ intent: "forged token", body: () => ({ form: { token: `${fx.savedSearchId}.forged` } }), expect: everyone(404), unchanged: () => rowsOf.savedSearch(fx.savedSearchId) }],
  },

  // Watchlist: everyone sees and changes only their own list
  "account/watched": {
    get: by({ visitor: "sign-in", rest: 200 }),
    actions: [
      { intent: "stop watching", body: () => ({ form: { intent: "unwatch", listingId: fx.publishedListingId } }), expect: by({ visitor: "sign-in", rest: 200 }) },
      { intent: "daily e-mail off", body: () => ({ form: { intent: "digest", enabled: "off" } }), expect: by({ visitor: "sign-in", rest: 200 }) },
    ],
  },
  "watched/unsubscribe": {
    get: everyone(404),
    query: "?token=forged",
    actions: [{ intent: "forged token", body: () => ({ form: { token: `${fx.people.buyer.id}.forged` } }), expect: everyone(404) }],
  },

  // Listings
  // Public comparison: only public listings are read, whoever asks (an empty one without machines).
  compare: { get: everyone(200), actions: "none" },
  "machines/:slug": {
    get: everyone(200),
    actions: [
      { intent: "watch", body: () => ({ form: { intent: "watch", listingId: fx.publishedListingId } }), expect: by({ visitor: "sign-in", rest: 200 }) },
      { intent: "unwatch", body: () => ({ form: { intent: "unwatch", listingId: fx.publishedListingId } }), expect: by({ visitor: "sign-in", rest: 200 }) },
      {
        intent: "ask the seller",
        body: () => ({ form: { intent: "inquire", listingId: fx.publishedListingId, message: "Is the tailstock quill free of play along its whole travel?" } }),
        expect: by({ visitor: "sign-in", sellerA: 422, rest: 200 }),
      },
    ],
  },
  // A seller's public page, by its own public id: anyone may read it; an unknown id is 404 below.
  "sellers/:publicId": { get: everyone(200), actions: "none" },
  "machines/:slug (a draft)": {
    get: by({ rest: 404, sellerA: 200, admin: 200 }),
    getParams: () => ({ slug: fx.draftSlug }),
    actions: "as above",
  },
  sell: { get: everyone(200), actions: "none" },
  "sell/new": {
    get: by({ visitor: "sign-in", rest: 403, sellerA: 200, sellerB: 200, admin: 200 }),
    actions: [{ intent: "save a new draft", body: () => ({ form: validListingFields() }), expect: by({ visitor: "sign-in", rest: 403, sellerA: "→/sell/listings/", sellerB: "→/sell/listings/", admin: "→/sell/listings/" }) }],
  },
  "sell/listings/:listingId": {
    get: by({ ...REFUSED_LISTING_EDIT, sellerA: 200, admin: 200 }),
    actions: [
      {
        intent: "save",
        body: () => ({ form: validListingFields({ make: "Overwritten", price: "1" }) }),
        params: freshDraftFor,
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: "→/sell/listings/", admin: "→/sell/listings/" }),
        unchanged: () => rowsOf.listing(fx.draftListingId),
      },
      ...(["publish", "withdraw", "mark-sold"] as const).map(
        (intent): ActionRow => ({
          intent,
          body: () => ({ form: { intent } }),
          // The owner's fresh draft has no photo and has never been published: the rules refuse, after the owner check.
          params: freshDraftFor,
          expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 422, admin: 422 }),
          unchanged: () => rowsOf.listing(fx.draftListingId),
        }),
      ),
      {
        intent: "delete",
        body: () => ({ form: { intent: "delete" } }),
        params: freshDraftFor,
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: "→/sell", admin: "→/sell" }),
        unchanged: () => rowsOf.listing(fx.draftListingId),
      },
      ...(["photo-delete", "photo-cover", "photo-later"] as const).map(
        (intent): ActionRow => ({
          intent,
          params: async (role) => (allowedToEditListing(role) ? { ...(await freshDraftFor(role)), photoId: randomId() } : { photoId: fx.draftPhotoId }),
          body: (_role, params) => ({ form: { intent, photoId: params.photoId! } }),
          // The owner names a photo the listing does not have.
          expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 404, admin: 404 }),
          unchanged: () => rowsOf.photos(fx.draftListingId),
        }),
      ),
      {
        intent: "document-delete",
        body: () => ({ form: { intent: "document-delete", documentId: randomId() } }),
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 404, admin: 404 }),
        unchanged: () => rowsOf.documents(fx.draftListingId),
      },
    ],
  },
  "sell/listings/:listingId/rebuild": {
    get: by({ ...REFUSED_LISTING_EDIT, sellerA: 200, admin: 200 }),
    actions: [
      {
        intent: "save a rebuild draft",
        body: () => ({
          form: {
            intent: "save",
            form: JSON.stringify({ units: "mm", profile: { key: "centre-lathe-normal", version: 1 }, asFound: { measuredOn: "", tests: { "L-SP-NOSE": { kind: "sweep", readings: ["0", "4"] } } }, asRebuilt: {}, notes: "Overwritten" }),
          },
        }),
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 200, admin: 200 }),
        unchanged: (params) => db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, params.listingId ?? fx.draftListingId)),
      },
    ],
  },
  // The same page on the published lathe that inspector A is booked to visit: they may enter its rebuild record
  // (shown as entered by them), but matching the machine across listings stays the seller's and staff's.
  "sell/listings/:listingId/rebuild (listing an inspector is booked on)": {
    get: by({ ...REFUSED_LISTING_EDIT, sellerA: 200, admin: 200, inspectorA: 200 }),
    getParams: () => ({ listingId: fx.publishedListingId }),
    actions: [
      {
        intent: "save a rebuild draft",
        params: () => ({ listingId: fx.publishedListingId }),
        body: () => ({
          form: {
            intent: "save",
            form: JSON.stringify({ units: "mm", profile: { key: "centre-lathe-normal", version: 1 }, asFound: { measuredOn: "", tests: { "L-SP-NOSE": { kind: "sweep", readings: ["0", "4"] } } }, asRebuilt: {} }),
          },
        }),
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 200, admin: 200, inspectorA: 200 }),
        unchanged: () => db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, fx.publishedListingId)),
      },
      {
        intent: "confirm-machine",
        params: () => ({ listingId: fx.publishedListingId }),
        body: () => ({ form: { intent: "confirm-machine", otherListingId: fx.draftListingId } }),
        // The owner and staff name a listing that is no suggested match (a draft is never suggested).
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 422, admin: 422 }),
        unchanged: () => db.select().from(machineListings).where(eq(machineListings.listingId, fx.publishedListingId)),
      },
      {
        intent: "refuse-machine",
        params: () => ({ listingId: fx.publishedListingId }),
        body: () => ({ form: { intent: "refuse-machine", otherListingId: randomId() } }),
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 404, admin: 404 }),
        unchanged: () => db.select().from(machineMatchRefusals).where(eq(machineMatchRefusals.listingId, fx.publishedListingId)),
      },
      {
        intent: "split-machine",
        params: () => ({ listingId: fx.publishedListingId }),
        body: () => ({ form: { intent: "split-machine" } }),
        // Staff only; this listing is linked to no machine, so there is nothing to split.
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 403, admin: 422 }),
        unchanged: () => db.select().from(machineListings).where(eq(machineListings.listingId, fx.publishedListingId)),
      },
    ],
  },
  // React Router answers a GET of a resource route with no loader 400.
  "sell/listings/:listingId/photos": {
    get: everyone(400),
    actions: [
      {
        intent: "presign",
        body: () => ({ form: { intent: "presign", fileName: "front.jpg", size: "120000", contentType: "image/jpeg" } }),
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 200, admin: 200 }),
        unchanged: () => rowsOf.photos(fx.draftListingId),
      },
    ],
  },
  "sell/listings/:listingId/documents": {
    get: everyone(400),
    actions: [
      {
        intent: "presign",
        body: () => ({ form: { intent: "presign", fileName: "manual.pdf", size: "120000", contentType: "application/pdf" } }),
        expect: by({ ...REFUSED_LISTING_EDIT, sellerA: 200, admin: 200 }),
        unchanged: () => rowsOf.documents(fx.draftListingId),
      },
    ],
  },

  // Inspections
  inspectors: { get: everyone(200), actions: "none" },
  "inspectors/:inspectorId": { get: everyone(200), actions: "none" },
  "inspectors/:inspectorId/certificate": {
    get: everyone(404),
    actions: "none",
    unverified: "inspector A has uploaded no certificate, so every role gets 404; the PDF is public once uploaded.",
  },
  "machines/:slug/book": {
    get: everyone(200),
    actions: [{ intent: "book with nothing chosen", body: () => ({ form: {} }), expect: by({ visitor: "sign-in", rest: 422 }) }],
  },
  bookings: { get: by({ visitor: "sign-in", rest: 200 }), actions: "none" },
  "bookings/:bookingId": {
    get: by({ visitor: "sign-in", buyer: 200, sellerA: 200, inspectorA: 200, admin: 200, rest: 403 }),
    actions: [
      {
        intent: "cancel",
        params: async (role): Promise<Params> => (role === "buyer" ? { bookingId: await heldBookingOfBuyer() } : {}),
        body: () => ({ form: { reason: "Matrix check" } }),
        expect: by({ visitor: "sign-in", buyer: 200, rest: 404 }),
        unchanged: () => rowsOf.booking(fx.bookingId),
      },
    ],
  },
  // The visit's logistics: the seller gives the site, the buyer and the inspector move the visit; others are not parties.
  "bookings/:bookingId/visit": {
    get: everyone(405),
    actions: [
      {
        intent: "save the machine's site",
        body: () => ({ form: { intent: "site", streetAddress: "Werkstrasse 4, 15234 Brennwald", contactName: "Jo Ulm", contactPhone: "+49 30 1234 567", accessNotes: "Gate 2" } }),
        expect: by({ visitor: "sign-in", sellerA: 200, buyer: 403, inspectorA: 403, admin: 403, rest: 404 }),
        unchanged: () => rowsOf.site(fx.bookingId),
      },
      {
        intent: "propose a time in the past",
        body: () => ({ form: { intent: "reschedule", date: "2020-01-06", startTime: "09:00", durationMinutes: "240" } }),
        expect: by({ visitor: "sign-in", buyer: 422, inspectorA: 422, sellerA: 403, admin: 403, rest: 404 }),
        unchanged: () => rowsOf.booking(fx.bookingId),
      },
      {
        intent: "answer a request that does not exist",
        body: () => ({ form: { intent: "decide", requestId: randomUUID(), decision: "accept" } }),
        expect: by({ visitor: "sign-in", buyer: 404, inspectorA: 404, sellerA: 403, admin: 403, rest: 404 }),
        unchanged: () => rowsOf.booking(fx.bookingId),
      },
    ],
  },
  "bookings/:bookingId/visit.ics": {
    get: by({ visitor: "sign-in", buyer: 200, sellerA: 200, inspectorA: 200, admin: 200, rest: 404 }),
    actions: "none",
  },
  "bookings/:bookingId/paid": {
    get: by({ visitor: "sign-in", buyer: 200, rest: 403 }),
    actions: "none",
  },
  "bookings/:bookingId/checkout-cancelled": {
    get: by({ visitor: "sign-in", buyer: "→/bookings/", rest: 403 }),
    actions: [
      {
        intent: "leave checkout",
        params: async (role): Promise<Params> => (role === "buyer" ? { bookingId: await heldBookingOfBuyer() } : {}),
        body: () => ({ form: {} }),
        // Seller A, inspector A and staff may see the booking but are not its buyer.
        expect: by({ visitor: "sign-in", buyer: "→/machines/", sellerA: 404, inspectorA: 404, admin: 404, rest: 403 }),
        unchanged: () => rowsOf.booking(fx.bookingId),
      },
    ],
  },
  "inspector/profile": {
    get: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 200 }),
    actions: [
      { intent: "profile with nothing filled in", body: () => ({ form: { intent: "profile" } }), expect: by({ ...INSPECTOR_ONLY, inspectorA: 422, inspectorB: 422 }) },
      { intent: "add a slot with no time", body: () => ({ form: { intent: "add-slot" } }), expect: by({ ...INSPECTOR_ONLY, inspectorA: 422, inspectorB: 422 }) },
      {
        intent: "remove inspector A's free slot",
        params: async (role) => ({ slotId: role === "inspectorA" ? await newSlot(fx.people.inspectorA.id) : fx.freeSlotId }),
        body: (_role, params) => ({ form: { intent: "remove-slot", slotId: params.slotId! } }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 404 }),
        unchanged: () => rowsOf.slot(fx.freeSlotId),
      },
    ],
  },
  "inspector/bookings": { get: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 200 }), actions: "none" },
  "inspector/bookings/:bookingId": {
    get: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 403 }),
    actions: [
      // Accepting an accepted booking changes nothing: inspector A may, and gets 200.
      { intent: "accept", body: () => ({ form: { intent: "accept" } }), expect: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 404 }), unchanged: () => rowsOf.booking(fx.bookingId) },
      {
        intent: "decline",
        body: (role) => ({ form: { intent: "decline", reason: role === "inspectorA" ? "" : "Someone else's request" } }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: 422, inspectorB: 404 }),
        unchanged: () => rowsOf.booking(fx.bookingId),
      },
    ],
  },
  // The way from the booking to its machine's rebuild record: only for the inspector whose visit it is.
  "inspector/bookings/:bookingId/rebuild": { get: by({ ...INSPECTOR_ONLY, inspectorA: "→/sell/listings/", inspectorB: 404 }), actions: "none" },
  "admin/payments": {
    get: by(STAFF_ONLY),
    actions: [
      {
        intent: "refund",
        body: () => ({ form: { bookingId: fx.bookingId, amount: "-1", reason: "Matrix check" } }),
        // Staff reach the refund rules (a refund of an accepted booking by hand is checked in the inspections tests).
        expect: by({ ...STAFF_ONLY, admin: 422 }),
        unchanged: () => rowsOf.booking(fx.bookingId),
      },
    ],
  },

  // Payouts and money: the inspector's own earnings, the buyer's own receipts (staff may read any receipt).
  "inspector/payouts/return": { get: by({ ...INSPECTOR_ONLY, inspectorA: "→/inspector/profile", inspectorB: "→/inspector/profile" }), actions: "none" },
  // A fresh onboarding link at the payments provider (the stand-in, on loopback).
  "inspector/payouts/refresh": { get: by({ ...INSPECTOR_ONLY, inspectorA: "→http://127.0.0.1", inspectorB: "→http://127.0.0.1" }), actions: "none" },
  "inspector/earnings": { get: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 200 }), actions: "none" },
  "inspector/earnings/statements/:file": {
    get: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 200 }),
    getParams: () => ({ file: "2026-01-eur.csv" }),
    actions: "none",
  },
  "bookings/:bookingId/receipts/:file": {
    get: by({ visitor: "sign-in", rest: 404, buyer: 200, admin: 200 }),
    getParams: () => ({ file: "payment.pdf" }),
    actions: "none",
  },

  // Accuracy reports
  "inspector/bookings/:bookingId/report": {
    get: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 404 }),
    actions: [
      {
        intent: "submit",
        body: (role) => ({ form: { intent: "submit", form: JSON.stringify(role === "inspectorA" ? { units: "mm" } : completeForm()) } }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: 422, inspectorB: 404 }),
        unchanged: () => rowsOf.reports(fx.bookingId),
      },
    ],
  },
  "inspector/bookings/:bookingId/report/draft": {
    get: everyone(405),
    actions: [
      {
        intent: "save the draft",
        body: () => ({ json: { form: completeForm() } }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 404 }),
        unchanged: () => rowsOf.drafts(fx.bookingId),
      },
    ],
  },
  // The inspector's own column mapping for instrument tables: each inspector saves only their own.
  "inspector/column-mapping": {
    get: everyone(405),
    actions: [
      {
        intent: "save a column mapping",
        body: () => ({ json: { run: 0, direction: 1, target: 2, deviation: 3, targetUnit: "mm", deviationUnit: "um", decimalComma: false, header: true } }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 200 }),
        unchanged: () => db.select().from(deviationColumnMappings),
      },
    ],
  },
  "inspector/bookings/:bookingId/report/photos": {
    get: everyone(405),
    actions: [
      {
        intent: "presign a set-up photo",
        body: () => ({ form: { intent: "presign", testCode: "L-SP-NOSE", fileName: "setup.jpg", size: "100000", contentType: "image/jpeg" } }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: 200, inspectorB: 404 }),
        unchanged: () => rowsOf.reports(fx.bookingId),
      },
    ],
  },
  "inspector/bookings/:bookingId/report/review": {
    get: by({ ...INSPECTOR_ONLY, inspectorA: "→/inspector/bookings/", inspectorB: 404 }),
    actions: [
      {
        intent: "sign the signed report again",
        params: () => ({ bookingId: fx.reportBookingId }),
        body: () => ({ form: { intent: "sign", reportId: fx.reportId, attest: "on" } }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: 409, inspectorB: 404 }),
        unchanged: () => rowsOf.reports(fx.reportBookingId),
      },
    ],
  },
  "inspector/reports/:reportId/correct": {
    get: everyone(405),
    actions: [
      {
        intent: "start a correction",
        body: () => ({ form: {} }),
        expect: by({ ...INSPECTOR_ONLY, inspectorA: "→/inspector/bookings/", inspectorB: 404 }),
        unchanged: () => rowsOf.drafts(fx.reportBookingId),
      },
    ],
  },
  "reports/verify": { get: everyone(200), actions: "none" },
  "reports/photos/:photoId/:variant": {
    get: everyone(404),
    actions: "none",
    unverified: "checked with an unknown photo id only: the signed fixture report has no set-up photo.",
  },
  "reports/:reportId": { get: everyone(200), actions: "none" },
  "reports/:reportId/certificate.pdf": { get: everyone(200), actions: "none" },

  // Files: processed photos and checked PDFs under unguessable ids; whoever has the address may fetch it.
  "tools/corrections": { get: by({ visitor: "sign-in", buyer: 403, rest: 200 }), actions: "none" },
  "files/*": { get: everyone(200), actions: "none" },

  // API
  "api/health": { get: everyone(200), actions: "none" },
  "api/auth/*": {
    get: everyone(200),
    getParams: () => ({ "*": "get-session" }),
    actions: [
      {
        intent: "sign in with a wrong password",
        params: () => ({ "*": "sign-in/email" }),
        body: () => ({ json: { email: `nobody-${randomId()}@example.test`, password: "not the password" } }),
        expect: everyone(401),
      },
    ],
  },
  "api/v1/evaluations": {
    get: everyone(405),
    actions: [{ intent: "score nothing", body: () => ({ json: {} }), expect: everyone(422) }],
  },
  "api/v1/listings": { get: everyone(200), query: "?q=lathe", actions: "none" },
  "api/v1/reports/verify": {
    get: everyone(400),
    query: "?hash=not-a-hash",
    actions: [{ intent: "any change", body: () => ({ json: {} }), expect: everyone(405) }],
  },
  "api/v1/reports/:reportId": {
    get: everyone(200),
    actions: [{ intent: "any change", body: () => ({ json: {} }), expect: everyone(405), unchanged: () => rowsOf.reports(fx.reportBookingId) }],
  },
  "api/v1/reports/:reportId/credential": {
    get: everyone(200),
    actions: [{ intent: "any change", body: () => ({ json: {} }), expect: everyone(405), unchanged: () => rowsOf.reports(fx.reportBookingId) }],
  },
  ".well-known/did.json": { get: everyone(200), actions: "none" },
  "api/webhooks/stripe": {
    get: everyone(405),
    actions: [{ intent: "unsigned event", body: () => ({ json: { type: "checkout.session.completed" } }), expect: everyone(400), unchanged: () => rowsOf.booking(fx.bookingId) }],
  },
};

// ————— Reading app/routes.ts —————

type RouteEntry = { path?: string; index?: boolean; children?: RouteEntry[] };

function routePaths(entries: RouteEntry[], prefix = ""): string[] {
  return entries.flatMap((entry) => {
    const own = entry.index ? prefix || "/" : entry.path !== undefined ? [prefix, entry.path].filter(Boolean).join("/") : prefix;
    const here = entry.index || entry.path !== undefined ? [own || "/"] : [];
    return [...here, ...(entry.children ? routePaths(entry.children, own) : [])];
  });
}

const declaredRoutes = routePaths(routeConfig as unknown as RouteEntry[]);

function defaultParams(): Params {
  return {
    slug: fx.publishedSlug,
    listingId: fx.draftListingId,
    inspectorId: fx.inspectorAPublicId,
    publicId: fx.sellerAPageId,
    bookingId: fx.bookingId,
    reportId: fx.reportId,
    photoId: randomId(),
    variant: "thumb",
    file: "payment.pdf",
    "*": fx.photoKey,
  };
}

function urlOf(pattern: string, params: Params, query = "") {
  const path = pattern === "/" ? "/" : `/${pattern.replace(/ \(.*\)$/, "")}`;
  const filled = path.replace(/:([A-Za-z]+)/g, (_, name: string) => encodeURIComponent(params[name] ?? "")).replace("*", params["*"] ?? "");
  return `${testAppOrigin}${filled}${query}`;
}

async function cookieFor(role: Role, fresh = false) {
  if (role === "visitor") return undefined;
  if (!fresh) return fx.cookies[role];
  const person = fx.people[role];
  return signInCookie(person.email, person.password);
}

/** The words of an answer, for a failure message: a page's main text, or the body as it is. */
function gist(text: string) {
  const main = /<main[^>]*>([\s\S]*?)<\/main>/.exec(text)?.[1] ?? text;
  return main.replace(/<[^>]+>/g, " ").replace(/\s+/g, " ").trim().slice(0, 200);
}

function describeOutcome(response: Response): string {
  const location = response.headers.get("location");
  return location ? `${response.status} → ${location}` : String(response.status);
}

function matches(response: Response, outcome: Outcome) {
  const location = response.headers.get("location") ?? "";
  const redirected = response.status >= 300 && response.status < 400;
  if (outcome === "sign-in") return redirected && location.startsWith("/sign-in");
  if (typeof outcome === "string") return redirected && location.startsWith(outcome.slice(1));
  return response.status === outcome;
}

const isRefusal = (outcome: Outcome) => outcome === "sign-in" || (typeof outcome === "number" && outcome >= 400);

async function send(url: string, method: string, role: Role, body: Body | undefined, fresh = false) {
  const cookie = await cookieFor(role, fresh);
  const headers: Record<string, string> = { origin: testAppOrigin, ...(cookie ? { cookie } : {}) };
  let payload: BodyInit | undefined;
  if (body?.json !== undefined) {
    headers["content-type"] = "application/json";
    payload = JSON.stringify(body.json);
  } else if (body?.form) {
    headers["content-type"] = "application/x-www-form-urlencoded";
    payload = new URLSearchParams(body.form);
  } else if (body?.raw !== undefined) {
    headers["content-type"] = body.contentType ?? "text/plain";
    payload = body.raw;
  }
  const response = await fetch(url, { method, headers, body: payload, redirect: "manual" });
  const text = await response.text();
  return { response, text };
}

describe("the authorization matrix", () => {
  it("has a row for every route in app/routes.ts, and no row for a route that is gone", () => {
    const rows = new Set(Object.keys(table).map((key) => key.replace(/ \(.*\)$/, "")));
    expect(declaredRoutes.filter((path) => !rows.has(path)), "routes with no row in the matrix").toEqual([]);
    expect([...rows].filter((path) => !declaredRoutes.includes(path)), "rows for routes that no longer exist").toEqual([]);
  });

  it("gives each role exactly the expected answer to reading each route", async () => {
    const unexpected: string[] = [];
    for (const [pattern, row] of Object.entries(table)) {
      for (const role of ROLES) {
        const url = urlOf(pattern, { ...defaultParams(), ...row.getParams?.(role) }, row.query);
        const { response, text } = await send(url, "GET", role, undefined);
        if (response.status >= 500) unexpected.push(`GET ${pattern} as ${role}: ${response.status} ${gist(text)}`);
        else if (!matches(response, row.get[role])) unexpected.push(`GET ${pattern} as ${role}: expected ${row.get[role]}, got ${describeOutcome(response)}`);
      }
    }
    expect(unexpected).toEqual([]);
    // Every route as every role: under a loaded machine this takes far longer than one request's budget.
  }, 120_000);

  it("gives each role exactly the expected answer to each action, and a refused one changes nothing", async () => {
    const unexpected: string[] = [];
    for (const [pattern, row] of Object.entries(table)) {
      if (row.actions === "as above") continue;
      const actions: ActionRow[] =
        row.actions === "none" ? [{ intent: "(no action: any POST)", body: () => ({ form: { intent: "anything" } }), expect: everyone(405) }] : row.actions;
      for (const action of actions) {
        for (const role of ROLES) {
          const params = { ...defaultParams(), ...(await action.params?.(role)) };
          const outcome = action.expect[role];
          const before = isRefusal(outcome) ? await action.unchanged?.(params) : undefined;
          const url = urlOf(pattern, params, action.query ?? row.query);
          const { response, text } = await send(url, action.method ?? "POST", role, await action.body(role, params), action.freshSession);
          const label = `${action.method ?? "POST"} ${pattern} [${action.intent}] as ${role}`;
          if (response.status >= 500) unexpected.push(`${label}: ${response.status} ${gist(text)}`);
          else if (!matches(response, outcome)) unexpected.push(`${label}: expected ${outcome}, got ${describeOutcome(response)}: ${gist(text)}`);
          if (before !== undefined) {
            const after = await action.unchanged!(params);
            if (JSON.stringify(after) !== JSON.stringify(before)) unexpected.push(`${label}: refused, yet changed ${JSON.stringify(before).slice(0, 200)} → ${JSON.stringify(after).slice(0, 200)}`);
          }
        }
      }
    }
    expect(unexpected).toEqual([]);
  }, 240_000);
});
