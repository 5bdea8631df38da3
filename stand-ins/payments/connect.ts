// Stripe Connect as far as Tenthmark uses it: Express accounts with their capabilities and requirements,
// account links to a hosted onboarding page, `account.updated` events, transfers to an account (tied to a
// charge with `source_transaction`), transfer reversals, and balance transactions with pending and
// available funds. Shapes follow Stripe's v1 API; anything else is refused as Stripe refuses it.
import { formatAmount, publicView, defaultApiVersion, type PaymentsLedger, type RequestContext } from "./api.ts";
import { ApiError, invalidParam, missingParam, noSuch } from "./errors.ts";
import type { FormObject } from "./form.ts";
import { currency, expandPaths, metadata, optionalInteger, optionalObject, optionalString, positiveInteger, refuseUnknown, url } from "./params.ts";
import { newId, now, type Account, type AccountLink, type BalanceTransaction, type Delivery, type Requirements, type Store, type Transfer, type TransferReversal } from "./state.ts";

/** What a new Express account still has to provide before it may receive transfers (Stripe's field names). */
const onboardingFields = [
  "business_profile.mcc",
  "business_profile.url",
  "external_account",
  "individual.dob.day",
  "individual.first_name",
  "individual.last_name",
  "tos_acceptance.date",
];

function requirements(due: string[], disabledReason: string | null): Requirements {
  return {
    alternatives: [],
    current_deadline: null,
    currently_due: due,
    disabled_reason: disabledReason,
    errors: [],
    eventually_due: due,
    past_due: due,
    pending_verification: [],
  };
}

/** How the hosted onboarding page can end: everything given, or some of it left for later. */
export type OnboardingChoice = "complete" | "requirements_due";

export class ConnectDesk {
  constructor(
    private readonly store: Store,
    private readonly ledger: PaymentsLedger,
    private readonly options: { publicOrigin: string },
  ) {}

  private get state() {
    return this.store.state;
  }

  account(id: string, param = "account"): Account {
    const account = this.state.accounts[id];
    if (!account) throw noSuch("account", id, param);
    return account;
  }

  // ── accounts ─────────────────────────────────────────────────────────────────────────────────────────

  createAccount(params: FormObject) {
    refuseUnknown(params, ["type", "country", "email", "capabilities", "business_type", "metadata", "default_currency", "expand"]);
    const type = optionalString(params.type, "type");
    if (type !== "express") throw invalidParam("type", `The payments stand-in makes Express accounts only (type=express), not "${type ?? ""}".`);
    const capabilities = optionalObject(params.capabilities, "capabilities") ?? {};
    refuseUnknown(capabilities, ["transfers", "card_payments"], "capabilities");
    const transfers = optionalObject(capabilities.transfers, "capabilities[transfers]");
    if (transfers) refuseUnknown(transfers, ["requested"], "capabilities[transfers]");
    const email = optionalString(params.email, "email") ?? null;
    if (email !== null && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) throw invalidParam("email", `Invalid email address: ${email}`, "email_invalid");
    const businessType = optionalString(params.business_type, "business_type") ?? null;
    if (businessType !== null && businessType !== "individual" && businessType !== "company") throw invalidParam("business_type", "Invalid business_type: must be one of individual or company");
    const country = (optionalString(params.country, "country") ?? "DE").toUpperCase();
    if (!/^[A-Z]{2}$/.test(country)) throw invalidParam("country", `Invalid country: ${country}`);
    const account: Account = {
      id: newId("acct_", 16),
      object: "account",
      business_type: businessType as Account["business_type"],
      capabilities: transfers?.requested === "true" ? { transfers: "inactive" } : {},
      charges_enabled: false,
      country,
      created: now(),
      default_currency: currency(optionalString(params.default_currency, "default_currency") ?? "eur", "default_currency"),
      details_submitted: false,
      email,
      metadata: metadata(params.metadata),
      payouts_enabled: false,
      requirements: requirements(onboardingFields, "requirements.past_due"),
      future_requirements: requirements([], null),
      type: "express",
    };
    this.state.accounts[account.id] = account;
    this.store.save();
    return this.ledger.expand(account, expandPaths(params));
  }

  retrieveAccount(id: string, params: FormObject) {
    refuseUnknown(params, ["expand"]);
    return this.ledger.expand(this.account(id, "id"), expandPaths(params));
  }

