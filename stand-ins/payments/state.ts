// Everything the stand-in knows, kept in one JSON file under its data folder so that a restart on the same
// folder carries on where it left off (sessions, payments, refunds, events and pending deliveries).
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import path from "node:path";

export type Metadata = Record<string, string>;

export type LineItem = { description: string; quantity: number; unit_amount: number; amount_total: number; currency: string };

export type CheckoutSession = {
  id: string;
  object: "checkout.session";
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  created: number;
  currency: string;
  customer_details: { email: string | null } | null;
  customer_email: string | null;
  expires_at: number;
  livemode: false;
  metadata: Metadata;
  mode: "payment";
  payment_intent: string | null;
  payment_status: "paid" | "unpaid";
  status: "open" | "complete" | "expired";
  success_url: string | null;
  url: string | null;
  /** Not part of Stripe's object: what the stand-in needs to make the payment intent and show the page. */
  _line_items: LineItem[];
  _payment_intent_data: {
    application_fee_amount: number | null;
    description: string | null;
    metadata: Metadata;
    transfer_group: string | null;
    transfer_data: { destination: string; amount?: number } | null;
  };
  _api_version: string;
};

export type PaymentError = {
  type: "card_error";
  code: string;
  decline_code?: string;
  message: string;
  param?: string;
  payment_method: { id: string; object: "payment_method"; type: "card"; card: { brand: string; last4: string } };
};

export type PaymentIntent = {
  id: string;
  object: "payment_intent";
  amount: number;
  amount_received: number;
  application_fee_amount: number | null;
  canceled_at: number | null;
  client_secret: string;
  created: number;
  currency: string;
  description: string | null;
  last_payment_error: PaymentError | null;
  latest_charge: string | null;
  livemode: false;
  metadata: Metadata;
  payment_method: string | null;
  payment_method_types: string[];
  receipt_email: string | null;
  status: "requires_payment_method" | "processing" | "succeeded" | "canceled";
  transfer_data: { destination: string; amount?: number } | null;
  transfer_group: string | null;
};

export type PaymentMethodDetails =
  | { type: "card"; card: { brand: string; last4: string; exp_month: number; exp_year: number } }
  | { type: "sepa_debit"; sepa_debit: { bank_code: string; country: string; last4: string } };

export type Charge = {
  id: string;
  object: "charge";
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  application_fee_amount: number | null;
  balance_transaction: string | null;
  billing_details: { email: string | null };
  captured: boolean;
  created: number;
  currency: string;
  description: string | null;
  livemode: false;
  metadata: Metadata;
  failure_code: string | null;
  failure_message: string | null;
  paid: boolean;
  payment_intent: string;
  payment_method: string;
  payment_method_details: PaymentMethodDetails;
  receipt_email: string | null;
  refunded: boolean;
  status: "pending" | "succeeded" | "failed";
  transfer_group: string | null;
  /** What the test card or bank account makes of this charge's later steps (not part of Stripe's object). */
  _behaviour: { refund: "succeeds" | "pending" | "fails_later"; settle: "succeeds" | "fails" };
};

export type Refund = {
  id: string;
  object: "refund";
  amount: number;
  balance_transaction: string | null;
  charge: string;
  created: number;
  currency: string;
  failure_balance_transaction?: string;
  failure_reason?: string;
  metadata: Metadata;
  payment_intent: string;
  pending_reason?: "processing" | "charge_pending";
  reason: string | null;
  status: "pending" | "succeeded" | "failed" | "canceled";
};

export type Requirements = {
  alternatives: unknown[];
  current_deadline: number | null;
  currently_due: string[];
  disabled_reason: string | null;
  errors: unknown[];
  eventually_due: string[];
  past_due: string[];
  pending_verification: string[];
};

export type Account = {
  id: string;
  object: "account";
  business_type: "individual" | "company" | null;
  capabilities: { transfers?: "active" | "inactive" | "pending" };
  charges_enabled: boolean;
  country: string;
  created: number;
  default_currency: string;
  details_submitted: boolean;
  email: string | null;
  metadata: Metadata;
  payouts_enabled: boolean;
  requirements: Requirements;
  future_requirements: Requirements;
  type: "express";
};

