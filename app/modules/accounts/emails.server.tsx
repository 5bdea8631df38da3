// The account e-mails: each rendered with React Email (HTML and plain text) and queued, never sent inline.
import { env } from "~/env.server";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { InspectorDecisionEmail } from "./emails/inspector-decision";
import { PasswordResetEmail } from "./emails/password-reset";
import { VerifyEmailEmail } from "./emails/verify-email";

type Recipient = { email: string; name: string };

export function verificationUrl(token: string) {
  return `${env().APP_ORIGIN}/verify-email?token=${encodeURIComponent(token)}`;
}

export function passwordResetUrl(token: string) {
  return `${env().APP_ORIGIN}/reset-password?token=${encodeURIComponent(token)}`;
}

export async function sendVerificationEmail(recipient: Recipient, token: string) {
  const { html, text } = await renderEmail(<VerifyEmailEmail name={recipient.name} url={verificationUrl(token)} />);
  await queueEmail({ to: recipient.email, subject: "Confirm your e-mail address for Tenthmark", html, text, tag: "verify-email" });
}

export async function sendPasswordResetEmail(recipient: Recipient, token: string) {
  const { html, text } = await renderEmail(<PasswordResetEmail name={recipient.name} url={passwordResetUrl(token)} />);
  await queueEmail({ to: recipient.email, subject: "Choose a new Tenthmark password", html, text, tag: "password-reset" });
}

export async function sendInspectorDecisionEmail(recipient: Recipient, decision: { approved: boolean; reason: string | null }) {
  const { html, text } = await renderEmail(
    <InspectorDecisionEmail name={recipient.name} approved={decision.approved} reason={decision.reason} accountUrl={`${env().APP_ORIGIN}/account/inspector`} />,
  );
  await queueEmail({
    to: recipient.email,
    subject: decision.approved ? "You are now a certified Tenthmark inspector" : "Your inspector application",
    html,
    text,
    tag: "inspector-decision",
  });
}
