// The written terms of a paid inspection: the platform's fee, the refund rules and the order of a booking's
// statuses. Pure, so the booking page shows exactly the rules the server applies.

export type BookingStatus =
  | "awaiting_payment"
  | "paid"
  | "accepted"
  | "report_filed"
  | "closed"
  | "declined"
  | "cancelled"
  | "refunded"
  | "expired";

/** The booking states in which an inspector has taken on, or done, the visit to a listing's machine. */
export const VISIT_TAKEN_ON: readonly BookingStatus[] = ["accepted", "report_filed", "closed"];

export const bookingStatusLabels: Record<BookingStatus, string> = {
  awaiting_payment: "Awaiting payment",
  paid: "Paid, waiting for the inspector",
  accepted: "Accepted and scheduled",
  report_filed: "Report filed",
  closed: "Closed",
  declined: "Declined, refund on its way",
  cancelled: "Cancelled",
  refunded: "Refunded",
  expired: "Not paid in time, slot released",
};

export const bookingStatusTones: Record<BookingStatus, "neutral" | "within" | "beyond" | "caution" | "brass"> = {
  awaiting_payment: "caution",
  paid: "brass",
  accepted: "within",
  report_filed: "within",
  closed: "neutral",
  declined: "beyond",
  cancelled: "neutral",
  refunded: "neutral",
  expired: "neutral",
};

/** Statuses that hold the inspector's time (the database's exclusion constraint covers the same list). */
export const activeStatuses: readonly BookingStatus[] = ["awaiting_payment", "paid", "accepted", "report_filed"];

/** The platform keeps this share of each fee; the rest is the inspector's, recorded as a transfer. */
export const PLATFORM_FEE_RATE = 0.15;

/** How long the buyer has to pay before the held slot is released (Stripe's shortest session lifetime). */
export const CHECKOUT_MINUTES = 30;

export function splitFee(feeMinor: number): { platformFeeMinor: number; inspectorShareMinor: number } {
  const platformFeeMinor = Math.round(feeMinor * PLATFORM_FEE_RATE);
  return { platformFeeMinor, inspectorShareMinor: feeMinor - platformFeeMinor };
}

const HOUR = 3_600_000;
export const FULL_REFUND_NOTICE_HOURS = 72;
export const HALF_REFUND_NOTICE_HOURS = 24;

export type RefundRule = "inspector_declined" | "inspector_cancelled" | "before_acceptance" | "ample_notice" | "short_notice" | "late_notice" | "slot_lost" | "admin";

export type RefundDecision = { rule: RefundRule; percent: number; amountMinor: number; explanation: string };

/** The refund rules as shown to the buyer before paying, in the order they are applied. */
export const refundRulesText: ReadonlyArray<{ rule: RefundRule; text: string }> = [
  { rule: "inspector_declined", text: "The inspector declines your request: the whole fee is refunded." },
  { rule: "inspector_cancelled", text: "The inspector cancels an accepted booking: the whole fee is refunded." },
  { rule: "before_acceptance", text: "You cancel before the inspector has accepted: the whole fee is refunded." },
  {
    rule: "ample_notice",
    text: `You cancel an accepted booking at least ${FULL_REFUND_NOTICE_HOURS} hours before it starts: the whole fee is refunded.`,
  },
  {
    rule: "short_notice",
    text: `You cancel between ${FULL_REFUND_NOTICE_HOURS} and ${HALF_REFUND_NOTICE_HOURS} hours before the start: half the fee is refunded.`,
  },
  {
    rule: "late_notice",
    text: `You cancel less than ${HALF_REFUND_NOTICE_HOURS} hours before the start, or after it: nothing is refunded, as the inspector has kept the day for you.`,
  },
  { rule: "slot_lost", text: "Your payment arrives after the slot was released and someone else took it: the whole fee is refunded." },
];

function decision(rule: RefundRule, percent: number, feeMinor: number): RefundDecision {
  const explanation = refundRulesText.find((entry) => entry.rule === rule)?.text ?? "";
  return { rule, percent, amountMinor: Math.round((feeMinor * percent) / 100), explanation };
}

/** What the buyer gets back when a paid booking ends early, by who ends it and how much notice they give. */
export function refundFor({
  by,
  status,
  feeMinor,
  startsAt,
  at,
}: {
  by: "inspector" | "buyer" | "system";
  status: BookingStatus;
  feeMinor: number;
  startsAt: Date;
  at: Date;
}): RefundDecision {
  if (by === "system") return decision("slot_lost", 100, feeMinor);
  if (by === "inspector") return decision(status === "accepted" ? "inspector_cancelled" : "inspector_declined", 100, feeMinor);
  if (status === "paid") return decision("before_acceptance", 100, feeMinor);
  const noticeHours = (startsAt.getTime() - at.getTime()) / HOUR;
  if (noticeHours >= FULL_REFUND_NOTICE_HOURS) return decision("ample_notice", 100, feeMinor);
  if (noticeHours >= HALF_REFUND_NOTICE_HOURS) return decision("short_notice", 50, feeMinor);
  return decision("late_notice", 0, feeMinor);
}

/** Short, unambiguous booking references to quote on the phone or in an e-mail (no 0/O or 1/I). */
export function bookingReference(random: () => number = Math.random): string {
  const alphabet = "ABCDEFGHJKLMNPQRSTUVWXYZ23456789";
  let out = "";
  for (let i = 0; i < 8; i++) out += alphabet[Math.floor(random() * alphabet.length)];
  return `IB-${out.slice(0, 4)}-${out.slice(4)}`;
}
