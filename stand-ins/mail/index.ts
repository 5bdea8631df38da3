// The local stand-in for Postmark: the subset of its send API we use (`POST /email`, `/email/batch`,
// `/email/withTemplate`, answered in Postmark's shapes), a mailbox page to read what was sent, and a JSON
// API for tests. Messages are kept as files under the data folder, so they survive a restart.
import { randomBytes, randomUUID } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import http from "node:http";
import path from "node:path";

const DEFAULT_FROM = "Tenthmark <mail@tenthmark.example.test>";

export type StoredMessage = {
  id: string;
  submittedAt: string;
  from: string;
  to: string[];
  cc: string[];
  bcc: string[];
  replyTo: string | null;
  /** Extra headers as Postmark takes them (`Headers: [{ Name, Value }]`). */
  headers: Array<{ name: string; value: string }>;
  subject: string;
  html: string;
  text: string;
  tag: string | null;
  messageStream: string | null;
  template: { id: number | null; alias: string | null; model: unknown } | null;
};

type PostmarkError = { status: number; ErrorCode: number; Message: string };

const invalid = (message: string): PostmarkError => ({ status: 422, ErrorCode: 300, Message: message });

/** The addresses in a Postmark recipient field ("a@x, Name <b@y>"), lower-cased. */
function addresses(field: unknown): string[] {
  if (typeof field !== "string" || !field.trim()) return [];
  return field
    .split(",")
    .map((part) => part.trim())
    .filter(Boolean)
    .map((part) => (part.match(/<([^>]+)>/)?.[1] ?? part).trim().toLowerCase());
}

const looksLikeAddress = (value: string) => /^[^\s@<>]+@[^\s@<>]+\.[^\s@<>]+$/.test(value);

/** Checks one message of a send request as Postmark does; returns the stored form or the error. */
function acceptMessage(body: unknown, withTemplate: boolean): StoredMessage | PostmarkError {
  if (!body || typeof body !== "object" || Array.isArray(body)) return invalid("Invalid email request: the body must be a JSON object.");
  const message = body as Record<string, unknown>;
  const from = typeof message.From === "string" ? message.From.trim() : "";
  if (!from) return invalid("Invalid 'From' address: the field is required.");
  if (!looksLikeAddress(addresses(from)[0] ?? "")) return invalid(`Invalid 'From' address: '${from}'.`);
  const to = addresses(message.To);
  if (to.length === 0) return invalid("Zero recipients specified: the 'To' field is required.");
  const cc = addresses(message.Cc);
  const bcc = addresses(message.Bcc);
  const bad = [...to, ...cc, ...bcc].find((address) => !looksLikeAddress(address));
  if (bad) return invalid(`Invalid 'To' address: '${bad}'.`);
  if (to.length + cc.length + bcc.length > 50) return invalid("Too many recipients: at most 50 in To, Cc and Bcc together.");

  let subject = typeof message.Subject === "string" ? message.Subject : "";
  let html = typeof message.HtmlBody === "string" ? message.HtmlBody : "";
  let text = typeof message.TextBody === "string" ? message.TextBody : "";
  let template: StoredMessage["template"] = null;
  if (withTemplate) {
    const id = typeof message.TemplateId === "number" ? message.TemplateId : null;
    const alias = typeof message.TemplateAlias === "string" ? message.TemplateAlias : null;
    if (id === null && alias === null) return invalid("Invalid email request: TemplateId or TemplateAlias is required.");
    if (!message.TemplateModel || typeof message.TemplateModel !== "object") return invalid("Invalid email request: TemplateModel must be an object.");
    template = { id, alias, model: message.TemplateModel };
    // The stand-in keeps no templates: it shows the model it was given.
    subject ||= `Template ${alias ?? id}`;
    text = JSON.stringify(message.TemplateModel, null, 2);
    html = `<pre>${escapeHtml(text)}</pre>`;
  } else if (!html && !text) {
    return invalid("Provide either email TextBody or HtmlBody or both.");
  }
  return {
    id: randomUUID(),
    submittedAt: new Date().toISOString(),
    from,
    to,
    cc,
    bcc,
    replyTo: typeof message.ReplyTo === "string" ? message.ReplyTo : null,
    headers: Array.isArray(message.Headers)
      ? message.Headers.flatMap((header: unknown) => {
          const { Name, Value } = (header ?? {}) as { Name?: unknown; Value?: unknown };
          return typeof Name === "string" && typeof Value === "string" ? [{ name: Name, value: Value }] : [];
        })
      : [],
    subject,
    html,
    text,
    tag: typeof message.Tag === "string" ? message.Tag : null,
    messageStream: typeof message.MessageStream === "string" ? message.MessageStream : null,
    template,
  };
}

