// The demo's rebuilt lathe: an invented scenario. The Orsay-Lindqvist OL 400 that Brandmoor listed "for a rebuild"
// (signed report, grade D, fourteen months ago) was sold to the Ostervik dealer, who rebuilt it and listed it again.
// The record and the machine match go through the domains' own functions, as the dealer would enter them.
import { and, eq } from "drizzle-orm";
import { getDatabase } from "~/db/client.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { listings } from "~/modules/listings/schema";
import { confirmMatch } from "~/modules/machines/service.server";
import { saveRebuild } from "~/modules/rebuilds/service.server";
import type { DemoPerson } from "./inspections.server";

const DAY = 86_400_000;
const dayOf = (now: Date, daysAgo: number) => new Date(now.getTime() - daysAgo * DAY).toISOString().slice(0, 10);

export async function seedDemoRebuild(dealer: DemoPerson, now = new Date()) {
  const db = getDatabase();
  const [earlier] = await db.select().from(listings).where(and(eq(listings.model, "OL 400"), eq(listings.make, "Orsay-Lindqvist")));
  const [rebuilt] = await db.select().from(listings).where(and(eq(listings.model, "OL-400"), eq(listings.make, "Orsay-Lindqvist")));
  if (!earlier || !rebuilt) throw new Error("demo rebuild: the two OL 400 listings are missing");
  // Brandmoor sold it as seen after its inspection; the report stays on the earlier listing.
  const soldAt = new Date(now.getTime() - 400 * DAY);
  await db.update(listings).set({ status: "sold", soldAt, updatedAt: soldAt }).where(eq(listings.id, earlier.id));

  const seller: SessionUser = { id: dealer.id, email: dealer.email, name: dealer.name, emailVerified: true, roles: ["seller"], displayUnits: "mm", inspectorStatus: "none" };
  const due = dayOf(now, -200);
  const saved = await saveRebuild(
    db,
    seller,
    rebuilt.id,
    {
      units: "mm",
      profile: { key: "centre-lathe-normal", version: 1 },
      instruments: [
        { id: "i1", kind: "lever-indicator", description: "Orvik lever indicator, 0.001 mm", resolution: "1", calibrationDue: due },
        { id: "i2", kind: "test-mandrel", description: "Test mandrel, 300 mm, in the spindle's taper", resolution: "", calibrationDue: "" },
      ],
      asFound: {
        measuredOn: dayOf(now, 75),
        tests: {
          "L-SP-NOSE": { kind: "sweep", readings: ["0", "9", "18", "8"], instrumentId: "i1" },
          "L-SP-SLIP": { kind: "sweep", readings: ["0", "7", "14", "6"], instrumentId: "i1" },
          "L-SP-PAR-V": { kind: "mandrel", near0: "0", near180: "0", far0: "52", far180: "36", instrumentId: "i1" },
          "L-SP-PAR-H": { kind: "mandrel", near0: "0", near180: "0", far0: "-18", far180: "-30", instrumentId: "i1" },
        },
      },
      asRebuilt: {
        measuredOn: dayOf(now, 10),
        tests: {
          "L-SP-NOSE": { kind: "sweep", readings: ["0", "2", "4", "2"], instrumentId: "i1" },
          "L-SP-SLIP": { kind: "sweep", readings: ["0", "2", "3", "1"], instrumentId: "i1" },
          "L-SP-PAR-V": { kind: "mandrel", near0: "0", near180: "0", far0: "12", far180: "4", instrumentId: "i1" },
          "L-SP-PAR-H": { kind: "mandrel", near0: "0", near180: "0", far0: "-4", far180: "-8", instrumentId: "i1" },
        },
      },
      workDone: ["bearings-adjusted", "headstock-shimmed", "ways-scraped", "gibs-adjusted", "levelled"],
      notes:
        "Thrust bearings preloaded, then the nut backed off 15° on its 1.5 mm thread for about 0.06 mm running clearance; end float read 0.02 mm.\nRear pad of the headstock shimmed 60 µm until the mandrel read true, then the seating scraped in four pads and the shim taken out.\nBed ways scraped over the first 600 mm where the chuck wore them; gibs refitted.",
    },
    true,
  );
  if (!saved.ok) throw new Error(`demo rebuild was refused: ${JSON.stringify(saved.errors)}`);
  // The dealer confirms the suggested match: the rebuilt listing shows the earlier one's signed report.
  await confirmMatch(db, seller, rebuilt.id, earlier.id);
  return 1;
}
