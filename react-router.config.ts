import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // The test run builds into its own folder so that it never disturbs a running `npm start`.
  buildDirectory: process.env.TENTHMARK_BUILD_DIR ?? "build",
  future: { v8_middleware: true },
  // Cross-origin posts are refused by our root middleware with a 403 and a message, for every route
  // (docs/decisions/cross-origin-requests.md); React Router's own check would answer a bare 400 before it.
  allowedActionOrigins: ["**"],
} satisfies Config;
