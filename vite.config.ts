import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import path from "node:path";
import { defineConfig } from "vite";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter()],
  resolve: { alias: { "~": path.resolve(import.meta.dirname, "app") } },
  server: { host: "127.0.0.1" },
  environments: {
    client: {
      build: {
        rolldownOptions: {
          output: {
            codeSplitting: {
              groups: [
                { name: "framework", test: /node_modules[\\/](react|react-dom|scheduler|react-router)[\\/]|rolldown[\\/]runtime|entry\.client|app[\\/](components[\\/]layout[\\/]route-announcer|components[\\/]ui[\\/](button|card|badge|cx)|modules[\\/]units[\\/]format|modules[\\/]listings[\\/]catalogue)\.tsx?$/ },
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
