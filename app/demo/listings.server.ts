// Demo listings for `npm start`: invented dealers, makes and places, with drawn photos run through the
// same photo pipeline as uploads. Forty machines of every category from five dealers and a private seller.
import { randomUUID } from "node:crypto";
import { getDatabase } from "~/db/client.server";
import { makePhotoVariants } from "~/modules/files/images.server";
import { writeObject } from "~/modules/files/storage.server";
import { drawMachinePhoto, paints, type MachineDrawing } from "./listing-photos.server";
import { listingPhotos, listings, sellerPages } from "~/modules/listings/schema";
import { makeSlug } from "~/modules/listings/service.server";

/** The sellers of the demo listings, by the key the seed knows their accounts by. */
export type DemoSellerKey = "dealer" | "brandmoor" | "vernois" | "hollerbeck" | "rietmolen" | "private";

type Place = Pick<typeof listings.$inferInsert, "city" | "region" | "country">;

// Where each seller keeps its machines (a dealer's yard, the private seller's garage).
const yards: Record<DemoSellerKey, Place> = {
  dealer: { city: "Ostervik", region: "Lower Haldmark", country: "NO" },
  brandmoor: { city: "Whitcombe Ferry", region: "Marlshire", country: "GB" },
  vernois: { city: "Saint-Aubrel", region: "Haute-Vernois", country: "FR" },
  hollerbeck: { city: "Falkenmoor", region: "Lindgau", country: "DE" },
  rietmolen: { city: "Veldhaven", region: "Oost-Marwold", country: "NL" },
  private: { city: "Tärnvik", region: "Norrlända", country: "SE" },
};

type DemoListing = Omit<typeof listings.$inferInsert, "sellerId" | "slug" | "city" | "region" | "country"> & {
  seller: DemoSellerKey;
  /** Paint of the drawn machine (index into `paints`) and how many photos the seller took. */
  paint: number;
  photos: number;
  /** Days since it was listed (for sold and withdrawn ones: since it was first published). */
  daysAgo: number;
  place?: Place;
};

const none = { serialNumber: null, spindleBoreMm: null, spindleNose: null, swingOverBedMm: null, distanceBetweenCentresMm: null };

