import { EmailAction, EmailHeading, EmailLayout, EmailParagraph } from "~/modules/mail/templates/layout";

/** To certified inspectors in the country: somebody wants a machine measured where nobody serves yet. */
export function InspectorWantedEmail({ place, machine, profileUrl }: { place: string; machine: string; profileUrl: string }) {
  return (
    <EmailLayout
      preview={`A ${machine} in ${place} needs an inspector.`}
      reason="You receive this because you are a certified inspector on Tenthmark and work in this country. We write once per region, when the first request for it comes in."
    >
      <EmailHeading>An inspector is wanted in {place}</EmailHeading>
      <EmailParagraph>
        A buyer or seller asked for an on-site geometry check of a {machine} in {place}, and no certified inspector serves that region yet. If
        you can travel there, add the region to your profile and open slots; everybody who asked is told at once.
      </EmailParagraph>
      <EmailAction href={profileUrl}>Edit your regions</EmailAction>
    </EmailLayout>
  );
}

/** To the person who asked: an inspector now serves the region. */
export function InspectorNowServesEmail({ place, bookUrl }: { place: string; bookUrl: string | null }) {
  return (
    <EmailLayout
      preview={`A certified inspector now serves ${place}.`}
      reason={`You receive this because you asked Tenthmark for an inspector in ${place}. We write once, when the first inspector starts serving it.`}
    >
      <EmailHeading>An inspector now serves {place}</EmailHeading>
      <EmailParagraph>You asked for a certified inspector in {place}. One has added it to the regions they serve.</EmailParagraph>
      {bookUrl ? <EmailAction href={bookUrl}>Book an inspection</EmailAction> : <EmailParagraph>The machine you asked about is no longer offered; find another under Machines.</EmailParagraph>}
    </EmailLayout>
  );
}
