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
              ],
            },
          },
        },
      },
    },
  },
});
