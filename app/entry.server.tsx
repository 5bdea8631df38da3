// React Router's default Node entry, plus the one thing the app server does besides answering requests:
// it runs the job queue's workers (mail, search indexing, …) in this same process.
import { Transform, Writable, type TransformCallback } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import type { EntryContext, HandleDataRequestFunction, HandleErrorFunction, RouterContextProvider } from "react-router";
import { isRouteErrorResponse, ServerRouter } from "react-router";
import { EnvironmentError, env } from "~/env.server";
import { startJobWorkers } from "~/modules/jobs/workers.server";
import { entityTag, holdsTag, notModified } from "~/modules/http/conditional.server";
import { renderFailedContext } from "~/modules/http/page-cache.server";
import { joinWithNonce, NONCE_PLACEHOLDER, splitAroundNonce } from "~/modules/http/kept-pages.server";
import { keptPageIdentity, renderedPages } from "~/modules/http/rendered-pages.server";
import { applySecurityHeaders, createNonce, cspNonceContext, withSecurityHeaders } from "~/modules/security/headers.server";
import { NonceProvider } from "~/modules/security/nonce";

// A missing, weak or published-default secret (or any other bad setting) stops the server before it answers
// anything; the message names each variable and what it must be.
try {
  env();
} catch (error) {
  if (!(error instanceof EnvironmentError)) throw error;
  console.error(`Tenthmark cannot start. ${error.message}`);
  process.exit(1);
}

// Once per process, when the server bundle is first loaded. A database that is down is retried inside.
void startJobWorkers();

// Our server (server/index.mjs) takes the static files' headers from the build, so they have one home, makes
// each request's router context here (it tells a page request from a client navigation's data request), and
// waits for the app's own stopping (the queue, the counted views, the pool) before it exits.
export { staticFileHeaders } from "~/modules/security/headers.server";
export { createLoadContext } from "~/modules/http/page-cache.server";
export { serverWorkStopped } from "~/modules/jobs/workers.server";

export const streamTimeout = 5_000;

/**
 * Passes React's output on in one piece per flush of its queues instead of its 4 KB chunks: every piece goes
 * through the web stream, the Express answer, compression (which flushes per piece) and the socket, so a
 * search page sent in 2 or 3 pieces instead of 20 or more costs the server less and compresses better. React
 * calls `flush()` when it has written all it has ready, so a streamed page still streams.
 */
class RenderedPieces extends Transform {
  private held: Buffer[] = [];

  constructor(private readonly onEnd: () => void) {
    super();
  }

  override _transform(chunk: Buffer, _encoding: BufferEncoding, callback: TransformCallback) {
    this.held.push(chunk);
    callback();
  }

  flush() {
    if (!this.held.length) return;
    const piece = this.held.length === 1 ? this.held[0]! : Buffer.concat(this.held);
    this.held = [];
    this.push(piece);
  }

  override _flush(callback: TransformCallback) {
    this.flush();
    this.onEnd();
    callback();
  }
}

/**
 * Errors React Router caught on the server. A request it answers with a 4xx itself (a GET to an
 * action-only route, a POST where there is no action, an unknown address) is the caller's mistake: one
 * line, no stack. Everything else is logged in full. Aborted requests (the client left) are not logged.
 */
