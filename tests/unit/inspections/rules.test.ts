import { addHours } from "date-fns";
import { describe, expect, it } from "vitest";
import { refundFor, splitFee } from "~/modules/inspections/rules";

// The refund rules are our own written terms (README, "Inspection bookings, payment and refunds").
const startsAt = new Date("2027-03-10T08:00:00Z");
const fee = 40_000;

describe("refund rules", () => {
  it("refund in full when the inspector declines or cancels, or before acceptance", () => {
    expect(refundFor({ by: "inspector", status: "paid", feeMinor: fee, startsAt, at: addHours(startsAt, -1) })).toMatchObject({ rule: "inspector_declined", amountMinor: fee });
    expect(refundFor({ by: "inspector", status: "accepted", feeMinor: fee, startsAt, at: addHours(startsAt, -1) })).toMatchObject({ rule: "inspector_cancelled", amountMinor: fee });
    expect(refundFor({ by: "buyer", status: "paid", feeMinor: fee, startsAt, at: addHours(startsAt, -2) })).toMatchObject({ rule: "before_acceptance", amountMinor: fee });
  });

  it("scale the buyer's refund of an accepted booking by notice: 72 h and more full, 24–72 h half, less nothing", () => {
    const at = (hoursBefore: number) => refundFor({ by: "buyer", status: "accepted", feeMinor: fee, startsAt, at: addHours(startsAt, -hoursBefore) });
    expect(at(72)).toMatchObject({ rule: "ample_notice", amountMinor: fee });
    expect(at(71.9)).toMatchObject({ rule: "short_notice", amountMinor: fee / 2 });
    expect(at(24)).toMatchObject({ rule: "short_notice", amountMinor: fee / 2 });
    expect(at(23.9)).toMatchObject({ rule: "late_notice", amountMinor: 0 });
    expect(at(-3)).toMatchObject({ rule: "late_notice", amountMinor: 0 });
  });

  it("split a fee into the platform's 15 % and the inspector's share without losing a cent", () => {
    expect(splitFee(39_500)).toEqual({ platformFeeMinor: 5_925, inspectorShareMinor: 33_575 });
    for (const amount of [1_001, 12_345, 99_999]) {
      const { platformFeeMinor, inspectorShareMinor } = splitFee(amount);
      expect(platformFeeMinor + inspectorShareMinor).toBe(amount);
    }
  });
});
