// The test cards the stand-in understands: Stripe's documented test numbers (docs.stripe.com/testing) for
// success and the common declines. Any other number is refused, as Stripe's test mode refuses real cards.

export type CardInput = { number: string; expiry?: string; cvc?: string };

export type RefundBehaviour = "succeeds" | "pending" | "fails_later";

export type CardCheck =
  | { ok: true; brand: string; last4: string; expMonth: number; expYear: number; refund: RefundBehaviour }
  | { ok: false; code: string; declineCode?: string; message: string; param: string; brand: string; last4: string };

const testCards: Record<string, { brand: string; refund?: RefundBehaviour; decline?: { code: string; declineCode?: string; message: string } }> = {
  "4242424242424242": { brand: "visa" },
  "5555555555554444": { brand: "mastercard" },
  // Refunds of these payments do not succeed at once (Stripe's refund test cards, from memory of docs.stripe.com/testing):
  // a refund stays pending until settled; a refund answers succeeded and fails later.
  "4000000000007726": { brand: "visa", refund: "pending" },
  "4000000000005126": { brand: "visa", refund: "fails_later" },
  "4000000000000002": { brand: "visa", decline: { code: "card_declined", declineCode: "generic_decline", message: "Your card was declined." } },
  "4000000000009995": {
    brand: "visa",
    decline: { code: "card_declined", declineCode: "insufficient_funds", message: "Your card has insufficient funds." },
  },
  "4000000000000069": { brand: "visa", decline: { code: "expired_card", declineCode: "expired_card", message: "Your card has expired." } },
};

export const documentedTestCards = [
  { number: "4242 4242 4242 4242", outcome: "succeeds" },
  { number: "4000 0000 0000 0002", outcome: "is declined" },
  { number: "4000 0000 0000 7726", outcome: "succeeds; a refund stays pending" },
  { number: "4000 0000 0000 5126", outcome: "succeeds; a refund fails later" },
];

/** Test bank accounts for the bank debit that settles days later (Stripe's SEPA test IBANs, from memory). */
export const testIbans: Record<string, "succeeds" | "fails"> = {
  DE89370400440532013000: "succeeds",
  DE62370400440532013001: "fails",
};

export type IbanCheck = { ok: true; country: string; bankCode: string; last4: string; settle: "succeeds" | "fails" } | { ok: false; message: string };

export function checkIban(input: string): IbanCheck {
  const iban = input.replace(/\s+/g, "").toUpperCase();
  if (!/^[A-Z]{2}\d{2}[A-Z0-9]{10,30}$/.test(iban)) return { ok: false, message: "Your bank account number (IBAN) is incomplete." };
  const settle = testIbans[iban];
  if (!settle) return { ok: false, message: "This is a test payment page: use one of the test bank accounts shown." };
  return { ok: true, country: iban.slice(0, 2), bankCode: iban.slice(4, 12), last4: iban.slice(-4), settle };
}

function luhnValid(digits: string): boolean {
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let digit = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      digit *= 2;
      if (digit > 9) digit -= 9;
    }
    sum += digit;
  }
  return sum % 10 === 0;
}

/** "12/34", "12 / 2034", "1234" → month and four-digit year. */
function parseExpiry(expiry: string): { month: number; year: number } | null {
  const match = expiry.replace(/\s+/g, "").match(/^(\d{1,2})\/?(\d{2}|\d{4})$/);
  if (!match) return null;
  const month = Number(match[1]);
  const year = match[2]!.length === 2 ? 2000 + Number(match[2]) : Number(match[2]);
  return month >= 1 && month <= 12 ? { month, year } : null;
}

export function checkCard(input: CardInput, today = new Date()): CardCheck {
  const digits = input.number.replace(/[\s-]/g, "");
  const last4 = digits.slice(-4);
  const known = testCards[digits];
  const brand = known?.brand ?? (digits.startsWith("4") ? "visa" : digits.startsWith("5") ? "mastercard" : "unknown");
  const refuse = (code: string, message: string, param: string, declineCode?: string): CardCheck => ({
    ok: false,
    code,
    message,
    param,
    brand,
    last4,
    declineCode,
  });

  if (!/^\d{12,19}$/.test(digits) || !luhnValid(digits)) return refuse("incorrect_number", "Your card number is incorrect.", "number");
  const expiry = parseExpiry(input.expiry ?? "12/34");
  if (!expiry) return refuse("invalid_expiry_month", "Your card's expiration date is incomplete.", "exp_month");
  const endOfMonth = new Date(Date.UTC(expiry.year, expiry.month, 1));
  if (endOfMonth <= today) return refuse("invalid_expiry_year", "Your card's expiration date is in the past.", "exp_year");
  if (!/^\d{3,4}$/.test((input.cvc ?? "123").trim())) return refuse("invalid_cvc", "Your card's security code is incomplete.", "cvc");
  if (!known) {
    return refuse(
      "card_declined",
      "Your card was declined. This is a test payment page: use one of the test card numbers shown.",
      "number",
      "test_mode_live_card",
    );
  }
  if (known.decline) return refuse(known.decline.code, known.decline.message, "number", known.decline.declineCode);
  return { ok: true, brand, last4, expMonth: expiry.month, expYear: expiry.year, refund: known.refund ?? "succeeds" };
}
