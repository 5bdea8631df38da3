// The payments stand-in: the part of Stripe's REST API that Tenthmark calls, a hosted test payment page,
// and signed webhooks to the app. Loopback only; state under `<dataDir>/payments/state.json`.
import http from "node:http";
import { randomBytes } from "node:crypto";
import { PaymentsLedger, defaultApiVersion, publicView, type RequestContext } from "./api.ts";
import { renderCheckoutPage, renderClosedPage, renderOnboardingPage } from "./checkout-page.ts";
import { ConnectDesk, type OnboardingChoice } from "./connect.ts";
import { ApiError } from "./errors.ts";
import { parseStripeForm, type FormObject } from "./form.ts";
import { Store } from "./state.ts";
import { WebhookDeliverer } from "./webhooks.ts";


export type PaymentsStandInOptions = {
  port: number;
  dataDir: string;
  appOrigin: string;
  /** Where events are posted; default `${appOrigin}/api/webhooks/stripe`. */
  webhookUrl?: string;
  /** The API key it accepts and the secret it signs webhooks with; random ones unless given. */
  secretKey?: string;
  webhookSecret?: string;
  /** Delay before the first redelivery, doubled each time (default 1 s). */
  retryBaseMs?: number;
  /** Delivery attempts per event, the first one included (default 8). */
  maxDeliveryAttempts?: number;
  /** How long paying waits for the first webhook attempts before redirecting (default 3 s). */
  awaitDeliveryMs?: number;
};

export type PaymentsStandIn = {
  name: "payments";
  url: string;
  env: {
    STRIPE_SECRET_KEY: string;
    STRIPE_WEBHOOK_SECRET: string;
    STRIPE_API_HOST: "127.0.0.1";
    STRIPE_API_PORT: string;
    STRIPE_API_PROTOCOL: "http";
    STRIPE_STAND_IN_URL: string;
  };
  stop: () => Promise<void>;
};

const maxBodyBytes = 1024 * 1024;

function readBody(request: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    request.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > maxBodyBytes) {
        reject(new ApiError(413, "invalid_request_error", "Request body too large."));
        request.destroy();
      } else chunks.push(chunk);
    });
    request.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    request.on("error", reject);
  });
}

function sendJson(response: http.ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}) {
  const text = typeof body === "string" ? body : JSON.stringify(body, null, 2);
  response.writeHead(status, { "Content-Type": "application/json", "Request-Id": `req_${randomBytes(7).toString("hex")}`, ...headers });
  response.end(text);
}

function sendHtml(response: http.ServerResponse, status: number, html: string) {
  response.writeHead(status, { "Content-Type": "text/html; charset=utf-8", "Cache-Control": "no-store" });
  response.end(html);
}

/** Control API bodies may be JSON or form-encoded. */
function parseControlBody(body: string, contentType: string | undefined): Record<string, unknown> {
  if (!body) return {};
  if (contentType?.includes("application/json")) return JSON.parse(body) as Record<string, unknown>;
  return parseStripeForm(body);
}