  createAccountLink(params: FormObject) {
    refuseUnknown(params, ["account", "type", "refresh_url", "return_url", "collect", "collection_options", "expand"]);
    const accountId = optionalString(params.account, "account");
    if (!accountId) throw missingParam("account");
    this.account(accountId);
    const type = optionalString(params.type, "type");
    if (!type) throw missingParam("type");
    if (type !== "account_onboarding" && type !== "account_update") throw invalidParam("type", "Invalid type: must be one of account_onboarding or account_update");
    const refreshUrl = optionalString(params.refresh_url, "refresh_url");
    const returnUrl = optionalString(params.return_url, "return_url");
    if (!refreshUrl) throw missingParam("refresh_url");
    if (!returnUrl) throw missingParam("return_url");
    const created = now();
    const token = newId("", 32);
    // Stripe's links are single-use and short-lived (a few minutes).
    const link: AccountLink = {
      object: "account_link",
      created,
      expires_at: created + 300,
      url: `${this.options.publicOrigin}/connect/onboarding/${token}`,
      _account: accountId,
      _refresh_url: url(refreshUrl, "refresh_url"),
      _return_url: url(returnUrl, "return_url"),
      _used: false,
    };
    this.state.account_links[token] = link;
    this.store.save();
    return publicView(link);
  }

  /** The link a visitor opened, or null when it is unknown; an expired or used link leads to its refresh URL. */
  openLink(token: string): { link: AccountLink; account: Account; usable: boolean } | null {
    const link = this.state.account_links[token];
    if (!link) return null;
    return { link, account: this.account(link._account), usable: !link._used && link.expires_at > now() };
  }

  /** The hosted page's answer: the account's new state, an `account.updated` event, and where to go next. */
  async finishOnboarding(token: string, choice: OnboardingChoice): Promise<{ redirect: string }> {
    const opened = this.openLink(token);
    if (!opened) throw noSuch("account_link", token);
    if (!opened.usable) return { redirect: opened.link._refresh_url };
    opened.link._used = true;
    await this.setState(opened.account.id, choice);
    return { redirect: opened.link._return_url };
  }

  /** Also a test control: puts an account in one of the two states the onboarding page can leave it in. */
  async setState(accountId: string, choice: OnboardingChoice) {
    const account = this.account(accountId);
    if (choice === "complete") {
      Object.assign(account, {
        details_submitted: true,
        charges_enabled: true,
        payouts_enabled: true,
        capabilities: { ...account.capabilities, transfers: "active" },
        requirements: requirements([], null),
      });
    } else {
      Object.assign(account, {
        details_submitted: true,
        charges_enabled: false,
        payouts_enabled: false,
        capabilities: { ...account.capabilities, transfers: "inactive" },
        requirements: requirements(["external_account", "individual.verification.document"], "requirements.past_due"),
      });
    }
    const delivery = this.ledger.emit("account.updated", account, defaultApiVersion, undefined, account.id);
    this.store.save();
    await this.ledger.settle([delivery]);
    return publicView(account);
  }

  // ── transfers and reversals ──────────────────────────────────────────────────────────────────────────

  /** The platform's own funds (no `Stripe-Account`) or a connected account's, by status and currency. */
  balance(accountId: string | null) {
    if (accountId) this.account(accountId);
    const sums = { available: new Map<string, number>(), pending: new Map<string, number>() };
    for (const transaction of Object.values(this.state.balance_transactions)) {
      if (transaction._account !== accountId) continue;
      const bucket = sums[transaction.status];
      bucket.set(transaction.currency, (bucket.get(transaction.currency) ?? 0) + transaction.net);
    }
    const list = (bucket: Map<string, number>) => [...bucket.entries()].map(([code, amount]) => ({ amount, currency: code, source_types: { card: amount } }));
    return { object: "balance", available: list(sums.available), livemode: false, pending: list(sums.pending) };
  }

  private available(accountId: string | null, currencyCode: string): number {
    return this.balance(accountId).available.find((entry) => entry.currency === currencyCode)?.amount ?? 0;
  }

