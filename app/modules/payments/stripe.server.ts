// The one door to Stripe. Configured only from the STRIPE_* environment (the local stand-in or Stripe
// itself, same code), it speaks the app's words (booking, amounts in minor units) and turns Stripe's
// failures into three typed errors a page can explain.
//
// Money model: separate charges and transfers. The buyer pays the whole fee to the platform through
// Checkout; the inspector's share is paid out later with `recordTransfer` (same `transfer_group`), so the
// platform fee is what stays. Stripe accepts `application_fee_amount` only on direct or destination
// charges, so it is not sent here; the fee travels in metadata instead.
import Stripe from "stripe";
import { z } from "zod";
import { env, type Environment } from "~/env.server";

/** Stripe or its stand-in did not answer, timed out, or failed on its side: nothing to fix in the request. */
export class PaymentsUnavailableError extends Error {
  override name = "PaymentsUnavailableError";
}

/** Stripe refused the request as made (e.g. refunding more than is left, a card declined, a bad parameter). */
export class PaymentsRejectedError extends Error {
  override name = "PaymentsRejectedError";
  constructor(
    message: string,
    readonly code: string | undefined,
    readonly param: string | undefined,
    readonly statusCode: number | undefined,
    options?: ErrorOptions,
  ) {
    super(message, options);
  }
}

export type WebhookSignatureProblem = "missing" | "mismatch" | "stale" | "malformed" | "not_an_event";

/** A webhook that is not provably from Stripe, or too old to trust: answer 400 and change nothing. */
export class WebhookSignatureError extends Error {
  override name = "WebhookSignatureError";
  constructor(
    message: string,
    readonly problem: WebhookSignatureProblem,
    options?: ErrorOptions,
  ) {
    super(message, options);
  }
}

/** What every event we act on has; a signed body without it is refused with 400, not failed on with 500. */
const webhookEventShape = z.object({
  id: z.string().min(1),
  type: z.string().min(1),
  data: z.object({ object: z.record(z.string(), z.unknown()) }),
});

/**
 * Stripe refuses a Checkout session whose `expires_at` is less than 30 minutes after it receives the request,
 * with no slack, and the SDK resends the same body when it retries; so the shortest session asked for is this
 * many minutes longer than 30.
 */
export const checkoutExpiryMarginMinutes = 5;

/** Seconds a webhook signature stays valid: Stripe's own default tolerance. */
export const webhookToleranceSeconds = 300;

export type PaymentsConfig = {
  secretKey: string;
  webhookSecret: string;
  host?: string;
  port?: number;
  protocol?: "http" | "https";
  timeoutMs: number;
  maxNetworkRetries: number;
};

export function paymentsConfig(environment: Environment = env()): PaymentsConfig {
  return {
    secretKey: environment.STRIPE_SECRET_KEY,
    webhookSecret: environment.STRIPE_WEBHOOK_SECRET,
    host: environment.STRIPE_API_HOST,
    port: environment.STRIPE_API_PORT,
    protocol: environment.STRIPE_API_PROTOCOL,
    timeoutMs: environment.STRIPE_TIMEOUT_MS,
    // A local stand-in answers at once or not at all; Stripe itself is retried safely with idempotency keys.
    maxNetworkRetries: environment.STRIPE_MAX_NETWORK_RETRIES ?? (environment.STRIPE_API_HOST ? 0 : 2),
  };
}

const checkoutInput = z
  .object({
    bookingId: z.string().min(1).max(200),
    amountMinor: z.number().int().positive(),
    currency: z
      .string()
      .regex(/^[A-Za-z]{3}$/, { error: "must be a three-letter ISO currency code" })
      .transform((code) => code.toLowerCase()),
    description: z.string().trim().min(1).max(250),
    platformFeeMinor: z.number().int().min(0),
    /** May contain `{CHECKOUT_SESSION_ID}`, which Stripe replaces with the session's id. */
    successUrl: z.url(),
    cancelUrl: z.url(),
    customerEmail: z.email().optional(),
    /** Stripe allows 30 minutes to 24 hours; below 30 + the margin, the margin is added. */
    expiresInMinutes: z.number().int().min(30).max(1440).default(30),
    idempotencyKey: z.string().min(1).max(255).optional(),
  })
  .refine((input) => input.platformFeeMinor <= input.amountMinor, { error: "cannot be more than the amount", path: ["platformFeeMinor"] });

