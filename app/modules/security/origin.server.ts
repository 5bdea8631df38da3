// Cross-site request forgery: a request that changes something must come from one of our own pages.
// The browser names the page's origin in `Origin` on every POST (or, failing that, in `Referer`); see
// docs/decisions/cross-origin-requests.md for who may send neither.
import { trustedOrigins } from "~/modules/accounts/auth.server";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Paths that servers, not browsers, call: they carry their own proof (a signature, a token) or change
 * nothing of anybody's, and so may come with neither Origin nor Referer.
 */
const machineToMachine: RegExp[] = [
  // Stripe's signed events.
  /^\/api\/webhooks\/stripe$/,
  // Public JSON APIs: no cookie is needed or honoured for what they do.
  /^\/api\/v1\//,
  // RFC 8058 one-click unsubscribe: the mail provider posts it; the signed token is the proof.
  /^\/saved-searches\/unsubscribe(\.data)?$/,
  /^\/watched\/unsubscribe(\.data)?$/,
];

export type OriginRefusal = { reason: "cross-origin" | "no-origin"; origin: string | null; message: string };

function originOf(value: string | null): string | null {
  if (!value) return null;
  if (value === "null") return "null";
  try {
    return new URL(value).origin;
  } catch {
    return "null";
  }
}

/** Null when the request may go on; otherwise why it is refused, in words a person can act on. */
export function crossOriginRefusal(request: Request, allowed: string[] = trustedOrigins()): OriginRefusal | null {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return null;
  const pathname = new URL(request.url).pathname;
  const claimed = originOf(request.headers.get("origin")) ?? originOf(request.headers.get("referer"));
  if (claimed === null) {
    if (machineToMachine.some((pattern) => pattern.test(pathname))) return null;
    return {
      reason: "no-origin",
      origin: null,
      message: "This form was sent without saying which page it came from, so it was refused. Send it again from the Tenthmark page itself.",
    };
  }
  if (allowed.includes(claimed)) return null;
  return {
    reason: "cross-origin",
    origin: claimed,
    message: "This form was sent from another website, so it was refused. Nothing was changed. Open the page on Tenthmark and send it from there.",
  };
}
