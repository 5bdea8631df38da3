// Reads of bookings that the reports domain needs and bookings.server.ts does not export: a booking with
// its machine and the people a signed report is sent to. Owned by the reports engineer; read-only.
import { eq } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { user } from "~/modules/accounts/schema";
import { listings } from "~/modules/listings/schema";
import type { Executor } from "./profiles.server";
import { bookings, inspectorProfiles } from "./schema";

const inspectorUser = alias(user, "report_inspector");
const buyerUser = alias(user, "report_buyer");
const sellerUser = alias(user, "report_seller");

/** One booking with the listing's facts a report records and the buyer's, seller's and inspector's names and addresses. */
export async function getBookingForReport(db: Executor, bookingId: string) {
  const [row] = await db
    .select({
      booking: {
        id: bookings.id,
        reference: bookings.reference,
        status: bookings.status,
        inspectorId: bookings.inspectorId,
        buyerId: bookings.buyerId,
        startsAt: bookings.startsAt,
        endsAt: bookings.endsAt,
        reportId: bookings.reportId,
      },
      listing: {
        id: listings.id,
        slug: listings.slug,
        status: listings.status,
        sellerId: listings.sellerId,
        category: listings.category,
        make: listings.make,
        model: listings.model,
        year: listings.year,
        serialNumber: listings.serialNumber,
        swingOverBedMm: listings.swingOverBedMm,
        distanceBetweenCentresMm: listings.distanceBetweenCentresMm,
        tableLengthMm: listings.tableLengthMm,
        city: listings.city,
        region: listings.region,
        country: listings.country,
      },
      inspector: { name: inspectorUser.name, email: inspectorUser.email, publicId: inspectorProfiles.publicId },
      buyer: { name: buyerUser.name, email: buyerUser.email },
      seller: { name: sellerUser.name, email: sellerUser.email },
    })
    .from(bookings)
    .innerJoin(listings, eq(listings.id, bookings.listingId))
    .innerJoin(inspectorUser, eq(inspectorUser.id, bookings.inspectorId))
    .innerJoin(inspectorProfiles, eq(inspectorProfiles.userId, bookings.inspectorId))
    .innerJoin(buyerUser, eq(buyerUser.id, bookings.buyerId))
    .innerJoin(sellerUser, eq(sellerUser.id, listings.sellerId))
    .where(eq(bookings.id, bookingId));
  return row ?? null;
}

export type BookingForReport = NonNullable<Awaited<ReturnType<typeof getBookingForReport>>>;
