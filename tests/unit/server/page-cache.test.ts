// The page cache's rules, with a stand-in page in place of React Router's render: what is kept, what never is,
// how the nonce is put back, and the byte budget.
import { RouterContextProvider } from "react-router";
import { describe, expect, it } from "vitest";
import { cachedPage, createLoadContext, NONCE_PLACEHOLDER, PageStore, renderFailedContext, requestKindContext } from "~/modules/http/page-cache.server";
import { cspNonceContext } from "~/modules/security/headers.server";

const origin = "http://localhost";

/** One request through the middleware; `render` stands in for the route's answer, given the nonce it sees. */
async function through(
  middleware: ReturnType<typeof cachedPage>,
  address: string,
  render: (nonce: string, context: RouterContextProvider) => Response,
  options: { headers?: Record<string, string>; method?: string; development?: boolean } = {},
) {
  // The development server makes no load context of ours: the request's kind is unknown.
  const context = options.development ? new RouterContextProvider() : createLoadContext(address);
  const nonce = `nonce${Math.random().toString(36).slice(2, 10)}`;
  context.set(cspNonceContext, nonce);
  // React Router hands middleware a data request's address without `.data`.
  const request = new Request(`${origin}${address.replace(/\.data(?=\?|$)/, "")}`, { method: options.method ?? "GET", headers: options.headers });
  let rendered = 0;
  const response = (await middleware({ request, params: {}, context, unstable_pattern: "" } as never, async () => {
    rendered += 1;
    return render(context.get(cspNonceContext)!, context);
  })) as Response;
  return { response, nonce, rendered, text: response.body ? await response.text() : "" };
}

const pageWith = (headers: Record<string, string>) => (nonce: string) =>
  new Response(`<html><script nonce="${nonce}">1</script><p>report</p><script nonce="${nonce}">2</script></html>`, {
    headers: { "content-type": "text/html", "cache-control": "public, max-age=60", etag: 'W/"t1"', "content-security-policy": `script-src 'nonce-${nonce}'`, ...headers },
  });
const page = pageWith({});

function setUp(version = { current: "v1" }) {
  const store = new PageStore(10_000, 5_000);
  const middleware = cachedPage(async ({ url }) => (url.searchParams.has("other") ? null : { key: `page ${url.pathname}`, version: version.current }), store);
  return { store, middleware, version };
}

