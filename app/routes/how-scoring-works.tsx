import { Card } from "~/components/ui";
import type { Route } from "./+types/how-scoring-works";
import { SafetyCautions } from "~/modules/reports/components/safety";

export const meta: Route.MetaFunction = () => [{ title: "How scoring works — Tenthmark" }];

const grades = [
  ["A", "Every required test within half its tolerance."],
  ["B", "Every required test within its tolerance."],
  ["C", "At most two tests out of tolerance, none beyond one and a half times it."],
  ["D", "Anything worse."],
  ["Incomplete", "A required test has no reading; no grade is given."],
] as const;

export default function HowScoringWorks() {
  return (
    <article className="mx-auto max-w-3xl px-4 py-12 sm:px-6">
      <h1 className="text-3xl font-extrabold text-ink-950">How scoring works</h1>
      <p className="mt-4 text-lg text-ink-600">
        An inspector measures the machine with dial indicators, a test mandrel and a precision level, and enters the
        readings. The server computes each result the way the trade does, compares it with the tolerance for that
        class and size of machine at the length actually measured over, and grades the whole report.
      </p>
      <h2 className="mt-10 text-xl font-bold text-ink-900">Results</h2>
      <ul className="mt-3 list-disc space-y-2 pl-5 text-ink-700">
        <li>Run-out and axial slip are total indicator readings: the largest reading less the smallest.</li>
        <li>
          Spindle-axis parallelism is read on a test mandrel near the nose and at the measuring length, at 0° and
          180°; averaging the two positions cancels the mandrel's own run-out.
        </li>
        <li>
          Straightness is the width of the band, parallel to a reference straight line, that holds every reading
          (ISO 230-1's end-point, least-squares or minimum-zone line).
        </li>
        <li>
          A tolerance given over one length is scaled in proportion to the length measured, never below the minimum
          for the class.
        </li>
        <li>
          Some tests allow a deviation one way only: a mandrel's free end may rise, never drop; a tailstock centre
          may sit high, never low. A reading the wrong way fails however small it is.
        </li>
      </ul>
      <h2 id="sources" className="mt-10 scroll-mt-20 text-xl font-bold text-ink-900">Where the tolerances come from</h2>
      <p className="mt-2 text-ink-600">
        Every tolerance a report is scored with names its source, and how far it can be trusted:
      </p>
      <ul className="mt-3 list-disc space-y-2 pl-5 text-ink-700">
        <li>
          <strong>Published</strong>: read in a standard, with its edition and clause or test number (for example
          IS 6040:1993, clause 3.5).
        </li>
        <li>
          <strong>Maker's chart</strong>: the acceptance chart the machine's maker shipped with it, named by its title.
          Such a profile covers one make and model, sometimes only a range of serial numbers.
        </li>
        <li>
          <strong>Common practice</strong>: a rule of the trade with no single written source, such as a mandrel's free
          end being allowed to rise but never to drop.
        </li>
        <li>
          <strong>From memory</strong>: a value recalled from a standard and not yet checked against a copy of it. A
          report scored with any such value says so above its results; read those tolerances as a guide.
        </li>
      </ul>
      <p className="mt-3 text-ink-600">
        The tables are kept as versions. Staff draft a new version, a second staff member reviews the differences and
        publishes it, and from then on new reports use it. A published version is never changed: a report keeps the
        exact version it was scored with, and scoring it again gives the same result.
      </p>
      <h2 className="mt-10 text-xl font-bold text-ink-900">Grades</h2>
      <p className="mt-2 text-ink-600">
        From the worst ratio of measured value to tolerance over the required tests. A grade is always shown with the
        key figures and the date; a report older than twelve months is marked as such.
      </p>
      <Card className="mt-4 divide-y divide-ink-100">
        {grades.map(([grade, meaning]) => (
          <div key={grade} className="flex gap-4 px-5 py-3">
            <span className="w-24 shrink-0 font-extrabold text-ink-900">{grade}</span>
            <span className="text-ink-700">{meaning}</span>
          </div>
        ))}
      </Card>
      <div className="mt-10">
        <SafetyCautions heading="Before any test: safety" />
      </div>
    </article>
  );
}