const isError = (value: StoredMessage | PostmarkError): value is PostmarkError => "ErrorCode" in value;

function receipt(message: StoredMessage) {
  return { To: message.to.join(", "), SubmittedAt: message.submittedAt, MessageID: message.id, ErrorCode: 0, Message: "OK" };
}

function escapeHtml(value: string) {
  return value.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

function sendJson(response: http.ServerResponse, status: number, body: unknown) {
  response.writeHead(status, { "Content-Type": "application/json; charset=utf-8", "Cache-Control": "no-store" });
  response.end(JSON.stringify(body));
}

function sendHtml(response: http.ServerResponse, status: number, html: string) {
  response.writeHead(status, { "Content-Type": "text/html; charset=utf-8", "Cache-Control": "no-store" });
  response.end(html);
}

function readBody(request: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    request.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > 10 * 1024 * 1024) request.destroy(new Error("request body over 10 MB"));
      else chunks.push(chunk);
    });
    request.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    request.on("error", reject);
  });
}

function page(title: string, body: string) {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} — mail stand-in</title>
<style>
body{font-family:system-ui,sans-serif;margin:0;background:#f5f6f7;color:#17212b}
header{background:#17212b;color:#fff;padding:12px 20px;display:flex;gap:16px;align-items:baseline;flex-wrap:wrap}
header a{color:#f1dbad}main{max-width:960px;margin:0 auto;padding:20px}
table{width:100%;border-collapse:collapse;background:#fff}td,th{padding:8px 10px;border-bottom:1px solid #d7dde2;text-align:left;font-size:14px;vertical-align:top}
th{font-size:12px;text-transform:uppercase;color:#4b5d6c}a{color:#17212b}
.meta{background:#fff;padding:12px 16px;border:1px solid #d7dde2;border-radius:8px;font-size:14px}
.meta dt{font-weight:700;float:left;width:90px}.meta dd{margin:0 0 4px 90px}
iframe{width:100%;height:520px;border:1px solid #d7dde2;border-radius:8px;background:#fff}
pre{white-space:pre-wrap;background:#fff;border:1px solid #d7dde2;border-radius:8px;padding:12px;font-size:13px}
button{font:inherit;padding:4px 10px}
</style></head><body><header><strong>Mail stand-in</strong><a href="/">Mailbox</a><span>Postmark subset on loopback; nothing leaves this machine.</span></header><main>${body}</main></body></html>`;
}

export type MailStandInOptions = { port: number; dataDir: string; appOrigin?: string; token?: string };

/** `token` is the server token it accepts; a random one unless given. */
export async function startMailStandIn({ port, dataDir, token = randomBytes(24).toString("hex") }: MailStandInOptions) {
  const directory = path.join(dataDir, "mail");
  mkdirSync(directory, { recursive: true });
  const messages: StoredMessage[] = readdirSync(directory)
    .filter((name) => name.endsWith(".json"))
    .map((name) => JSON.parse(readFileSync(path.join(directory, name), "utf8")) as StoredMessage)
    .sort((a, b) => a.submittedAt.localeCompare(b.submittedAt));

  const store = (message: StoredMessage) => {
    writeFileSync(path.join(directory, `${message.id}.json`), JSON.stringify(message, null, 2));
    messages.push(message);
  };
  const forAddress = (to: string | null) =>
    to ? messages.filter((message) => [...message.to, ...message.cc, ...message.bcc].includes(to.trim().toLowerCase())) : messages;

  async function handleSend(request: http.IncomingMessage, response: http.ServerResponse, kind: "single" | "batch" | "template") {
    if (request.headers["x-postmark-server-token"] !== token) {
      return sendJson(response, 401, {
        ErrorCode: 10,
        Message: "The Server Token you provided in the X-Postmark-Server-Token request header was invalid. Please verify that you are using a valid token.",
      });
    }
    let body: unknown;
    try {
      body = JSON.parse(await readBody(request));
    } catch {
      return sendJson(response, 422, { ErrorCode: 300, Message: "Invalid email request: the body is not valid JSON." });
    }
    if (kind === "batch") {
      if (!Array.isArray(body)) return sendJson(response, 422, { ErrorCode: 300, Message: "Invalid email request: a batch must be a JSON array." });
      if (body.length > 500) return sendJson(response, 422, { ErrorCode: 300, Message: "Invalid email request: at most 500 messages in a batch." });
      // Postmark answers a batch with one result per message, sending the good ones.
      const results = body.map((item) => {
        const accepted = acceptMessage(item, false);
        if (isError(accepted)) return { ErrorCode: accepted.ErrorCode, Message: accepted.Message };
        store(accepted);
        return receipt(accepted);
      });
      return sendJson(response, 200, results);
    }
    const accepted = acceptMessage(body, kind === "template");
    if (isError(accepted)) return sendJson(response, accepted.status, { ErrorCode: accepted.ErrorCode, Message: accepted.Message });
    store(accepted);
    return sendJson(response, 200, receipt(accepted));
  }

  function mailboxPage(to: string | null) {
    const rows = [...forAddress(to)]
      .reverse()
      .map(
        (message) => `<tr><td>${escapeHtml(new Date(message.submittedAt).toLocaleString("en-GB"))}</td>
<td>${escapeHtml(message.to.join(", "))}</td><td><a href="/messages/${message.id}">${escapeHtml(message.subject || "(no subject)")}</a></td><td>${escapeHtml(message.tag ?? "")}</td></tr>`,
      )
      .join("");
    return page(
      "Mailbox",
      `<form method="get" action="/" style="margin-bottom:12px"><label>Recipient <input name="to" value="${escapeHtml(to ?? "")}" placeholder="someone@example.test"></label> <button>Filter</button></form>
<table><thead><tr><th>Sent</th><th>To</th><th>Subject</th><th>Tag</th></tr></thead><tbody>${rows || `<tr><td colspan="4">No messages${to ? ` to ${escapeHtml(to)}` : ""} yet.</td></tr>`}</tbody></table>`,
    );
  }

  function messagePage(message: StoredMessage) {
    return page(
      message.subject,
      `<dl class="meta"><dt>From</dt><dd>${escapeHtml(message.from)}</dd><dt>To</dt><dd>${escapeHtml(message.to.join(", "))}</dd>
<dt>Subject</dt><dd>${escapeHtml(message.subject)}</dd><dt>Sent</dt><dd>${escapeHtml(message.submittedAt)}</dd>${message.replyTo ? `<dt>Reply-To</dt><dd>${escapeHtml(message.replyTo)}</dd>` : ""}</dl>
<h2>HTML</h2><iframe title="HTML part" sandbox="allow-popups allow-popups-to-escape-sandbox allow-top-navigation-by-user-activation" src="/messages/${message.id}/html"></iframe>
<h2>Plain text</h2><pre>${escapeHtml(message.text)}</pre>`,
    );
  }

  const server = http.createServer(async (request, response) => {
    try {
      const url = new URL(request.url ?? "/", `http://127.0.0.1:${port}`);
      const method = request.method ?? "GET";
      const to = url.searchParams.get("to");
      if (method === "POST" && url.pathname === "/email") return await handleSend(request, response, "single");
      if (method === "POST" && url.pathname === "/email/batch") return await handleSend(request, response, "batch");
      if (method === "POST" && url.pathname === "/email/withTemplate") return await handleSend(request, response, "template");

      if (method === "GET" && url.pathname === "/api/messages") return sendJson(response, 200, { messages: forAddress(to) });
      if (method === "GET" && url.pathname === "/api/messages/latest") {
        const latest = forAddress(to).at(-1);
        return latest ? sendJson(response, 200, latest) : sendJson(response, 404, { message: `no message${to ? ` to ${to}` : ""}` });
      }
      if (method === "DELETE" && url.pathname === "/api/messages") {
        const removed = forAddress(to);
        for (const message of removed) rmSync(path.join(directory, `${message.id}.json`), { force: true });
        const keep = messages.filter((message) => !removed.includes(message));
        messages.splice(0, messages.length, ...keep);
        return sendJson(response, 200, { removed: removed.length });
      }

      if (method === "GET" && url.pathname === "/") return sendHtml(response, 200, mailboxPage(to));
      const match = url.pathname.match(/^\/messages\/([0-9a-f-]{36})(\/html|\/text)?$/);
      const message = match ? messages.find((candidate) => candidate.id === match[1]) : undefined;
      if (method === "GET" && message) {
        if (match![2] === "/html") return sendHtml(response, 200, message.html || `<pre>${escapeHtml(message.text)}</pre>`);
        if (match![2] === "/text") {
          response.writeHead(200, { "Content-Type": "text/plain; charset=utf-8" });
          return response.end(message.text);
        }
        return sendHtml(response, 200, messagePage(message));
      }
      return sendJson(response, 404, { ErrorCode: 404, Message: "Not found" });
    } catch (error) {
      sendJson(response, 500, { ErrorCode: 500, Message: error instanceof Error ? error.message : String(error) });
    }
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => resolve());
  });
  return {
    name: "mail",
    env: {
      POSTMARK_SERVER_TOKEN: token,
      POSTMARK_API_HOST: `127.0.0.1:${port}`,
      POSTMARK_USE_HTTPS: "false",
      MAIL_FROM: DEFAULT_FROM,
      MAILBOX_URL: `http://127.0.0.1:${port}`,
    },
    stop: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
