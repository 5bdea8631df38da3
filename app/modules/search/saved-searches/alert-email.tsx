import { EmailAction, EmailHeading, EmailLayout, EmailPanel, EmailParagraph } from "~/modules/mail/templates/layout";

export type AlertedMachine = {
  title: string;
  place: string;
  price: string | null;
  /** "Grade B · spindle run-out 4 µm · axial slip 2 µm", or null before a report. */
  accuracy: string | null;
  listingUrl: string;
};

export function SavedSearchAlertEmail({
  searchName,
  occasion,
  machine,
  searchUrl,
  unsubscribeUrl,
}: {
  searchName: string;
  occasion: "listed" | "verified";
  machine: AlertedMachine;
  searchUrl: string;
  unsubscribeUrl: string;
}) {
  const heading = occasion === "verified" ? `Now verified: ${machine.title}` : `Newly listed: ${machine.title}`;
  return (
    <EmailLayout
      preview={`${machine.title} matches your saved search “${searchName}”.`}
      reason={`You receive this because you saved the search “${searchName}” on Tenthmark with e-mail alerts. Stop these alerts with one click: ${unsubscribeUrl}`}
    >
      <EmailHeading>{heading}</EmailHeading>
      <EmailParagraph>
        {occasion === "verified"
          ? `An inspector has signed an accuracy report for this machine, and it now matches your saved search “${searchName}”.`
          : `This machine was just listed and matches your saved search “${searchName}”.`}
      </EmailParagraph>
      <EmailPanel>
        <strong>{machine.title}</strong>
        <br />
        {machine.place}
        {machine.price ? ` · ${machine.price}` : ""}
        <br />
        {machine.accuracy ?? "Not yet verified"}
      </EmailPanel>
      <EmailAction href={machine.listingUrl}>Open the listing</EmailAction>
      <EmailParagraph>
        See everything that matches: {searchUrl}
      </EmailParagraph>
    </EmailLayout>
  );
}
