import { EmailAction, EmailHeading, EmailLayout, EmailParagraph } from "~/modules/mail/templates/layout";

export function VerifyEmailEmail({ name, url }: { name: string; url: string }) {
  return (
    <EmailLayout preview="Confirm your e-mail address to list machines and book inspections." reason="You receive this because this address was used to create a Tenthmark account. If that was not you, ignore this message.">
      <EmailHeading>Confirm your e-mail address</EmailHeading>
      <EmailParagraph>Hello {name},</EmailParagraph>
      <EmailParagraph>
        Confirm this address to list machines, book inspections and apply as an inspector. The link works for 24 hours.
      </EmailParagraph>
      <EmailAction href={url}>Confirm my address</EmailAction>
    </EmailLayout>
  );
}
