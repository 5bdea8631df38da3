// Outgoing e-mail: a request calls `queueEmail`, which stores the message as a job and returns at once;
// the mail worker hands it to Postmark, and pg-boss retries it while Postmark (or its stand-in) is down.
import { ServerClient } from "postmark";
import { z } from "zod";
import { env } from "~/env.server";
import { enqueue, registerWorker, type SqlRunner } from "~/modules/jobs/queue.server";

export const MAIL_QUEUE = "mail.send";

export const outgoingEmailSchema = z.object({
  to: z.email(),
  subject: z.string().min(1).max(500),
  html: z.string().min(1),
  text: z.string().min(1),
  tag: z.string().max(100).optional(),
  replyTo: z.email().optional(),
  /** Extra message headers, e.g. List-Unsubscribe (RFC 2369) and List-Unsubscribe-Post (RFC 8058). */
  headers: z.array(z.object({ name: z.string().regex(/^[A-Za-z0-9-]+$/), value: z.string().max(2000) })).max(10).optional(),
});

export type OutgoingEmail = z.infer<typeof outgoingEmailSchema>;

/**
 * Enqueues a message for sending; never waits for the mail service. Inside a transaction, pass it as
 * `within`: the message is then sent only if the transaction commits.
 */
export async function queueEmail(message: OutgoingEmail, options: { within?: SqlRunner } = {}): Promise<void> {
  await enqueue(MAIL_QUEUE, outgoingEmailSchema.parse(message), options);
}

let client: ServerClient | undefined;

function postmark(): ServerClient {
  const settings = env();
  client ??= new ServerClient(settings.POSTMARK_SERVER_TOKEN, {
    requestHost: settings.POSTMARK_API_HOST,
    useHttps: settings.POSTMARK_USE_HTTPS,
    timeout: 15,
  });
  return client;
}

/** Sends one message through Postmark now. Used by the mail worker; a failure throws, so the job is retried. */
export async function deliverEmail(message: OutgoingEmail): Promise<string> {
  const receipt = await postmark().sendEmail({
    From: env().MAIL_FROM,
    To: message.to,
    Subject: message.subject,
    HtmlBody: message.html,
    TextBody: message.text,
    Tag: message.tag,
    ReplyTo: message.replyTo,
    Headers: message.headers?.map((header) => ({ Name: header.name, Value: header.value })),
    MessageStream: "outbound",
  });
  return receipt.MessageID;
}

/** Declares the mail worker of this process (see ~/modules/jobs/workers.server). */
export function declareMailWorker() {
  registerWorker<OutgoingEmail>(
    MAIL_QUEUE,
    async (message) => {
      await deliverEmail(message);
    },
    // Backoff from 2 s doubling, twelve tries: a mail service that is out for about an hour loses nothing.
    { retryLimit: 12, retryDelay: 2, retryBackoff: true, expireInSeconds: 60 },
  );
}
