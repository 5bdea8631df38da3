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
    /** Stripe allows 30 minutes to 24 hours. */
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
  idempotencyKey: z.string().min(1).max(255).optional(),
});

const transferInput = z.object({
  amountMinor: z.number().int().positive(),
  currency: z
    .string()
    .regex(/^[A-Za-z]{3}$/)
    .transform((code) => code.toLowerCase()),
  /** The inspector's connected account (`acct_…`). */
  destination: z.string().startsWith("acct_"),
  bookingId: z.string().min(1).max(200),
  /** The charge the money came from: lets Stripe pay out before the charge's funds are available. */
  sourceChargeId: z.string().startsWith("ch_").optional(),
  idempotencyKey: z.string().min(1).max(255).optional(),
});

export type CheckoutSessionInput = z.input<typeof checkoutInput>;
export type RefundInput = z.input<typeof refundInput>;
export type TransferInput = z.input<typeof transferInput>;

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

export type RefundSummary = { id: string; amountMinor: number; currency: string; status: string | null; paymentIntentId: string | null };
export type TransferSummary = { id: string; amountMinor: number; currency: string; destination: string; transferGroup: string | null };

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
            expires_at: Math.floor(Date.now() / 1000) + booking.expiresInMinutes * 60,
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
      const idempotencyKey = refund.idempotencyKey ?? `refund:${refund.bookingId}:${refund.paymentIntentId}:${refund.amountMinor ?? "rest"}`;
      const created = await call(() =>
        stripe.refunds.create(
          {
            payment_intent: refund.paymentIntentId,
            ...(refund.amountMinor ? { amount: refund.amountMinor } : {}),
            reason: "requested_by_customer",
            metadata: { booking_id: refund.bookingId, refund_reason: refund.reason },
          },
          { idempotencyKey },
        ),
      );
      return {
        id: created.id,
        amountMinor: created.amount,
        currency: created.currency,
        status: created.status,
        paymentIntentId: idOf(created.payment_intent),
      };
    },

    /** Records the inspector's payout for a booking as a transfer to their connected account. */
    async recordTransfer(input: TransferInput): Promise<TransferSummary> {
      const payout = transferInput.parse(input);
      const idempotencyKey = payout.idempotencyKey ?? `transfer:${payout.bookingId}:${payout.destination}:${payout.amountMinor}`;
      const transfer = await call(() =>
        stripe.transfers.create(
          {
            amount: payout.amountMinor,
            currency: payout.currency,
            destination: payout.destination,
            transfer_group: transferGroupOf(payout.bookingId),
            ...(payout.sourceChargeId ? { source_transaction: payout.sourceChargeId } : {}),
            metadata: { booking_id: payout.bookingId },
          },
          { idempotencyKey },
        ),
      );
      return {
        id: transfer.id,
        amountMinor: transfer.amount,
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
export const verifyWebhook = (rawBody: string, signatureHeader: string | null) => payments().verifyWebhook(rawBody, signatureHeader);
