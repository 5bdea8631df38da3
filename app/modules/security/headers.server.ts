// The security headers every response carries: one policy for the whole app, built from the environment
// so that the same code allows the local stand-ins or S3 and Stripe themselves.
import { randomBytes } from "node:crypto";
import { createContext } from "react-router";
import { env, type Environment } from "~/env.server";

/** The nonce of this request's Content-Security-Policy, set by the root middleware. */
export const cspNonceContext = createContext<string | null>(null);

export function createNonce(): string {
  return randomBytes(18).toString("base64");
}

/** The origin of the hosted checkout page a booking redirects to: Stripe's, or the payments stand-in's. */
export function checkoutOrigin(settings: Pick<Environment, "STRIPE_API_HOST" | "STRIPE_API_PORT" | "STRIPE_API_PROTOCOL"> = env()): string {
  if (!settings.STRIPE_API_HOST) return "https://checkout.stripe.com";
  const protocol = settings.STRIPE_API_PROTOCOL ?? "https";
  const port = settings.STRIPE_API_PORT ? `:${settings.STRIPE_API_PORT}` : "";
  return new URL(`${protocol}://${settings.STRIPE_API_HOST}${port}`).origin;
}

type PolicySettings = Pick<Environment, "S3_ENDPOINT" | "STRIPE_API_HOST" | "STRIPE_API_PORT" | "STRIPE_API_PROTOCOL" | "APP_ORIGIN">;

export function contentSecurityPolicy(nonce: string, settings: PolicySettings = env()): string {
  // The browser PUTs photos and documents straight to the bucket with presigned URLs (path-style).
  const storage = new URL(settings.S3_ENDPOINT).origin;
  const directives: Record<string, string[]> = {
    "default-src": ["'self'"],
    // React Router's hydration and scroll scripts, and React's streaming scripts, are inline: nonce them.
    "script-src": ["'self'", `'nonce-${nonce}'`],
    // Server-rendered style attributes (grade bars, plot keys, upload progress) and the style elements
    // Radix's dialog and select add at run time cannot carry a nonce.
    "style-src": ["'self'", "'unsafe-inline'"],
    "img-src": ["'self'", "data:", "blob:"],
    "font-src": ["'self'", "data:"],
    "connect-src": ["'self'", storage],
    // A booking form without JavaScript is answered with a redirect to the hosted checkout page.
    "form-action": ["'self'", checkoutOrigin(settings)],
    "frame-ancestors": ["'none'"],
    "base-uri": ["'self'"],
    "object-src": ["'none'"],
  };
  return Object.entries(directives)
    .map(([name, sources]) => `${name} ${sources.join(" ")}`)
    .join("; ");
}

// Nothing in the app uses these; a page that is ever framed or scripted by someone else gets none of them.
// Only features Chromium knows: an unknown one (e.g. bluetooth) is a console warning on every page.
const permissionsPolicy = [
  "camera=()",
  "microphone=()",
  "geolocation=()",
  "payment=()",
  "usb=()",
  "serial=()",
  "magnetometer=()",
  "gyroscope=()",
  "accelerometer=()",
].join(", ");

/**
 * Browsers remember for two years to reach us over https only — sent only when the public origin is https
 * (the local build runs on http://localhost, where it would be ignored or, worse, stick to localhost).
 */
export function transportSecurity(settings: Pick<Environment, "APP_ORIGIN"> = env()): Record<string, string> {
  return settings.APP_ORIGIN.startsWith("https://") ? { "Strict-Transport-Security": "max-age=63072000; includeSubDomains" } : {};
}

export function securityHeaders(nonce: string, settings: PolicySettings = env()): Record<string, string> {
  return {
    "Content-Security-Policy": contentSecurityPolicy(nonce, settings),
    "X-Content-Type-Options": "nosniff",
    "Referrer-Policy": "strict-origin-when-cross-origin",
    "X-Frame-Options": "DENY",
    "Permissions-Policy": permissionsPolicy,
    ...transportSecurity(settings),
  };
}

/**
 * The headers of the static files (hashed scripts and styles under /assets/, the favicon, fonts), which our
 * server (server/index.mjs) sends before the app sees the request: no sniffing, no framing, and a policy
 * that lets an SVG opened on its own run nothing.
 */
export function staticFileHeaders(settings: Pick<Environment, "APP_ORIGIN"> = env()): Record<string, string> {
  return {
    "Content-Security-Policy": "default-src 'none'; style-src 'unsafe-inline'; img-src 'self' data:; frame-ancestors 'none'",
    "X-Content-Type-Options": "nosniff",
    "X-Frame-Options": "DENY",
    "Referrer-Policy": "strict-origin-when-cross-origin",
    ...transportSecurity(settings),
  };
}

/** Sets the headers on `headers` (a route's own Content-Security-Policy is replaced: there is one policy). */
export function applySecurityHeaders(headers: Headers, nonce: string): void {
  for (const [name, value] of Object.entries(securityHeaders(nonce))) headers.set(name, value);
}

/** The response with the headers; a response whose headers are immutable (e.g. a proxied fetch) is copied. */
export function withSecurityHeaders(response: Response, nonce: string): Response {
  // A 304's headers replace the stored page's: a new policy would carry a nonce its scripts do not have.
  const apply = (headers: Headers) => {
    applySecurityHeaders(headers, nonce);
    if (response.status === 304) headers.delete("Content-Security-Policy");
  };
  try {
    apply(response.headers);
    return response;
  } catch {
    const copy = new Response(response.body, response);
    apply(copy.headers);
    return copy;
  }
}
