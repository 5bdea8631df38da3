// A listing's rebuild record over HTTP: only the listing's seller (or an inspector booked to visit it) records it, hostile input is refused at its field
// with nothing written, and the listing says "declared by the seller" unless a signed report confirms the
// as-rebuilt figures.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { listingPhotos } from "~/modules/listings/schema";
import { describe, expect, it } from "vitest";
import { rebuildRecords } from "~/modules/rebuilds/schema";
import { revokeRole } from "~/modules/accounts/service.server";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { certifiedInspector } from "../../support/inspections";
import { bookings } from "~/modules/inspections/schema";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";

const today = new Date().toISOString().slice(0, 10);
const lastMonth = new Date(Date.now() - 30 * 86_400_000).toISOString().slice(0, 10);

function rebuildForm(overrides: { asRebuiltNose?: string[]; notes?: string; asRebuiltOn?: string } = {}) {
  return {
    units: "mm",
    profile: { key: "centre-lathe-normal", version: 1 },
    asFound: {
      measuredOn: lastMonth,
      tests: {
        "L-SP-PAR-V": { kind: "mandrel", near0: "0", near180: "0", far0: "60", far180: "40" },
        "L-SP-NOSE": { kind: "sweep", readings: ["0", "6", "12", "6"] },
      },
    },
    asRebuilt: {
      measuredOn: overrides.asRebuiltOn ?? today,
      tests: {
        "L-SP-PAR-V": { kind: "mandrel", near0: "0", near180: "0", far0: "30", far180: "10" },
        "L-SP-NOSE": { kind: "sweep", readings: overrides.asRebuiltNose ?? ["0", "2", "4", "2"] },
      },
    },
    workDone: ["bearings-adjusted", "headstock-shimmed"],
    notes: overrides.notes ?? "Rear pad shimmed 30 µm, then the seating scraped in three pads.",
  };
}

