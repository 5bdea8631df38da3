// Meeting at the machine: the seller's private site details reach the booking's parties and nobody else,
// the calendar file, and moving the visit by request and answer.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { bookingEvents, bookings, rescheduleRequests } from "~/modules/inspections/schema";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { latestEmailTo } from "../../support/mailbox";
import { acceptedBooking, db } from "../../support/reports";

function post(cookie: string, bookingId: string, form: Record<string, string>) {
  return fetch(`${testAppOrigin}/bookings/${bookingId}/visit`, {
    method: "POST",
    headers: { cookie, origin: testAppOrigin, "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams(form),
    redirect: "manual",
  });
}

const get = (cookie: string | null, path: string) => fetch(`${testAppOrigin}${path}`, { headers: cookie ? { cookie } : {}, redirect: "manual" });

async function withSite() {
  const booked = await acceptedBooking();
  const street = `Quellweg${randomUUID().slice(0, 6)}`;
  const cookies = {
    seller: await signInCookie(booked.seller.email, booked.seller.password),
    buyer: await signInCookie(booked.buyer.email, booked.buyer.password),
    inspector: await signInCookie(booked.inspector.email, booked.inspector.password),
  };
  const saved = await post(cookies.seller, booked.bookingId, {
    intent: "site",
    streetAddress: `${street} 12\n15234 Brennwald`,
    contactName: "Jo Ulm",
    contactPhone: "+49 30 1234 567",
    accessNotes: "Loading dock at the back; 07:00–15:00, ask at the gate.",
  });
  expect(saved.status).toBe(200);
  return { booked, street, cookies };
}

describe("the machine's site details", () => {
  it("reach the buyer and the inspector of the accepted booking, in the page and the calendar file", async () => {
    const { booked, street, cookies } = await withSite();
    for (const [cookie, path] of [
      [cookies.buyer, `/bookings/${booked.bookingId}`],
      [cookies.inspector, `/inspector/bookings/${booked.bookingId}`],
    ] as const) {
      const page = await get(cookie, path);
      expect(page.status).toBe(200);
      const html = await page.text();
      expect(html).toContain(street);
      expect(html).toContain("Loading dock at the back");
    }
    const calendar = await get(cookies.buyer, `/bookings/${booked.bookingId}/visit.ics`);
    expect(calendar.status).toBe(200);
    expect(calendar.headers.get("content-type")).toMatch(/^text\/calendar/);
    expect(calendar.headers.get("cache-control")).toContain("no-store");
    const body = (await calendar.text()).replace(/\r\n[ \t]/g, "");
    expect(body).toContain(`LOCATION:${street} 12\\, 15234 Brennwald`);
    const [booking] = await db.select().from(bookings).where(eq(bookings.id, booked.bookingId));
    expect(body).toContain(`DTSTART:${booking!.startsAt.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}/, "")}`);
  });

  it("never reach a public page, the listings API, the search or anyone outside the booking", async () => {
    const { booked, street } = await withSite();
    const stranger = await createTestUser({ name: "Otto Fremd" });
    const strangerCookie = await signInCookie(stranger.email, stranger.password);
    for (const [cookie, path] of [
      [null, `/machines/${booked.listing.slug}`],
      [strangerCookie, `/machines/${booked.listing.slug}`],
      [null, `/api/v1/listings?q=Tessmar`],
      [null, `/machines?q=Tessmar`],
      [strangerCookie, `/bookings/${booked.bookingId}/visit.ics`],
      [strangerCookie, `/bookings/${booked.bookingId}`],
    ] as const) {
      const response = await get(cookie, path);
      expect(await response.text(), path).not.toContain(street);
    }
    expect((await get(strangerCookie, `/bookings/${booked.bookingId}/visit.ics`)).status).toBe(404);
    // Searching for the street finds nothing (the answer echoes the query, so its hits are what is read).
    const found = (await (await get(null, `/api/v1/listings?q=${street}`)).json()) as { hits: unknown[] };
    expect(found.hits).toEqual([]);
  });

  it("refuses hostile or oversized input with a field message and stores nothing", async () => {
    const { booked, cookies, street } = await withSite();
    for (const [field, value] of [
      ["streetAddress", "\u200b\u200b\u200b\u200b\u200b"],
      ["contactName", "Jo\u0000Ulm"],
      ["contactPhone", "call me maybe"],
      ["accessNotes", "x".repeat(1001)],
    ] as const) {
      const form = { intent: "site", streetAddress: "Elsewhere 1, 10000 Town", contactName: "Jo", contactPhone: "+49 30 1", accessNotes: "", [field]: value };
      const refused = await post(cookies.seller, booked.bookingId, form);
      expect(refused.status, `${field}: ${JSON.stringify(value).slice(0, 20)}`).toBe(422);
      const body = (await refused.json()) as { errors: Record<string, string[]> } | unknown;
      expect(JSON.stringify(body)).toContain(field);
    }
    expect(await (await get(cookies.buyer, `/bookings/${booked.bookingId}`)).text()).toContain(street);
  });
});

describe("moving the visit", () => {
  it("is asked by one side and accepted by the other: the booking moves, both are told, the history says so", async () => {
    const { booked, cookies } = await withSite();
    const day = new Date(Date.now() + 20 * 86_400_000).toISOString().slice(0, 10);
    const asked = await post(cookies.buyer, booked.bookingId, { intent: "reschedule", date: day, startTime: "09:00", durationMinutes: "180", reason: "Machine still wired to the old line" });
    expect(asked.status).toBe(200);
    // A second request while one is open is refused.
    expect((await post(cookies.inspector, booked.bookingId, { intent: "reschedule", date: day, startTime: "13:00", durationMinutes: "180" })).status).toBe(409);
    const told = await latestEmailTo(booked.inspector.email, { matching: (message) => message.subject.startsWith("Request to move inspection") });
    expect(told.text).toContain("Machine still wired to the old line");

    const [request] = await db.select().from(rescheduleRequests).where(eq(rescheduleRequests.bookingId, booked.bookingId));
    // The requester cannot accept their own request; the seller cannot answer it.
    expect((await post(cookies.buyer, booked.bookingId, { intent: "decide", requestId: request!.id, decision: "accept" })).status).toBe(403);
    expect((await post(cookies.seller, booked.bookingId, { intent: "decide", requestId: request!.id, decision: "accept" })).status).toBe(403);
    expect((await post(cookies.inspector, booked.bookingId, { intent: "decide", requestId: request!.id, decision: "accept" })).status).toBe(200);

    const [moved] = await db.select().from(bookings).where(eq(bookings.id, booked.bookingId));
    // 09:00 in Berlin (the listing is in Germany): 08:00 UTC in winter, 07:00 UTC in summer.
    expect([7, 8]).toContain(moved!.startsAt.getUTCHours());
    expect(moved!.startsAt.toISOString().slice(0, 10)).toBe(day);
    expect(moved!.endsAt.getTime() - moved!.startsAt.getTime()).toBe(180 * 60_000);
    const moveNotice = await latestEmailTo(booked.buyer.email, { matching: (message) => /moved to/.test(message.subject) });
    expect(moveNotice.text).toContain("/visit.ics");
    await latestEmailTo(booked.seller.email, { matching: (message) => /moved to/.test(message.subject) });
    const kinds = (await db.select().from(bookingEvents).where(eq(bookingEvents.bookingId, booked.bookingId))).map((event) => event.kind);
    expect(kinds).toEqual(expect.arrayContaining(["reschedule_requested_by_buyer", "reschedule_accepted"]));
    // Answered once only.
    expect((await post(cookies.inspector, booked.bookingId, { intent: "decide", requestId: request!.id, decision: "decline" })).status).toBe(409);
    const calendar = (await (await get(cookies.inspector, `/bookings/${booked.bookingId}/visit.ics`)).text()).replace(/\r\n[ \t]/g, "");
    expect(calendar).toContain("SEQUENCE:1");
  });

  it("declined, leaves the visit as booked and tells the one who asked", async () => {
    const { booked, cookies } = await withSite();
    const [before] = await db.select().from(bookings).where(eq(bookings.id, booked.bookingId));
    const day = new Date(Date.now() + 21 * 86_400_000).toISOString().slice(0, 10);
    expect((await post(cookies.inspector, booked.bookingId, { intent: "reschedule", date: day, startTime: "10:00", durationMinutes: "240" })).status).toBe(200);
    const [request] = await db.select().from(rescheduleRequests).where(eq(rescheduleRequests.bookingId, booked.bookingId));
    expect((await post(cookies.buyer, booked.bookingId, { intent: "decide", requestId: request!.id, decision: "decline" })).status).toBe(200);
    const [after] = await db.select().from(bookings).where(eq(bookings.id, booked.bookingId));
    expect(after!.startsAt).toEqual(before!.startsAt);
    await latestEmailTo(booked.inspector.email, { matching: (message) => /stays as booked/.test(message.subject) });
  });
});
