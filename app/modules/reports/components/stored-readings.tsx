// In place of grade, results and plots, for a signed report whose numbers cannot be scored or drawn: the
// notice, then every test's readings as they were signed, as plain text.
import { Card, CardBody, CardHeader } from "~/components/ui";
import type { ReportContent } from "../content";
import { storedReadings } from "../stored-readings";

export function StoredReadings({ content, notice }: { content: ReportContent; notice: string }) {
  const tests = storedReadings(content);
  return (
    <Card className="border-caution/40" data-testid="stored-readings">
      <CardHeader title="Readings as signed" />
      <CardBody className="space-y-4 text-sm">
        <p className="rounded-control border border-caution/40 bg-caution-soft px-4 py-3 font-semibold text-caution">{notice}</p>
        <p className="text-ink-600">Stations in {content.entryUnits === "inch" ? "inches" : "mm"}, readings in {content.entryUnits === "inch" ? "inches" : "µm"} (level tilts in µm/m), as the inspector typed them.</p>
        {tests.map((test) => (
          <section key={test.code} aria-label={`${test.code} ${test.title}`}>
            <h3 className="font-bold text-ink-900">
              {test.code} {test.title}
            </h3>
            <ul className="mt-1 space-y-0.5 break-all font-mono text-ink-800">
              {test.lines.map((line, i) => (
                <li key={i}>{line}</li>
              ))}
            </ul>
          </section>
        ))}
      </CardBody>
    </Card>
  );
}