export async function startPaymentsStandIn(options: PaymentsStandInOptions): Promise<PaymentsStandIn> {
  const secretKey = options.secretKey ?? `sk_test_${randomBytes(24).toString("hex")}`;
  const webhookSecret = options.webhookSecret ?? `whsec_${randomBytes(32).toString("hex")}`;
  const origin = `http://127.0.0.1:${options.port}`;
  const store = new Store(options.dataDir);
  const deliverer = new WebhookDeliverer(store, {
    url: options.webhookUrl ?? process.env.STRIPE_STAND_IN_WEBHOOK_URL ?? `${options.appOrigin}/api/webhooks/stripe`,
    secret: webhookSecret,
    retryBaseMs: options.retryBaseMs ?? 1_000,
    maxAttempts: options.maxDeliveryAttempts ?? 8,
    attemptTimeoutMs: 10_000,
  });
  const ledger = new PaymentsLedger(store, deliverer, { publicOrigin: origin, awaitDeliveryMs: options.awaitDeliveryMs ?? 3_000 });
  const connect = new ConnectDesk(store, ledger, { publicOrigin: origin });
  const inFlightKeys = new Set<string>();

  async function handleApi(request: http.IncomingMessage, response: http.ServerResponse, url: URL) {
    const authorization = request.headers.authorization;
    if (!authorization) {
      throw new ApiError(
        401,
        "invalid_request_error",
        "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').",
      );
    }
    const presented = authorization.replace(/^Bearer\s+/i, "");
    if (presented !== secretKey) {
      throw new ApiError(401, "authentication_error", `Invalid API Key provided: ${presented.slice(0, 8)}${"*".repeat(4)}${presented.slice(-4)}`);
    }
    const method = request.method ?? "GET";
    const body = method === "POST" ? await readBody(request) : "";
    const params: FormObject = method === "POST" ? parseStripeForm(body) : parseStripeForm(url.search.slice(1));
    const context: RequestContext = {
      idempotencyKey: (request.headers["idempotency-key"] as string | undefined) ?? null,
      apiVersion: (request.headers["stripe-version"] as string | undefined) ?? null,
      stripeAccount: (request.headers["stripe-account"] as string | undefined) ?? null,
    };
    const versionHeader = { "Stripe-Version": context.apiVersion ?? defaultApiVersion };

    const key = method === "POST" ? context.idempotencyKey : null;
    const fingerprint = `${method} ${url.pathname} ${body}`;
    if (key) {
      const saved = store.state.idempotency[key];
      if (saved) {
        if (saved.fingerprint !== fingerprint) {
          throw new ApiError(
            400,
            "idempotency_error",
            `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
          );
        }
        return sendJson(response, saved.status, saved.body, { ...versionHeader, "Idempotent-Replayed": "true", "Idempotency-Key": key });
      }
      if (inFlightKeys.has(key)) {
        throw new ApiError(409, "idempotency_error", `There is currently another in-progress request using this Idempotent Key (${key}). Try again later.`, "idempotency_key_in_use");
      }
      inFlightKeys.add(key);
    }
    try {
      const result = await route(method, url.pathname, params, context);
      const text = JSON.stringify(result, null, 2);
      // Stripe keeps the result of a request that ran, for 24 hours, to answer a retry with the same key.
      if (key) {
        store.state.idempotency[key] = { fingerprint, status: 200, body: text, created: Date.now() };
        const dayAgo = Date.now() - 24 * 3600 * 1000;
        for (const [savedKey, saved] of Object.entries(store.state.idempotency)) if (saved.created < dayAgo) delete store.state.idempotency[savedKey];
        store.save();
      }
      sendJson(response, 200, text, { ...versionHeader, ...(key ? { "Idempotency-Key": key } : {}) });
    } finally {
      if (key) inFlightKeys.delete(key);
    }
  }

  async function route(method: string, pathname: string, params: FormObject, context: RequestContext): Promise<unknown> {
    let match: RegExpMatchArray | null;
    if (pathname === "/v1/checkout/sessions" && method === "POST") return ledger.createSession(params, context);
    if ((match = pathname.match(/^\/v1\/checkout\/sessions\/([^/]+)$/)) && method === "GET") return ledger.retrieveSession(decodeURIComponent(match[1]!), params);
    if ((match = pathname.match(/^\/v1\/checkout\/sessions\/([^/]+)\/expire$/)) && method === "POST") {
      return ledger.expireSession(decodeURIComponent(match[1]!), params, context);
    }
    if ((match = pathname.match(/^\/v1\/payment_intents\/([^/]+)$/)) && method === "GET") return ledger.retrievePaymentIntent(decodeURIComponent(match[1]!), params);
    if ((match = pathname.match(/^\/v1\/charges\/([^/]+)$/)) && method === "GET") return ledger.retrieveCharge(decodeURIComponent(match[1]!), params);
    if (pathname === "/v1/refunds" && method === "POST") return ledger.createRefund(params, context);
    if ((match = pathname.match(/^\/v1\/refunds\/([^/]+)$/)) && method === "GET") return ledger.retrieveRefund(decodeURIComponent(match[1]!), params);
    if (pathname === "/v1/transfers" && method === "POST") return connect.createTransfer(params, context);
    if ((match = pathname.match(/^\/v1\/transfers\/([^/]+)$/)) && method === "GET") return connect.retrieveTransfer(decodeURIComponent(match[1]!), params);
    if ((match = pathname.match(/^\/v1\/transfers\/([^/]+)\/reversals$/))) {
      if (method === "POST") return connect.createReversal(decodeURIComponent(match[1]!), params, context);
      if (method === "GET") return connect.listReversals(decodeURIComponent(match[1]!), params);
    }
    if (pathname === "/v1/accounts" && method === "POST") return connect.createAccount(params);
    if ((match = pathname.match(/^\/v1\/accounts\/([^/]+)$/)) && method === "GET") return connect.retrieveAccount(decodeURIComponent(match[1]!), params);
    if (pathname === "/v1/account_links" && method === "POST") return connect.createAccountLink(params);
    if (pathname === "/v1/balance" && method === "GET") return connect.balance(context.stripeAccount);
    if (pathname === "/v1/balance_transactions" && method === "GET") return connect.listBalanceTransactions(params, context);
    if ((match = pathname.match(/^\/v1\/balance_transactions\/([^/]+)$/)) && method === "GET") {
      return connect.retrieveBalanceTransaction(decodeURIComponent(match[1]!), params, context);
    }
    if (pathname === "/v1/events" && method === "GET") return ledger.listEvents(params);
    if ((match = pathname.match(/^\/v1\/events\/([^/]+)$/)) && method === "GET") return ledger.event(decodeURIComponent(match[1]!));
    throw new ApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${pathname}). The payments stand-in speaks only the subset listed in stand-ins/payments/README.md.`);
  }

  async function handlePage(request: http.IncomingMessage, response: http.ServerResponse, sessionId: string) {
    ledger.expireDueSessions();
    const session = store.state.sessions[sessionId];
    if (!session) return sendHtml(response, 404, renderClosedPage(undefined));
    if (request.method === "GET") {
      return session.status === "open" ? sendHtml(response, 200, renderCheckoutPage(session)) : sendHtml(response, 410, renderClosedPage(session));
    }
    if (request.method !== "POST") return sendHtml(response, 405, renderClosedPage(session));
    const form = new URLSearchParams(await readBody(request));
    const values = { number: form.get("card_number") ?? "", expiry: form.get("expiry") ?? "", cvc: form.get("cvc") ?? "", email: form.get("email") ?? "", iban: form.get("iban") ?? "" };
    if (session.status !== "open") return sendHtml(response, 410, renderClosedPage(session));
    const result = form.get("method") === "bank_debit" ? await ledger.payByBankDebit(sessionId, values.iban, values.email || undefined) : await ledger.pay(sessionId, values, values.email || undefined);
    if (result.outcome === "declined") {
      return sendHtml(response, 402, renderCheckoutPage(session, { error: result.error.message, values: { ...values, cvc: "" } }));
    }
    if (result.redirectUrl) {
      response.writeHead(303, { Location: result.redirectUrl });
      return response.end();
    }
    return sendHtml(response, 200, renderClosedPage(session));
  }

  /** The hosted onboarding page an account link leads to: "complete" or "leave requirements due". */
  async function handleOnboarding(request: http.IncomingMessage, response: http.ServerResponse, token: string) {
    const opened = connect.openLink(token);
    if (!opened) return sendHtml(response, 404, renderOnboardingPage(undefined));
    // As at Stripe, a link that has expired or was used already sends the visitor to its refresh URL.
    if (!opened.usable) {
      response.writeHead(303, { Location: opened.link._refresh_url });
      return response.end();
    }
    if (request.method === "GET") return sendHtml(response, 200, renderOnboardingPage(opened.account, token));
    if (request.method !== "POST") return sendHtml(response, 405, renderOnboardingPage(undefined));
    const form = new URLSearchParams(await readBody(request));
    const choice = form.get("choice") === "requirements_due" ? "requirements_due" : "complete";
    const { redirect } = await connect.finishOnboarding(token, choice);
    response.writeHead(303, { Location: redirect });
    return response.end();
  }

  async function handleControl(request: http.IncomingMessage, response: http.ServerResponse, url: URL) {
    let match: RegExpMatchArray | null;
    const method = request.method ?? "GET";
    const controlBody = async () => parseControlBody(await readBody(request), request.headers["content-type"]);
    const outcome = (value: unknown) => (value === "succeeded" || value === "failed" ? value : undefined);
    if ((match = url.pathname.match(/^\/__stand-in\/sessions\/([^/]+)\/pay-by-bank-debit$/)) && method === "POST") {
      const body = await controlBody();
      const result = await ledger.payByBankDebit(decodeURIComponent(match[1]!), typeof body.iban === "string" ? body.iban : "", typeof body.email === "string" ? body.email : undefined);
      if (result.outcome === "declined") return sendJson(response, 402, result.error.toJSON());
      return sendJson(response, 200, { outcome: "processing", session: publicView(result.session), payment_intent: publicView(result.paymentIntent), redirect_url: result.redirectUrl, deliveries: result.deliveries });
    }
    if ((match = url.pathname.match(/^\/__stand-in\/payment_intents\/([^/]+)\/settle$/)) && method === "POST") {
      return sendJson(response, 200, await ledger.settlePayment(decodeURIComponent(match[1]!), outcome((await controlBody()).outcome)));
    }
    if ((match = url.pathname.match(/^\/__stand-in\/refunds\/([^/]+)\/settle$/)) && method === "POST") {
      return sendJson(response, 200, await ledger.settleRefund(decodeURIComponent(match[1]!), outcome((await controlBody()).outcome)));
    }
    if ((match = url.pathname.match(/^\/__stand-in\/charges\/([^/]+)\/settle$/)) && method === "POST") {
      return sendJson(response, 200, connect.settleCharge(decodeURIComponent(match[1]!)));
    }
    if ((match = url.pathname.match(/^\/__stand-in\/accounts\/([^/]+)\/state$/)) && method === "POST") {
      const body = await controlBody();
      const choice: OnboardingChoice = body.state === "requirements_due" ? "requirements_due" : "complete";
      return sendJson(response, 200, await connect.setState(decodeURIComponent(match[1]!), choice));
    }
    if ((match = url.pathname.match(/^\/__stand-in\/sessions\/([^/]+)\/pay$/)) && method === "POST") {
      const body = parseControlBody(await readBody(request), request.headers["content-type"]);
      const number = typeof body.card_number === "string" ? body.card_number : undefined;
      if (!number) throw new ApiError(400, "invalid_request_error", "Missing required param: card_number.", "parameter_missing", "card_number");
      const result = await ledger.pay(decodeURIComponent(match[1]!), {
        number,
        expiry: typeof body.expiry === "string" ? body.expiry : undefined,
        cvc: typeof body.cvc === "string" ? body.cvc : undefined,
      }, typeof body.email === "string" ? body.email : undefined);
      if (result.outcome === "declined") {
        return sendJson(response, 402, result.error.toJSON());
      }
      return sendJson(response, 200, {
        outcome: "paid",
        session: publicView(result.session),
        payment_intent: publicView(result.paymentIntent),
        redirect_url: result.redirectUrl,
        deliveries: result.deliveries,
      });
    }
    if ((match = url.pathname.match(/^\/__stand-in\/events\/([^/]+)\/resend$/)) && method === "POST") {
      return sendJson(response, 200, { delivery: await ledger.resend(decodeURIComponent(match[1]!)) });
    }
    if (url.pathname === "/__stand-in/deliveries" && method === "GET") {
      const eventId = url.searchParams.get("event_id");
      const type = url.searchParams.get("type");
      const data = store.state.deliveries.filter(
        (delivery) => (!eventId || delivery.event_id === eventId) && (!type || delivery.event_type === type),
      );
      return sendJson(response, 200, { object: "list", data, pending: store.state.pending });
    }
    throw new ApiError(404, "invalid_request_error", `Unrecognized control request (${method}: ${url.pathname}).`);
  }

  const server = http.createServer(async (request, response) => {
    const url = new URL(request.url ?? "/", origin);
    try {
      if (url.pathname.startsWith("/v1/")) return await handleApi(request, response, url);
      const page = url.pathname.match(/^\/pay\/([^/]+)$/);
      if (page) return await handlePage(request, response, decodeURIComponent(page[1]!));
      const onboarding = url.pathname.match(/^\/connect\/onboarding\/([^/]+)$/);
      if (onboarding) return await handleOnboarding(request, response, decodeURIComponent(onboarding[1]!));
      if (url.pathname.startsWith("/__stand-in/")) return await handleControl(request, response, url);
      if (url.pathname === "/") return sendJson(response, 200, { service: "payments stand-in", api: `${origin}/v1`, status: "ok" });
      throw new ApiError(404, "invalid_request_error", `Unrecognized request URL (${request.method}: ${url.pathname}).`);
    } catch (error) {
      if (response.headersSent) return response.end();
      if (error instanceof ApiError) return sendJson(response, error.status, error.toJSON());
      if (error instanceof SyntaxError) return sendJson(response, 400, new ApiError(400, "invalid_request_error", `Invalid body: ${error.message}`).toJSON());
      const message = error instanceof Error ? error.message : String(error);
      return sendJson(response, 500, new ApiError(500, "api_error", `The payments stand-in failed: ${message}`).toJSON());
    }
  });
  server.keepAliveTimeout = 5_000;

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  deliverer.resume();
  const sweep = setInterval(() => ledger.expireDueSessions(), 5_000);
  sweep.unref();

  return {
    name: "payments",
    url: origin,
    env: {
      STRIPE_SECRET_KEY: secretKey,
      STRIPE_WEBHOOK_SECRET: webhookSecret,
      STRIPE_API_HOST: "127.0.0.1",
      STRIPE_API_PORT: String(options.port),
      STRIPE_API_PROTOCOL: "http",
      STRIPE_STAND_IN_URL: origin,
    },
    async stop() {
      clearInterval(sweep);
      deliverer.stop();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
  };
}