export const handleError: HandleErrorFunction = (error, { request }) => {
  if (request.signal.aborted) return;
  // The router keeps the Error behind its own 4xx/5xx answers in `error` (not in the public type).
  const inner = isRouteErrorResponse(error) ? (error as { error?: unknown }).error : undefined;
  if (isRouteErrorResponse(error) && error.status < 500) {
    console.warn(`[http] ${error.status} ${request.method} ${new URL(request.url).pathname}: ${inner instanceof Error ? inner.message : error.statusText}`);
    return;
  }
  console.error(inner ?? error);
};

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: RouterContextProvider,
) {
  // The root middleware made this request's nonce; a page rendered without it (none known) gets its own.
  const nonce = loadContext.get(cspNonceContext) ?? createNonce();
  // A page whose loader named what it depends on (an ETag) is tagged with this build too, and a browser that
  // holds it is answered 304 before anything is rendered.
  const dependsOn = responseHeaders.get("ETag");
  if (dependsOn && responseStatusCode === 200) {
    const tag = entityTag([dependsOn, routerContext.manifest.version]);
    responseHeaders.set("ETag", tag);
    if (holdsTag(request, tag)) return notModified(responseHeaders);
  }
  applySecurityHeaders(responseHeaders, nonce);

  // https://httpwg.org/specs/rfc9110.html#HEAD
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }

  // A page kept by the digest of its data (rendered-pages.server.ts) is sent without rendering it again.
  const kept = keptPageIdentity(request, responseStatusCode, routerContext);
  if (kept) {
    responseHeaders.set("Content-Type", "text/html");
    const page = renderedPages.get(kept.key, kept.digest);
    if (page) return new Response(joinWithNonce(page.parts, nonce), { headers: responseHeaders, status: responseStatusCode });
    return renderToKeep(routerContext, request, responseHeaders, nonce, kept);
  }

  return new Promise((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Bots and SPA mode wait for all content; people get the shell as soon as it is ready.
    const readyOption: keyof RenderToPipeableStreamOptions = (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";

    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const app = (
      <NonceProvider value={nonce}>
        <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
      </NonceProvider>
    );
    const { pipe, abort } = renderToPipeableStream(app, {
      nonce,
      [readyOption]() {
        shellRendered = true;
        const body = new RenderedPieces(() => {
          clearTimeout(timeoutId);
          timeoutId = undefined;
        });
        const stream = createReadableStreamFromReadable(body);
        responseHeaders.set("Content-Type", "text/html");
        pipe(body);
        resolve(new Response(stream, { headers: responseHeaders, status: responseStatusCode }));
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        responseStatusCode = 500;
        // The status may have gone already: at least the page cache must not keep this page.
        loadContext.set(renderFailedContext, true);
        // Errors inside the shell are logged here; shell errors reject and are logged by React Router.
        if (shellRendered) console.error(error);
      },
    });
  });
}

/**
 * Renders a page to be kept: whole (all ready), with the nonce's placeholder, stored, and answered with this
 * request's nonce. A render that met an error is answered and not kept.
 */
function renderToKeep(routerContext: EntryContext, request: Request, responseHeaders: Headers, nonce: string, kept: { key: string; digest: string }) {
  return new Promise<Response>((resolve, reject) => {
    let failed = false;
    const held: Buffer[] = [];
    const timeoutId = setTimeout(() => abort(), streamTimeout + 1000);
    const app = (
      <NonceProvider value={NONCE_PLACEHOLDER}>
        <ServerRouter context={routerContext} url={request.url} nonce={NONCE_PLACEHOLDER} />
      </NonceProvider>
    );
    const { pipe, abort } = renderToPipeableStream(app, {
      nonce: NONCE_PLACEHOLDER,
      onAllReady() {
        const collector = new Writable({
          write(chunk: Buffer, _encoding, callback) {
            held.push(chunk);
            callback();
          },
          final(callback) {
            clearTimeout(timeoutId);
            const html = Buffer.concat(held);
            // Split around the placeholder once: the pieces are kept and answered with this request's nonce.
            const parts = failed ? splitAroundNonce(html) : renderedPages.set(kept.key, kept.digest, html);
            resolve(new Response(joinWithNonce(parts, nonce), { headers: responseHeaders, status: failed ? 500 : 200 }));
            callback();
          },
        });
        pipe(collector);
      },
      onShellError(error: unknown) {
        clearTimeout(timeoutId);
        reject(error);
      },
      onError(error: unknown) {
        failed = true;
        console.error(error);
      },
    });
  });
}

// Client-side navigations fetch `.data`: the same headers as a page, whatever the route answered.
export const handleDataRequest: HandleDataRequestFunction = (response, { context }) => {
  return withSecurityHeaders(response, (context as RouterContextProvider).get(cspNonceContext) ?? createNonce());
};