export type AccountLink = { object: "account_link"; created: number; expires_at: number; url: string; _account: string; _refresh_url: string; _return_url: string; _used: boolean };

export type TransferReversal = {
  id: string;
  object: "transfer_reversal";
  amount: number;
  balance_transaction: string | null;
  created: number;
  currency: string;
  destination_payment_refund: string | null;
  metadata: Metadata;
  source_refund: string | null;
  transfer: string;
};

export type BalanceTransaction = {
  id: string;
  object: "balance_transaction";
  amount: number;
  available_on: number;
  balance_type: "payments";
  created: number;
  currency: string;
  description: string | null;
  exchange_rate: null;
  fee: number;
  fee_details: unknown[];
  net: number;
  reporting_category: string;
  source: string | null;
  status: "pending" | "available";
  type: string;
  /** The connected account whose balance this is; null for the platform's own (not part of Stripe's object). */
  _account: string | null;
  /** The charge whose settling makes this available (not part of Stripe's object). */
  _waits_for: string | null;
};

export type Transfer = {
  id: string;
  object: "transfer";
  amount: number;
  amount_reversed: number;
  created: number;
  currency: string;
  description: string | null;
  destination: string;
  livemode: false;
  metadata: Metadata;
  balance_transaction: string | null;
  destination_payment: string | null;
  reversals: { object: "list"; data: TransferReversal[]; has_more: false; url: string };
  reversed: boolean;
  source_transaction: string | null;
  transfer_group: string | null;
};

export type StripeObject = CheckoutSession | PaymentIntent | Charge | Refund | Transfer | Account | TransferReversal | BalanceTransaction;

export type Event = {
  id: string;
  object: "event";
  /** The connected account the event is about (events of connected accounts only). */
  account?: string;
  api_version: string;
  created: number;
  data: { object: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
};

export type Delivery = {
  event_id: string;
  event_type: string;
  attempt: number;
  url: string;
  at: number;
  /** HTTP status the endpoint answered with, or null when it could not be reached. */
  status: number | null;
  error: string | null;
  delivered: boolean;
};

export type PendingDelivery = { event_id: string; attempts: number; next_attempt_at: number };

export type IdempotentResponse = { fingerprint: string; status: number; body: string; created: number };

export type State = {
  sessions: Record<string, CheckoutSession>;
  payment_intents: Record<string, PaymentIntent>;
  charges: Record<string, Charge>;
  refunds: Record<string, Refund>;
  transfers: Record<string, Transfer>;
  accounts: Record<string, Account>;
  account_links: Record<string, AccountLink>;
  transfer_reversals: Record<string, TransferReversal>;
  balance_transactions: Record<string, BalanceTransaction>;
  events: Record<string, Event>;
  /** Event ids in the order they happened. */
  event_order: string[];
  deliveries: Delivery[];
  pending: PendingDelivery[];
  idempotency: Record<string, IdempotentResponse>;
};

const emptyState = (): State => ({
  sessions: {},
  payment_intents: {},
  charges: {},
  refunds: {},
  transfers: {},
  accounts: {},
  account_links: {},
  transfer_reversals: {},
  balance_transactions: {},
  events: {},
  event_order: [],
  deliveries: [],
  pending: [],
  idempotency: {},
});

/** Ids shaped like Stripe's: a prefix and 24 random characters from [A-Za-z0-9]. */
export function newId(prefix: string, length = 24): string {
  const alphabet = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789";
  const bytes = randomBytes(length);
  let out = "";
  for (const byte of bytes) out += alphabet[byte % alphabet.length];
  return `${prefix}${out}`;
}

export const now = () => Math.floor(Date.now() / 1000);

export class Store {
  readonly state: State;
  private readonly file: string;

  constructor(dataDir: string) {
    const folder = path.join(dataDir, "payments");
    mkdirSync(folder, { recursive: true });
    this.file = path.join(folder, "state.json");
    this.state = existsSync(this.file) ? { ...emptyState(), ...JSON.parse(readFileSync(this.file, "utf8")) } : emptyState();
  }

  /** Written whole after every change; renamed into place so that a crash never leaves half a file. */
  save() {
    const temporary = `${this.file}.${process.pid}.tmp`;
    writeFileSync(temporary, JSON.stringify(this.state));
    renameSync(temporary, this.file);
  }
}
