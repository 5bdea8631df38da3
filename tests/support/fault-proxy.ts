// A small HTTP proxy to put between an app server and a stand-in, to make the service misbehave on
// command: pass requests through, refuse connections (down), hold them (slow), or answer 500.
import http from "node:http";
import type { AddressInfo, Socket } from "node:net";

export type FaultMode = { kind: "pass" } | { kind: "down" } | { kind: "slow"; delayMs: number } | { kind: "error"; status?: number };

export type FaultProxy = {
  url: string;
  port: number;
  /** How the proxy treats the next requests. */
  set(mode: FaultMode): void;
  /** Requests that reached the proxy since it started (passed or not). */
  readonly seen: number;
  stop(): Promise<void>;
};

/** Listens on 127.0.0.1:`port` (0 for any) and forwards to `target` (e.g. http://127.0.0.1:4568), Host header and all. */
export async function startFaultProxy(target: string, port = 0): Promise<FaultProxy> {
  const upstream = new URL(target);
  let mode: FaultMode = { kind: "pass" };
  let seen = 0;
  const sockets = new Set<Socket>();

  const server = http.createServer((request, response) => {
    seen += 1;
    const current = mode;
    if (current.kind === "down") {
      // As close to a stopped service as a listening socket gets: the connection is cut without an answer.
      request.socket.destroy();
      return;
    }
    if (current.kind === "error") {
      request.resume();
      response.writeHead(current.status ?? 500, { "content-type": "application/json" });
      response.end(JSON.stringify({ error: { type: "api_error", message: "Injected fault: the service failed." } }));
      return;
    }
    const forward = () => {
      // Headers go on unchanged: presigned S3 URLs are signed for the Host the client used.
      const proxied = http.request(
        { hostname: upstream.hostname, port: upstream.port, method: request.method, path: request.url, headers: request.headers },
        (answer) => {
          response.writeHead(answer.statusCode ?? 502, answer.headers);
          answer.pipe(response);
        },
      );
      proxied.on("error", () => {
        if (!response.headersSent) response.writeHead(502);
        response.end();
      });
      request.pipe(proxied);
    };
    if (current.kind === "slow") {
      request.pause();
      const timer = setTimeout(() => {
        request.resume();
        forward();
      }, current.delayMs);
      request.socket.once("close", () => clearTimeout(timer));
    } else forward();
  });
  server.on("connection", (socket) => {
    sockets.add(socket);
    socket.once("close", () => sockets.delete(socket));
  });
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", resolve));
  const actualPort = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${actualPort}`,
    port: actualPort,
    set(next) {
      mode = next;
    },
    get seen() {
      return seen;
    },
    async stop() {
      for (const socket of sockets) socket.destroy();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
