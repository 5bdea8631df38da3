// The hosted payment page a Checkout session's `url` leads to. It is a test stand-in and says so at the
// top; its look is our own and plain. Works without JavaScript: the form posts back to the stand-in.
import { formatAmount } from "./api.ts";
import { documentedTestCards, testIbans } from "./cards.ts";
import type { Account, CheckoutSession } from "./state.ts";

const escape = (text: string) =>
  text.replace(/[&<>"']/g, (char) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[char]!);

const styles = `
  *, *::before, *::after { box-sizing: border-box; }
  html { -webkit-text-size-adjust: 100%; }
  body { margin: 0; background: #eef0ee; color: #1d2320; font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; }
  .notice { background: #fff4c2; border-bottom: 1px solid #e2cf73; color: #4a3d00; font-size: 14px; padding: 10px 16px; text-align: center; }
  .notice strong { font-weight: 700; }
  main { max-width: 460px; margin: 0 auto; padding: 28px 16px 48px; }
  .panel { background: #fff; border: 1px solid #d5dad6; border-radius: 10px; padding: 24px; }
  .label { color: #5b6660; font-size: 13px; letter-spacing: .04em; text-transform: uppercase; margin: 0; }
  .amount { font-size: 34px; font-weight: 700; letter-spacing: -.01em; margin: 2px 0 4px; font-variant-numeric: tabular-nums; }
  .items { list-style: none; margin: 16px 0 0; padding: 12px 0 0; border-top: 1px solid #e4e8e5; }
  .items li { display: flex; justify-content: space-between; gap: 16px; font-size: 15px; padding: 2px 0; }
  .items li span:last-child { font-variant-numeric: tabular-nums; white-space: nowrap; }
  form { margin-top: 22px; display: grid; gap: 14px; }
  .row { display: grid; grid-template-columns: 1fr 1fr; gap: 12px; }
  label { display: grid; gap: 4px; font-size: 14px; font-weight: 600; color: #2f3833; }
  input { width: 100%; font: inherit; font-size: 16px; font-weight: 400; padding: 10px 12px; border: 1px solid #b9c1bc; border-radius: 6px; background: #fff; color: inherit; }
  input:focus { outline: 2px solid #2e6b57; outline-offset: 1px; border-color: #2e6b57; }
  input[readonly] { background: #f3f5f3; color: #5b6660; }
  button { font: inherit; font-weight: 700; font-size: 16px; padding: 12px 16px; border: 0; border-radius: 6px; background: #2e6b57; color: #fff; cursor: pointer; }
  button:hover { background: #255746; }
  .error { background: #fdecea; border: 1px solid #f0b8b1; color: #8a1f12; border-radius: 6px; padding: 10px 12px; font-size: 15px; margin: 18px 0 0; }
  .cards { margin: 18px 0 0; padding: 12px 14px; border: 1px dashed #b9c1bc; border-radius: 6px; font-size: 14px; color: #46514b; }
  .cards p { margin: 0 0 4px; font-weight: 600; color: #2f3833; }
  .cards ul { margin: 0; padding-left: 18px; }
  code { font-family: ui-monospace, "SFMono-Regular", Menlo, monospace; font-size: 13px; }
  .back { display: inline-block; margin-top: 18px; color: #2e6b57; font-size: 15px; }
  .meta { margin-top: 16px; color: #6b756f; font-size: 12px; word-break: break-all; }
  h1 { font-size: 22px; margin: 0 0 8px; }
  h2 { font-size: 17px; margin: 0; }
  .debit { border-top: 1px solid #e4e8e5; padding-top: 18px; }
  .hint { margin: 0; color: #5b6660; font-size: 14px; }
  button.secondary { background: #fff; color: #2e6b57; border: 1px solid #2e6b57; }
  button.secondary:hover { background: #eef5f1; }
  .choices { display: grid; gap: 10px; margin-top: 18px; }
  .due { margin: 12px 0 0; padding-left: 18px; font-size: 14px; color: #46514b; }
`;

function page(title: string, body: string, notice = "<strong>Test payment page — local stand-in.</strong> No real card is charged."): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escape(title)}</title>
<style>${styles}</style>
</head>
<body>
<div class="notice" role="note">${notice}</div>
<main>${body}</main>
</body>
</html>`;
}

export type CheckoutFormValues = { number?: string; expiry?: string; cvc?: string; email?: string; iban?: string };

export function renderCheckoutPage(session: CheckoutSession, options: { error?: string; values?: CheckoutFormValues } = {}): string {
  const total = formatAmount(session.amount_total, session.currency);
  const values = options.values ?? {};
  const items = session._line_items
    .map(
      (item) =>
        `<li><span>${escape(item.description)}${item.quantity > 1 ? ` × ${item.quantity}` : ""}</span><span>${escape(formatAmount(item.amount_total, item.currency))}</span></li>`,
    )
    .join("");
  const email = session.customer_email ?? values.email ?? "";
  const body = `
<section class="panel" aria-labelledby="amount">
  <p class="label">Amount due · ${escape(session.currency.toUpperCase())}</p>
  <p class="amount" id="amount">${escape(total)}</p>
  <ul class="items" aria-label="What you pay for">${items}</ul>
  ${options.error ? `<p class="error" id="payment-error" role="alert">${escape(options.error)}</p>` : ""}
  <form method="post" action="/pay/${escape(session.id)}" novalidate>
    <label>E-mail
      <input name="email" type="email" autocomplete="email" value="${escape(email)}" ${session.customer_email ? "readonly" : ""}>
    </label>
    <label>Card number
      <input name="card_number" inputmode="numeric" autocomplete="cc-number" placeholder="1234 1234 1234 1234" value="${escape(values.number ?? "")}" required${
        options.error ? ' aria-invalid="true" aria-describedby="payment-error"' : ""
      }>
    </label>
    <div class="row">
      <label>Expiry (MM / YY)
        <input name="expiry" inputmode="numeric" autocomplete="cc-exp" placeholder="MM / YY" value="${escape(values.expiry ?? "")}" required>
      </label>
      <label>CVC
        <input name="cvc" inputmode="numeric" autocomplete="cc-csc" placeholder="123" value="${escape(values.cvc ?? "")}" required>
      </label>
    </div>
    <button type="submit" name="method" value="card">Pay ${escape(total)}</button>
  </form>
  ${
    session.currency === "eur"
      ? `<form method="post" action="/pay/${escape(session.id)}" novalidate class="debit" aria-labelledby="debit-heading">
    <h2 id="debit-heading">Or by bank debit</h2>
    <p class="hint">Settles in a few working days; the payment stays "processing" until then.</p>
    <input type="hidden" name="email" value="${escape(email)}">
    <label>Bank account (IBAN)
      <input name="iban" autocomplete="off" placeholder="DE89 3704 0044 0532 0130 00" value="${escape(values.iban ?? "")}">
    </label>
    <button type="submit" name="method" value="bank_debit" class="secondary">Debit ${escape(total)} from this account</button>
  </form>`
      : ""
  }
  <div class="cards">
    <p>Test cards</p>
    <ul>${documentedTestCards.map((card) => `<li><code>${card.number}</code> ${card.outcome}</li>`).join("")}</ul>
    Any future expiry date and any three-digit CVC.
    ${session.currency === "eur" ? `<p>Test bank accounts</p><ul>${Object.entries(testIbans).map(([iban, outcome]) => `<li><code>${iban}</code> ${outcome === "succeeds" ? "settles" : "fails when settled"}</li>`).join("")}</ul>` : ""}
  </div>
  ${session.cancel_url ? `<a class="back" href="${escape(session.cancel_url)}">Cancel and go back</a>` : ""}
</section>
<p class="meta">Session ${escape(session.id)}</p>`;
  return page(`Pay ${total}`, body);
}

/** A session that can no longer be paid: expired, or already paid. */
export function renderClosedPage(session: CheckoutSession | undefined): string {
  if (!session) {
    return page("Payment not found", `<section class="panel"><h1>Payment not found</h1><p>This payment link is not known to the stand-in.</p></section>`);
  }
  if (session.status === "complete") {
    const success = session.success_url?.replaceAll("{CHECKOUT_SESSION_ID}", session.id);
    return page(
      "Already paid",
      `<section class="panel"><h1>Already paid</h1><p>${escape(formatAmount(session.amount_total, session.currency))} was paid for this session.</p>${
        success ? `<a class="back" href="${escape(success)}">Continue</a>` : ""
      }</section>`,
    );
  }
  return page(
    "Payment link expired",
    `<section class="panel"><h1>This payment link has expired</h1><p>It can no longer be paid. Start again from where you came from.</p>${
      session.cancel_url ? `<a class="back" href="${escape(session.cancel_url)}">Go back</a>` : ""
    }</section>`,
  );
}

/** The hosted onboarding page an account link leads to: finish set-up, or leave some requirements for later. */
export function renderOnboardingPage(account: Account | undefined, token?: string): string {
  if (!account || !token) {
    return page("Link not found", `<section class="panel"><h1>Set-up link not found</h1><p>This link is not known to the stand-in.</p></section>`);
  }
  const due = account.requirements.currently_due;
  const body = `
<section class="panel" aria-labelledby="onboarding-heading">
  <p class="label">Payout account set-up</p>
  <h1 id="onboarding-heading">Set up payouts for ${escape(account.email ?? account.id)}</h1>
  <p>A real provider would ask for identity details and a bank account here. This test page lets you choose how set-up ends.</p>
  ${due.length ? `<p class="hint">Still required:</p><ul class="due">${due.map((field) => `<li><code>${escape(field)}</code></li>`).join("")}</ul>` : ""}
  <form method="post" action="/connect/onboarding/${escape(token)}" class="choices">
    <button type="submit" name="choice" value="complete">Complete set-up</button>
    <button type="submit" name="choice" value="requirements_due" class="secondary">Leave requirements due</button>
  </form>
</section>
<p class="meta">Account ${escape(account.id)}</p>`;
  return page("Set up payouts", body, "<strong>Test set-up page — local stand-in.</strong> No identity or bank details are collected.");
}
