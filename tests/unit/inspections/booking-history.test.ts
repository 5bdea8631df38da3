import { describe, expect, it } from "vitest";
import { historyFor } from "~/modules/inspections/booking-view.server";

const at = new Date("2026-12-04T10:00:00Z");
const event = (kind: string, toStatus: string | null, note: string | null = null) =>
  ({ id: kind, bookingId: "b", kind, fromStatus: null, toStatus, actorId: null, note, createdAt: at }) as never;
const events = [
  event("report_filed", "report_filed"),
  event("share_held", null, "held until payout set-up"),
  event("payout_recorded", "closed", "transfer tr_123"),
];

describe("a booking's history by role", () => {
  it("tells the buyer and the seller no payout lines and no transfer ids; a payout that closed the booking is the inspection completed", () => {
    for (const role of ["buyer", "seller"] as const) {
      const shown = historyFor(role, events);
      expect(shown.map((entry) => entry.kind)).toEqual(["report_filed", "completed"]);
      expect(shown.every((entry) => entry.note === null)).toBe(true);
      expect(JSON.stringify(shown)).not.toContain("tr_123");
    }
  });

  it("keeps the payout lines for the inspector, and the notes for staff", () => {
    expect(historyFor("inspector", events).map((entry) => entry.kind)).toEqual(["report_filed", "share_held", "payout_recorded"]);
    expect(historyFor("admin", events)[2]!.note).toBe("transfer tr_123");
  });
});
