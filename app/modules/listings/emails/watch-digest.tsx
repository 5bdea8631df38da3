import { EmailAction, EmailHeading, EmailLayout, EmailPanel, EmailParagraph } from "~/modules/mail/templates/layout";

export type WatchNews = { title: string; place: string; listingUrl: string | null; changes: string[] };

/** The day's news about the machines a person watches: one message, one panel per machine. */
export function WatchDigestEmail({ machines, watchlistUrl, unsubscribeUrl }: { machines: WatchNews[]; watchlistUrl: string; unsubscribeUrl: string }) {
  const heading = machines.length === 1 ? `News about the ${machines[0]!.title}` : `News about ${machines.length} machines you watch`;
  return (
    <EmailLayout
      preview={machines.map((machine) => `${machine.title}: ${machine.changes.join("; ")}`).join(" · ")}
      reason={`You receive this because you watch these machines on Tenthmark. We send at most one of these a day. Stop them with one click: ${unsubscribeUrl}`}
    >
      <EmailHeading>{heading}</EmailHeading>
      {machines.map((machine) => (
        <EmailPanel key={machine.title + machine.place}>
          <strong>{machine.title}</strong>
          <br />
          {machine.place}
          {machine.changes.map((change) => (
            <span key={change}>
              <br />
              {change}
            </span>
          ))}
          {machine.listingUrl ? (
            <>
              <br />
              {machine.listingUrl}
            </>
          ) : null}
        </EmailPanel>
      ))}
      <EmailAction href={watchlistUrl}>Your watched machines</EmailAction>
      <EmailParagraph>Stop watching a machine from its page or from your list.</EmailParagraph>
    </EmailLayout>
  );
}
