// Demo listings for `npm start`: invented dealers, makes and places, with drawn photos run through the
// same photo pipeline as uploads.
import { randomUUID } from "node:crypto";
import { eq, inArray } from "drizzle-orm";
import { getDatabase } from "~/db/client.server";
import { makePhotoVariants } from "~/modules/files/images.server";
import { writeObject } from "~/modules/files/storage.server";
import { drawLathePhoto, paints } from "./demo-photos.server";
import { listingPhotos, listings } from "./schema";
import { makeSlug } from "./service.server";

type DemoListing = Omit<typeof listings.$inferInsert, "sellerId" | "slug"> & { dealer: number; paint: number; photos: number; daysAgo: number };

const demoListings: DemoListing[] = [
  {
    dealer: 0, paint: 0, photos: 3, daysAgo: 2, status: "published", category: "centre_lathe", condition: "reconditioned",
    make: "Kessling", model: "KD 320", year: 1988, serialNumber: "KD320-11873",
    swingOverBedMm: 320, distanceBetweenCentresMm: 1000, spindleBoreMm: 42, spindleNose: "D1-5 camlock", motorPowerKw: 4, weightKg: 1350,
    city: "Ostervik", region: "Lower Haldmark", country: "NO", priceMinor: 14_500_00, currency: "EUR",
    toolingIncluded: "3-jaw and 4-jaw chucks, faceplate, fixed and travelling steadies, quick-change tool post with six holders",
    description:
      "Rebuilt in our own shop this spring: bed ways reground, saddle re-scraped and fitted with new wipers, spindle bearings replaced with matched angular-contact pairs. Gearbox opened, cleaned and all shafts checked. Runs quietly through all 12 speeds; you are welcome to see it cutting before you decide.",
  },
  {
    dealer: 0, paint: 1, photos: 2, daysAgo: 6, status: "published", category: "toolroom_lathe", condition: "used",
    make: "Varnholt", model: "TR 250 Precision", year: 1979, serialNumber: null,
    swingOverBedMm: 250, distanceBetweenCentresMm: 500, spindleBoreMm: 26, spindleNose: "Collet nose, 5C", motorPowerKw: 1.5, weightKg: 820,
    city: "Ostervik", region: "Lower Haldmark", country: "NO", priceMinor: 9_800_00, currency: "EUR",
    toolingIncluded: "Collet set 3–25 mm, taper turning attachment",
    description: "Toolroom lathe from a gauge maker's workshop, used for light finishing work all its life. Original paint, ways show very little wear near the headstock. Single-phase conversion not done; needs a 400 V supply.",
  },
  {
    dealer: 1, paint: 2, photos: 3, daysAgo: 9, status: "published", category: "centre_lathe", condition: "used",
    make: "Brandmoor", model: "Series 14 x 40", year: 1995, serialNumber: "B14-5521",
    swingOverBedMm: 355.6, distanceBetweenCentresMm: 1016, spindleBoreMm: 38.1, spindleNose: "D1-4 camlock", motorPowerKw: 2.2, weightKg: 1150,
    city: "Whitcombe Ferry", region: "Marlshire", country: "GB", priceMinor: 6_250_00, currency: "GBP",
    toolingIncluded: "3-jaw chuck, faceplate, coolant pump, work light",
    description: "Inch-dial gap-bed lathe out of a college workshop. Leadscrew and half-nuts in good order, cross-slide backlash about 0.15 mm. Some paint chips on the tray. Loaded onto your transport with our forklift.",
  },
  {
    dealer: 1, paint: 3, photos: 1, daysAgo: 14, status: "published", category: "centre_lathe", condition: "as_is",
    make: "Orsay-Lindqvist", model: "OL 400", year: 1969, serialNumber: null,
    swingOverBedMm: 400, distanceBetweenCentresMm: 1500, spindleBoreMm: 52, spindleNose: "L1 long taper", motorPowerKw: 5.5, weightKg: 2100,
    city: "Whitcombe Ferry", region: "Marlshire", country: "GB", priceMinor: 2_400_00, currency: "GBP",
    toolingIncluded: null,
    description: "Heavy lathe sold as seen, for a rebuild or for parts. Spindle turns freely by hand; motor not tested. Bed has a worn patch near the chuck. Needs a crane or a machinery skate team to move.",
  },
  {
    dealer: 2, paint: 1, photos: 2, daysAgo: 20, status: "published", category: "cnc_lathe", condition: "reconditioned",
    make: "Talvera", model: "TC-6 Slant", year: 2008, serialNumber: "TC6-08-0417",
    swingOverBedMm: 520, distanceBetweenCentresMm: 600, spindleBoreMm: 66, spindleNose: "A2-6", motorPowerKw: 15, weightKg: 4200,
    city: "Saint-Aubrel", region: "Haute-Vernois", country: "FR", priceMinor: 38_000_00, currency: "EUR",
    toolingIncluded: "12-station turret with 8 holders, hydraulic 3-jaw chuck, chip conveyor",
    description: "Slant-bed CNC lathe, control and servo drives serviced, new way wipers and turret seals. 18 400 spindle hours. Can be shown under power by appointment.",
  },
  {
    dealer: 2, paint: 0, photos: 1, daysAgo: 1, status: "draft", category: "centre_lathe", condition: "used",
    make: "Kessling", model: "KD 250", year: 1984, serialNumber: null,
    swingOverBedMm: 250, distanceBetweenCentresMm: 750, spindleBoreMm: 32, spindleNose: "D1-4 camlock", motorPowerKw: 2.2, weightKg: 900,
    city: "Saint-Aubrel", region: "Haute-Vernois", country: "FR", priceMinor: 5_900_00, currency: "EUR",
    toolingIncluded: null,
    description: "Draft listing being prepared: the smaller sister of the KD 320, from the same workshop, to be photographed after cleaning.",
  },
];

