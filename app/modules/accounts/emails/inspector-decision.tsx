import { EmailAction, EmailHeading, EmailLayout, EmailParagraph } from "~/modules/mail/templates/layout";

export function InspectorDecisionEmail({ name, approved, reason, accountUrl }: { name: string; approved: boolean; reason: string | null; accountUrl: string }) {
  return (
    <EmailLayout
      preview={approved ? "Your inspector application was approved." : "Your inspector application was not approved."}
      reason="You receive this because you applied to inspect machines on Tenthmark."
    >
      <EmailHeading>{approved ? "You are certified" : "Your application was not approved"}</EmailHeading>
      <EmailParagraph>Hello {name},</EmailParagraph>
      <EmailParagraph>
        {approved
          ? "Our staff approved your application. Buyers and sellers can now book you for on-site geometry checks. Set your regions, fee and free slots next."
          : "Our staff looked at your application and could not approve it this time."}
      </EmailParagraph>
      {reason ? <EmailParagraph>Reason given: {reason}</EmailParagraph> : null}
      <EmailAction href={accountUrl}>Open your inspector page</EmailAction>
    </EmailLayout>
  );
}
