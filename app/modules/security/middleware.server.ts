import { data, type MiddlewareFunction } from "react-router";
import { DOCUMENT_MAX_BYTES, formatBytes } from "~/modules/files/limits";
import { applySecurityHeaders, createNonce, cspNonceContext, withSecurityHeaders } from "./headers.server";
import { crossOriginRefusal } from "./origin.server";

/** The largest body any route takes (an inspector's certificate PDF, as a form), with room for the form around it. */
export const MAX_BODY_BYTES = DOCUMENT_MAX_BYTES + 1024 * 1024;

const KB = 1024;
const MB = 1024 * KB;

/**
 * Smaller caps where no file is ever sent; the first pattern that matches the path decides, anything else
 * takes MAX_BODY_BYTES. The JSON routes parse and check their whole body, so its size bounds their cost.
 */
export const BODY_LIMITS: ReadonlyArray<{ path: RegExp; bytes: number }> = [
  // Every profile test with 1 000 stations of full-precision numbers is about 0.5 MB.
  { path: /^\/api\/v1\/evaluations$/, bytes: 1 * MB },
  // Stripe's events are a few KB.
  { path: /^\/api\/webhooks\/stripe$/, bytes: 512 * KB },
  // Sign-in, sign-up, search and verification: a few fields.
  { path: /^\/api\//, bytes: 64 * KB },
  // A report form at its caps (200 stations per test, notes of 2 000 characters) is under 1 MB: autosave, submit, sign.
  // Imported positioning runs add at most 200 targets × 40 runs per axis test, about 0.45 MB for a machining centre.
  { path: /^\/inspector\/bookings\/[^/]+\/report(\/draft|\/review)?$/, bytes: 2 * MB },
  // An inspector's column mapping for instrument tables: eight small fields.
  { path: /^\/inspector\/column-mapping$/, bytes: 4 * KB },
];

/** The largest body this path takes, in bytes. */
export function bodyLimitFor(pathname: string): number {
  const path = pathname.replace(/\.data$/, "");
  return BODY_LIMITS.find((limit) => limit.path.test(path))?.bytes ?? MAX_BODY_BYTES;
}

/**
 * First in the root's chain: gives the request its CSP nonce, refuses a cross-origin change, an oversized
 * body or one of unknown length before any loader or action runs, turns an unreadable form into a 400,
 * and puts the security headers on whatever answer comes back.
 */
export const securityMiddleware: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  const nonce = createNonce();
  context.set(cspNonceContext, nonce);
  const refusal = crossOriginRefusal(request);
  if (refusal) throw problem(request, nonce, 403, { error: "cross_origin_request", reason: refusal.reason, message: refusal.message });
  const limit = bodyLimitFor(new URL(request.url).pathname);
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > limit) {
    // Read and dropped unparsed (cheap), so that the sender gets the answer on a connection that stays usable;
    // a body beyond anything the site takes is answered at once and its connection closed.
    if (declared <= MAX_BODY_BYTES) await request.body?.pipeTo(new WritableStream()).catch(() => undefined);
    throw problem(request, nonce, 413, { error: "body_too_large", message: `This request is larger than the ${formatBytes(limit)} this address accepts.` });
  }
  // A body of unknown length (chunked) could grow past that limit unseen; pages and API clients send a length.
  if (request.headers.has("transfer-encoding") && !request.headers.has("content-length")) {
    throw problem(request, nonce, 411, { error: "length_required", message: "Send this request with a Content-Length header: bodies of unknown length are not accepted." });
  }
  const unreadable = await unreadableForm(request);
  if (unreadable) throw problem(request, nonce, unreadable.status, { error: "unreadable_form", message: unreadable.message });
  return withSecurityHeaders(await next(), nonce);
};

const FORM_TYPES = /^\s*(application\/x-www-form-urlencoded|multipart\/form-data)\b/i;
/** Routes whose bodies are JSON (or Stripe's raw event), not forms: they read and answer for their bodies themselves. */
const takesOtherBodies = [/^\/api\//, /^\/inspector\/bookings\/[^/]+\/report\/draft$/, /^\/inspector\/column-mapping$/];

/**
 * Page actions read their form with `request.formData()`, which throws on a body that is not one (JSON,
 * plain text, a multipart body without or with the wrong boundary). That is the sender's mistake: say so
 * with a 415 or 400 before the action runs, instead of a 500 from inside it.
 */
async function unreadableForm(request: Request): Promise<{ status: number; message: string } | null> {
  if (!["POST", "PUT", "PATCH", "DELETE"].includes(request.method.toUpperCase())) return null;
  const pathname = new URL(request.url).pathname.replace(/\.data$/, "");
  if (takesOtherBodies.some((pattern) => pattern.test(pathname))) return null;
  // An empty POST (e.g. a button that sends nothing) is left to the action, which may not read a body at all.
  if (request.headers.get("content-length") === "0") return null;
  if (!FORM_TYPES.test(request.headers.get("content-type") ?? "")) {
    return { status: 415, message: "Send this form as application/x-www-form-urlencoded or multipart/form-data, as the page does." };
  }
  try {
    await request.clone().formData();
    return null;
  } catch {
    return { status: 400, message: "The form in this request could not be read. Reload the page and send it again." };
  }
}

/**
 * Thrown, so that a page request shows the message in the site's error page, a client-side navigation gets
 * it as route error data, and an API caller gets JSON as it is.
 */
function problem(request: Request, nonce: string, status: number, body: { error: string; message: string; reason?: string }) {
  const url = new URL(request.url);
  // A refused body is left unread on the connection: close it, so that the client does not send its next request after it.
  const closing = status === 411 || status === 413 ? { connection: "close" } : undefined;
  if (url.pathname.endsWith(".data")) return data(body.message, { status, headers: closing });
  const wantsJson = url.pathname.startsWith("/api/") || !/text\/html/.test(request.headers.get("accept") ?? "");
  const response = wantsJson
    ? Response.json(body, { status })
    : new Response(body.message, { status, headers: { "content-type": "text/plain; charset=utf-8" } });
  if (closing) response.headers.set("connection", closing.connection);
  applySecurityHeaders(response.headers, nonce);
  return response;
}