/** Writes the demo listings for the given dealers (indexes 0..2) unless the first dealer already has some. */
export async function seedDemoListings(dealerIds: string[]) {
  const db = getDatabase();
  const existing = await db.select({ id: listings.id }).from(listings).where(inArray(listings.sellerId, dealerIds)).limit(1);
  if (existing.length) return 0;
  for (const demo of demoListings) {
    const { dealer, paint, photos, daysAgo, ...columns } = demo;
    const publishedAt = columns.status === "published" ? new Date(Date.now() - daysAgo * 86_400_000) : null;
    const [listing] = await db
      .insert(listings)
      .values({ ...columns, sellerId: dealerIds[dealer], slug: makeSlug({ make: columns.make, model: columns.model, category: columns.category, year: columns.year ?? null }), publishedAt, createdAt: publishedAt ?? new Date(), updatedAt: publishedAt ?? new Date() })
      .returning({ id: listings.id });
    for (let view = 0; view < photos; view++) {
      const photoId = randomUUID();
      const variants = await makePhotoVariants(await drawLathePhoto({ paint: paints[paint], view }));
      const prefix = `listings/${listing.id}/photos/${photoId}`;
      await writeObject({ key: `${prefix}/thumb.webp`, body: variants.thumbnail, contentType: "image/webp" });
      await writeObject({ key: `${prefix}/large.webp`, body: variants.large, contentType: "image/webp" });
      await db.insert(listingPhotos).values({
        id: photoId,
        listingId: listing.id,
        position: view,
        thumbnailKey: `${prefix}/thumb.webp`,
        largeKey: `${prefix}/large.webp`,
        width: variants.width,
        height: variants.height,
        originalName: `photo-${view + 1}.jpg`,
        originalBytes: variants.large.length,
      });
    }
  }
  await db.update(listings).set({ updatedAt: new Date() }).where(eq(listings.status, "draft"));
  return demoListings.length;
}
