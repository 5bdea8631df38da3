import { EmailAction, EmailHeading, EmailLayout, EmailParagraph } from "~/modules/mail/templates/layout";

export function PasswordResetEmail({ name, url }: { name: string; url: string }) {
  return (
    <EmailLayout preview="A link to choose a new password, valid for one hour." reason="You receive this because someone asked to reset the password of the Tenthmark account with this address. If it was not you, ignore this message: your password stays as it is.">
      <EmailHeading>Choose a new password</EmailHeading>
      <EmailParagraph>Hello {name},</EmailParagraph>
      <EmailParagraph>
        Open the link below to set a new password. It works once, for one hour. Setting a new password signs out every
        device that was signed in.
      </EmailParagraph>
      <EmailAction href={url}>Set a new password</EmailAction>
    </EmailLayout>
  );
}