export const demoListings: DemoListing[] = [
  // ————— Centre lathes —————
  {
    seller: "dealer", paint: 0, photos: 3, daysAgo: 40, status: "published", category: "centre_lathe", condition: "reconditioned",
    make: "Kessling", model: "KD 320", year: 1988, serialNumber: "KD320-11873",
    swingOverBedMm: 320, distanceBetweenCentresMm: 1000, spindleBoreMm: 42, spindleNose: "D1-5 camlock", motorPowerKw: 4, weightKg: 1350,
    supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50, spindleSpeedMinRpm: 30, spindleSpeedMaxRpm: 2000, tailstockTaper: "Morse taper 4",
    threadPitchMinMm: 0.25, threadPitchMaxMm: 7, threadTpiMin: 4, threadTpiMax: 56, swingOverCrossSlideMm: 190, footprintLengthMm: 2100, footprintWidthMm: 950,
    priceMinor: 14_500_00, currency: "EUR",
    toolingIncluded: "3-jaw and 4-jaw chucks, faceplate, fixed and travelling steadies, quick-change tool post with six holders",
    description:
      "Rebuilt in our own shop this spring: bed ways reground, saddle re-scraped and fitted with new wipers, spindle bearings replaced with matched angular-contact pairs. Gearbox opened, cleaned and all shafts checked. Runs quietly through all 12 speeds; you are welcome to see it cutting before you decide.",
  },
  {
    seller: "brandmoor", paint: 2, photos: 3, daysAgo: 75, status: "published", category: "centre_lathe", condition: "used",
    make: "Brandmoor", model: "Series 14 x 40", year: 1995, serialNumber: "B14-5521",
    swingOverBedMm: 355.6, distanceBetweenCentresMm: 1016, spindleBoreMm: 38.1, spindleNose: "D1-4 camlock", motorPowerKw: 2.2, weightKg: 1150,
    supplyVoltage: 240, supplyPhases: 1, supplyFrequencyHz: 50, spindleSpeedMinRpm: 70, spindleSpeedMaxRpm: 2000, tailstockTaper: "Morse taper 3",
    threadPitchMinMm: 0.4, threadPitchMaxMm: 7, threadTpiMin: 4, threadTpiMax: 56, swingOverCrossSlideMm: 220, footprintLengthMm: 1930, footprintWidthMm: 760,
    priceMinor: 6_250_00, currency: "GBP",
    toolingIncluded: "3-jaw chuck, faceplate, coolant pump, work light",
    description: "Inch-dial gap-bed lathe out of a college workshop. Leadscrew and half-nuts in good order, cross-slide backlash about 0.15 mm. Some paint chips on the tray. Loaded onto your transport with our forklift.",
  },
  {
    seller: "brandmoor", paint: 3, photos: 1, daysAgo: 470, status: "published", category: "centre_lathe", condition: "as_is",
    make: "Orsay-Lindqvist", model: "OL 400", year: 1969, serialNumber: "OL400-5108",
    swingOverBedMm: 400, distanceBetweenCentresMm: 1500, spindleBoreMm: 52, spindleNose: "L1 long taper", motorPowerKw: 5.5, weightKg: 2100,
    priceMinor: 2_400_00, currency: "GBP",
    toolingIncluded: null,
    description: "Heavy lathe sold as seen, for a rebuild or for parts. Spindle turns freely by hand; motor not tested. Bed has a worn patch near the chuck. Needs a crane or a machinery skate team to move.",
  },
  // The same OL 400, bought by the Ostervik dealer, rebuilt and listed again (model and serial typed their own way):
  // its rebuild record and the earlier listing's signed report are seeded in rebuilds.server.ts.
  {
    seller: "dealer", paint: 1, photos: 2, daysAgo: 8, status: "published", category: "centre_lathe", condition: "reconditioned",
    make: "Orsay-Lindqvist", model: "OL-400", year: 1969, serialNumber: "OL 400/5108",
    swingOverBedMm: 400, distanceBetweenCentresMm: 1500, spindleBoreMm: 52, spindleNose: "L1 long taper", motorPowerKw: 5.5, weightKg: 2100,
    priceMinor: 118_000_00, currency: "NOK",
    toolingIncluded: "Three-jaw and four-jaw chucks, fixed and travelling steadies, test mandrel",
    description: "Rebuilt in our shop: spindle bearings adjusted, headstock shimmed and its seating scraped, bed ways scraped, gibs refitted. The rebuild record on this page shows every test as found and as rebuilt.",
  },
  {
    seller: "vernois", paint: 0, photos: 1, daysAgo: 1, status: "draft", category: "centre_lathe", condition: "used",
    make: "Kessling", model: "KD 250", year: 1984, serialNumber: null,
    swingOverBedMm: 250, distanceBetweenCentresMm: 750, spindleBoreMm: 32, spindleNose: "D1-4 camlock", motorPowerKw: 2.2, weightKg: 900,
    priceMinor: 5_900_00, currency: "EUR",
    toolingIncluded: null,
    description: "Draft listing being prepared: the smaller sister of the KD 320, from the same workshop, to be photographed after cleaning.",
  },
  {
    seller: "hollerbeck", paint: 4, photos: 4, daysAgo: 60, status: "published", category: "centre_lathe", condition: "reconditioned",
    make: "Varnholt", model: "L 360 Universal", year: 1991, serialNumber: "L360-2207",
    swingOverBedMm: 360, distanceBetweenCentresMm: 1000, spindleBoreMm: 52, spindleNose: "D1-6 camlock", motorPowerKw: 5.5, weightKg: 1650,
    supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50, spindleSpeedMinRpm: 22, spindleSpeedMaxRpm: 2240, tailstockTaper: "Morse taper 4",
    threadPitchMinMm: 0.2, threadPitchMaxMm: 14, threadTpiMin: 2, threadTpiMax: 112, swingOverCrossSlideMm: 215, footprintLengthMm: 2450, footprintWidthMm: 1050,
    priceMinor: 17_900_00, currency: "EUR",
    toolingIncluded: "3-jaw chuck 200 mm, 4-jaw chuck 250 mm, faceplate, fixed steady, taper turning attachment, digital readout on both axes",
    description: "General overhaul in our Falkenmoor workshop: headstock bearings renewed, bed and saddle reground, new cross-slide nut and screw, fresh oil in every sump. The two-axis readout was fitted last year. Test certificate with this listing.",
  },
  {
    seller: "hollerbeck", paint: 1, photos: 2, daysAgo: 150, status: "published", category: "centre_lathe", condition: "used",
    make: "Talvera", model: "CL-410 Gap", year: 1999, serialNumber: "CL410-99-318",
    swingOverBedMm: 410, distanceBetweenCentresMm: 1500, spindleBoreMm: 58, spindleNose: "D1-6 camlock", motorPowerKw: 7.5, weightKg: 2250,
    supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50, spindleSpeedMinRpm: 25, spindleSpeedMaxRpm: 1600, tailstockTaper: "Morse taper 5",
    threadPitchMinMm: 0.5, threadPitchMaxMm: 12, swingOverCrossSlideMm: 255,
    priceMinor: 12_800_00, currency: "EUR",
    toolingIncluded: "3-jaw chuck, gap piece, coolant, foot brake",
    description: "Gap-bed lathe from a maintenance shop, used on one shift. Gap piece fitted and pinned. Spindle runs quiet and cool after an hour at top speed. Light marks on the bed near the chuck, no ridge.",
  },
  {
    seller: "rietmolen", paint: 5, photos: 2, daysAgo: 45, status: "published", category: "centre_lathe", condition: "used",
    make: "Ferrand-Oury", model: "FO 300", year: 1986, serialNumber: "FO3-86-0445",
    swingOverBedMm: 300, distanceBetweenCentresMm: 750, spindleBoreMm: 38, spindleNose: "D1-4 camlock", motorPowerKw: 3, weightKg: 980,
    supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50, spindleSpeedMinRpm: 45, spindleSpeedMaxRpm: 1800, tailstockTaper: "Morse taper 3",
    threadPitchMinMm: 0.25, threadPitchMaxMm: 6, footprintLengthMm: 1700, footprintWidthMm: 800,
    priceMinor: 7_450_00, currency: "EUR",
    toolingIncluded: "3-jaw chuck, faceplate, 4-way tool post, catch plate and centres",
    description: "Compact centre lathe from a Veldhaven instrument maker. Headstock and carriage in good order; the tailstock has seen hard use (see the report). Three-phase, 400 V.",
  },
  {
    seller: "rietmolen", paint: 3, photos: 2, daysAgo: 28, status: "published", category: "centre_lathe", condition: "used",
    make: "Orsay-Lindqvist", model: "OL 280", year: 1977, serialNumber: "OL280-6631",
    swingOverBedMm: 280, distanceBetweenCentresMm: 1000, spindleBoreMm: 36, spindleNose: "L0 long taper", motorPowerKw: 3, weightKg: 1200,
    priceMinor: 3_950_00, currency: "EUR",
    toolingIncluded: "3-jaw chuck, faceplate, change gears for metric and inch threads",
    description: "Old but honest lathe, headstock quiet. The tailstock sleeve is seized in its bore and needs freeing, so the tailstock could not be checked. Priced to suit.",
  },
  {
    seller: "private", paint: 2, photos: 2, daysAgo: 18, status: "published", category: "centre_lathe", condition: "used",
    make: "Kessling", model: "KD 200 Hobby", year: 2001, serialNumber: null,
    swingOverBedMm: 200, distanceBetweenCentresMm: 500, spindleBoreMm: 26, spindleNose: "Threaded 1½\"-8", motorPowerKw: 0.75, weightKg: 310,
    priceMinor: 38_000_00, currency: "SEK",
    toolingIncluded: "3-jaw chuck, a box of HSS tools, live centre, the original manual",
    description: "My garage lathe of twenty years; I am moving to a flat. Single-phase motor, runs on a household socket. Collect from Tärnvik; I can help load it onto a trailer.",
  },
  {
    seller: "dealer", paint: 2, photos: 3, daysAgo: 190, status: "published", category: "centre_lathe", condition: "reconditioned",
    make: "Brandmoor", model: "Series 13 x 30", year: 1990, serialNumber: "B13-2290",
    swingOverBedMm: 330, distanceBetweenCentresMm: 760, spindleBoreMm: 38, spindleNose: "D1-4 camlock", motorPowerKw: 2.2, weightKg: 980,
    priceMinor: 62_000_00, currency: "NOK",
    toolingIncluded: "3-jaw and 4-jaw chucks, fixed steady, quick-change gearbox for metric threads",
    description: "Brought over from Marlshire and reconditioned here: spindle bearings adjusted, carriage gibs re-set, new belts and a new motor contactor. A good first lathe for a jobbing shop.",
  },
  {
    seller: "vernois", paint: 1, photos: 3, daysAgo: 70, status: "published", category: "centre_lathe", condition: "used",
    make: "Ferrand-Oury", model: "FO 460", year: 1982, serialNumber: "FO4-82-1180",
    swingOverBedMm: 460, distanceBetweenCentresMm: 1500, spindleBoreMm: 62, spindleNose: "D1-8 camlock", motorPowerKw: 7.5, weightKg: 2800,
    priceMinor: 8_900_00, currency: "EUR",
    toolingIncluded: "4-jaw chuck 315 mm, faceplate 500 mm, fixed and travelling steadies",
    description: "Heavy-duty lathe from a railway workshop. Powerful and rigid; the bed shows its forty years near the chuck (see the report). Ideal for large, not-too-fine work.",
  },
  {
    seller: "brandmoor", paint: 4, photos: 2, daysAgo: 22, status: "published", category: "centre_lathe", condition: "used",
    make: "Brandmoor", model: "Series 17 x 60", year: 1998, serialNumber: "B17-0812",
    swingOverBedMm: 431.8, distanceBetweenCentresMm: 1524, spindleBoreMm: 80, spindleNose: "D1-8 camlock", motorPowerKw: 7.5, weightKg: 3100,
    priceMinor: 11_500_00, currency: "GBP",
    toolingIncluded: "3-jaw chuck 250 mm, fixed steady, coolant",
    description: "Long-bed big-bore lathe. 60 in between centres and an 80 mm bore take pipe and shaft work. Inch and metric threads from the gearbox.",
  },
  {
    seller: "hollerbeck", paint: 0, photos: 2, daysAgo: 95, status: "sold", category: "centre_lathe", condition: "used",
    make: "Varnholt", model: "L 300 Compact", year: 1994, serialNumber: null,
    swingOverBedMm: 300, distanceBetweenCentresMm: 650, spindleBoreMm: 40, spindleNose: "D1-4 camlock", motorPowerKw: 3, weightKg: 900,
    priceMinor: 8_400_00, currency: "EUR",
    toolingIncluded: "3-jaw chuck, tool post",
    description: "Sold to a workshop in Lindgau. Compact lathe with a clean bed and a quiet gearbox.",
  },
  {
    seller: "dealer", paint: 1, photos: 1, daysAgo: 130, status: "withdrawn", category: "centre_lathe", condition: "as_is",
    make: "Kessling", model: "KD 400 Long-bed", year: 1976, serialNumber: null,
    swingOverBedMm: 400, distanceBetweenCentresMm: 2000, spindleBoreMm: 52, spindleNose: "L1 long taper", motorPowerKw: 5.5, weightKg: 2600,
    priceMinor: 3_200_00, currency: "EUR",
    toolingIncluded: null,
    description: "Withdrawn: we are keeping it for our own rebuild programme.",
  },
  {
    seller: "vernois", paint: 5, photos: 3, daysAgo: 18, status: "published", category: "centre_lathe", condition: "reconditioned",
    make: "Ferrand-Oury", model: "FO 250 Apprentice", year: 1993, serialNumber: "FO2-93-3317",
    swingOverBedMm: 250, distanceBetweenCentresMm: 600, spindleBoreMm: 30, spindleNose: "D1-3 camlock", motorPowerKw: 1.5, weightKg: 640,
    priceMinor: 6_900_00, currency: "EUR",
    toolingIncluded: "3-jaw chuck, 4-jaw chuck, faceplate, quick-change tool post, collet closer with 5C collets",
    description: "A training-school lathe, rebuilt in our Saint-Aubrel shop: new spindle bearings, bed and saddle hand-scraped, every gib re-fitted. Small, precise and easy to move.",
  },
  {
    seller: "brandmoor", paint: 0, photos: 2, daysAgo: 9, status: "published", category: "centre_lathe", condition: "used",
    make: "Brandmoor", model: "Series 12 x 36", year: 2003, serialNumber: "B12-4417",
    swingOverBedMm: 304.8, distanceBetweenCentresMm: 914.4, spindleBoreMm: 38, spindleNose: "D1-4 camlock", motorPowerKw: 1.5, weightKg: 720,
    priceMinor: 4_850_00, currency: "GBP",
    toolingIncluded: "3-jaw chuck, faceplate, fixed and travelling steadies",
    description: "Late-model bench-height lathe from a model engineer's workshop. Very little wear; an inspection is booked so buyers can see the figures.",
  },

  // ————— Toolroom lathes —————
  {
    seller: "dealer", paint: 1, photos: 2, daysAgo: 30, status: "published", category: "toolroom_lathe", condition: "used",
    make: "Varnholt", model: "TR 250 Precision", year: 1979, serialNumber: "TR250-0391",
    swingOverBedMm: 250, distanceBetweenCentresMm: 500, spindleBoreMm: 26, spindleNose: "Collet nose, 5C", motorPowerKw: 1.5, weightKg: 820,
    priceMinor: 9_800_00, currency: "EUR",
    toolingIncluded: "Collet set 3–25 mm, taper turning attachment",
    description: "Toolroom lathe from a gauge maker's workshop, used for light finishing work all its life. Original paint, ways show very little wear near the headstock. Single-phase conversion not done; needs a 400 V supply.",
  },
  {
    seller: "hollerbeck", paint: 4, photos: 3, daysAgo: 120, status: "published", category: "toolroom_lathe", condition: "reconditioned",
    make: "Vintner-Hale", model: "VH 6 Toolroom", year: 1983, serialNumber: "VH6-1147",
    swingOverBedMm: 260, distanceBetweenCentresMm: 600, spindleBoreMm: 28, spindleNose: "D1-3 camlock", motorPowerKw: 2.2, weightKg: 1050,
    priceMinor: 21_500_00, currency: "EUR",
    toolingIncluded: "Precision 3-jaw chuck, collet chuck with 22 collets, relieving attachment, digital readout",
    description: "Precision toolroom lathe with a stepless spindle drive. Spindle bearings replaced and run in; bed hand-scraped to the maker's chart. Certificate of our own checks with this listing.",
  },
  {
    seller: "rietmolen", paint: 1, photos: 2, daysAgo: 50, status: "published", category: "toolroom_lathe", condition: "used",
    make: "Vintner-Hale", model: "VH 8 Toolroom", year: 1975, serialNumber: "VH8-0208",
    swingOverBedMm: 280, distanceBetweenCentresMm: 750, spindleBoreMm: 32, spindleNose: "D1-4 camlock", motorPowerKw: 3, weightKg: 1300,
    priceMinor: 7_200_00, currency: "EUR",
    toolingIncluded: "3-jaw chuck, collet closer, thread dial",
    description: "Older toolroom lathe, complete and running. Spindle bearings are due for renewal (see the report); otherwise a solid base for a precision rebuild.",
  },
  {
    seller: "vernois", paint: 4, photos: 2, daysAgo: 34, status: "published", category: "toolroom_lathe", condition: "used",
    make: "Varnholt", model: "TR 200 Gauge", year: 1987, serialNumber: "TR200-1522",
    swingOverBedMm: 200, distanceBetweenCentresMm: 450, spindleBoreMm: 22, spindleNose: "Collet nose, 5C", motorPowerKw: 1.1, weightKg: 560,
    priceMinor: 6_400_00, currency: "EUR",
    toolingIncluded: "5C collets 2–26 mm, lever collet closer. No tailstock: it was sold separately years ago",
    description: "Small gauge-room lathe without its tailstock (a replacement can be found). Headstock and carriage checked: see the report.",
  },
  {
    seller: "private", paint: 0, photos: 1, daysAgo: 6, status: "published", category: "toolroom_lathe", condition: "used",
    make: "Vintner-Hale", model: "VH 5", year: 1971, serialNumber: null,
    swingOverBedMm: 240, distanceBetweenCentresMm: 500, spindleBoreMm: 25, spindleNose: "D1-3 camlock", motorPowerKw: 1.1, weightKg: 700,
    priceMinor: 54_000_00, currency: "SEK",
    toolingIncluded: "Collet chuck and collets, steady rest",
    description: "Bought from a closing watch-parts maker and used lightly at home since. An inspector is booked to check it; you may come along.",
  },
  {
    seller: "brandmoor", paint: 5, photos: 0, daysAgo: 0, status: "draft", category: "toolroom_lathe", condition: "used",
    make: "Varnholt", model: "TR 280", year: 1990, serialNumber: null,
    swingOverBedMm: 280, distanceBetweenCentresMm: 600, spindleBoreMm: 30, spindleNose: "D1-4 camlock", motorPowerKw: 2.2, weightKg: 980,
    priceMinor: 8_750_00, currency: "GBP",
    toolingIncluded: null,
    description: "Draft: arriving next week from a toolroom in Marlshire.",
  },

  // ————— CNC lathes —————
  {
    seller: "vernois", paint: 1, photos: 2, daysAgo: 80, status: "published", category: "cnc_lathe", condition: "reconditioned",
    make: "Talvera", model: "TC-6 Slant", year: 2008, serialNumber: "TC6-08-0417",
    swingOverBedMm: 520, distanceBetweenCentresMm: 600, spindleBoreMm: 66, spindleNose: "A2-6", motorPowerKw: 15, weightKg: 4200,
    priceMinor: 38_000_00, currency: "EUR",
    toolingIncluded: "12-station turret with 8 holders, hydraulic 3-jaw chuck, programmable tailstock, chip conveyor",
    description: "Slant-bed CNC lathe, control and servo drives serviced, new way wipers and turret seals. 18 400 spindle hours. Can be shown under power by appointment.",
  },
  {
    seller: "hollerbeck", paint: 2, photos: 3, daysAgo: 15, status: "published", category: "cnc_lathe", condition: "used",
    make: "Okkerdal", model: "OK-42 Turn", year: 2012, serialNumber: "OK42-12-0093", spindleBoreMm: 52, spindleNose: "A2-5", swingOverBedMm: 420, distanceBetweenCentresMm: 500,
    motorPowerKw: 11, weightKg: 3600,
    priceMinor: 46_000_00, currency: "EUR",
    toolingIncluded: "8-station turret, hydraulic chuck 210 mm, bar feeder interface, parts catcher",
    description: "Two-axis CNC lathe from a one-shift production cell. 22 000 spindle hours, serviced every year by the maker's agent. Manuals and ladder diagrams included.",
  },
  {
    seller: "rietmolen", paint: 4, photos: 2, daysAgo: 44, status: "published", category: "cnc_lathe", condition: "reconditioned",
    make: "Okkerdal", model: "OK-26 Compact", year: 2016, serialNumber: "OK26-16-0311", spindleBoreMm: 42, spindleNose: "A2-5", swingOverBedMm: 300, distanceBetweenCentresMm: 350,
    motorPowerKw: 7.5, weightKg: 2300,
    priceMinor: 29_500_00, currency: "EUR",
    toolingIncluded: "Gang tooling plate with 6 holders, collet chuck, coolant through the spindle",
    description: "Small gang-tool CNC lathe, ideal for short bar work. Ball screws replaced last year; backlash now below 3 µm on both axes.",
  },
  {
    seller: "brandmoor", paint: 1, photos: 1, daysAgo: 200, status: "sold", category: "cnc_lathe", condition: "used",
    make: "Talvera", model: "TC-4 Slant", year: 2005, serialNumber: null, spindleBoreMm: 46, spindleNose: "A2-5", swingOverBedMm: 400, distanceBetweenCentresMm: 450,
    motorPowerKw: 11, weightKg: 3300,
    priceMinor: 18_750_00, currency: "GBP",
    toolingIncluded: "10-station turret, hydraulic chuck",
    description: "Sold. Slant-bed CNC lathe, shown under power to the buyer in our yard.",
  },
  {
    seller: "dealer", paint: 4, photos: 2, daysAgo: 8, status: "published", category: "cnc_lathe", condition: "as_is",
    make: "Okkerdal", model: "OK-65 Bar", year: 2010, serialNumber: "OK65-10-0027", spindleBoreMm: 80, spindleNose: "A2-8", swingOverBedMm: 650, distanceBetweenCentresMm: 1000,
    motorPowerKw: 22, weightKg: 6800,
    priceMinor: 180_000_00, currency: "NOK",
    toolingIncluded: "12-station turret, hydraulic chuck 315 mm, steady rest",
    description: "Big-bore CNC lathe out of an offshore supply shop. Control powers up; the Z-axis drive shows an alarm that we have not traced. Sold as is, with the spare drive board that came with it.",
  },

  // ————— Vertical machining centres —————
  {
    seller: "rietmolen", paint: 3, photos: 3, daysAgo: 36, status: "published", category: "machining_centre", condition: "used",
    make: "Brevelle", model: "VX 850", tableLengthMm: 1000, tableWidthMm: 500, year: 2011, ...none, serialNumber: "VX850-11-0262", spindleNose: "ISO 40", motorPowerKw: 15, weightKg: 6200,
    priceMinor: 58_000_00, currency: "EUR",
    toolingIncluded: "24-place tool changer, 30 holders ISO 40, 4th-axis interface, chip conveyor, coolant through the spindle",
    description: "Vertical machining centre, travels 850 × 500 × 510 mm. 21 000 spindle hours in a two-shift mould shop; ball screws and way covers serviced two years ago. Can be shown cutting.",
  },
  {
    seller: "hollerbeck", paint: 5, photos: 2, daysAgo: 12, status: "published", category: "machining_centre", condition: "reconditioned",
    make: "Kalmbrook", model: "KV-600", tableLengthMm: 800, tableWidthMm: 420, year: 2015, ...none, serialNumber: "KV6-15-1138", spindleNose: "ISO 40", motorPowerKw: 11, weightKg: 4300,
    priceMinor: 44_500_00, currency: "EUR",
    toolingIncluded: "20-place carousel, 20 holders, machine vice, probe interface",
    description: "Compact vertical machining centre, travels 600 × 400 × 450 mm. New X and Y ball screws and spindle bearings, control backed up and serviced. Laser-checked after the rebuild.",
  },

  // ————— Milling machines —————
  {
    seller: "hollerbeck", paint: 0, photos: 3, daysAgo: 33, status: "published", category: "milling_machine", condition: "reconditioned",
    make: "Rocholt", model: "FK 3 Knee Mill", tableLengthMm: 1100, tableWidthMm: 260, year: 1987, ...none, serialNumber: "FK3-87-4410", spindleNose: "ISO 40", motorPowerKw: 3, weightKg: 1450,
    supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50, spindleSpeedMinRpm: 45, spindleSpeedMaxRpm: 2000, footprintLengthMm: 1900, footprintWidthMm: 1700,
    priceMinor: 8_900_00, currency: "EUR",
    toolingIncluded: "Machine vice 150 mm, ISO 40 collet chuck, arbor for side-and-face cutters, power feed on X",
    description: "Knee-type mill with vertical and horizontal spindles. Table and saddle ways reground, new table screw and nut, spindle bearings renewed. Table 1100 × 260 mm.",
  },
  {
    seller: "brandmoor", paint: 3, photos: 2, daysAgo: 57, status: "published", category: "milling_machine", condition: "used",
    make: "Rocholt", model: "FK 2", tableLengthMm: 800, tableWidthMm: 200, year: 1979, ...none, spindleNose: "ISO 30", motorPowerKw: 1.5, weightKg: 900,
    priceMinor: 3_450_00, currency: "GBP",
    toolingIncluded: "Swivel vice, a set of collets",
    description: "Small knee mill from a school workshop. Table travel 600 mm, little wear in the middle of the table. Single-shot lubrication works.",
  },
  {
    seller: "rietmolen", paint: 1, photos: 3, daysAgo: 21, status: "published", category: "milling_machine", condition: "used",
    make: "Rocholt", model: "UW 4 Universal", tableLengthMm: 1200, tableWidthMm: 280, year: 1992, ...none, serialNumber: "UW4-92-0178", spindleNose: "ISO 40", motorPowerKw: 4, weightKg: 1900,
    priceMinor: 12_400_00, currency: "EUR",
    toolingIncluded: "Universal dividing head, rotary table 250 mm, slotting head, vice",
    description: "Universal mill with swivelling table and a full set of accessories. Ideal for a toolroom. Power feeds on all three axes.",
  },
  {
    seller: "vernois", paint: 5, photos: 2, daysAgo: 40, status: "published", category: "milling_machine", condition: "used",
    make: "Ferrand-Oury", model: "FV 5 Vertical", tableLengthMm: 1000, tableWidthMm: 250, year: 1985, ...none, spindleNose: "ISO 40", motorPowerKw: 4, weightKg: 1700,
    priceMinor: 7_800_00, currency: "EUR",
    toolingIncluded: "Vice, drill chuck, 2-axis readout",
    description: "Vertical bed-type mill with a quill feed and a readout on X and Y. Strong and quiet; the table has a few old vice marks.",
  },
  {
    seller: "vernois", paint: 2, photos: 1, daysAgo: 160, status: "withdrawn", category: "milling_machine", condition: "as_is",
    make: "Rocholt", model: "FK 4 Heavy", year: 1974, ...none, spindleNose: "ISO 50", motorPowerKw: 7.5, weightKg: 3200,
    priceMinor: 4_100_00, currency: "EUR",
    toolingIncluded: null,
    description: "Withdrawn while we decide whether to break it for parts.",
  },
  {
    seller: "dealer", paint: 3, photos: 0, daysAgo: 0, status: "draft", category: "milling_machine", condition: "reconditioned",
    make: "Kessling", model: "KF 30 Vertical", year: 1996, ...none, spindleNose: "ISO 30", motorPowerKw: 2.2, weightKg: 1100,
    priceMinor: 11_200_00, currency: "EUR",
    toolingIncluded: "Vice, collet chuck, power feed",
    description: "Draft: a vertical mill in our rebuild queue; photos once the paint is dry.",
  },

  // ————— Surface grinders —————
  {
    seller: "hollerbeck", paint: 4, photos: 2, daysAgo: 48, status: "published", category: "surface_grinder", condition: "reconditioned",
    make: "Tessendal", model: "SG 618", tableLengthMm: 450, tableWidthMm: 150, year: 1998, ...none, motorPowerKw: 1.5, weightKg: 1100,
    supplyVoltage: 230, supplyPhases: 3, supplyFrequencyHz: 50, spindleSpeedMinRpm: 2850, spindleSpeedMaxRpm: 2850, footprintLengthMm: 1750, footprintWidthMm: 1200,
    priceMinor: 6_800_00, currency: "EUR",
    toolingIncluded: "Magnetic chuck 450 × 150 mm, wheel balancing stand, diamond dresser, two spare wheels",
    description: "Hand-feed surface grinder, wheel-head spindle rebuilt and balanced. Table ways re-scraped. Grinds flat to within a couple of micrometres over the chuck.",
  },
  {
    seller: "rietmolen", paint: 2, photos: 3, daysAgo: 65, status: "published", category: "surface_grinder", condition: "used",
    make: "Tessendal", model: "SG 1020 Hydraulic", tableLengthMm: 500, tableWidthMm: 250, year: 2003, ...none, motorPowerKw: 4, weightKg: 2900,
    priceMinor: 14_900_00, currency: "EUR",
    toolingIncluded: "Electro-permanent chuck 500 × 250 mm, coolant with magnetic separator, dust extraction",
    description: "Hydraulic surface grinder with automatic cross feed and down feed. Serviced last year; hydraulic oil and filters new.",
  },
  {
    seller: "brandmoor", paint: 3, photos: 1, daysAgo: 210, status: "published", category: "surface_grinder", condition: "as_is",
    make: "Tessendal", model: "SG 612 Hand", tableLengthMm: 300, tableWidthMm: 150, year: 1975, ...none, motorPowerKw: 0.75, weightKg: 650,
    priceMinor: 1_250_00, currency: "GBP",
    toolingIncluded: "Magnetic chuck (weak)",
    description: "Small hand grinder, sold as is. Spindle runs; the magnetic chuck holds weakly and may need re-magnetising.",
  },
  {
    seller: "dealer", paint: 0, photos: 2, daysAgo: 36, status: "published", category: "surface_grinder", condition: "used",
    make: "Tessendal", model: "SG 824", tableLengthMm: 600, tableWidthMm: 200, year: 1989, ...none, motorPowerKw: 2.2, weightKg: 1600,
    priceMinor: 74_000_00, currency: "NOK",
    toolingIncluded: "Magnetic chuck 600 × 200 mm, dresser",
    description: "Mid-size surface grinder from a die shop. Table hydraulics smooth, wheel-head spindle quiet. Can be seen grinding in Ostervik.",
  },

  // ————— Other machine tools —————
  {
    seller: "vernois", paint: 3, photos: 2, daysAgo: 88, status: "published", category: "other", condition: "used",
    make: "Merrow & Pask", model: "S 18 Shaping Machine", year: 1961, ...none, motorPowerKw: 1.5, weightKg: 1250,
    priceMinor: 2_900_00, currency: "EUR",
    toolingIncluded: "Machine vice, clapper box tools",
    description: "18-inch stroke shaping machine, still cutting keyways every week in our shop. Ram ways oiled by hand. A piece of workshop history that still earns its keep.",
  },
  {
    seller: "brandmoor", paint: 5, photos: 2, daysAgo: 42, status: "published", category: "other", condition: "used",
    make: "Merrow & Pask", model: "T&C 2 Tool and Cutter Grinder", year: 1984, ...none, motorPowerKw: 0.55, weightKg: 480,
    priceMinor: 2_150_00, currency: "GBP",
    toolingIncluded: "Universal work head, tooth rests, collet set, a selection of cup and dish wheels",
    description: "Universal tool and cutter grinder for end mills, reamers and lathe tools. Table slides free and smooth.",
  },
  {
    seller: "rietmolen", paint: 0, photos: 1, daysAgo: 14, status: "published", category: "other", condition: "reconditioned",
    make: "Merrow & Pask", model: "S 24 Shaping Machine", year: 1968, ...none, motorPowerKw: 2.2, weightKg: 1800,
    priceMinor: 4_400_00, currency: "EUR",
    toolingIncluded: "Vice, tool head with clapper box, set of shaping tools",
    description: "Rebuilt 24-inch shaper: ram gibs re-fitted, new crank block, fresh paint. Guarded belt drive to today's rules.",
  },
];