  async createTransfer(params: FormObject, context: RequestContext) {
    refuseUnknown(params, ["amount", "currency", "destination", "transfer_group", "metadata", "description", "source_transaction", "expand"]);
    const rawAmount = optionalInteger(params.amount, "amount");
    if (rawAmount === undefined) throw missingParam("amount");
    const amount = positiveInteger(rawAmount, "amount");
    const rawCurrency = optionalString(params.currency, "currency");
    if (!rawCurrency) throw missingParam("currency");
    const transferCurrency = currency(rawCurrency, "currency");
    const destinationId = optionalString(params.destination, "destination");
    if (!destinationId) throw missingParam("destination");
    const destination = this.state.accounts[destinationId];
    if (!destination) throw new ApiError(400, "invalid_request_error", `No such destination: '${destinationId}'`, "resource_missing", "destination");
    if (destination.capabilities.transfers !== "active") {
      throw new ApiError(
        400,
        "invalid_request_error",
        "Your destination account needs to have at least one of the following capabilities enabled: transfers, crypto_transfers, legacy_payments",
        "insufficient_capabilities_for_transfer",
        "destination",
      );
    }
    const sourceTransaction = optionalString(params.source_transaction, "source_transaction") ?? null;
    let waitsFor: string | null = null;
    if (sourceTransaction) {
      const charge = this.state.charges[sourceTransaction];
      if (!charge) throw noSuch("charge", sourceTransaction, "source_transaction");
      if (charge.currency !== transferCurrency) {
        throw invalidParam("currency", `The currency of the transfer (${transferCurrency}) must match the source transaction's (${charge.currency}).`);
      }
      if (charge.status === "failed") throw invalidParam("source_transaction", `The source transaction ${charge.id} failed and has no funds to transfer.`);
      const alreadyOut = Object.values(this.state.transfers)
        .filter((transfer) => transfer.source_transaction === sourceTransaction)
        .reduce((sum, transfer) => sum + transfer.amount, 0);
      if (alreadyOut + amount > charge.amount) {
        throw invalidParam("amount", `Transfers from ${sourceTransaction} would exceed the charge's amount (${formatAmount(charge.amount, charge.currency)}).`, "amount_too_large");
      }
      // Stripe makes the transfer at once; the money waits in the account until the charge's funds are available.
      const chargeFunds = charge.balance_transaction ? this.state.balance_transactions[charge.balance_transaction] : undefined;
      if (!chargeFunds || chargeFunds.status === "pending") waitsFor = charge.id;
    } else if (amount > this.available(null, transferCurrency)) {
      throw new ApiError(
        400,
        "invalid_request_error",
        "You have insufficient available funds in your Stripe account. Try adding funds directly to your available balance by creating Charges.",
        "balance_insufficient",
        "amount",
      );
    }
    const id = newId("tr_");
    const outgoing = this.ledger.balanceTransaction({ amount: -amount, currency: transferCurrency, type: "transfer", reporting_category: "transfer", source: id, status: "available" });
    const paymentId = newId("py_");
    const chargeFunds = waitsFor ? this.state.balance_transactions[this.state.charges[waitsFor]!.balance_transaction ?? ""] : undefined;
    this.ledger.balanceTransaction({
      amount,
      currency: transferCurrency,
      type: "payment",
      reporting_category: "charge",
      source: paymentId,
      status: waitsFor ? "pending" : "available",
      available_on: chargeFunds?.available_on ?? now(),
      _account: destination.id,
      _waits_for: waitsFor,
    });
    const transfer: Transfer = {
      id,
      object: "transfer",
      amount,
      amount_reversed: 0,
      balance_transaction: outgoing.id,
      created: now(),
      currency: transferCurrency,
      description: optionalString(params.description, "description") ?? null,
      destination: destination.id,
      destination_payment: paymentId,
      livemode: false,
      metadata: metadata(params.metadata),
      reversals: { object: "list", data: [], has_more: false, url: `/v1/transfers/${id}/reversals` },
      reversed: false,
      source_transaction: sourceTransaction,
      transfer_group: optionalString(params.transfer_group, "transfer_group") ?? null,
    };
    this.state.transfers[transfer.id] = transfer;
    const delivery = this.ledger.emit("transfer.created", transfer, context.apiVersion ?? defaultApiVersion, context);
    this.store.save();
    await this.ledger.settle([delivery]);
    return this.ledger.expand(transfer, expandPaths(params));
  }

  transfer(id: string, param = "id"): Transfer {
    const transfer = this.state.transfers[id];
    if (!transfer) throw noSuch("transfer", id, param);
    return transfer;
  }

  retrieveTransfer(id: string, params: FormObject) {
    refuseUnknown(params, ["expand"]);
    return this.ledger.expand(this.transfer(id), expandPaths(params));
  }