function postRebuild(cookie: string, listingId: string, form: unknown, intent: "save" | "publish" = "publish") {
  const body = new FormData();
  body.set("intent", intent);
  body.set("form", typeof form === "string" ? form : JSON.stringify(form));
  return fetch(`${testAppOrigin}/sell/listings/${listingId}/rebuild`, { method: "POST", body, headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
}

async function standingOn(slug: string) {
  const html = await (await fetch(`${testAppOrigin}/machines/${slug}`)).text();
  const match = /data-testid="rebuild-standing"[^>]*>([\s\S]*?)<\/p>/.exec(html);
  return match ? match[1]!.replace(/<[^>]+>/g, "").replace(/<!-- -->/g, "") : null;
}

describe("a listing's rebuild record", () => {
  it("is declared by the seller, and only a later signed report reading as well confirms it", async () => {
    const { seller, listing, inspector, bookingId } = await acceptedBooking();
    const cookie = await signInCookie(seller.email, seller.password);
    expect(await standingOn(listing.slug)).toBeNull();

    const published = await postRebuild(cookie, listing.id, rebuildForm());
    expect(published.status).toBe(302);
    expect(published.headers.get("location")).toBe(`/machines/${listing.slug}#rebuild`);
    const standing = await standingOn(listing.slug);
    expect(standing).toContain("Declared by the seller.");
    expect(standing).not.toMatch(/confirmed/i);

    const [row] = await db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id));
    const results = row!.results as { asFound: { code: string; value: number }[]; asRebuilt: { code: string; value: number }[] };
    // Scored by the report engine on the server: the mandrel's inclination is mean(far) − mean(near).
    expect(results.asFound.find((r) => r.code === "L-SP-PAR-V")!.value).toBe(50);
    expect(results.asRebuilt.find((r) => r.code === "L-SP-PAR-V")!.value).toBe(20);

    // The inspector's signed report reads the same figures (completeForm: +20 µm and 4 µm): confirmed.
    await fileAndSign(await inspectorCookie(inspector), bookingId, completeForm());
    const confirmed = await standingOn(listing.slug);
    expect(confirmed).toContain("As-rebuilt figures confirmed");
    expect(confirmed).toContain("Aldo Verrin");
  });

  it("stays declared by the seller when the signed report reads worse than declared", async () => {
    const { seller, listing, inspector, bookingId } = await acceptedBooking();
    const cookie = await signInCookie(seller.email, seller.password);
    // Declared 1 µm of run-out at the nose; the inspector finds 4 µm (tolerance 10 µm, slack 2.5 µm).
    expect((await postRebuild(cookie, listing.id, rebuildForm({ asRebuiltNose: ["0", "1", "0.5", "0"] }))).status).toBe(302);
    await fileAndSign(await inspectorCookie(inspector), bookingId, completeForm());
    const standing = await standingOn(listing.slug);
    expect(standing).toContain("Declared by the seller.");
    expect(standing).not.toMatch(/confirmed/i);
  });

  it("is recorded by the listing's seller only", async () => {
    const { listing, buyer } = await acceptedBooking();
    const otherSeller = await createTestUser({ roles: ["seller"] });
    expect((await postRebuild(await signInCookie(otherSeller.email, otherSeller.password), listing.id, rebuildForm())).status).toBe(403);
    expect((await postRebuild(await signInCookie(buyer.email, buyer.password), listing.id, rebuildForm())).status).toBe(403);
    expect(await db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id))).toHaveLength(0);
  });

  it("is not recorded by an owner whose seller role was withdrawn", async () => {
    const { listing, seller } = await acceptedBooking();
    const cookie = await signInCookie(seller.email, seller.password);
    await revokeRole(seller.id, "seller");
    expect((await postRebuild(cookie, listing.id, rebuildForm())).status).toBe(403);
    expect(await db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id))).toHaveLength(0);
  });

  it("may be entered by the inspector booked to visit the machine, says so, and is still not verified", async () => {
    const { listing, inspector, bookingId, seller } = await acceptedBooking();
    const cookie = await inspectorCookie(inspector);
    const page = await fetch(`${testAppOrigin}/sell/listings/${listing.id}/rebuild`, { headers: { cookie } });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("marked as entered by you");
    // Matching the machine across listings stays the seller's decision.
    expect(html).not.toContain("Yes, the same machine");

    expect((await postRebuild(cookie, listing.id, rebuildForm())).status).toBe(302);
    const [row] = await db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id));
    expect(row!.authorId).toBe(inspector.id);
    const standing = await standingOn(listing.slug);
    expect(standing).toContain("Entered by inspector Aldo Verrin.");
    expect(standing).toContain("not verified");
    expect(standing).not.toMatch(/confirmed/i);

    // Machine history stays the seller's: the inspector cannot confirm or split a match.
    for (const intent of ["confirm-machine", "refuse-machine", "split-machine"]) {
      const body = new FormData();
      body.set("intent", intent);
      body.set("otherListingId", randomUUID());
      const response = await fetch(`${testAppOrigin}/sell/listings/${listing.id}/rebuild`, { method: "POST", body, headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
      expect(response.status, intent).toBe(403);
    }

    // Only the signed report confirms it; the as-found figures then stay the inspector's unsigned entry.
    await fileAndSign(cookie, bookingId, completeForm());
    const confirmed = await standingOn(listing.slug);
    expect(confirmed).toContain("As-rebuilt figures confirmed");
    expect(confirmed).toContain("entered by inspector Aldo Verrin and are not signed");

    // The seller still owns the listing and may edit the record; it is then theirs.
    expect((await postRebuild(await signInCookie(seller.email, seller.password), listing.id, rebuildForm({ notes: "Checked by us." }))).status).toBe(302);
    expect(await standingOn(listing.slug)).toContain("declared by the seller");
  });

  it("is refused to an inspector with no taken-on booking on the listing, and to one whose booking is not yet accepted", async () => {
    const { listing, bookingId, inspector } = await acceptedBooking();
    const stranger = await certifiedInspector();
    const strangerCookie = await signInCookie(stranger.email, stranger.password);
    expect((await fetch(`${testAppOrigin}/sell/listings/${listing.id}/rebuild`, { headers: { cookie: strangerCookie } })).status).toBe(403);
    expect((await postRebuild(strangerCookie, listing.id, rebuildForm())).status).toBe(403);
    // The booked inspector before accepting (the booking only paid): refused too.
    await db.update(bookings).set({ status: "paid" }).where(eq(bookings.id, bookingId));
    expect((await postRebuild(await inspectorCookie(inspector), listing.id, rebuildForm())).status).toBe(403);
    expect(await db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id))).toHaveLength(0);
  });

  it("lists the instruments typed on it in each test's instrument choice, and refuses an instrument not in the list", async () => {
    const { seller, listing } = await acceptedBooking();
    const cookie = await signInCookie(seller.email, seller.password);
    const form = rebuildForm();
    const withInstruments = {
      ...form,
      instruments: [{ id: "i1", kind: "dial-indicator", description: "Bench indicator 0.001", resolution: "1", calibrationDue: "2030-01-01" }],
      asRebuilt: { ...form.asRebuilt, tests: { ...form.asRebuilt.tests, "L-SP-NOSE": { kind: "sweep", readings: ["0", "2", "4", "2"], instrumentId: "i1" } } },
    };
    expect((await postRebuild(cookie, listing.id, withInstruments, "save")).status).toBe(200);
    const html = await (await fetch(`${testAppOrigin}/sell/listings/${listing.id}/rebuild`, { headers: { cookie } })).text();
    expect(html).toContain("Bench indicator 0.001");
    const stray = { ...withInstruments, asRebuilt: { ...withInstruments.asRebuilt, tests: { ...withInstruments.asRebuilt.tests, "L-SP-NOSE": { kind: "sweep", readings: ["0", "2", "4", "2"], instrumentId: "i9" } } } };
    const refused = await postRebuild(cookie, listing.id, stray, "save");
    expect(refused.status).toBe(422);
    expect(await refused.text()).toContain("asRebuilt.tests.L-SP-NOSE.instrumentId");
  });

  it("refuses hostile or impossible input at its field, writing nothing", async () => {
    const { seller, listing } = await acceptedBooking();
    const cookie = await signInCookie(seller.email, seller.password);
    for (const [form, field] of [
      [rebuildForm({ notes: "bad\u0000note" }), "notes"],
      [rebuildForm({ notes: "\u200b\u200b" }), null],
      [rebuildForm({ asRebuiltNose: ["0", "1e999", "1", "2"] }), "asRebuilt.tests.L-SP-NOSE"],
      [rebuildForm({ asRebuiltOn: "2000-01-01" }), "asRebuilt.measuredOn"],
      [{ ...rebuildForm(), workDone: ["moonlighting"] }, "workDone.0"],
      [{ ...rebuildForm(), profile: { key: "no-such-profile", version: 1 } }, "profile"],
      [{ ...rebuildForm(), photoIds: [randomUUID()] }, "photoIds"],
      [{ ...rebuildForm(), photoIds: ["../photo"] }, "photoIds.0"],
    ] as const) {
      const response = await postRebuild(cookie, listing.id, form);
      if (field === null) {
        expect([302, 422]).toContain(response.status);
        continue;
      }
      expect(response.status, JSON.stringify(form).slice(0, 80)).toBe(422);
      const text = await response.text();
      expect(text).toContain(field);
    }
    expect((await postRebuild(cookie, listing.id, "{not json")).status).toBe(400);
    const [row] = await db.select().from(rebuildRecords).where(eq(rebuildRecords.listingId, listing.id));
    expect(row?.notes ?? "").not.toContain("\u0000");
  });

  it("shows the listing photos the seller chose as photos of the work, and refuses another listing's", async () => {
    const { seller, listing } = await acceptedBooking();
    const other = await acceptedBooking();
    const photo = async (listingId: string) => {
      const id = randomUUID();
      await db.insert(listingPhotos).values({ id, listingId, position: 0, thumbnailKey: `listings/${listingId}/${id}-thumb.webp`, largeKey: `listings/${listingId}/${id}-large.webp`, width: 1600, height: 1200, originalName: "scraped.jpg", originalBytes: 1000 });
      return id;
    };
    const own = await photo(listing.id);
    const theirs = await photo(other.listing.id);
    const cookie = await signInCookie(seller.email, seller.password);
    expect((await postRebuild(cookie, listing.id, { ...rebuildForm(), photoIds: [theirs] })).status).toBe(422);
    expect((await postRebuild(cookie, listing.id, { ...rebuildForm(), photoIds: [own] })).status).toBe(302);
    const html = await (await fetch(`${testAppOrigin}/machines/${listing.slug}`)).text();
    expect(html.replace(/<!-- -->/g, "")).toContain("The work, photo 1 of 1");
    expect(html).toContain(`${own}-thumb.webp`);
  });
});
