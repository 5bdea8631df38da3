// Request bodies the site refuses before any action reads them: larger than the largest upload, or of
// unknown length (chunked), which could grow past that limit unseen. Each gets its status and a message.
import { request } from "node:http";
import { describe, expect, it } from "vitest";
import { MAX_BODY_BYTES } from "~/modules/security/middleware.server";
import { testAppOrigin } from "../../support/accounts";

describe("request bodies", () => {
  it("larger than the site accepts get a 413 with a message, before anything reads them", async () => {
    // The length is declared and no byte of the body sent: the answer has to come from the header alone. (A
    // client that writes the whole body can meet a closed socket, EPIPE, before it reads that answer.)
    const answer = await new Promise<{ status: number; body: string }>((resolve, reject) => {
      const sent = request(`${testAppOrigin}/api/v1/evaluations`, {
        method: "POST",
        headers: { origin: testAppOrigin, "content-type": "application/json", "content-length": String(MAX_BODY_BYTES + 1) },
      });
      sent.on("response", (response) => {
        let body = "";
        response.setEncoding("utf8");
        response.on("data", (chunk: string) => (body += chunk));
        response.on("end", () => {
          resolve({ status: response.statusCode ?? 0, body });
          sent.destroy();
        });
      });
      sent.on("error", reject);
      sent.flushHeaders();
    });
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.body)).toMatchObject({ error: "body_too_large", message: expect.stringMatching(/larger than the \d+ MB/) });
  });

  it("of unknown length (chunked, no Content-Length) get a 411 with a message", async () => {
    const chunks = new ReadableStream<Uint8Array>({
      start(controller) {
        controller.enqueue(new TextEncoder().encode("email=someone%40example.test"));
        controller.close();
      },
    });
    const response = await fetch(`${testAppOrigin}/forgot-password`, {
      method: "POST",
      headers: { origin: testAppOrigin, "content-type": "application/x-www-form-urlencoded", accept: "text/html" },
      body: chunks,
      duplex: "half",
    } as RequestInit);
    expect(response.status).toBe(411);
    expect(await response.text()).toMatch(/Content-Length/);
  });
});