/** Which drawing shows a listing's machine. */
function drawingOf(listing: Pick<DemoListing, "category" | "model">): MachineDrawing {
  // An enclosed machine either way: the CNC drawing is the nearest for a machining centre.
  if (listing.category === "cnc_lathe" || listing.category === "machining_centre") return "cnc-lathe";
  if (listing.category === "milling_machine") return "mill";
  if (listing.category === "surface_grinder") return "grinder";
  if (listing.category === "other") return /grinder/i.test(listing.model) ? "grinder" : "shaper";
  return "lathe";
}

type Variants = Awaited<ReturnType<typeof makePhotoVariants>>;

// Listings that share a drawing, paint and view share its pixels: each picture is drawn and processed once.
const drawn = new Map<string, Promise<Variants>>();
function photoVariants(drawing: MachineDrawing, paint: number, view: number) {
  const key = `${drawing}:${paint}:${view}`;
  let variants = drawn.get(key);
  if (!variants) {
    // 1024 × 768 is enough for the large view and keeps the seed quick on a small machine.
    variants = drawMachinePhoto({ drawing, paint: paints[paint % paints.length], view, width: 1024, height: 768 }).then(makePhotoVariants);
    drawn.set(key, variants);
  }
  return variants;
}

/** Writes the demo listings with their photos for the sellers given by key; returns how many were written. */
export async function seedDemoListings(sellers: Record<DemoSellerKey, string>, now = new Date()) {
  const db = getDatabase();
  // Draw every distinct picture first, two at a time (sharp runs on the thread pool).
  const pictures = [...new Set(demoListings.flatMap((demo) => Array.from({ length: demo.photos }, (_, view) => `${drawingOf(demo)}:${demo.paint}:${view}`)))];
  for (let i = 0; i < pictures.length; i += 2) {
    await Promise.all(pictures.slice(i, i + 2).map((key) => {
      const [drawing, paint, view] = key.split(":");
      return photoVariants(drawing as MachineDrawing, Number(paint), Number(view));
    }));
  }
  for (const demo of demoListings) {
    const { seller, paint, photos, daysAgo, place, ...columns } = demo;
    const listedAt = new Date(now.getTime() - daysAgo * 86_400_000);
    const wasPublished = columns.status !== "draft";
    const endedAt = new Date(listedAt.getTime() + Math.max(1, Math.round(daysAgo / 2)) * 86_400_000);
    await db.insert(sellerPages).values({ userId: sellers[seller] }).onConflictDoNothing();
    const [listing] = await db
      .insert(listings)
      .values({
        ...columns,
        ...(place ?? yards[seller]),
        sellerId: sellers[seller],
        slug: makeSlug({ make: columns.make, model: columns.model, category: columns.category, year: columns.year ?? null }),
        publishedAt: wasPublished ? listedAt : null,
        soldAt: columns.status === "sold" ? endedAt : null,
        withdrawnAt: columns.status === "withdrawn" ? endedAt : null,
        createdAt: listedAt,
        updatedAt: columns.status === "sold" || columns.status === "withdrawn" ? endedAt : listedAt,
      })
      .returning({ id: listings.id });
    for (let view = 0; view < photos; view++) {
      const photoId = randomUUID();
      const variants = await photoVariants(drawingOf(demo), paint, view);
      const prefix = `listings/${listing!.id}/photos/${photoId}`;
      await writeObject({ key: `${prefix}/thumb.webp`, body: variants.thumbnail, contentType: "image/webp" });
      await writeObject({ key: `${prefix}/large.webp`, body: variants.large, contentType: "image/webp" });
      await db.insert(listingPhotos).values({
        id: photoId,
        listingId: listing!.id,
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
  return demoListings.length;
}
