// Expected failures of the inspections domain; routes turn them into a clear message and a 4xx.

/** Someone else's booking holds this time: the database's exclusion constraint refused ours. */
export class SlotTakenError extends Error {
  override name = "SlotTakenError";
  constructor() {
    super("This slot was just taken by another booking. Nothing was charged — please choose another slot.");
  }
}

/** The action is not allowed for this booking, user or listing (status 403/404/409/422 as given). */
export class BookingRuleError extends Error {
  override name = "BookingRuleError";
  constructor(
    message: string,
    readonly status: 403 | 404 | 409 | 422 = 422,
    readonly field?: string,
  ) {
    super(message);
  }
}

/** PostgreSQL's SQLSTATE for an exclusion-constraint violation. */
export const EXCLUSION_VIOLATION = "23P01";

export function isExclusionViolation(error: unknown, constraint?: string): boolean {
  // Drizzle wraps the driver's error; the SQLSTATE is on the error or its cause.
  for (let current = error as { code?: string; constraint?: string; cause?: unknown } | undefined; current; current = current.cause as typeof current) {
    if (current.code === EXCLUSION_VIOLATION) return constraint ? current.constraint === constraint : true;
  }
  return false;
}
