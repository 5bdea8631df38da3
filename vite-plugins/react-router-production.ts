// React Router ships one build for development and production: its browser code keeps the developer
// warnings (`ENABLE_DEV_WARNINGS = true`), and its components are made by calls the bundler must assume have
// effects (`React.forwardRef(…)`, `X.displayName = "X"`), so that a component no page uses (NavLink, say)
// stays in every page's script. For the browser's production build this plugin turns the warnings off and
// marks those calls pure, as a production build of the package would: about 1.3 KB gzip off every page
// (docs/benchmarks.md). Lines are edited in place, so the package's own line numbers still hold.
//
// It also leaves out the router's instrumentation (the `unstable_instrumentations` option of the client
// entry, about 1 KB gzip), which this app does not use: its only client entry is React Router's default
// one. An `app/entry.client.tsx` that names instrumentations keeps it (checked when the build starts).
//
// And it leaves out what only runs under React Server Components (`useIsRSCRouterContext()` is true only
// inside the RSC router, which this app does not use: its client entry hydrates `HydratedRouter`), and the
// part of `<Scripts>` that writes the server's inline scripts (only under the server's static router; the
// browser renders them as blank text). A client entry that names RSC keeps the RSC code. Prefetching goes
// too while no module of `app/` prefetches (a Link's `prefetch`, `PrefetchPageLinks`, a `links` export).
//
// Each edit is anchored on the package's own text. When a chunk that should hold an anchor no longer does
// (an upgrade moved it), the build goes on unedited there and warns once, never fails.
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import type { Plugin } from "vite";

const PACKAGE = /[\\/]node_modules[\\/]react-router[\\/]dist[\\/].*\.mjs$/;
const COMPONENT_FACTORY = /^(var \w+ = )(React\d*\.(?:forwardRef|createContext|memo)\()/gm;
const DISPLAY_NAME = /^\w+\.displayName = "[^"]*";$/gm;

type Patch = {
  /** What the edit leaves out, for the warning. */
  what: string;
  /** Text found only in the chunk the anchor belongs to. */
  chunk: string;
  anchor: RegExp;
  replacement: string;
  /** Kept for apps that use what it leaves out. */
  unless?: keyof Keep;
};

