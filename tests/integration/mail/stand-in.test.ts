import { randomUUID } from "node:crypto";
import { ServerClient } from "postmark";
import { describe, expect, it } from "vitest";

const mailboxUrl = process.env.MAILBOX_URL!;
const token = process.env.POSTMARK_SERVER_TOKEN!;
const host = process.env.POSTMARK_API_HOST!;
const address = () => `stand-in-${randomUUID().slice(0, 8)}@example.test`;

function post(path: string, body: unknown, serverToken = token) {
  return fetch(`${mailboxUrl}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json", accept: "application/json", "x-postmark-server-token": serverToken },
    body: JSON.stringify(body),
  });
}

describe("the Postmark stand-in", () => {
  it("accepts a message from the postmark SDK and answers in Postmark's shape", async () => {
    const to = address();
    const client = new ServerClient(token, { requestHost: host, useHttps: false });
    const receipt = await client.sendEmail({ From: "mail@tenthmark.example.test", To: to, Subject: "Hello", TextBody: "Plain", HtmlBody: "<p>Rich</p>" });
    expect(receipt).toMatchObject({ To: to, ErrorCode: 0, Message: "OK" });
    expect(receipt.MessageID).toMatch(/^[0-9a-f-]{36}$/);
    expect(new Date(receipt.SubmittedAt).getTime()).not.toBeNaN();
    const latest = await (await fetch(`${mailboxUrl}/api/messages/latest?to=${encodeURIComponent(to)}`)).json();
    expect(latest).toMatchObject({ id: receipt.MessageID, subject: "Hello", text: "Plain", html: "<p>Rich</p>" });
  });

  it("rejects a bad server token with 401", async () => {
    const response = await post("/email", { From: "mail@tenthmark.example.test", To: address(), Subject: "x", TextBody: "x" }, "not-the-token");
    expect(response.status).toBe(401);
    expect((await response.json()).ErrorCode).toBe(10);
    const client = new ServerClient("not-the-token", { requestHost: host, useHttps: false });
    await expect(client.sendEmail({ From: "mail@tenthmark.example.test", To: address(), Subject: "x", TextBody: "x" })).rejects.toMatchObject({ statusCode: 401 });
  });

  it("answers 422 with ErrorCode 300 for an invalid request", async () => {
    for (const body of [
      { From: "mail@tenthmark.example.test", Subject: "no recipient", TextBody: "x" },
      { From: "mail@tenthmark.example.test", To: address(), Subject: "no body" },
      { To: address(), Subject: "no sender", TextBody: "x" },
      { From: "mail@tenthmark.example.test", To: "not an address", Subject: "x", TextBody: "x" },
    ]) {
      const response = await post("/email", body);
      expect(response.status).toBe(422);
      const answer = await response.json();
      expect(answer.ErrorCode).toBe(300);
      expect(answer.Message).toBeTruthy();
    }
  });

  it("sends a batch, one result per message, and a templated message", async () => {
    const [first, second] = [address(), address()];
    const batch = await post("/email/batch", [
      { From: "mail@tenthmark.example.test", To: first, Subject: "One", TextBody: "1" },
      { From: "mail@tenthmark.example.test", Subject: "Missing To", TextBody: "2" },
      { From: "mail@tenthmark.example.test", To: second, Subject: "Three", HtmlBody: "<p>3</p>" },
    ]);
    expect(batch.status).toBe(200);
    const results = await batch.json();
    expect(results.map((result: { ErrorCode: number }) => result.ErrorCode)).toEqual([0, 300, 0]);
    const templated = await post("/email/withTemplate", { From: "mail@tenthmark.example.test", To: first, TemplateAlias: "welcome", TemplateModel: { name: "Ada" } });
    expect(templated.status).toBe(200);
    const list = await (await fetch(`${mailboxUrl}/api/messages?to=${encodeURIComponent(first)}`)).json();
    expect(list.messages).toHaveLength(2);
  });

  it("shows a mailbox page and clears one address's messages", async () => {
    const to = address();
    await post("/email", { From: "mail@tenthmark.example.test", To: to, Subject: "Mailbox <check>", TextBody: "x" });
    const page = await fetch(`${mailboxUrl}/?to=${encodeURIComponent(to)}`);
    expect(page.headers.get("content-type")).toMatch(/text\/html/);
    expect(await page.text()).toContain("Mailbox &lt;check&gt;");
    const cleared = await fetch(`${mailboxUrl}/api/messages?to=${encodeURIComponent(to)}`, { method: "DELETE" });
    expect((await cleared.json()).removed).toBe(1);
    expect((await fetch(`${mailboxUrl}/api/messages/latest?to=${encodeURIComponent(to)}`)).status).toBe(404);
  });
});
