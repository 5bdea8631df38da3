// Pages kept by the digest of their data: which requests may be answered with a kept page, that any change of
// the data, the address, the build or the day renders anew, that the nonce is put back per answer, and the
// byte budget.
import type { EntryContext } from "react-router";
import { describe, expect, it } from "vitest";
import { SESSION_COOKIE_PREFIX } from "~/modules/accounts/auth.server";
import { joinWithNonce, NONCE_PLACEHOLDER, splitAroundNonce } from "~/modules/http/kept-pages.server";
import { keptPageIdentity, RenderedPages } from "~/modules/http/rendered-pages.server";

function entryContext(loaderData: Record<string, unknown>, options: { keep?: boolean; version?: string; errors?: unknown; actionData?: unknown } = {}) {
  return {
    manifest: { version: options.version ?? "build-1" },
    routeModules: { root: {}, "routes/listings/machine": { handle: options.keep === false ? undefined : { keepRendered: true } } },
    staticHandlerContext: {
      loaderData,
      actionData: options.actionData ?? null,
      errors: options.errors ?? null,
      matches: [{ route: { id: "root" } }, { route: { id: "routes/listings/machine" } }],
    },
  } as unknown as EntryContext;
}

const listing = { root: { user: null }, "routes/listings/machine": { listing: { title: "Varnholt VL 300", priceMinor: 1_200_000 }, now: "2026-12-05T00:00:00.000Z" } };
const get = (address = "/machines/varnholt-vl-300", headers: Record<string, string> = {}, method = "GET") =>
  new Request(`http://localhost${address}`, { method, headers });

describe("pages kept by the digest of their data", () => {
  it("gives the same identity for the same data and address, another for any change of the data", () => {
    const first = keptPageIdentity(get(), 200, entryContext(listing));
    const again = keptPageIdentity(get(), 200, entryContext(structuredClone(listing)));
    expect(first).not.toBeNull();
    expect(again).toEqual(first);
    const repriced = structuredClone(listing);
    repriced["routes/listings/machine"].listing.priceMinor = 1_199_999;
    expect(keptPageIdentity(get(), 200, entryContext(repriced))?.digest).not.toBe(first!.digest);
    // Another address, or another build, is another page.
    expect(keptPageIdentity(get("/machines/varnholt-vl-300?units=inch"), 200, entryContext(listing))?.key).not.toBe(first!.key);
    expect(keptPageIdentity(get(), 200, entryContext(listing, { version: "build-2" }))?.key).not.toBe(first!.key);
  });

  it("keeps nothing for a session, another method, another status, an action's answer, an error, a route that did not opt in or data that is not plain", () => {
    expect(keptPageIdentity(get("/machines/x", { cookie: `${SESSION_COOKIE_PREFIX}.session_token=abc.def` }), 200, entryContext(listing))).toBeNull();
    expect(keptPageIdentity(get("/machines/x", {}, "POST"), 200, entryContext(listing))).toBeNull();
    expect(keptPageIdentity(get(), 404, entryContext(listing))).toBeNull();
    expect(keptPageIdentity(get(), 200, entryContext(listing, { actionData: { "routes/listings/machine": { sent: true } } }))).toBeNull();
    expect(keptPageIdentity(get(), 200, entryContext(listing, { errors: { root: new Error("down") } }))).toBeNull();
    expect(keptPageIdentity(get(), 200, entryContext(listing, { keep: false }))).toBeNull();
    expect(keptPageIdentity(get(), 200, entryContext({ ...listing, deferred: { history: Promise.resolve([]) } }))).toBeNull();
    expect(keptPageIdentity(get(), 200, entryContext({ ...listing, counts: new Map([["a", 1]]) }))).toBeNull();
    // Another cookie (no session) still gets the kept page.
    expect(keptPageIdentity(get("/machines/varnholt-vl-300", { cookie: "theme=dark" }), 200, entryContext(listing))).toEqual(keptPageIdentity(get(), 200, entryContext(listing)));
  });

  it("puts each answer's nonce in every place of the placeholder", () => {
    const html = Buffer.from(`<script nonce="${NONCE_PLACEHOLDER}">1</script><p>page</p><link nonce="${NONCE_PLACEHOLDER}"/>`);
    const parts = splitAroundNonce(html);
    expect(parts).toHaveLength(3);
    expect(Buffer.from(joinWithNonce(parts, "abc123")).toString()).toBe(`<script nonce="abc123">1</script><p>page</p><link nonce="abc123"/>`);
    expect(Buffer.from(joinWithNonce(splitAroundNonce(Buffer.from("<p>no script</p>")), "abc123")).toString()).toBe("<p>no script</p>");
  });

  it("answers a kept page only for the digest it was rendered from, within its byte budget, least recently used out first", () => {
    const store = new RenderedPages(3_000, 1_500);
    store.set("a", "d1", Buffer.alloc(1_000, "a"));
    expect(store.get("a", "d1")).toBeDefined();
    expect(store.get("a", "d2")).toBeUndefined();
    store.set("b", "d1", Buffer.alloc(1_000, "b"));
    expect(store.get("a", "d1")).toBeDefined();
    store.set("c", "d1", Buffer.alloc(1_000, "c"));
    // Over budget: "b" was used least recently.
    expect(store.get("b", "d1")).toBeUndefined();
    expect(store.get("a", "d1")).toBeDefined();
    expect(store.bytes).toBeLessThanOrEqual(3_000);
    // Larger than one page may be: not kept.
    store.set("big", "d1", Buffer.alloc(2_000));
    expect(store.get("big", "d1")).toBeUndefined();
    // Rendered anew from other data: the old page is replaced.
    store.set("a", "d2", Buffer.alloc(500));
    expect(store.get("a", "d1")).toBeUndefined();
    expect(store.get("a", "d2")).toBeDefined();
  });
});
