import { EmailAction, EmailHeading, EmailLayout, EmailParagraph } from "~/modules/mail/templates/layout";

export function ReportSignedEmail({
  name,
  machine,
  grade,
  measuredOn,
  inspector,
  figures,
  reportUrl,
  revision,
  reason,
}: {
  name: string;
  machine: string;
  grade: string;
  measuredOn: string;
  inspector: string;
  figures: string[];
  reportUrl: string;
  revision: number;
  reason: string;
}) {
  const gradeText = grade === "incomplete" ? "incomplete (a required test has no reading)" : grade;
  return (
    <EmailLayout preview={`Accuracy report for the ${machine}: grade ${gradeText}.`} reason={reason}>
      <EmailHeading>{revision > 1 ? "A corrected accuracy report is signed" : "The accuracy report is signed"}</EmailHeading>
      <EmailParagraph>Hello {name},</EmailParagraph>
      <EmailParagraph>
        {inspector} measured the {machine} on {measuredOn} and signed the report{revision > 1 ? ` (revision ${revision}, which replaces the earlier one)` : ""}. Grade:{" "}
        <strong>{gradeText}</strong>.
      </EmailParagraph>
      <EmailParagraph>Key figures:</EmailParagraph>
      {figures.map((line) => (
        <EmailParagraph key={line}>• {line}</EmailParagraph>
      ))}
      <EmailAction href={reportUrl}>Read the report</EmailAction>
    </EmailLayout>
  );
}
