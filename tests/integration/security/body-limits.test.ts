// Request bodies the site refuses before any action reads them: larger than the largest upload, or of
// unknown length (chunked), which could grow past that limit unseen. Each gets its status and a message.
import { describe, expect, it } from "vitest";
import { MAX_BODY_BYTES } from "~/modules/security/middleware.server";
import { testAppOrigin } from "../../support/accounts";

describe("request bodies", () => {
  it("larger than the site accepts get a 413 with a message, before anything reads them", async () => {
    const response = await fetch(`${testAppOrigin}/api/v1/evaluations`, {
      method: "POST",
      headers: { origin: testAppOrigin, "content-type": "application/json" },
      body: new Uint8Array(MAX_BODY_BYTES + 1),
    });
    expect(response.status).toBe(413);
    expect(await response.json()).toMatchObject({ error: "body_too_large", message: expect.stringMatching(/larger than the \d+ MB/) });
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
