// The payments the stand-in keeps: Checkout sessions, their payment intents and charges, refunds and
// transfers, with the events each change sends. Shapes and rules follow Stripe's v1 API for the subset
// Tenthmark uses; anything else is refused with Stripe's "unknown parameter" error.
import { checkCard, checkIban, type CardInput } from "./cards.ts";
import { ApiError, invalidParam, missingParam, noSuch } from "./errors.ts";
import type { FormObject } from "./form.ts";
import {
  currency,
  expandPaths,
  metadata,
  optionalArray,
  optionalInteger,
  optionalObject,
  optionalString,
  positiveInteger,
  refuseUnknown,
  url,
} from "./params.ts";
import {
  newId,
  now,
  type Charge,
  type CheckoutSession,
  type Delivery,
  type Event,
  type LineItem,
  type PaymentIntent,
  type Refund,
  type BalanceTransaction,
  type Store,
  type StripeObject,
} from "./state.ts";
import type { WebhookDeliverer } from "./webhooks.ts";

/** The API version the SDK in this repository speaks; events carry it like Stripe's do. */
export const defaultApiVersion = "2026-10-28.endive";

export type RequestContext = { idempotencyKey: string | null; apiVersion: string | null; stripeAccount: string | null };

export type PayOutcome =
  | { outcome: "paid"; session: CheckoutSession; paymentIntent: PaymentIntent; redirectUrl: string | null; deliveries: Delivery[] }
  | { outcome: "declined"; error: ApiError; paymentIntent: PaymentIntent };

const collections = {
  cs_test_: "sessions",
  pi_: "payment_intents",
  ch_: "charges",
  re_: "refunds",
  trr_: "transfer_reversals",
  tr_: "transfers",
  acct_: "accounts",
  txn_: "balance_transactions",
} as const;

/** A copy without the stand-in's own `_` fields, as the API shows it. */
export function publicView<T extends object>(object: T): Record<string, unknown> {
  return JSON.parse(JSON.stringify(object, (key, value) => (key.startsWith("_") ? undefined : value)));
}