const refundInput = z.object({
  paymentIntentId: z.string().startsWith("pi_"),
  /** Leave out to refund whatever is left of the payment. */
  amountMinor: z.number().int().positive().optional(),
  /** Our own words for why (kept in the refund's metadata; Stripe's `reason` is a fixed list). */
  reason: z.string().trim().min(1).max(500),
  bookingId: z.string().min(1).max(200),
  /**
   * Our record of this refund, written before the request: its id is the idempotency key, so a retry of this
   * refund is answered with the same refund, and a second refund of the same amount is a refund of its own.
   */
  refundRecordId: z.string().min(1).max(200),
});

const transferInput = z.object({
  amountMinor: z.number().int().positive(),
  currency: z
    .string()
    .regex(/^[A-Za-z]{3}$/)
    .transform((code) => code.toLowerCase()),
  /** The inspector's connected account (`acct_…`), as stored when they set up payouts. */
  destination: z.string().regex(/^acct_[A-Za-z0-9]+$/),
  bookingId: z.string().min(1).max(200),
  /**
   * The charge the money came from (`source_transaction`): Stripe makes the transfer at once, even while the
   * charge's funds are still pending, and the inspector's money becomes available when the charge's does.
   */
  sourceChargeId: z.string().startsWith("ch_").or(z.string().startsWith("py_")),
});

const reversalInput = z.object({
  transferId: z.string().startsWith("tr_"),
  amountMinor: z.number().int().positive(),
  bookingId: z.string().min(1).max(200),
  /** Our record of the reversal; its id is the idempotency key. */
  reversalRecordId: z.string().min(1).max(200),
});

const payoutAccountInput = z.object({
  userId: z.string().min(1).max(200),
  email: z.email(),
  country: z.string().regex(/^[A-Z]{2}$/).default("DE"),
});

const onboardingLinkInput = z.object({
  accountId: z.string().regex(/^acct_[A-Za-z0-9]+$/),
  returnUrl: z.url(),
  refreshUrl: z.url(),
});

export type CheckoutSessionInput = z.input<typeof checkoutInput>;
export type RefundInput = z.input<typeof refundInput>;
export type TransferInput = z.input<typeof transferInput>;
export type ReversalInput = z.input<typeof reversalInput>;

export type CheckoutSessionSummary = {
  id: string;
  /** The hosted payment page; null once the session is complete or expired. */
  url: string | null;
  status: Stripe.Checkout.Session.Status;
  paymentStatus: Stripe.Checkout.Session.PaymentStatus;
  amountTotalMinor: number;
  currency: string;
  bookingId: string | null;
  paymentIntentId: string | null;
  customerEmail: string | null;
  expiresAt: Date;
};

export type PaymentSummary = {
  id: string;
  status: Stripe.PaymentIntent.Status;
  amountMinor: number;
  amountReceivedMinor: number;
  amountRefundedMinor: number;
  currency: string;
  latestChargeId: string | null;
  bookingId: string | null;
  /** Why the last attempt failed, in Stripe's words (e.g. "Your card was declined."). */
  lastPaymentError: string | null;
};

export type RefundStatus = "pending" | "succeeded" | "failed" | "canceled";

export type RefundSummary = {
  id: string;
  amountMinor: number;
  currency: string;
  /** Card refunds usually answer `succeeded`; bank debits and some cards answer `pending` and settle later, or fail. */
  status: RefundStatus;
  failureReason: string | null;
  paymentIntentId: string | null;
  bookingId: string | null;
};
export type TransferSummary = { id: string; amountMinor: number; amountReversedMinor: number; currency: string; destination: string; transferGroup: string | null };
export type ReversalSummary = { id: string; amountMinor: number; currency: string; transferId: string };

/** A connected account's state in the words the app needs. */
export type PayoutAccountState = {
  accountId: string;
  detailsSubmitted: boolean;
  transfersCapability: "active" | "inactive" | "pending";
  payoutsEnabled: boolean;
  /** Stripe's `currently_due` and `past_due`, without repeats. */
  requirementsDue: string[];
  disabledReason: string | null;
};

