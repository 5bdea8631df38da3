import { data, type MiddlewareFunction } from "react-router";
import { applySecurityHeaders, createNonce, cspNonceContext, withSecurityHeaders } from "./headers.server";
import { crossOriginRefusal, type OriginRefusal } from "./origin.server";

/**
 * First in the root's chain: gives the request its CSP nonce, refuses a cross-origin change before any
 * loader or action runs, and puts the security headers on whatever answer comes back.
 */
export const securityMiddleware: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  const nonce = createNonce();
  context.set(cspNonceContext, nonce);
  const refusal = crossOriginRefusal(request);
  // Thrown, so a page request shows the refusal in the site's error page and an API caller gets it as is.
  if (refusal) {
    // A client-side navigation's `.data` request carries the refusal as route error data.
    if (new URL(request.url).pathname.endsWith(".data")) throw data(refusal.message, { status: 403 });
    throw refusalResponse(request, refusal, nonce);
  }
  return withSecurityHeaders(await next(), nonce);
};

function refusalResponse(request: Request, refusal: OriginRefusal, nonce: string): Response {
  const url = new URL(request.url);
  const wantsJson = url.pathname.startsWith("/api/") || /application\/json/.test(request.headers.get("accept") ?? "");
  const response = wantsJson
    ? Response.json({ error: "cross_origin_request", reason: refusal.reason, message: refusal.message }, { status: 403 })
    : new Response(refusal.message, { status: 403, headers: { "content-type": "text/plain; charset=utf-8" } });
  applySecurityHeaders(response.headers, nonce);
  return response;
}
