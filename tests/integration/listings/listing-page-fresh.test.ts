// The listing page is never behind its listing: right after a price edit it shows the new price, and right after
// the inspector signs a report it shows the machine as verified with the report's grade — whatever the server
// keeps between requests (formatters, signing keys, checked credentials) must not keep a page's facts.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { listings } from "~/modules/listings/schema";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, db, fileAndSign, inspectorCookie } from "../../support/reports";

async function page(slug: string) {
  const response = await fetch(`${testAppOrigin}/machines/${slug}`);
  expect(response.status).toBe(200);
  return response.text();
}

describe("the listing page after an edit or a signed report", () => {
  it("shows the new price at once, and the grade as soon as the report is signed", async () => {
    const booking = await acceptedBooking();
    const { slug, id } = booking.listing;
    await db.update(listings).set({ priceMinor: 1_234_500, currency: "EUR" }).where(eq(listings.id, id));
    const before = await page(slug);
    expect(before).toContain("€12,345");
    expect(before).toContain("Not yet verified");

    // Read twice, so that anything kept from the first read would show on the second.
    await db.update(listings).set({ priceMinor: 987_650 }).where(eq(listings.id, id));
    expect(await page(slug)).toContain("€9,876.50");
    await db.update(listings).set({ priceMinor: 990_000, currency: "GBP" }).where(eq(listings.id, id));
    const repriced = await page(slug);
    expect(repriced).toContain("£9,900");
    expect(repriced).not.toContain("€9,876.50");

    const signed = await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
    const verified = await page(slug);
    // React separates the text and the grade with an empty comment.
    expect(verified).toMatch(new RegExp(`Verified · grade (<!-- -->)?${signed.grade}<`));
    expect(verified).not.toContain("Not yet verified");
  });
});

describe("the listing page's specification", () => {
  it("says a lathe's swing is not given, and leaves a lathe's sizes off a machine of another kind", async () => {
    const booking = await acceptedBooking();
    const { slug, id } = booking.listing;
    await db.update(listings).set({ swingOverBedMm: null, distanceBetweenCentresMm: null }).where(eq(listings.id, id));
    expect(await page(slug)).toMatch(/Swing over bed<\/dt><dd[^>]*>not given/);
    await db.update(listings).set({ category: "machining_centre" }).where(eq(listings.id, id));
    const centre = await page(slug);
    expect(centre).not.toContain("Swing over bed");
    expect(centre).not.toContain("Distance between centres");
  });
});