export function summariseAccount(account: Stripe.Account): PayoutAccountState {
  const due = [...(account.requirements?.currently_due ?? []), ...(account.requirements?.past_due ?? [])];
  const transfers = account.capabilities?.transfers;
  return {
    accountId: account.id,
    detailsSubmitted: account.details_submitted,
    transfersCapability: transfers === "active" ? "active" : transfers === "pending" ? "pending" : "inactive",
    payoutsEnabled: account.payouts_enabled,
    requirementsDue: [...new Set(due)].sort(),
    disabledReason: account.requirements?.disabled_reason ?? null,
  };
}

export function summariseRefund(refund: Stripe.Refund): RefundSummary {
  const status = refund.status === "pending" || refund.status === "failed" || refund.status === "canceled" ? refund.status : "succeeded";
  return {
    id: refund.id,
    amountMinor: refund.amount,
    currency: refund.currency,
    status: refund.status === "requires_action" ? "pending" : status,
    failureReason: refund.failure_reason ?? null,
    paymentIntentId: idOf(refund.payment_intent),
    bookingId: refund.metadata?.booking_id ?? null,
  };
}

export const transferGroupOf = (bookingId: string) => `booking_${bookingId}`;

function idOf(value: string | { id: string } | null | undefined): string | null {
  if (!value) return null;
  return typeof value === "string" ? value : value.id;
}

function summariseSession(session: Stripe.Checkout.Session): CheckoutSessionSummary {
  return {
    id: session.id,
    url: session.url,
    status: session.status ?? "open",
    paymentStatus: session.payment_status,
    amountTotalMinor: session.amount_total ?? 0,
    currency: session.currency ?? "",
    bookingId: session.metadata?.booking_id ?? session.client_reference_id ?? null,
    paymentIntentId: idOf(session.payment_intent),
    customerEmail: session.customer_details?.email ?? session.customer_email ?? null,
    expiresAt: new Date(session.expires_at * 1000),
  };
}

/** Stripe's own errors, sorted into "try again later" and "this request was refused". */
function translate(error: unknown): unknown {
  if (
    error instanceof Stripe.errors.StripeConnectionError ||
    error instanceof Stripe.errors.StripeAPIError ||
    error instanceof Stripe.errors.StripeRateLimitError
  ) {
    return new PaymentsUnavailableError("Payments are unavailable right now: the payment service did not answer. Please try again in a few minutes.", {
      cause: error,
    });
  }
  if (
    error instanceof Stripe.errors.StripeInvalidRequestError ||
    error instanceof Stripe.errors.StripeCardError ||
    error instanceof Stripe.errors.StripeIdempotencyError
  ) {
    return new PaymentsRejectedError(error.message, error.code, error.param, error.statusCode, { cause: error });
  }
  // Authentication and permission errors are configuration mistakes: let them surface as they are.
  return error;
}

async function call<T>(request: () => Promise<T>): Promise<T> {
  try {
    return await request();
  } catch (error) {
    throw translate(error);
  }
}

export type PaymentsClient = ReturnType<typeof createPaymentsClient>;

