// Zod compiles object parsers with `new Function` when it may; our Content-Security-Policy forbids eval,
// so in the browser it is told not to try (the try alone is reported as a violation). Imported first by
// root.tsx, before any schema is built. Zod 4 keeps its settings in `globalThis.__zod_globalConfig`, shared
// by every copy of zod and read when a schema is built, so this sets `jitless` without importing zod: a
// page that builds no schema in the browser (the search page) downloads no zod at all.
// tests/unit/security/zod-without-eval.test.ts checks that zod reads the setting, in either load order.
type WithZodConfig = typeof globalThis & { __zod_globalConfig?: Record<string, unknown> };

if (typeof document !== "undefined") {
  const scope = globalThis as WithZodConfig;
  scope.__zod_globalConfig = Object.assign(scope.__zod_globalConfig ?? {}, { jitless: true });
}

// A module (imported for its effect), not a script.
export {};
