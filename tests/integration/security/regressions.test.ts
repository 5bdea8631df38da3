// Faults the hardening suite found in the app, each pinned by the smallest test that shows it.
import { addDays, addHours } from "date-fns";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { getOwnProfile, removeSlot } from "~/modules/inspections/profiles.server";
import { inspectorSlots } from "~/modules/inspections/schema";
import { certifiedInspector, heldBooking } from "../../support/inspections";

const db = getDatabase();

describe("an inspector's own slots", () => {
  it("are free while only other inspectors' bookings are active, and can be removed", async () => {
    // An active booking of someone else, elsewhere in time: it must not mark this inspector's slots booked.
    await heldBooking();
    const inspector = await certifiedInspector();
    const startsAt = addHours(addDays(new Date(), 40), 3);
    const [free] = await db.insert(inspectorSlots).values({ inspectorId: inspector.id, startsAt, endsAt: addHours(startsAt, 4) }).returning();
    const { slots } = await getOwnProfile(db, inspector.id);
    expect(slots.map((slot) => [slot.id, slot.booked])).toEqual([
      [inspector.slot.id, false],
      [free!.id, false],
    ]);
    await removeSlot(db, inspector.id, free!.id);
    expect((await getOwnProfile(db, inspector.id)).slots.map((slot) => slot.id)).toEqual([inspector.slot.id]);
  });
});
