import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import path from "node:path";
import { defineConfig } from "vite";
import { reactRouterProduction } from "./vite-plugins/react-router-production.ts";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter(), reactRouterProduction()],
  resolve: { alias: { "~": path.resolve(import.meta.dirname, "app") } },
  server: { host: "127.0.0.1" },
  environments: {
    client: {
      build: {
        // `SOURCEMAP=1 npm run build` for reading what a chunk holds (docs/benchmarks.md); never shipped.
        sourcemap: process.env.SOURCEMAP === "1",
        rolldownOptions: {
          output: {
            codeSplitting: {
              groups: [
                // Every page loads the root layout too (header, footer, announcer), so it lives here rather than in a file of its own.
                { name: "framework", test: /node_modules[\\/](react|react-dom|scheduler|react-router)[\\/]|rolldown[\\/]runtime|entry\.client|app[\\/](root|components[\\/]layout[\\/](route-announcer|site-header|site-footer|name-mark)|modules[\\/]security[\\/](nonce|zod-without-eval)|components[\\/]ui[\\/](button|card|badge|cx)|modules[\\/]units[\\/]lengths)\.tsx?$/ },
                // What a signed report's pages share (the report and listing pages, the entry form): grade, figures,
                // sources, dates and the engine's few small files they need. One file instead of about eight.
                { name: "report-shared", test: /app[\\/](modules[\\/]reports[\\/](format|sources|content|components[\\/]grade)|geometry[\\/](sources|units|errors|straightness-line))\.tsx?$/ },
              ],
            },
          },
        },
      },
    },
  },
});
