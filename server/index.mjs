// The production server: react-router-serve's own set-up (compression, the hashed assets for a year, the
// rest of the client build and public/ for an hour, morgan's log, then the app), with the security headers
// on the static files too, which react-router-serve's static handler sends without them. Same operation:
// `node server/index.mjs build/server/index.js`, PORT (default 3000) and HOST from the environment.
// Plain JavaScript so that production runs it with Node alone.
import path from "node:path";
import { pathToFileURL } from "node:url";
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import morgan from "morgan";
import { oneDrainListenerPerWait } from "./drain-relay.mjs";

const buildPathArgument = process.argv[2];
if (!buildPathArgument) {
  console.error("Usage: node server/index.mjs <server-build-path>, e.g. node server/index.mjs build/server/index.js");
  process.exit(1);
}
const buildPath = path.resolve(buildPathArgument);
const build = await import(pathToFileURL(buildPath).href);

// One home for the headers: app/modules/security/headers.server.ts, exported through the server entry.
const staticHeaders = build.entry.module.staticFileHeaders();
const withHeaders = (options = {}) => ({ ...options, setHeaders: (response) => response.set(staticHeaders) });

const app = express();
app.disable("x-powered-by");
app.use(compression());
app.use(oneDrainListenerPerWait);
app.use(path.posix.join(build.publicPath, "assets"), express.static(path.join(build.assetsBuildDirectory, "assets"), withHeaders({ immutable: true, maxAge: "1y" })));
app.use(build.publicPath, express.static(build.assetsBuildDirectory, withHeaders()));
app.use(express.static("public", withHeaders({ maxAge: "1h" })));
app.use(morgan("tiny"));
// Each request's router context comes from the app (the page cache needs to know a data request by its address).
app.all("*", createRequestHandler({ build, mode: process.env.NODE_ENV, getLoadContext: (request) => build.entry.module.createLoadContext(request.originalUrl) }));

const port = Number(process.env.PORT ?? 3000);
const onListen = () => console.log(`[server] http://localhost:${port}${process.env.HOST ? ` (on ${process.env.HOST})` : ""}`);
const server = process.env.HOST ? app.listen(port, process.env.HOST, onListen) : app.listen(port, onListen);

// Ctrl-C in `npm start` reaches this process twice (the terminal's SIGINT, then the parent's SIGTERM): close once.
let closing = false;
function shutDown() {
  if (closing) return;
  closing = true;
  server.close(async (error) => {
    if (error) console.error(error);
    // The app's own stopping (started by the same signal): counted views written, the queue stopped.
    await build.entry.module.serverWorkStopped?.().catch((failure) => console.error(failure));
    process.exit(0);
  });
  server.closeIdleConnections();
  setTimeout(() => process.exit(0), 5_000).unref();
}
for (const signal of ["SIGTERM", "SIGINT"]) process.on(signal, shutDown);