export function createPaymentsClient(config: PaymentsConfig) {
  const stripe = new Stripe(config.secretKey, {
    ...(config.host ? { host: config.host } : {}),
    ...(config.port ? { port: config.port } : {}),
    ...(config.protocol ? { protocol: config.protocol } : {}),
    maxNetworkRetries: config.maxNetworkRetries,
    timeout: config.timeoutMs,
    appInfo: { name: "Tenthmark" },
  });

  return {
    /** A one-off Checkout payment for a booking's inspection fee; the booking id travels in metadata. */
    async createCheckoutSession(input: CheckoutSessionInput): Promise<CheckoutSessionSummary> {
      const booking = checkoutInput.parse(input);
      const metadata = { booking_id: booking.bookingId, platform_fee_minor: String(booking.platformFeeMinor) };
      const session = await call(() =>
        stripe.checkout.sessions.create(
          {
            mode: "payment",
            line_items: [
              {
                quantity: 1,
                price_data: { currency: booking.currency, unit_amount: booking.amountMinor, product_data: { name: booking.description } },
              },
            ],
            success_url: booking.successUrl,
            cancel_url: booking.cancelUrl,
            client_reference_id: booking.bookingId,
            ...(booking.customerEmail ? { customer_email: booking.customerEmail } : {}),
            expires_at: Math.floor(Date.now() / 1000) + Math.max(booking.expiresInMinutes, 30 + checkoutExpiryMarginMinutes) * 60,
            metadata,
            payment_intent_data: { description: booking.description, metadata, transfer_group: transferGroupOf(booking.bookingId) },
          },
          booking.idempotencyKey ? { idempotencyKey: booking.idempotencyKey } : undefined,
        ),
      );
      return summariseSession(session);
    },

    async retrieveCheckoutSession(id: string): Promise<CheckoutSessionSummary> {
      return summariseSession(await call(() => stripe.checkout.sessions.retrieve(id)));
    },

    /** Ends an unpaid session early (e.g. the slot was taken meanwhile), so it can no longer be paid. */
    async expireCheckoutSession(id: string): Promise<CheckoutSessionSummary> {
      return summariseSession(await call(() => stripe.checkout.sessions.expire(id)));
    },

    async retrievePayment(paymentIntentId: string): Promise<PaymentSummary> {
      const intent = await call(() => stripe.paymentIntents.retrieve(paymentIntentId, { expand: ["latest_charge"] }));
      const charge = typeof intent.latest_charge === "object" ? intent.latest_charge : null;
      return {
        id: intent.id,
        status: intent.status,
        amountMinor: intent.amount,
        amountReceivedMinor: intent.amount_received,
        amountRefundedMinor: charge?.amount_refunded ?? 0,
        currency: intent.currency,
        latestChargeId: idOf(intent.latest_charge),
        bookingId: intent.metadata?.booking_id ?? null,
        lastPaymentError: intent.last_payment_error?.message ?? null,
      };
    },

    /** Refunds a payment in full (no amount) or in part; the same request twice refunds once. */
    async refundPayment(input: RefundInput): Promise<RefundSummary> {
      const refund = refundInput.parse(input);
      const created = await call(() =>
        stripe.refunds.create(
          {
            payment_intent: refund.paymentIntentId,
            ...(refund.amountMinor ? { amount: refund.amountMinor } : {}),
            reason: "requested_by_customer",
            metadata: { booking_id: refund.bookingId, refund_record: refund.refundRecordId, refund_reason: refund.reason },
          },
          { idempotencyKey: `refund:${refund.refundRecordId}` },
        ),
      );
      return summariseRefund(created);
    },

    /** An Express connected account for an inspector; one per person (the key is their user id). */
    async createPayoutAccount(input: z.input<typeof payoutAccountInput>): Promise<PayoutAccountState> {
      const person = payoutAccountInput.parse(input);
      const account = await call(() =>
        stripe.accounts.create(
          {
            type: "express",
            country: person.country,
            email: person.email,
            business_type: "individual",
            capabilities: { transfers: { requested: true } },
            metadata: { user_id: person.userId },
          },
          { idempotencyKey: `payout-account:${person.userId}` },
        ),
      );
      return summariseAccount(account);
    },

    async retrievePayoutAccount(accountId: string): Promise<PayoutAccountState> {
      return summariseAccount(await call(() => stripe.accounts.retrieve(accountId)));
    },

    /** A short-lived, single-use link to the hosted onboarding (or update) of the account. */
    async createOnboardingLink(input: z.input<typeof onboardingLinkInput>): Promise<{ url: string; expiresAt: Date }> {
      const link = onboardingLinkInput.parse(input);
      const created = await call(() =>
        stripe.accountLinks.create({ account: link.accountId, type: "account_onboarding", return_url: link.returnUrl, refresh_url: link.refreshUrl }),
      );
      return { url: created.url, expiresAt: new Date(created.expires_at * 1000) };
    },

    /** Takes back part of a transfer (a refund after the payout); the same record twice reverses once. */
    async reverseTransfer(input: ReversalInput): Promise<ReversalSummary> {
      const reversal = reversalInput.parse(input);
      const created = await call(() =>
        stripe.transfers.createReversal(
          reversal.transferId,
          { amount: reversal.amountMinor, metadata: { booking_id: reversal.bookingId, reversal_record: reversal.reversalRecordId } },
          { idempotencyKey: `reversal:${reversal.reversalRecordId}` },
        ),
      );
      return { id: created.id, amountMinor: created.amount, currency: created.currency, transferId: idOf(created.transfer) ?? reversal.transferId };
    },

    /** Records the inspector's payout for a booking as a transfer to their connected account. */
    async recordTransfer(input: TransferInput): Promise<TransferSummary> {
      const payout = transferInput.parse(input);
      // One transfer per booking, ever: the key names the booking alone.
      const idempotencyKey = `transfer:${payout.bookingId}`;
      const transfer = await call(() =>
        stripe.transfers.create(
          {
            amount: payout.amountMinor,
            currency: payout.currency,
            destination: payout.destination,
            transfer_group: transferGroupOf(payout.bookingId),
            source_transaction: payout.sourceChargeId,
            metadata: { booking_id: payout.bookingId },
          },
          { idempotencyKey },
        ),
      );
      return {
        id: transfer.id,
        amountMinor: transfer.amount,
        amountReversedMinor: transfer.amount_reversed,
        currency: transfer.currency,
        destination: idOf(transfer.destination) ?? payout.destination,
        transferGroup: transfer.transfer_group,
      };
    },

    /**
     * The event in a webhook request, once its `Stripe-Signature` proves it came from Stripe within the
     * tolerance. `rawBody` must be the body exactly as received (not parsed and re-serialised).
     */
    verifyWebhook(rawBody: string, signatureHeader: string | null): Stripe.Event {
      if (!signatureHeader) throw new WebhookSignatureError("The Stripe-Signature header is missing.", "missing");
      let event: Stripe.Event;
      try {
        event = stripe.webhooks.constructEvent(rawBody, signatureHeader, config.webhookSecret, webhookToleranceSeconds);
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        const problem: WebhookSignatureProblem = /tolerance/i.test(message)
          ? "stale"
          : /matching the expected signature/i.test(message)
            ? "mismatch"
            : "malformed";
        throw new WebhookSignatureError(`Webhook signature rejected (${problem}): ${message.split("\n")[0]}`, problem, { cause: error });
      }
      // The SDK only refuses old timestamps; one from the future is as untrustworthy (a replay kept for later).
      const signedAt = Number(/(?:^|,)\s*t=(\d+)/.exec(signatureHeader)?.[1]);
      if (signedAt > Math.floor(Date.now() / 1000) + webhookToleranceSeconds) {
        throw new WebhookSignatureError(`Webhook signature rejected (stale): the timestamp is more than ${webhookToleranceSeconds} s in the future.`, "stale");
      }
      if (!webhookEventShape.safeParse(event).success) {
        throw new WebhookSignatureError("Webhook rejected (not_an_event): the body is not a Stripe event with an id, a type and data.object.", "not_an_event");
      }
      return event;
    },
  };
}