/** Formats an amount in minor units the way people read it, e.g. 12000 eur → "€120.00". */
export function formatAmount(amountMinor: number, currencyCode: string): string {
  const format = new Intl.NumberFormat("en", { style: "currency", currency: currencyCode.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(amountMinor / 10 ** digits);
}

export class PaymentsLedger {
  constructor(
    private readonly store: Store,
    private readonly deliverer: WebhookDeliverer,
    private readonly options: { publicOrigin: string; awaitDeliveryMs: number },
  ) {}

  private get state() {
    return this.store.state;
  }

  // ── lookups ──────────────────────────────────────────────────────────────────────────────────────────

  private find(id: string): StripeObject | undefined {
    for (const [prefix, collection] of Object.entries(collections)) {
      if (id.startsWith(prefix)) return (this.state[collection] as Record<string, StripeObject>)[id];
    }
    return undefined;
  }

  /** `expand[]=payment_intent`, `expand[]=payment_intent.latest_charge`: ids replaced by their objects. */
  expand(object: StripeObject, paths: string[]): Record<string, unknown> {
    const view = publicView(object);
    for (const path of paths) {
      let node: Record<string, unknown> | undefined = view;
      const segments = path.split(".");
      for (const [index, segment] of segments.entries()) {
        if (!node) break;
        const value: unknown = node[segment];
        if (typeof value === "string") {
          const found = this.find(value);
          if (!found) break;
          node[segment] = publicView(found);
        } else if (value === undefined || (value !== null && typeof value !== "object")) {
          throw invalidParam(`expand[${paths.indexOf(path)}]`, `This property cannot be expanded (${segments.slice(0, index + 1).join(".")}).`);
        }
        node = node[segment] as Record<string, unknown> | undefined;
      }
    }
    return view;
  }

  session(id: string): CheckoutSession {
    this.expireDueSessions();
    const session = this.state.sessions[id];
    if (!session) throw noSuch("checkout.session", id);
    return session;
  }

  // ── events ───────────────────────────────────────────────────────────────────────────────────────────

  /** Records an event with a snapshot of the object and starts its delivery; resolves after the first attempt. */
  emit(type: string, object: StripeObject, apiVersion: string, context?: RequestContext, account?: string): Promise<Delivery> {
    const event: Event = {
      id: newId("evt_"),
      object: "event",
      ...(account ? { account } : {}),
      api_version: apiVersion,
      created: now(),
      data: { object: publicView(object) },
      livemode: false,
      pending_webhooks: 1,
      request: { id: context ? newId("req_", 14) : null, idempotency_key: context?.idempotencyKey ?? null },
      type,
    };
    this.state.events[event.id] = event;
    this.state.event_order.push(event.id);
    return this.deliverer.enqueue(event);
  }

  /** Waits for first delivery attempts, but never longer than `awaitDeliveryMs` (the app may be slow or down). */
  async settle(deliveries: Promise<Delivery>[]): Promise<Delivery[]> {
    let timer: NodeJS.Timeout | undefined;
    const timeout = new Promise<"timeout">((resolve) => {
      timer = setTimeout(() => resolve("timeout"), this.options.awaitDeliveryMs);
    });
    const all = Promise.all(deliveries);
    const result = await Promise.race([all, timeout]);
    clearTimeout(timer);
    return result === "timeout" ? [] : result;
  }

  event(id: string): Event {
    const event = this.state.events[id];
    if (!event) throw noSuch("event", id);
    return event;
  }

  listEvents(params: FormObject) {
    refuseUnknown(params, ["limit", "starting_after", "ending_before", "type", "types", "created", "delivery_success"]);
    const limit = optionalInteger(params.limit, "limit") ?? 10;
    if (limit < 1 || limit > 100) throw invalidParam("limit", "This value must be between 1 and 100.");
    const type = optionalString(params.type, "type");
    const types = optionalArray(params.types, "types")?.map(String);
    let ids = [...this.state.event_order].reverse();
    if (type) {
      const pattern = new RegExp(`^${type.replace(/[.+?^${}()|[\]\\]/g, "\\$&").replace(/\*/g, ".*")}$`);
      ids = ids.filter((id) => pattern.test(this.state.events[id]!.type));
    }
    if (types) ids = ids.filter((id) => types.includes(this.state.events[id]!.type));
    const startingAfter = optionalString(params.starting_after, "starting_after");
    if (startingAfter) {
      const index = ids.indexOf(startingAfter);
      if (index === -1) throw noSuch("event", startingAfter, "starting_after");
      ids = ids.slice(index + 1);
    }
    const endingBefore = optionalString(params.ending_before, "ending_before");
    if (endingBefore) {
      const index = ids.indexOf(endingBefore);
      if (index === -1) throw noSuch("event", endingBefore, "ending_before");
      ids = ids.slice(Math.max(0, index - limit), index);
    }
    return { object: "list", data: ids.slice(0, limit).map((id) => this.state.events[id]), has_more: ids.length > limit, url: "/v1/events" };
  }

  resend(eventId: string): Promise<Delivery> {
    this.event(eventId);
    return this.deliverer.resend(eventId);
  }

  // ── checkout sessions ────────────────────────────────────────────────────────────────────────────────

  createSession(params: FormObject, context: RequestContext) {
    refuseUnknown(params, [
      "mode",
      "line_items",
      "success_url",
      "cancel_url",
      "metadata",
      "client_reference_id",
      "customer_email",
      "expires_at",
      "payment_intent_data",
      "payment_method_types",
      "locale",
      "expand",
    ]);
    const mode = optionalString(params.mode, "mode");
    if (!mode) throw missingParam("mode");
    if (mode !== "payment") throw invalidParam("mode", `The payments stand-in supports mode "payment" only, not "${mode}".`);

    const rawItems = optionalArray(params.line_items, "line_items");
    if (!rawItems || rawItems.length === 0) throw missingParam("line_items");
    const lineItems: LineItem[] = rawItems.map((raw, index) => {
      const name = `line_items[${index}]`;
      const item = optionalObject(raw, name)!;
      refuseUnknown(item, ["price_data", "quantity"], name);
      const priceData = optionalObject(item.price_data, `${name}[price_data]`);
      if (!priceData) throw missingParam(`${name}[price_data]`);
      refuseUnknown(priceData, ["currency", "unit_amount", "product_data"], `${name}[price_data]`);
      const itemCurrency = optionalString(priceData.currency, `${name}[price_data][currency]`);
      if (!itemCurrency) throw missingParam(`${name}[price_data][currency]`);
      const unitAmount = optionalInteger(priceData.unit_amount, `${name}[price_data][unit_amount]`);
      if (unitAmount === undefined) throw missingParam(`${name}[price_data][unit_amount]`);
      if (unitAmount < 0) throw invalidParam(`${name}[price_data][unit_amount]`, "This value must be greater than or equal to 0.");
      const productData = optionalObject(priceData.product_data, `${name}[price_data][product_data]`);
      if (!productData) throw missingParam(`${name}[price_data][product_data]`);
      refuseUnknown(productData, ["name", "description"], `${name}[price_data][product_data]`);
      const productName = optionalString(productData.name, `${name}[price_data][product_data][name]`);
      if (!productName) throw missingParam(`${name}[price_data][product_data][name]`);
      const quantity = optionalInteger(item.quantity, `${name}[quantity]`);
      if (quantity === undefined) throw missingParam(`${name}[quantity]`);
      positiveInteger(quantity, `${name}[quantity]`);
      return {
        description: productName,
        quantity,
        unit_amount: unitAmount,
        amount_total: unitAmount * quantity,
        currency: currency(itemCurrency, `${name}[price_data][currency]`),
      };
    });
    const sessionCurrency = lineItems[0]!.currency;
    if (lineItems.some((item) => item.currency !== sessionCurrency)) {
      throw invalidParam("line_items", "All line items of a Checkout Session must share one currency.");
    }
    const amountTotal = lineItems.reduce((sum, item) => sum + item.amount_total, 0);
    if (amountTotal <= 0) throw invalidParam("line_items", "The total of a payment-mode Checkout Session must be above zero.", "amount_too_small");

    const successUrl = optionalString(params.success_url, "success_url");
    const cancelUrl = optionalString(params.cancel_url, "cancel_url");
    const customerEmail = optionalString(params.customer_email, "customer_email");
    if (customerEmail !== undefined && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(customerEmail)) {
      throw invalidParam("customer_email", `Invalid email address: ${customerEmail}`, "email_invalid");
    }
    const created = now();
    const expiresAt = optionalInteger(params.expires_at, "expires_at") ?? created + 24 * 3600;
    // Stripe allows 30 minutes to 24 hours and no slack: a request resent a moment later with the same value is refused.
    if (expiresAt < created + 30 * 60) {
      throw invalidParam("expires_at", "The `expires_at` timestamp must be at least 30 minutes from Checkout Session creation.");
    }
    if (expiresAt > created + 24 * 3600 + 60) {
      throw invalidParam("expires_at", "The `expires_at` timestamp must be less than 24 hours from Checkout Session creation.");
    }

    const intentParams = optionalObject(params.payment_intent_data, "payment_intent_data") ?? {};
    refuseUnknown(intentParams, ["application_fee_amount", "description", "metadata", "transfer_group", "transfer_data"], "payment_intent_data");
    const applicationFee = optionalInteger(intentParams.application_fee_amount, "payment_intent_data[application_fee_amount]") ?? null;
    const transferParams = optionalObject(intentParams.transfer_data, "payment_intent_data[transfer_data]");
    let transferData: CheckoutSession["_payment_intent_data"]["transfer_data"] = null;
    if (transferParams) {
      refuseUnknown(transferParams, ["destination", "amount"], "payment_intent_data[transfer_data]");
      const destination = optionalString(transferParams.destination, "payment_intent_data[transfer_data][destination]");
      if (!destination) throw missingParam("payment_intent_data[transfer_data][destination]");
      const amount = optionalInteger(transferParams.amount, "payment_intent_data[transfer_data][amount]");
      if (!this.state.accounts[destination]) throw new ApiError(400, "invalid_request_error", `No such destination: '${destination}'`, "resource_missing", "payment_intent_data[transfer_data][destination]");
      transferData = { destination, ...(amount === undefined ? {} : { amount }) };
    }
    if (applicationFee !== null) {
      // Stripe takes an application fee only on a direct or a destination charge.
      if (!transferData && !context.stripeAccount) {
        throw invalidParam(
          "payment_intent_data[application_fee_amount]",
          "Can only apply an application_fee_amount when the PaymentIntent is attempting a direct payment (using an OAuth key or Stripe-Account header) or destination payment (using `transfer_data[destination]`).",
        );
      }
      if (applicationFee < 0 || applicationFee > amountTotal) {
        throw invalidParam("payment_intent_data[application_fee_amount]", "The application fee cannot be negative or more than the amount of the payment.");
      }
    }

    const id = newId("cs_test_", 58);
    const session: CheckoutSession = {
      id,
      object: "checkout.session",
      amount_subtotal: amountTotal,
      amount_total: amountTotal,
      cancel_url: cancelUrl === undefined ? null : url(cancelUrl, "cancel_url"),
      client_reference_id: optionalString(params.client_reference_id, "client_reference_id", 200) ?? null,
      created,
      currency: sessionCurrency,
      customer_details: null,
      customer_email: customerEmail ?? null,
      expires_at: expiresAt,
      livemode: false,
      metadata: metadata(params.metadata),
      mode: "payment",
      payment_intent: null,
      payment_status: "unpaid",
      status: "open",
      success_url: successUrl === undefined ? null : url(successUrl, "success_url"),
      url: `${this.options.publicOrigin}/pay/${id}`,
      _line_items: lineItems,
      _payment_intent_data: {
        application_fee_amount: applicationFee,
        description: optionalString(intentParams.description, "payment_intent_data[description]") ?? null,
        metadata: metadata(intentParams.metadata, "payment_intent_data[metadata]"),
        transfer_group: optionalString(intentParams.transfer_group, "payment_intent_data[transfer_group]") ?? null,
        transfer_data: transferData,
      },
      _api_version: context.apiVersion ?? defaultApiVersion,
    };
    const expand = expandPaths(params);
    this.state.sessions[id] = session;
    this.store.save();
    return this.expand(session, expand);
  }

  retrieveSession(id: string, params: FormObject) {
    refuseUnknown(params, ["expand"]);
    return this.expand(this.session(id), expandPaths(params));
  }

  async expireSession(id: string, params: FormObject, context: RequestContext) {
    refuseUnknown(params, ["expand"]);
    const session = this.session(id);
    if (session.status !== "open") {
      throw new ApiError(400, "invalid_request_error", `Only Checkout Sessions with a status in ["open"] can be expired; this one is "${session.status}".`, "checkout_session_not_open");
    }
    const delivery = this.expire(session, context);
    await this.settle([delivery]);
    return this.expand(session, expandPaths(params));
  }

  private expire(session: CheckoutSession, context?: RequestContext): Promise<Delivery> {
    session.status = "expired";
    session.url = null;
    const intent = session.payment_intent ? this.state.payment_intents[session.payment_intent] : undefined;
    if (intent && intent.status === "requires_payment_method") {
      intent.status = "canceled";
      intent.canceled_at = now();
    }
    const delivery = this.emit("checkout.session.expired", session, session._api_version, context);
    this.store.save();
    return delivery;
  }

  /** Sessions past their `expires_at` expire as they would at Stripe (checked on every request and on a timer). */
  expireDueSessions() {
    const current = now();
    for (const session of Object.values(this.state.sessions)) {
      if (session.status === "open" && session.expires_at <= current) void this.expire(session);
    }
  }

  // ── paying on the checkout page ──────────────────────────────────────────────────────────────────────

  async pay(sessionId: string, card: CardInput, email?: string): Promise<PayOutcome> {
    const session = this.session(sessionId);
    if (session.status === "expired") {
      throw new ApiError(400, "invalid_request_error", "This checkout session has expired and can no longer be paid.", "checkout_session_expired");
    }
    if (session.status === "complete") {
      throw new ApiError(400, "invalid_request_error", "This checkout session has already been paid.", "checkout_session_complete");
    }
    const intent = this.intentFor(session);
    const check = checkCard(card);
    const paymentMethod = newId("pm_");
    intent.payment_method = paymentMethod;
    if (!check.ok) {
      intent.last_payment_error = {
        type: "card_error",
        code: check.code,
        ...(check.declineCode ? { decline_code: check.declineCode } : {}),
        message: check.message,
        param: check.param,
        payment_method: { id: paymentMethod, object: "payment_method", type: "card", card: { brand: check.brand, last4: check.last4 } },
      };
      const delivery = this.emit("payment_intent.payment_failed", intent, session._api_version);
      this.store.save();
      await this.settle([delivery]);
      const error = new ApiError(402, "card_error", check.message, check.code, check.param, {
        ...(check.declineCode ? { decline_code: check.declineCode } : {}),
        payment_intent: publicView(intent),
      });
      return { outcome: "declined", error, paymentIntent: intent };
    }

    const customerEmail = session.customer_email ?? email ?? null;
    const charge: Charge = {
      id: newId("ch_"),
      object: "charge",
      amount: intent.amount,
      amount_captured: intent.amount,
      amount_refunded: 0,
      application_fee_amount: intent.application_fee_amount,
      balance_transaction: null,
      billing_details: { email: customerEmail },
      captured: true,
      created: now(),
      currency: intent.currency,
      description: intent.description,
      failure_code: null,
      failure_message: null,
      livemode: false,
      metadata: { ...intent.metadata },
      paid: true,
      payment_intent: intent.id,
      payment_method: paymentMethod,
      payment_method_details: { type: "card", card: { brand: check.brand, last4: check.last4, exp_month: check.expMonth, exp_year: check.expYear } },
      receipt_email: customerEmail,
      refunded: false,
      status: "succeeded",
      transfer_group: intent.transfer_group,
      _behaviour: { refund: check.refund, settle: "succeeds" },
    };
    this.state.charges[charge.id] = charge;
    charge.balance_transaction = this.chargeFunds(charge).id;
    Object.assign(intent, { status: "succeeded", amount_received: intent.amount, latest_charge: charge.id, last_payment_error: null, receipt_email: customerEmail });
    Object.assign(session, { status: "complete", payment_status: "paid", url: null, customer_details: { email: customerEmail } });
    const deliveries = [
      this.emit("charge.succeeded", charge, session._api_version),
      this.emit("payment_intent.succeeded", intent, session._api_version),
      this.emit("checkout.session.completed", session, session._api_version),
    ];
    this.store.save();
    const settled = await this.settle(deliveries);
    const redirectUrl = session.success_url ? session.success_url.replaceAll("{CHECKOUT_SESSION_ID}", session.id) : null;
    return { outcome: "paid", session, paymentIntent: intent, redirectUrl, deliveries: settled };
  }

  /**
   * Card money is pending for days at Stripe before it is available to spend (two days here, or until the
   * test control settles the charge); a transfer tied to the charge (`source_transaction`) need not wait.
   */
  private chargeFunds(charge: Charge): BalanceTransaction {
    return this.balanceTransaction({
      amount: charge.amount,
      currency: charge.currency,
      type: "charge",
      reporting_category: "charge",
      source: charge.id,
      status: "pending",
      available_on: now() + 2 * 86400,
      description: charge.description,
    });
  }

  balanceTransaction(input: Pick<BalanceTransaction, "amount" | "currency" | "type" | "reporting_category" | "source" | "status"> & Partial<BalanceTransaction>): BalanceTransaction {
    const created = now();
    const transaction: BalanceTransaction = {
      id: newId("txn_"),
      object: "balance_transaction",
      available_on: created,
      balance_type: "payments",
      created,
      description: null,
      exchange_rate: null,
      fee: 0,
      fee_details: [],
      net: input.amount,
      _account: null,
      _waits_for: null,
      ...input,
    };
    this.state.balance_transactions[transaction.id] = transaction;
    return transaction;
  }

  /**
   * A bank debit (SEPA) that settles days later: the session completes with `payment_status: "unpaid"`, the
   * intent is `processing`, and the outcome follows when the test control settles it.
   */
  async payByBankDebit(sessionId: string, iban: string, email?: string): Promise<PayOutcome> {
    const session = this.session(sessionId);
    if (session.status !== "open") {
      throw new ApiError(400, "invalid_request_error", `This checkout session is ${session.status} and can no longer be paid.`, session.status === "expired" ? "checkout_session_expired" : "checkout_session_complete");
    }
    if (session.currency !== "eur") throw new ApiError(400, "invalid_request_error", "Bank debits are offered for payments in EUR only.", "payment_method_unactivated");
    const intent = this.intentFor(session);
    const check = checkIban(iban);
    if (!check.ok) {
      const error = new ApiError(402, "invalid_request_error", check.message, "invalid_bank_account_iban", "iban");
      return { outcome: "declined", error, paymentIntent: intent };
    }
    const paymentMethod = newId("pm_");
    const customerEmail = session.customer_email ?? email ?? null;
    const charge: Charge = {
      id: newId("ch_"),
      object: "charge",
      amount: intent.amount,
      amount_captured: intent.amount,
      amount_refunded: 0,
      application_fee_amount: intent.application_fee_amount,
      balance_transaction: null,
      billing_details: { email: customerEmail },
      captured: true,
      created: now(),
      currency: intent.currency,
      description: intent.description,
      failure_code: null,
      failure_message: null,
      livemode: false,
      metadata: { ...intent.metadata },
      paid: false,
      payment_intent: intent.id,
      payment_method: paymentMethod,
      payment_method_details: { type: "sepa_debit", sepa_debit: { bank_code: check.bankCode, country: check.country, last4: check.last4 } },
      receipt_email: customerEmail,
      refunded: false,
      status: "pending",
      transfer_group: intent.transfer_group,
      _behaviour: { refund: "pending", settle: check.settle },
    };
    this.state.charges[charge.id] = charge;
    Object.assign(intent, { status: "processing", payment_method: paymentMethod, latest_charge: charge.id, last_payment_error: null, receipt_email: customerEmail });
    Object.assign(session, { status: "complete", payment_status: "unpaid", url: null, customer_details: { email: customerEmail } });
    const deliveries = [
      this.emit("charge.pending", charge, session._api_version),
      this.emit("payment_intent.processing", intent, session._api_version),
      this.emit("checkout.session.completed", session, session._api_version),
    ];
    this.store.save();
    const settled = await this.settle(deliveries);
    const redirectUrl = session.success_url ? session.success_url.replaceAll("{CHECKOUT_SESSION_ID}", session.id) : null;
    return { outcome: "paid", session, paymentIntent: intent, redirectUrl, deliveries: settled };
  }

  /** Test control: a processing bank debit succeeds or fails, as its test account says unless told otherwise. */
  async settlePayment(intentId: string, outcome?: "succeeded" | "failed") {
    const intent = this.state.payment_intents[intentId];
    if (!intent) throw noSuch("payment_intent", intentId);
    if (intent.status !== "processing" || !intent.latest_charge) {
      throw new ApiError(400, "invalid_request_error", `This PaymentIntent is ${intent.status}; only a processing one can be settled.`, "payment_intent_unexpected_state");
    }
    const charge = this.state.charges[intent.latest_charge]!;
    const session = Object.values(this.state.sessions).find((candidate) => candidate.payment_intent === intent.id)!;
    const succeeds = (outcome ?? (charge._behaviour.settle === "succeeds" ? "succeeded" : "failed")) === "succeeded";
    const version = session._api_version;
    let deliveries: Promise<Delivery>[];
    if (succeeds) {
      Object.assign(charge, { status: "succeeded", paid: true });
      charge.balance_transaction = this.chargeFunds(charge).id;
      Object.assign(intent, { status: "succeeded", amount_received: intent.amount });
      session.payment_status = "paid";
      deliveries = [
        this.emit("charge.succeeded", charge, version),
        this.emit("payment_intent.succeeded", intent, version),
        this.emit("checkout.session.async_payment_succeeded", session, version),
      ];
    } else {
      Object.assign(charge, { status: "failed", failure_code: "insufficient_funds", failure_message: "The customer's account has insufficient funds to cover this payment." });
      Object.assign(intent, {
        status: "requires_payment_method",
        last_payment_error: { type: "card_error", code: "payment_intent_payment_attempt_failed", message: "The customer's account has insufficient funds to cover this payment.", payment_method: { id: charge.payment_method, object: "payment_method", type: "sepa_debit" } },
      });
      deliveries = [
        this.emit("charge.failed", charge, version),
        this.emit("payment_intent.payment_failed", intent, version),
        this.emit("checkout.session.async_payment_failed", session, version),
      ];
    }
    this.store.save();
    await this.settle(deliveries);
    return { payment_intent: publicView(intent), charge: publicView(charge), session: publicView(session) };
  }

  /** Test control: a refund that is pending succeeds or fails; one that "fails later" (its test card) fails. */
  async settleRefund(refundId: string, outcome?: "succeeded" | "failed") {
    const refund = this.state.refunds[refundId];
    if (!refund) throw noSuch("refund", refundId);
    const charge = this.state.charges[refund.charge]!;
    const fails = outcome ? outcome === "failed" : charge._behaviour.refund === "fails_later";
    const canFail = refund.status === "pending" || (refund.status === "succeeded" && charge._behaviour.refund === "fails_later");
    if (fails ? !canFail : refund.status !== "pending") {
      throw new ApiError(400, "invalid_request_error", `This refund is ${refund.status} and cannot become ${fails ? "failed" : "succeeded"}.`, "refund_unexpected_state");
    }
    const version = defaultApiVersion;
    const deliveries: Promise<Delivery>[] = [];
    delete refund.pending_reason;
    if (fails) {
      refund.status = "failed";
      refund.failure_reason = "expired_or_canceled_card";
      // The money comes back to the platform's balance; the charge counts it as not refunded.
      refund.failure_balance_transaction = this.balanceTransaction({ amount: refund.amount, currency: refund.currency, type: "refund_failure", reporting_category: "refund_failure", source: refund.id, status: "available" }).id;
      charge.amount_refunded -= refund.amount;
      charge.refunded = false;
      deliveries.push(this.emit("refund.updated", refund, version), this.emit("refund.failed", refund, version), this.emit("charge.refund.updated", refund, version));
    } else {
      refund.status = "succeeded";
      deliveries.push(this.emit("refund.updated", refund, version), this.emit("charge.refund.updated", refund, version));
    }
    this.store.save();
    await this.settle(deliveries);
    return publicView(refund);
  }

  /** Stripe makes a session's payment intent when the customer first tries to pay. */
  private intentFor(session: CheckoutSession): PaymentIntent {
    const existing = session.payment_intent ? this.state.payment_intents[session.payment_intent] : undefined;
    if (existing) return existing;
    const data = session._payment_intent_data;
    const id = newId("pi_");
    const intent: PaymentIntent = {
      id,
      object: "payment_intent",
      amount: session.amount_total,
      amount_received: 0,
      application_fee_amount: data.application_fee_amount,
      canceled_at: null,
      client_secret: `${id}_secret_${newId("", 24)}`,
      created: now(),
      currency: session.currency,
      description: data.description ?? session._line_items.map((item) => item.description).join(", "),
      last_payment_error: null,
      latest_charge: null,
      livemode: false,
      metadata: { ...data.metadata },
      payment_method: null,
      payment_method_types: session.currency === "eur" ? ["card", "sepa_debit"] : ["card"],
      receipt_email: null,
      status: "requires_payment_method",
      transfer_data: data.transfer_data,
      transfer_group: data.transfer_group,
    };
    this.state.payment_intents[id] = intent;
    session.payment_intent = id;
    return intent;
  }

  // ── payment intents, charges ─────────────────────────────────────────────────────────────────────────

  retrievePaymentIntent(id: string, params: FormObject) {
    refuseUnknown(params, ["expand", "client_secret"]);
    const intent = this.state.payment_intents[id];
    if (!intent) throw noSuch("payment_intent", id);
    return this.expand(intent, expandPaths(params));
  }

  retrieveCharge(id: string, params: FormObject) {
    refuseUnknown(params, ["expand"]);
    const charge = this.state.charges[id];
    if (!charge) throw noSuch("charge", id);
    return this.expand(charge, expandPaths(params));
  }

  // ── refunds ──────────────────────────────────────────────────────────────────────────────────────────

  async createRefund(params: FormObject, context: RequestContext) {
    refuseUnknown(params, ["payment_intent", "charge", "amount", "reason", "metadata", "expand"]);
    const intentId = optionalString(params.payment_intent, "payment_intent");
    const chargeId = optionalString(params.charge, "charge");
    if (!intentId && !chargeId) throw missingParam("payment_intent");
    let charge: Charge | undefined;
    if (intentId) {
      const intent = this.state.payment_intents[intentId];
      if (!intent) throw noSuch("payment_intent", intentId, "payment_intent");
      if (intent.status !== "succeeded" || !intent.latest_charge) {
        throw new ApiError(
          400,
          "invalid_request_error",
          `This PaymentIntent (${intentId}) does not have a successful charge to refund.`,
          "charge_not_refundable",
          "payment_intent",
        );
      }
      charge = this.state.charges[intent.latest_charge];
    } else {
      charge = this.state.charges[chargeId!];
      if (!charge) throw noSuch("charge", chargeId!, "charge");
    }
    if (!charge) throw new ApiError(500, "api_error", "The stand-in lost the charge of this payment.");
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining === 0) {
      throw new ApiError(400, "invalid_request_error", `Charge ${charge.id} has already been refunded.`, "charge_already_refunded");
    }
    const requested = optionalInteger(params.amount, "amount");
    const amount = requested === undefined ? remaining : positiveInteger(requested, "amount");
    if (amount > remaining) {
      throw new ApiError(
        400,
        "invalid_request_error",
        `Refund amount (${formatAmount(amount, charge.currency)}) is greater than unrefunded amount on charge (${formatAmount(remaining, charge.currency)})`,
        "amount_too_large",
        "amount",
      );
    }
    const reason = optionalString(params.reason, "reason") ?? null;
    if (reason !== null && !["duplicate", "fraudulent", "requested_by_customer"].includes(reason)) {
      throw invalidParam("reason", "Invalid reason: must be one of duplicate, fraudulent, or requested_by_customer");
    }
    const pending = charge._behaviour.refund === "pending";
    const refund: Refund = {
      id: newId("re_"),
      object: "refund",
      amount,
      balance_transaction: null,
      charge: charge.id,
      created: now(),
      currency: charge.currency,
      metadata: metadata(params.metadata),
      payment_intent: charge.payment_intent,
      ...(pending ? { pending_reason: "processing" as const } : {}),
      reason,
      status: pending ? "pending" : "succeeded",
    };
    refund.balance_transaction = this.balanceTransaction({ amount: -amount, currency: refund.currency, type: "refund", reporting_category: "refund", source: refund.id, status: "available" }).id;
    this.state.refunds[refund.id] = refund;
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    const version = context.apiVersion ?? defaultApiVersion;
    const deliveries = [this.emit("refund.created", refund, version, context), this.emit("charge.refunded", charge, version, context)];
    this.store.save();
    await this.settle(deliveries);
    return this.expand(refund, expandPaths(params));
  }

  retrieveRefund(id: string, params: FormObject) {
    refuseUnknown(params, ["expand"]);
    const refund = this.state.refunds[id];
    if (!refund) throw noSuch("refund", id);
    return this.expand(refund, expandPaths(params));
  }
}
