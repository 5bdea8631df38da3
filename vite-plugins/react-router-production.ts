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
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import type { Plugin } from "vite";

const PACKAGE = /[\\/]node_modules[\\/]react-router[\\/]dist[\\/].*\.mjs$/;
const WARNINGS_ON = "var ENABLE_DEV_WARNINGS = true;";
const COMPONENT_FACTORY = /^(var \w+ = )(React\d*\.(?:forwardRef|createContext|memo)\()/gm;
const DISPLAY_NAME = /^\w+\.displayName = "[^"]*";$/gm;
// Where the router takes its instrumentation: the browser router's and the data routes' (`init`), the
// memory and static routers' (`opts`).
const INSTRUMENTED = /if \((?:init|opts\?)\.instrumentations\)/g;

export function reactRouterProduction(): Plugin {
  let keepInstrumentation = false;
  let warnedMissing = false;
  return {
    name: "tenthmark:react-router-production",
    apply: "build",
    applyToEnvironment: (environment) => environment.name === "client",
    configResolved(config) {
      const entry = path.join(config.root, "app", "entry.client.tsx");
      keepInstrumentation = existsSync(entry) && readFileSync(entry, "utf8").includes("instrumentations");
    },
    transform(code, id) {
      if (!PACKAGE.test(id)) return;
      // The chunk that holds the router also holds the flag; a new version without it is worth a look.
      if (code.includes("var ENABLE_DEV_WARNINGS") && !code.includes(WARNINGS_ON) && !warnedMissing) {
        warnedMissing = true;
        this.warn("React Router's ENABLE_DEV_WARNINGS is no longer `true` where expected: check vite-plugins/react-router-production.ts");
      }
      let out = code
        .replace(WARNINGS_ON, "var ENABLE_DEV_WARNINGS = false;")
        .replace(COMPONENT_FACTORY, "$1/* @__PURE__ */ $2")
        .replace(DISPLAY_NAME, "");
      if (!keepInstrumentation) out = out.replace(INSTRUMENTED, "if (false)");
      return out === code ? undefined : { code: out, map: null };
    },
  };
}