let configured: PaymentsClient | undefined;

/** The client configured from the environment, made on first use. */
function payments(): PaymentsClient {
  configured ??= createPaymentsClient(paymentsConfig());
  return configured;
}

export const createCheckoutSession = (input: CheckoutSessionInput) => payments().createCheckoutSession(input);
export const retrieveCheckoutSession = (id: string) => payments().retrieveCheckoutSession(id);
export const expireCheckoutSession = (id: string) => payments().expireCheckoutSession(id);
export const retrievePayment = (paymentIntentId: string) => payments().retrievePayment(paymentIntentId);
export const refundPayment = (input: RefundInput) => payments().refundPayment(input);
export const recordTransfer = (input: TransferInput) => payments().recordTransfer(input);
export const reverseTransfer = (input: ReversalInput) => payments().reverseTransfer(input);
export const createPayoutAccount = (input: z.input<typeof payoutAccountInput>) => payments().createPayoutAccount(input);
export const retrievePayoutAccount = (accountId: string) => payments().retrievePayoutAccount(accountId);
export const createOnboardingLink = (input: z.input<typeof onboardingLinkInput>) => payments().createOnboardingLink(input);
export const verifyWebhook = (rawBody: string, signatureHeader: string | null) => payments().verifyWebhook(rawBody, signatureHeader);
