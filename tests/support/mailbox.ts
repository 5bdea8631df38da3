// The mail stand-in's JSON API (stand-ins/mail), for tests that follow a link from an e-mail.
export type MailboxMessage = {
  id: string;
  submittedAt: string;
  from: string;
  to: string[];
  subject: string;
  html: string;
  text: string;
  tag: string | null;
  replyTo: string | null;
  headers: Array<{ name: string; value: string }>;
};

function mailboxUrl(): string {
  const url = process.env.MAILBOX_URL;
  if (!url) throw new Error("MAILBOX_URL is not set: run the tests with `npm test`, which starts the mail stand-in.");
  return url;
}

/**
 * The newest message to `address`, waiting up to `waitMs` for one to arrive (mail goes through the queue).
 * `matching` skips messages that are not the one wanted (e.g. by subject or tag).
 */
export async function latestEmailTo(
  address: string,
  options: { waitMs?: number; matching?: (message: MailboxMessage) => boolean } = {},
): Promise<MailboxMessage> {
  const deadline = Date.now() + (options.waitMs ?? 15_000);
  for (;;) {
    const response = await fetch(`${mailboxUrl()}/api/messages?${new URLSearchParams({ to: address })}`);
    if (!response.ok) throw new Error(`mailbox answered ${response.status}`);
    const { messages } = (await response.json()) as { messages: MailboxMessage[] };
    const wanted = messages.filter(options.matching ?? (() => true)).at(-1);
    if (wanted) return wanted;
    if (Date.now() > deadline) throw new Error(`no e-mail to ${address} arrived within ${options.waitMs ?? 15_000} ms`);
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

/** Every message to `address`, oldest first. */
export async function emailsTo(address: string): Promise<MailboxMessage[]> {
  const response = await fetch(`${mailboxUrl()}/api/messages?${new URLSearchParams({ to: address })}`);
  return ((await response.json()) as { messages: MailboxMessage[] }).messages;
}

/**
 * Deletes the messages to `address`. Without an address it empties the whole mailbox, which other test files
 * running at the same time may still be reading: prefer unique addresses and pass one.
 */
export async function clearMailbox(address?: string): Promise<void> {
  const query = address ? `?${new URLSearchParams({ to: address })}` : "";
  const response = await fetch(`${mailboxUrl()}/api/messages${query}`, { method: "DELETE" });
  if (!response.ok) throw new Error(`mailbox answered ${response.status}`);
}

/** The first link in a message's plain text that starts with `prefix` (e.g. the app origin + "/verify-email"). */
export function linkIn(message: MailboxMessage, prefix: string): string {
  const link = message.text.match(/https?:\/\/[^\s)\]>]+/g)?.find((url) => url.startsWith(prefix));
  if (!link) throw new Error(`no link starting with ${prefix} in "${message.subject}"`);
  return link;
}