export const PATCHES: Patch[] = [
  {
    what: "developer warnings (ENABLE_DEV_WARNINGS)",
    chunk: "var ENABLE_DEV_WARNINGS",
    anchor: /^var ENABLE_DEV_WARNINGS = true;$/m,
    replacement: "var ENABLE_DEV_WARNINGS = false;",
  },
  {
    // Where the router takes its instrumentation: the browser router's and the data routes' (`init`), the
    // memory and static routers' (`opts`).
    what: "instrumentation",
    chunk: "function instrumentClientSideRouter(",
    anchor: /if \((?:init|opts\?)\.instrumentations\)/g,
    replacement: "if (false)",
    unless: "instrumentation",
  },
  {
    // RouterProvider, PrefetchPageLinks and Scripts each ask once, in a line of its own.
    what: "React Server Components (useIsRSCRouterContext)",
    chunk: "function useIsRSCRouterContext()",
    anchor: /^(\s+let \w+ = )useIsRSCRouterContext\(\);$/gm,
    replacement: "$1false;",
    unless: "rsc",
  },
  {
    // RenderErrorBoundary reads the RSC router's context (its `contextType`) to decode a server
    // component's error digest and to follow its redirects.
    what: "React Server Components (RenderErrorBoundary's digest)",
    chunk: "RenderErrorBoundary.contextType = RSCRouterContext;",
    anchor: /^(\s+if \()this\.context( && typeof error === "object" && error && "digest" in error)/m,
    replacement: "$1false$2",
    unless: "rsc",
  },
  {
    what: "React Server Components (RenderErrorBoundary's redirects)",
    chunk: "RenderErrorBoundary.contextType = RSCRouterContext;",
    anchor: /^(\s+if \()this\.context(\) \{\n\s+return \/\* @__PURE__ \*\/ React\d*\.createElement\(RSCErrorHandler,)/m,
    replacement: "$1false$2",
    unless: "rsc",
  },
  {
    // Only the server's StaticRouterProvider makes a static data router; the browser's is never static,
    // and there `<Scripts>` renders its inline scripts as " ". Reading them as such lets the bundler drop
    // the code that writes them (and the partial manifest it inlines).
    what: "<Scripts>'s server-only inline scripts",
    chunk: "The <Scripts /> element is a no-op when using RSC",
    anchor: /^(\s+let \{ router), static: isStatic, staticContext( \} = useDataRouterContext\d*\(\);)$/m,
    replacement: "$1$2 let isStatic = false, staticContext = void 0;",
  },
  {
    // Prefetching: a `<Link prefetch>` other than "none" (the default), `<PrefetchPageLinks>`, or a route's
    // `links` export naming a page. With none of them in the app, every Link's prefetch state stays false
    // and its handlers empty, so the hook returns that at once and the page-prefetch components go.
    what: "prefetching (usePrefetchBehavior)",
    chunk: "function usePrefetchBehavior(",
    anchor: /^(function usePrefetchBehavior\(prefetch, theirElementProps\) \{)\n(\s+let frameworkContext = )(React\d*)(\.useContext\(FrameworkContext\);)$/m,
    replacement: "$1 return [false, $3.useRef(null), {}];\n$2$3$4",
    unless: "prefetch",
  },
  {
    what: "prefetching (Link's PrefetchPageLinks)",
    chunk: "function usePrefetchBehavior(",
    anchor: /^(\s+return )shouldPrefetch( && !isAbsolute \? .*createElement\(PrefetchPageLinks, \{ page: href \}\)\) : link;)$/m,
    replacement: "$1false$2",
    unless: "prefetch",
  },
  {
    what: "prefetching (Links' page descriptors)",
    chunk: "function usePrefetchBehavior(",
    anchor: /^(\s+\(\{ key, link \}\) => )isPageLinkDescriptor\(link\)( \? .*createElement\()$/m,
    replacement: "$1false$2",
    unless: "prefetch",
  },
];

export type Keep = { instrumentation: boolean; rsc: boolean; prefetch: boolean };

/** React Router's browser module `code` with the patches applied, and the patches whose anchor was missing. */
export function patchReactRouter(code: string, keep: Keep) {
  let out = code
    .replace(COMPONENT_FACTORY, "$1/* @__PURE__ */ $2")
    .replace(DISPLAY_NAME, "");
  const missing: string[] = [];
  for (const patch of PATCHES) {
    if (patch.unless && keep[patch.unless]) continue;
    if (!code.includes(patch.chunk)) continue;
    const edited = out.replace(patch.anchor, patch.replacement);
    if (edited === out) missing.push(patch.what);
    out = edited;
  }
  return { code: out, missing };
}

/** What the app uses of what the patches would leave out: its client entry (React Router's default one uses
 * neither instrumentation nor RSC), and any module of `app/` that prefetches or exports `links`. */
export function keptFor(root: string): Keep {
  const entry = path.join(root, "app", "entry.client.tsx");
  const text = existsSync(entry) ? readFileSync(entry, "utf8") : "";
  return { instrumentation: text.includes("instrumentations"), rsc: text.includes("RSC"), prefetch: appPrefetches(path.join(root, "app")) };
}

const MODULE = /\.(?:ts|tsx|js|jsx|mts|mjs)$/;
const PREFETCHES = /prefetch|export\s+(?:const|let|var|function|async\s+function)\s+links\b|export\s*\{[^}]*\blinks\b/i;

function appPrefetches(folder: string): boolean {
  if (!existsSync(folder)) return false;
  for (const entry of readdirSync(folder, { withFileTypes: true, recursive: true })) {
    if (!entry.isFile() || !MODULE.test(entry.name)) continue;
    if (PREFETCHES.test(readFileSync(path.join(entry.parentPath, entry.name), "utf8"))) return true;
  }
  return false;
}

export function reactRouterProduction(): Plugin {
  let keep: Keep = { instrumentation: false, rsc: false, prefetch: false };
  const warned = new Set<string>();
  return {
    name: "tenthmark:react-router-production",
    apply: "build",
    applyToEnvironment: (environment) => environment.name === "client",
    configResolved(config) {
      keep = keptFor(config.root);
    },
    transform(code, id) {
      if (!PACKAGE.test(id)) return;
      const patched = patchReactRouter(code, keep);
      for (const what of patched.missing) {
        if (warned.has(what)) continue;
        warned.add(what);
        this.warn(`React Router's code for ${what} is no longer where expected, so it stays in: check vite-plugins/react-router-production.ts`);
      }
      return patched.code === code ? undefined : { code: patched.code, map: null };
    },
  };
}
