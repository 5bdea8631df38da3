// Machine history over HTTP: a second listing of the same serial is suggested to its seller and links only when
// the seller confirms; the listing then shows the earlier signed report; staff can split a wrong match.
import { eq } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { listings } from "~/modules/listings/schema";
import { machineListings } from "~/modules/machines/schema";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";

/** The first listing's plate, unique to the test so that other tests' lathes are not suggested. */
async function uniquePlate(listingId: string) {
  const serial = `DL330-${Math.floor(Math.random() * 90_000 + 10_000)}`;
  await db.update(listings).set({ serialNumber: serial }).where(eq(listings.id, listingId));
  return serial;
}

async function secondListing(sellerId: string, serialNumber: string, model = "DL-330") {
  const [listing] = await db
    .insert(listings)
    .values({
      sellerId,
      slug: `resold-lathe-${randomUUID().slice(0, 8)}`,
      status: "published",
      category: "centre_lathe",
      make: "Tessmar",
      model,
      year: 1991,
      serialNumber,
      swingOverBedMm: 330,
      distanceBetweenCentresMm: 1000,
      city: "Kaltenbrunn",
      country: "AT",
      priceMinor: 1_590_000,
      currency: "EUR",
      condition: "reconditioned",
      description: "Rebuilt lathe, bought from another dealer",
      publishedAt: new Date(),
    })
    .returning();
  return listing!;
}

function post(cookie: string, listingId: string, fields: Record<string, string>) {
  const body = new FormData();
  for (const [name, value] of Object.entries(fields)) body.set(name, value);
  return fetch(`${testAppOrigin}/sell/listings/${listingId}/rebuild`, { method: "POST", body, headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
}

const page = async (path: string, cookie?: string) => (await (await fetch(`${testAppOrigin}${path}`, cookie ? { headers: { cookie } } : {})).text()).replace(/<!-- -->/g, "");

describe("a machine's history across listings", () => {
  it("links a second listing of the same serial only after its seller confirms, then shows the earlier signed report", async () => {
    const first = await acceptedBooking();
    const plate = await uniquePlate(first.listing.id);
    await fileAndSign(await inspectorCookie(first.inspector), first.bookingId, completeForm());
    const dealer = await createTestUser({ roles: ["seller"] });
    const cookie = await signInCookie(dealer.email, dealer.password);
    const resold = await secondListing(dealer.id, plate.toLowerCase().replace("-", " "));

    // Suggested to the seller, but not linked: the public listing shows no history yet.
    const editor = await page(`/sell/listings/${resold.id}/rebuild`, cookie);
    expect(editor).toContain("Is this the same machine?");
    expect(editor).toContain(first.listing.slug);
    expect(await db.select().from(machineListings).where(eq(machineListings.listingId, resold.id))).toHaveLength(0);
    expect(await page(`/machines/${resold.slug}`)).not.toContain("This machine&#x27;s history");

    // Another seller cannot confirm it for them.
    const stranger = await createTestUser({ roles: ["seller"] });
    expect((await post(await signInCookie(stranger.email, stranger.password), resold.id, { intent: "confirm-machine", otherListingId: first.listing.id })).status).toBe(403);
    // A listing that is no suggestion cannot be linked.
    expect((await post(cookie, resold.id, { intent: "confirm-machine", otherListingId: randomUUID() })).status).toBe(422);
    expect((await post(cookie, resold.id, { intent: "confirm-machine", otherListingId: "\u0000" })).status).toBe(422);

    expect((await post(cookie, resold.id, { intent: "confirm-machine", otherListingId: first.listing.id })).status).toBe(200);
    const history = await page(`/machines/${resold.slug}`);
    expect(history).toMatch(/This machine(&#x27;|')s history/);
    expect(history).toContain("Signed report by Aldo Verrin");

    // Staff split the match: the history is gone and the pair is not suggested again.
    const staff = await createTestUser({ roles: ["admin"] });
    const staffCookie = await signInCookie(staff.email, staff.password);
    expect((await post(cookie, resold.id, { intent: "split-machine" })).status).toBe(403);
    expect((await post(staffCookie, resold.id, { intent: "split-machine" })).status).toBe(200);
    expect(await page(`/machines/${resold.slug}`)).not.toContain("Signed report by Aldo Verrin");
    expect(await page(`/sell/listings/${resold.id}/rebuild`, cookie)).not.toContain("Is this the same machine?");
  });

  it("finds the machine among many listings of the same model", async () => {
    // More listings of the model than the suggestion reads: the one with the same plate is still found. (Two
    // letters in each filler's serial keep it from being one character off another test's plate of digits.)
    const dealer = await createTestUser({ roles: ["seller"] });
    for (let batch = 0; batch < 3; batch += 1) {
      await Promise.all(Array.from({ length: 25 }, (_, n) => secondListing(dealer.id, `DL330-XQ${batch}${String(n).padStart(2, "0")}`)));
    }
    const earlier = await secondListing(dealer.id, `DL330-${Math.floor(Math.random() * 90_000 + 10_000)}`);
    const resold = await secondListing(dealer.id, earlier.serialNumber!.replace("-", " ").toLowerCase());
    const editor = await page(`/sell/listings/${resold.id}/rebuild`, await signInCookie(dealer.email, dealer.password));
    expect(editor).toContain(earlier.slug);
  });

  it("does not suggest another model, or a listing the seller turned down", async () => {
    const first = await acceptedBooking();
    const plate = await uniquePlate(first.listing.id);
    const dealer = await createTestUser({ roles: ["seller"] });
    const cookie = await signInCookie(dealer.email, dealer.password);
    const otherModel = await secondListing(dealer.id, plate, "DL 360");
    expect(await page(`/sell/listings/${otherModel.id}/rebuild`, cookie)).not.toContain("Is this the same machine?");
    const close = await secondListing(dealer.id, `${plate.slice(0, -1)}${plate.endsWith("9") ? "8" : "9"}`);
    expect(await page(`/sell/listings/${close.id}/rebuild`, cookie)).toContain("Serial differs by one character");
    expect((await post(cookie, close.id, { intent: "refuse-machine", otherListingId: first.listing.id })).status).toBe(200);
    expect(await page(`/sell/listings/${close.id}/rebuild`, cookie)).not.toContain("Is this the same machine?");
  });
});
