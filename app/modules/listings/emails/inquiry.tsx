import { EmailAction, EmailHeading, EmailLayout, EmailPanel, EmailParagraph } from "~/modules/mail/templates/layout";

export function InquiryEmail({
  sellerName,
  buyerName,
  buyerEmail,
  phone,
  machine,
  message,
  listingUrl,
}: {
  sellerName: string;
  buyerName: string;
  buyerEmail: string;
  phone: string | null;
  machine: string;
  message: string;
  listingUrl: string;
}) {
  return (
    <EmailLayout
      preview={`${buyerName} asks about your ${machine}.`}
      reason="You receive this because a signed-in Tenthmark user wrote to you about one of your listings. Reply to this e-mail to answer them directly."
    >
      <EmailHeading>A question about your {machine}</EmailHeading>
      <EmailParagraph>Hello {sellerName},</EmailParagraph>
      <EmailParagraph>
        {buyerName} ({buyerEmail}
        {phone ? `, ${phone}` : ""}) wrote:
      </EmailParagraph>
      <EmailPanel keepLineBreaks>{message}</EmailPanel>
      <EmailParagraph>Reply to this e-mail to answer; your reply goes straight to {buyerName}.</EmailParagraph>
      <EmailAction href={listingUrl}>Open the listing</EmailAction>
    </EmailLayout>
  );
}
