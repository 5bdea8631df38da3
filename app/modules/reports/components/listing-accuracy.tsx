// The listing page's accuracy panel once a signed report exists: grade with key figures, the report's date
// and age (marked past 12 months), and the way to the whole report.
import { Link } from "react-router";
import { Badge, ButtonLink, Card, CardBody, CardHeader, cx } from "~/components/ui";
import type { DisplayUnits } from "~/modules/units/format";
import { reportAge } from "../content";
import { formatReportDate } from "../format";
import { makersChartLine } from "../sources";
import type { ListingReportSummary } from "../service.server";
import { GradeMark, gradeMeaning, KeyFigureList } from "./grade";

export function VerifiedAccuracyPanel({ report, units, now, bookingLink, category }: { report: ListingReportSummary; units: DisplayUnits; now: Date; bookingLink?: string; category?: string }) {
  const age = reportAge(report.measuredOn, now);
  return (
    <Card id="accuracy" className={age.expired ? "border-caution/40" : "border-within/30"} data-testid="accuracy-panel">
      <CardHeader title="Accuracy" action={age.expired ? <Badge tone="caution">Report over 12 months old</Badge> : <Badge tone="within">Verified</Badge>} />
      <CardBody className="space-y-4 text-sm text-ink-700">
        <div className="flex items-center gap-3">
          <GradeMark grade={report.grade} />
          <div>
            <p className="font-bold text-ink-900">Grade {report.grade}</p>
            <p className="text-ink-600">{gradeMeaning(report.grade)}</p>
          </div>
        </div>
        <KeyFigureList figures={report.keyFigures} units={units} columns={1} category={category} />
        <p className={cx(age.expired ? "font-semibold text-caution" : "text-ink-600")}>
          Measured {formatReportDate(report.measuredOn)} ({age.label}) by {report.inspectorName}
          {age.expired ? ". Accuracy changes with use: a new check is advised." : "."}
        </p>
        {report.profile.makersChart ? <p className="font-semibold text-ink-800" data-testid="makers-chart">{makersChartLine(report.profile)}</p> : null}
        <ButtonLink to={`/reports/${report.id}`} variant="secondary" className="w-full">
          Read the full report
        </ButtonLink>
        {bookingLink ? (
          <p className="text-xs text-ink-500">
            Want your own check?{" "}
            <Link to={bookingLink} className="underline underline-offset-2">
              Book an inspection
            </Link>
          </p>
        ) : null}
      </CardBody>
    </Card>
  );
}