  async createReversal(transferId: string, params: FormObject, context: RequestContext) {
    refuseUnknown(params, ["amount", "description", "metadata", "refund_application_fee", "expand"]);
    const transfer = this.transfer(transferId);
    const remaining = transfer.amount - transfer.amount_reversed;
    const requested = optionalInteger(params.amount, "amount");
    const amount = requested === undefined ? remaining : positiveInteger(requested, "amount");
    if (remaining === 0) throw new ApiError(400, "invalid_request_error", `Transfer ${transfer.id} has already been fully reversed.`, "transfer_already_reversed");
    if (amount > remaining) {
      throw new ApiError(
        400,
        "invalid_request_error",
        `Reversal amount (${formatAmount(amount, transfer.currency)}) is greater than the amount left on the transfer (${formatAmount(remaining, transfer.currency)}).`,
        "amount_too_large",
        "amount",
      );
    }
    const id = newId("trr_");
    const incoming = this.ledger.balanceTransaction({ amount, currency: transfer.currency, type: "transfer_refund", reporting_category: "transfer_reversal", source: id, status: "available" });
    const refundId = newId("pyr_");
    this.ledger.balanceTransaction({ amount: -amount, currency: transfer.currency, type: "payment_refund", reporting_category: "transfer_reversal", source: refundId, status: "available", _account: transfer.destination });
    const reversal: TransferReversal = {
      id,
      object: "transfer_reversal",
      amount,
      balance_transaction: incoming.id,
      created: now(),
      currency: transfer.currency,
      destination_payment_refund: refundId,
      metadata: metadata(params.metadata),
      source_refund: null,
      transfer: transfer.id,
    };
    this.state.transfer_reversals[id] = reversal;
    transfer.amount_reversed += amount;
    transfer.reversed = transfer.amount_reversed === transfer.amount;
    transfer.reversals.data.unshift(reversal);
    const version = context.apiVersion ?? defaultApiVersion;
    const deliveries: Promise<Delivery>[] = [this.ledger.emit("transfer.reversed", transfer, version, context), this.ledger.emit("transfer.updated", transfer, version, context)];
    this.store.save();
    await this.ledger.settle(deliveries);
    return this.ledger.expand(reversal, expandPaths(params));
  }

  listReversals(transferId: string, params: FormObject) {
    refuseUnknown(params, ["limit", "expand"]);
    const transfer = this.transfer(transferId);
    return { object: "list", data: transfer.reversals.data, has_more: false, url: transfer.reversals.url };
  }

  // ── balance ──────────────────────────────────────────────────────────────────────────────────────────

  retrieveBalanceTransaction(id: string, params: FormObject, context: RequestContext) {
    refuseUnknown(params, ["expand"]);
    const transaction = this.state.balance_transactions[id];
    if (!transaction || transaction._account !== context.stripeAccount) throw noSuch("balance transaction", id);
    return this.ledger.expand(transaction, expandPaths(params));
  }

  listBalanceTransactions(params: FormObject, context: RequestContext) {
    refuseUnknown(params, ["limit", "source", "type", "currency", "expand"]);
    const limit = optionalInteger(params.limit, "limit") ?? 10;
    if (limit < 1 || limit > 100) throw invalidParam("limit", "This value must be between 1 and 100.");
    const source = optionalString(params.source, "source");
    const type = optionalString(params.type, "type");
    const data = Object.values(this.state.balance_transactions)
      .filter((transaction) => transaction._account === context.stripeAccount && (!source || transaction.source === source) && (!type || transaction.type === type))
      .reverse();
    return { object: "list", data: data.slice(0, limit).map((transaction) => publicView(transaction)), has_more: data.length > limit, url: "/v1/balance_transactions" };
  }

  /** Test control: the charge's funds become available now, and so does what was transferred from it. */
  settleCharge(chargeId: string) {
    const charge = this.state.charges[chargeId];
    if (!charge) throw noSuch("charge", chargeId);
    const settled: BalanceTransaction[] = [];
    for (const transaction of Object.values(this.state.balance_transactions)) {
      if (transaction.status === "pending" && (transaction.source === chargeId || transaction._waits_for === chargeId)) {
        transaction.status = "available";
        transaction.available_on = now();
        settled.push(transaction);
      }
    }
    this.store.save();
    return { object: "list", data: settled.map((transaction) => publicView(transaction)) };
  }
}
