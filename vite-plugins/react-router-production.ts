// React Router ships one build for development and production: its browser code keeps the developer
// warnings (`ENABLE_DEV_WARNINGS = true`), and its components are made by calls the bundler must assume have
// effects (`React.forwardRef(…)`, `X.displayName = "X"`), so that a component no page uses (NavLink, say)
// stays in every page's script. For the browser's production build this plugin turns the warnings off and
// marks those calls pure, as a production build of the package would: about 1.3 KB gzip off every page
// (docs/benchmarks.md). Lines are edited in place, so the package's own line numbers still hold.
import type { Plugin } from "vite";

const PACKAGE = /[\\/]node_modules[\\/]react-router[\\/]dist[\\/].*\.mjs$/;
const WARNINGS_ON = "var ENABLE_DEV_WARNINGS = true;";
const COMPONENT_FACTORY = /^(var \w+ = )(React\d*\.(?:forwardRef|createContext|memo)\()/gm;
const DISPLAY_NAME = /^\w+\.displayName = "[^"]*";$/gm;

export function reactRouterProduction(): Plugin {
  let warnedMissing = false;
  return {
    name: "tenthmark:react-router-production",
    apply: "build",
    applyToEnvironment: (environment) => environment.name === "client",
    transform(code, id) {
      if (!PACKAGE.test(id)) return;
      // The chunk that holds the router also holds the flag; a new version without it is worth a look.
      if (code.includes("var ENABLE_DEV_WARNINGS") && !code.includes(WARNINGS_ON) && !warnedMissing) {
        warnedMissing = true;
        this.warn("React Router's ENABLE_DEV_WARNINGS is no longer `true` where expected: check vite-plugins/react-router-production.ts");
      }
      const out = code
        .replace(WARNINGS_ON, "var ENABLE_DEV_WARNINGS = false;")
        .replace(COMPONENT_FACTORY, "$1/* @__PURE__ */ $2")
        .replace(DISPLAY_NAME, "");
      return out === code ? undefined : { code: out, map: null };
    },
  };
}
