// listing_search, what the PostgreSQL search reads, follows every write in the same transaction: a listing
// inserted, edited, unpublished; a report signed; a seller renamed; a write rolled back leaves no trace.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { user } from "~/modules/accounts/schema";
import { listings } from "~/modules/listings/schema";
import { listingSearch } from "~/modules/search/schema";
import { searchMachines } from "~/modules/search/service.server";
import { SearchUnavailableError, type ListingSearch } from "~/modules/search/search.server";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { insertListings, uniqueWord } from "../../support/search";

const db = getDatabase();
const row = async (id: string) => (await db.select().from(listingSearch).where(eq(listingSearch.listingId, id)))[0];
// The search service out of reach: every search runs in PostgreSQL.
const down = (): never => {
  throw new SearchUnavailableError("unreachable", "search service out of reach in this test");
};
const noService = { searchListings: down, searchListingsTogether: down } as unknown as ListingSearch;
const fromDatabase = (text: string) => searchMachines(db, { text, sort: "newest" }, { search: noService });

describe("listing_search", () => {
  it("follows a listing's insert, edit and unpublishing, and finds it by folded words", async () => {
    const word = uniqueWord();
    const [listing] = await insertListings([{ make: word, model: "Präzision 300", region: " Nördliche Marken " }]);
    expect(await row(listing!.id)).toMatchObject({ status: "published", priceMinor: 900_000, verified: false, reportId: null, regionKey: "nördliche marken".normalize("NFKD") });
    // Decomposed and without the umlaut: the same word.
    expect((await fromDatabase(`${word} prazision`)).hits.map((hit) => hit.id)).toEqual([listing!.id]);
    expect((await fromDatabase(`${word} PRA\u0308ZISION`)).hits.map((hit) => hit.id)).toEqual([listing!.id]);

    await db.update(listings).set({ priceMinor: 1_200_000, description: "Gap bed lathe, quillfeed tailstock." }).where(eq(listings.id, listing!.id));
    expect(await row(listing!.id)).toMatchObject({ priceMinor: 1_200_000 });
    expect((await fromDatabase(`${word} quillfeed`)).totalHits).toBe(1);

    await db.update(listings).set({ status: "withdrawn" }).where(eq(listings.id, listing!.id));
    expect(await row(listing!.id)).toMatchObject({ status: "withdrawn" });
    expect((await fromDatabase(word)).totalHits).toBe(0);
  });

  it("follows a seller's new name, and not a rolled-back edit", async () => {
    const word = uniqueWord();
    const [listing] = await insertListings([{ make: word }]);
    const renamed = uniqueWord("seller");
    await db.update(user).set({ name: `Renamed ${renamed}` }).where(eq(user.id, listing!.sellerId));
    expect((await fromDatabase(renamed)).hits.map((hit) => hit.id)).toEqual([listing!.id]);

    await expect(
      db.transaction(async (tx) => {
        await tx.update(listings).set({ priceMinor: 5 }).where(eq(listings.id, listing!.id));
        throw new Error("rolled back");
      }),
    ).rejects.toThrow("rolled back");
    expect(await row(listing!.id)).toMatchObject({ priceMinor: 900_000 });
  });

  it("takes a signed report's grade and figures (as magnitudes) when it is signed", async () => {
    const booking = await acceptedBooking();
    expect(await row(booking.listing.id)).toMatchObject({ reportId: null, verified: false });
    const signed = await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
    const figures = signed.keyFigures as Record<string, number | null>;
    expect(await row(booking.listing.id)).toMatchObject({
      reportId: signed.id,
      grade: signed.grade,
      verified: signed.grade !== "incomplete",
      spindleRunoutUm: figures.spindleRunOut === null ? null : Math.abs(figures.spindleRunOut!),
      axialSlipUm: figures.axialSlip === null ? null : Math.abs(figures.axialSlip!),
    });
  });
});
