// E-mails when a report is signed: the buyer who booked and the seller of the machine, through the mail queue.
import type { BookingForReport } from "~/modules/inspections/report-queries.server";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { KEY_FIGURE_LABELS, keyFigureNamesFor, SIGNED_KEY_FIGURES, type ReportContent } from "./content";
import { ReportSignedEmail } from "./emails/report-signed";
import { formatDeviationBoth, formatReportDate } from "./format";
import { reportUrl } from "./links.server";

export function keyFigureLines(content: ReportContent): string[] {
  return keyFigureNamesFor(content.machine.category).map((name) => {
    const value = content.score.keyFigures[name] ?? null;
    const signed = SIGNED_KEY_FIGURES.has(name);
    return `${KEY_FIGURE_LABELS[name]}: ${value === null ? "not measured" : formatDeviationBoth(value, { signed })}`;
  });
}

/** Queues the notices; true when both were queued. A failure is reported, and never undoes the signature. */
export async function sendReportSignedNotices(found: BookingForReport, content: ReportContent, _hash: string): Promise<boolean> {
  const people = [{ ...found.buyer, why: `You receive this because you booked inspection ${found.booking.reference} on Tenthmark.` }];
  if (found.seller.email !== found.buyer.email) {
    people.push({ ...found.seller, why: `You receive this because your listing of the ${content.machine.title} was inspected on Tenthmark (${found.booking.reference}).` });
  }
  try {
    for (const person of people) {
      const { html, text } = await renderEmail(
        <ReportSignedEmail
          name={person.name}
          machine={content.machine.title}
          grade={content.score.grade}
          measuredOn={formatReportDate(content.measuredOn)}
          inspector={content.inspector.name}
          figures={keyFigureLines(content)}
          reportUrl={reportUrl(content.reportId)}
          revision={content.revision}
          reason={person.why}
        />,
      );
      await queueEmail({ to: person.email, subject: `Accuracy report signed: ${content.machine.title}, grade ${content.score.grade}`, html, text, tag: "report-signed" });
    }
    return true;
  } catch (error) {
    console.error("The report-signed e-mails could not be queued", error);
    return false;
  }
}
