// A large page streamed to a slow client through compression: React Router's writer waits for "drain"
// each time, and every wait must leave no listener behind (it logged MaxListenersExceededWarning).
import http from "node:http";
import type { AddressInfo } from "node:net";
import { writeReadableStreamToWritable } from "@react-router/node";
// @ts-expect-error compression ships no types; only its middleware call is used here.
import compression from "compression";
import { afterEach, describe, expect, it } from "vitest";
import { oneDrainListenerPerWait } from "../../../server/drain-relay.mjs";

const servers: http.Server[] = [];
afterEach(() => {
  for (const server of servers.splice(0)) server.close();
});

async function streamSlowly() {
  const warnings: string[] = [];
  const onWarning = (warning: Error) => warning.name === "MaxListenersExceededWarning" && warnings.push(warning.message);
  process.on("warning", onWarning);
  let drainWaits = 0;
  const compress = compression();
  const handle = async (response: http.ServerResponse) => {
    response.setHeader("content-type", "text/html");
    const realOnce = response.once.bind(response);
    response.once = ((type: string, listener: () => void) => {
      if (type === "drain") drainWaits++;
      return realOnce(type, listener);
    }) as typeof response.once;
    let chunks = 0;
    const page = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (chunks++ > 200) return controller.close();
        controller.enqueue(new TextEncoder().encode(Array.from({ length: 2000 }, () => `<td>${Math.random()}</td>`).join("")));
      },
    });
    await writeReadableStreamToWritable(page, response);
  };
  // The production server's order: compression, then the relay, then the app.
  const server = http.createServer((request, response) =>
    compress(request, response, () => oneDrainListenerPerWait(request, response, () => void handle(response))),
  );
  server.listen(0);
  servers.push(server);
  await new Promise((resolve) => server.once("listening", resolve));
  const { port } = server.address() as AddressInfo;
  const received = await new Promise<number>((resolve, reject) => {
    http
      .get({ port, path: "/", headers: { "accept-encoding": "gzip" } }, (response) => {
        let total = 0;
        response.pause();
        const tick = setInterval(() => {
          response.resume();
          setTimeout(() => response.pause(), 2);
        }, 5);
        response.on("data", (chunk: Buffer) => (total += chunk.length));
        response.on("end", () => {
          clearInterval(tick);
          resolve(total);
        });
      })
      .on("error", reject);
  });
  await new Promise((resolve) => setImmediate(resolve));
  process.off("warning", onWarning);
  return { received, warnings, drainWaits };
}

describe("a compressed page streamed to a slow client", () => {
  it("leaves no drain listener behind however often the writer waits", async () => {
    const { received, warnings, drainWaits } = await streamSlowly();
    expect(received).toBeGreaterThan(100_000);
    // Without the relay, the eleventh wait logs MaxListenersExceededWarning.
    expect(drainWaits).toBeGreaterThan(10);
    expect(warnings).toEqual([]);
  });
});
