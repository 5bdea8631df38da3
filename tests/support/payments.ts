// For payments tests: a payments stand-in of the test's own on a free port, and a small HTTP receiver
// standing in for the app's webhook endpoint, which records every delivery and answers as told.
import http from "node:http";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { freePort } from "../../scripts/lib/ports.ts";
import { startPaymentsStandIn, type PaymentsStandIn, type PaymentsStandInOptions } from "../../stand-ins/payments/index.ts";
import { createPaymentsClient } from "~/modules/payments/stripe.server";

export type ReceivedWebhook = { body: string; signature: string | null; event: { id: string; type: string; data: { object: Record<string, any> } } };

export type WebhookReceiver = {
  url: string;
  origin: string;
  received: ReceivedWebhook[];
  /** Decides the status each delivery is answered with (200 unless set). */
  answer: (webhook: ReceivedWebhook) => number;
  /** Other paths (e.g. a success page) are answered by this. */
  page: (request: http.IncomingMessage, response: http.ServerResponse) => void;
  close: () => Promise<void>;
};

export async function startWebhookReceiver(): Promise<WebhookReceiver> {
  const port = await freePort();
  const receiver: WebhookReceiver = {
    url: `http://127.0.0.1:${port}/api/webhooks/stripe`,
    origin: `http://127.0.0.1:${port}`,
    received: [],
    answer: () => 200,
    page: (_request, response) => {
      response.writeHead(404);
      response.end();
    },
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
  const server = http.createServer((request, response) => {
    if (request.url !== "/api/webhooks/stripe") return receiver.page(request, response);
    const chunks: Buffer[] = [];
    request.on("data", (chunk: Buffer) => chunks.push(chunk));
    request.on("end", () => {
      const body = Buffer.concat(chunks).toString("utf8");
      const webhook: ReceivedWebhook = { body, signature: (request.headers["stripe-signature"] as string | undefined) ?? null, event: JSON.parse(body) };
      receiver.received.push(webhook);
      response.writeHead(receiver.answer(webhook), { "Content-Type": "application/json" });
      response.end('{"received":true}');
    });
  });
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", resolve));
  server.unref();
  const close = receiver.close;
  receiver.close = async () => {
    server.closeAllConnections();
    await close();
  };
  return receiver;
}

export type PaymentsHarness = {
  standIn: PaymentsStandIn;
  receiver: WebhookReceiver;
  port: number;
  dataDir: string;
  client: ReturnType<typeof createPaymentsClient>;
  sdkOptions: { host: string; port: number; protocol: "http"; maxNetworkRetries: 0 };
  stop: () => Promise<void>;
};

export async function startPaymentsHarness(options: Partial<PaymentsStandInOptions> = {}): Promise<PaymentsHarness> {
  const receiver = await startWebhookReceiver();
  const port = await freePort();
  const dataDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-payments-"));
  const standIn = await startPaymentsStandIn({
    port,
    dataDir,
    appOrigin: receiver.origin,
    retryBaseMs: 100,
    maxDeliveryAttempts: 5,
    awaitDeliveryMs: 2_000,
    ...options,
  });
  const client = createPaymentsClient({
    secretKey: standIn.env.STRIPE_SECRET_KEY,
    webhookSecret: standIn.env.STRIPE_WEBHOOK_SECRET,
    host: "127.0.0.1",
    port,
    protocol: "http",
    timeoutMs: 5_000,
    maxNetworkRetries: 0,
  });
  return {
    standIn,
    receiver,
    port,
    dataDir,
    client,
    sdkOptions: { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0 },
    async stop() {
      await standIn.stop();
      await receiver.close();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export async function waitFor<T>(probe: () => T | undefined | Promise<T | undefined>, { timeoutMs = 10_000, what = "condition" } = {}): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}