describe("the page cache", () => {
  it("renders once, then sends the kept page with each request's own nonce in every place", async () => {
    const { middleware, store } = setUp();
    const first = await through(middleware, "/reports/a", page);
    const second = await through(middleware, "/reports/a", page);
    expect([first.rendered, second.rendered]).toEqual([1, 0]);
    for (const answer of [first, second]) {
      expect(answer.text).toBe(`<html><script nonce="${answer.nonce}">1</script><p>report</p><script nonce="${answer.nonce}">2</script></html>`);
      expect(answer.text).not.toContain(NONCE_PLACEHOLDER);
      expect(answer.response.headers.get("content-security-policy") ?? "").not.toContain(NONCE_PLACEHOLDER);
    }
    expect(first.nonce).not.toBe(second.nonce);
    expect(store.size).toBe(1);
  });

  it("renders again when the version changes, and drops the old page", async () => {
    const { middleware, version } = setUp();
    await through(middleware, "/reports/a", page);
    version.current = "v2";
    expect((await through(middleware, "/reports/a", page)).rendered).toBe(1);
    expect((await through(middleware, "/reports/a", page)).rendered).toBe(0);
  });

  it("never keeps an answer with a cookie, a private or uncacheable one, or one that is not 200", async () => {
    const answers: Array<(nonce: string) => Response> = [
      pageWith({ "set-cookie": "a=b" }),
      pageWith({ "cache-control": "private, no-cache" }),
      pageWith({ "cache-control": "public, no-store" }),
      pageWith({ "cache-control": "" }),
      (nonce) => new Response(`<html><script nonce="${nonce}"></script></html>`, { status: 404, headers: { "content-type": "text/html", "cache-control": "public" } }),
      // A page that carries no nonce at all was not rendered as expected: not kept.
      () => new Response("<html></html>", { headers: { "content-type": "text/html", "cache-control": "public" } }),
    ];
    for (const answer of answers) {
      const { middleware, store } = setUp();
      const first = await through(middleware, "/reports/a", answer);
      expect(first.text).not.toContain(NONCE_PLACEHOLDER);
      expect((await through(middleware, "/reports/a", answer)).rendered).toBe(1);
      expect(store.size).toBe(0);
    }
  });

  it("never keeps a page React reported an error in while it streamed", async () => {
    const { middleware, store } = setUp();
    const failing = (nonce: string, context: RouterContextProvider) => {
      context.set(renderFailedContext, true);
      return page(nonce);
    };
    await through(middleware, "/reports/a", failing);
    expect(store.size).toBe(0);
  });

  it("keeps robots' pages (sent whole) apart from people's (streamed)", async () => {
    const { middleware } = setUp();
    await through(middleware, "/reports/a", page, { headers: { "user-agent": "Mozilla/5.0 (X11; Linux x86_64) Chrome/131.0 Safari/537.36" } });
    expect((await through(middleware, "/reports/a", page, { headers: { "user-agent": "Googlebot/2.1 (+http://www.google.com/bot.html)" } })).rendered).toBe(1);
    expect((await through(middleware, "/reports/a", page, { headers: { "user-agent": "Googlebot/2.1 (+http://www.google.com/bot.html)" } })).rendered).toBe(0);
  });

  it("keeps no header but the page's own: no cookie, no security header replayed", async () => {
    const { middleware } = setUp();
    await through(middleware, "/reports/a", pageWith({ "x-frame-options": "DENY", "x-other": "1" }));
    const kept = await through(middleware, "/reports/a", page);
    expect(kept.rendered).toBe(0);
    expect([...kept.response.headers.keys()].sort()).toEqual(["cache-control", "content-type", "etag"]);
  });

  it("is bypassed with a session cookie, for other methods, other parameters, and without the server's request kind", async () => {
    const { middleware, store } = setUp();
    expect((await through(middleware, "/reports/a", page, { headers: { cookie: "tenthmark.session_token=abc" } })).rendered).toBe(1);
    expect((await through(middleware, "/reports/a", page, { method: "POST" })).rendered).toBe(1);
    expect((await through(middleware, "/reports/a?other=1", page)).rendered).toBe(1);
    expect(store.size).toBe(0);
    // Kept, then asked for with a session cookie: rendered for that visitor, the kept page untouched.
    await through(middleware, "/reports/a", page);
    const signedIn = await through(middleware, "/reports/a", page, { headers: { cookie: "__Secure-tenthmark.session_token=abc" } });
    expect(signedIn.rendered).toBe(1);
    expect(new RouterContextProvider().get(requestKindContext)).toBeNull();
    const { middleware: fresh } = setUp();
    for (let round = 0; round < 2; round += 1) expect((await through(fresh, "/reports/a", page, { development: true })).rendered).toBe(1);
  });

  it("keeps a data request apart from the page at the same address", async () => {
    const { middleware } = setUp();
    const data = () => new Response('[{"data":1}]', { headers: { "content-type": "text/x-script", "cache-control": "public, max-age=60" } });
    await through(middleware, "/reports/a", page);
    const first = await through(middleware, "/reports/a.data", data);
    const second = await through(middleware, "/reports/a.data", data);
    expect([first.rendered, second.rendered]).toEqual([1, 0]);
    expect(second.text).toBe('[{"data":1}]');
    const document = await through(middleware, "/reports/a", page);
    expect(document.rendered).toBe(0);
    expect(document.text).toContain("<html>");
    // Another set of loaders asked for is another answer.
    expect((await through(middleware, "/reports/a.data?_routes=root", data)).rendered).toBe(1);
  });

  it("answers HEAD and a held tag from the kept page without a body", async () => {
    const { middleware } = setUp();
    await through(middleware, "/reports/a", page);
    const head = await through(middleware, "/reports/a", page, { method: "HEAD" });
    expect([head.rendered, head.response.status, head.text]).toEqual([0, 200, ""]);
    const held = await through(middleware, "/reports/a", page, { headers: { "if-none-match": 'W/"t1"' } });
    expect([held.rendered, held.response.status, held.text]).toEqual([0, 304, ""]);
  });

  it("holds its byte budget, the least recently used page out first, and refuses a page over the largest size", () => {
    const store = new PageStore(1_000, 600);
    const stored = (bytes: number) => ({ version: "v", kind: "document" as const, headers: [], parts: [Buffer.alloc(bytes)], bytes });
    store.set("a", stored(400));
    store.set("b", stored(400));
    expect(store.get("a", "v")).toBeDefined();
    store.set("c", stored(400));
    expect(store.get("b", "v")).toBeUndefined();
    expect(store.get("a", "v")).toBeDefined();
    expect(store.bytes).toBe(800);
    expect(store.set("d", stored(700))).toBe(false);
    expect(store.bytes).toBeLessThanOrEqual(1_000);
    expect(store.get("a", "other")).toBeUndefined();
    expect(store.bytes).toBe(400);
  });
});
