// The browser's zod setting without importing zod (app/modules/security/zod-without-eval.ts): zod 4 reads
// `jitless` from the shared `globalThis.__zod_globalConfig`, whichever of the two is loaded first, and then
// never tries `new Function` (which the Content-Security-Policy reports). Source: zod's own core
// (v4/core/core.js `globalConfig`, v4/core/schemas.js `$ZodObject`), read in node_modules.
import { afterEach, describe, expect, it, vi } from "vitest";

const scope = globalThis as unknown as { document?: unknown; __zod_globalConfig?: Record<string, unknown> };

// zod itself stays loaded between tests (as in a page): its shared settings object is reset instead.
afterEach(() => {
  delete scope.document;
  if (scope.__zod_globalConfig) delete scope.__zod_globalConfig.jitless;
  vi.restoreAllMocks();
  vi.resetModules();
});

/** Builds and runs an object schema; says whether zod tried to compile it with `new Function`. */
async function triesEval() {
  const { z } = await import("zod");
  const tries = vi.spyOn(globalThis, "Function");
  const schema = z.object({ make: z.string(), runoutUm: z.number() });
  expect(schema.parse({ make: "Orvik", runoutUm: 3 })).toEqual({ make: "Orvik", runoutUm: 3 });
  return tries.mock.calls.length > 0;
}

describe("zod without eval in the browser", () => {
  it("is jitless when the setting is made before zod loads", async () => {
    scope.document = {};
    await import("~/modules/security/zod-without-eval");
    const { z } = await import("zod");
    expect(z.config().jitless).toBe(true);
    expect(await triesEval()).toBe(false);
  });

  it("is jitless when zod loaded first", async () => {
    scope.document = {};
    const { z } = await import("zod");
    await import("~/modules/security/zod-without-eval");
    expect(z.config().jitless).toBe(true);
    expect(await triesEval()).toBe(false);
  });

  // Last: it lets zod make its one-time eval check, which the tests above must not have needed.
  it("leaves the server's zod alone, which then does try eval (so the check above can see it)", async () => {
    await import("~/modules/security/zod-without-eval");
    const { z } = await import("zod");
    expect(z.config().jitless).toBeUndefined();
    expect(await triesEval()).toBe(true);
  });
});
