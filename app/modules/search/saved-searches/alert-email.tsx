import { EmailAction, EmailHeading, EmailLayout, EmailPanel, EmailParagraph } from "~/modules/mail/templates/layout";

export type AlertedMachine = {
  title: string;
  place: string;
  price: string | null;
  /** "Grade B · spindle run-out 4 µm · axial slip 2 µm", or null before a report. */
  accuracy: string | null;
  listingUrl: string;
};

/** “A”, “A” and “B”, “A”, “B” and “C”. */
export function quotedList(names: string[]): string {
  const quoted = names.map((name) => `“${name}”`);
  return quoted.length <= 1 ? (quoted[0] ?? "") : `${quoted.slice(0, -1).join(", ")} and ${quoted.at(-1)}`;
}

/** One message per machine and person, naming every saved search of theirs that it matches. */
export function SavedSearchAlertEmail({
  searches,
  occasion,
  machine,
  unsubscribeUrl,
}: {
  searches: { name: string; url: string }[];
  occasion: "listed" | "verified";
  machine: AlertedMachine;
  unsubscribeUrl: string;
}) {
  const heading = occasion === "verified" ? `Now verified: ${machine.title}` : `Newly listed: ${machine.title}`;
  const names = quotedList(searches.map((search) => search.name));
  const which = searches.length === 1 ? `your saved search ${names}` : `your saved searches ${names}`;
  return (
    <EmailLayout
      preview={`${machine.title} matches ${which}.`}
      reason={`You receive this because you saved ${searches.length === 1 ? "the search" : "the searches"} ${names} on Tenthmark with e-mail alerts. Stop ${searches.length === 1 ? "these alerts" : "alerts for them"} with one click: ${unsubscribeUrl}`}
    >
      <EmailHeading>{heading}</EmailHeading>
      <EmailParagraph>
        {occasion === "verified"
          ? `An inspector has signed an accuracy report for this machine, and it now matches ${which}.`
          : `This machine was just listed and matches ${which}.`}
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
      {searches.map((search) => (
        <EmailParagraph key={search.url}>
          Everything that matches “{search.name}”: {search.url}
        </EmailParagraph>
      ))}
    </EmailLayout>
  );
}
