import QRCode from "qrcode";
import { data, Form, Link, redirect, useLoaderData, useSearchParams } from "react-router";
import { Badge, Button, ButtonLink, Card, CardBody, CardHeader } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { entityTag } from "~/modules/http/conditional.server";
import { cachedPage } from "~/modules/http/page-cache.server";
import { latheSizeRows, reportAge } from "~/modules/reports/content";
import { ConditionsAndInstruments, GradeCard, ResultsTable, TestDetails } from "~/modules/reports/components/report-body";
import { StoredReadings } from "~/modules/reports/components/stored-readings";
import { formatReportDate, formatSignedAt } from "~/modules/reports/format";
import { getPublicReport, publicReportPageIdentity, unsealedMessage } from "~/modules/reports/service.server";
import { formatLength, type DisplayUnits } from "~/modules/units/format";
import type { Route } from "./+types/report";

export const meta: Route.MetaFunction = ({ data: loaded }) =>
  loaded
    ? [
        { title: `Accuracy report, ${loaded.report.notice ? "readings as signed" : `grade ${loaded.report.content.score.grade}`}: ${loaded.report.content.machine.title} — Tenthmark` },
        { name: "description", content: `Geometric accuracy of the ${loaded.report.content.machine.title}, measured ${loaded.report.content.measuredOn} by ${loaded.report.content.inspector.name}.` },
      ]
    : [{ title: "Report not found — Tenthmark" }];

// A visitor without a session is sent the page as rendered for the report and units, while the report's
// stamp and the day are unchanged (docs/decisions/page-cache.md).
export const middleware: Route.MiddlewareFunction[] = [cachedPage(({ url, params, context }) => publicReportPageIdentity(context.get(databaseContext), params.reportId, url))];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const viewer = await getOptionalUser(request);
  const report = await getPublicReport(context.get(databaseContext), params.reportId, viewer);
  if (!report) throw data("There is no signed report at this address.", { status: 404 });
  if (report.kind === "draft") throw redirect(`/inspector/bookings/${report.bookingId}/report/review`);
  if (report.kind === "unsealed") throw data(unsealedMessage(report.reason), { status: 409 });
  const url = new URL(request.url);
  const requested = url.searchParams.get("units");
  const units: DisplayUnits = requested === "inch" || requested === "mm" ? requested : (viewer?.displayUnits ?? "mm");
  const qrSvg = await verificationQrCode(report.verificationUrl);
  const now = new Date();
  // The page changes only with the report's row (its seal, a correction), the viewer, the units, the
  // address's notices and the day (the report's age): the browser revalidates and gets 304 until then.
  const dependsOn = entityTag([
    report.id, report.contentHash, report.status, report.supersededBy, report.revisions, report.isInspector,
    viewer && [viewer.id, viewer.name, viewer.email, viewer.roles, viewer.displayUnits, viewer.emailVerified],
    units, url.search, now.toISOString().slice(0, 10),
  ]);
  // Without a session the page is the same for everyone: a shared cache may keep it for a minute, then asks
  // again with the tag (a correction or a changed row shows within that minute). Signed in, it is the viewer's.
  const cacheControl = viewer ? "private, no-cache" : "public, max-age=60";
  return data({ report, units, qrSvg, now: now.toISOString() }, { headers: { ETag: dependsOn, "Cache-Control": cacheControl, Vary: "Cookie" } });
}

export const headers: Route.HeadersFunction = ({ loaderHeaders }) => loaderHeaders;

// The QR code of a verification address never changes: drawn once per report (500 kept, oldest out).
const qrCodes = new Map<string, string>();
async function verificationQrCode(address: string): Promise<string> {
  const known = qrCodes.get(address);
  if (known) return known;
  const svg = await QRCode.toString(address, { type: "svg", margin: 1, errorCorrectionLevel: "M", color: { dark: "#17212b", light: "#ffffff" } });
  qrCodes.set(address, svg);
  if (qrCodes.size > 500) qrCodes.delete(qrCodes.keys().next().value!);
  return svg;
}

// A published report is immutable: nothing is posted to it.
export function action() {
  throw data("A signed report cannot be changed. Its inspector can file a correction as a new revision.", { status: 405, headers: { Allow: "GET" } });
}

export default function ReportPage() {
  const { report, units, qrSvg, now } = useLoaderData<typeof loader>();
  const [search] = useSearchParams();
  const { content } = report;
  const age = reportAge(content.measuredOn, new Date(now));
  const facts: Array<[string, string]> = [
    ["Inspector", content.inspector.name],
    ["Date of the tests", `${formatReportDate(content.measuredOn)} (${age.label})`],
    ["Signed", formatSignedAt(report.signedAt)],
    ...(report.reissuedOn ? ([["Credential re-issued", `${formatSignedAt(report.reissuedOn)} (the report predates signed credentials)`]] as Array<[string, string]>) : []),
    ["Tolerance profile", `${content.profile.title} — ${content.profile.key} v${content.profile.version}`],
    ["Why this profile", content.profile.reason],
    ...latheSizeRows(content.machine, (mm) => formatLength(mm, units)),
    ["Serial number", content.machine.serialNumber ?? "not given"],
    ["Booking", content.booking.reference],
    ["Revision", `${content.revision}${content.supersedes ? ` (corrects revision ${content.revision - 1})` : ""}`],
  ];
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6">
      {search.get("signed") ? (
        <p role="status" className="mb-6 rounded-control border border-within/30 bg-within-soft px-4 py-3 text-sm font-semibold text-within">
          Signed and published. {search.get("mail") === "failed" ? "The e-mails to the buyer and seller could not be queued; tell them yourself." : "The buyer and the seller have been e-mailed."}
        </p>
      ) : null}
      {report.status === "superseded" ? (
        <p role="alert" className="mb-6 rounded-control border border-caution/40 bg-caution-soft px-4 py-3 text-sm font-semibold text-caution" data-testid="superseded-banner">
          Superseded: a later revision corrects this report.{" "}
          {report.supersededBy ? (
            <Link to={`/reports/${report.supersededBy.id}`} className="underline underline-offset-2">
              Read revision {report.supersededBy.revision}
            </Link>
          ) : null}
        </p>
      ) : null}

      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <nav aria-label="Breadcrumb" className="text-sm text-ink-500">
            <Link to={`/machines/${content.machine.slug}`} className="font-semibold hover:text-ink-900">
              {content.machine.title}
            </Link>{" "}
            / accuracy report
          </nav>
          <h1 className="mt-1 text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Accuracy report: {content.machine.title}</h1>
          <p className="mt-1 text-ink-600">
            {content.machine.year ? `${content.machine.year} · ` : ""}
            {content.machine.location}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <Badge tone={report.status === "signed" ? "within" : "caution"}>{report.status === "signed" ? "Signed" : "Superseded"}</Badge>
          <div className="inline-flex rounded-control ring-1 ring-ink-300" role="group" aria-label="Units">
            {(["mm", "inch"] as const).map((option) => (
              <Link
                key={option}
                to={`?units=${option}`}
                preventScrollReset
                className={`px-3 py-1.5 text-sm font-semibold first:rounded-l-control last:rounded-r-control ${units === option ? "bg-ink-900 text-white" : "bg-white text-ink-700"}`}
              >
                {option === "mm" ? "µm" : "in"}
              </Link>
            ))}
          </div>
          <a href={`/reports/${report.id}/certificate.pdf?units=${units}`} className="inline-flex h-10 items-center rounded-control bg-ink-900 px-4 text-sm font-semibold text-white hover:bg-ink-700" download>
            Download the certificate (PDF)
          </a>
        </div>
      </div>

      <div className="mt-6 space-y-6">
        {report.notice ? <StoredReadings content={content} notice={report.notice} /> : <GradeCard content={content} units={units} now={new Date(now)} />}

        <Card>
          <CardHeader title="Machine and inspection" />
          <dl className="grid divide-y divide-ink-100 text-sm md:grid-cols-2 md:divide-y-0">
            {facts.map(([term, value]) => (
              <div key={term} className="grid grid-cols-[9.5rem_1fr] gap-3 px-5 py-2 md:border-b md:border-ink-100">
                <dt className="font-semibold text-ink-600">{term}</dt>
                <dd className="text-ink-900">{value}</dd>
              </div>
            ))}
          </dl>
        </Card>

        {report.notice ? null : (
          <>
            <section aria-labelledby="results">
              <h2 id="results" className="mb-3 text-xl font-bold text-ink-900">
                Results
              </h2>
              <ResultsTable content={content} units={units} />
              <p className="mt-2 text-xs text-ink-500">
                Ratio = value ÷ tolerance at the length measured. A test that allows one direction fails on any reading the other way beyond the instrument's resolution. Sources of each tolerance are in the JSON.
              </p>
            </section>

            <TestDetails content={content} units={units} photoUrls={report.photoUrls} />
          </>
        )}
        <ConditionsAndInstruments content={content} units={units} />

        {content.notes ? (
          <Card>
            <CardHeader title="Inspector's notes" />
            <CardBody className="whitespace-pre-line text-sm text-ink-800">{content.notes}</CardBody>
          </Card>
        ) : null}

        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_18rem]">
          <Card>
            <CardHeader
              title="Verification"
              description="The SHA-256 hash of this report's RFC 8785 canonical JSON, sealed in a credential signed with Tenthmark's Ed25519 key. Anyone can check the credential in their browser or offline."
              action={<Badge tone={report.intact ? "within" : "beyond"}>{report.intact ? "Signature and hash verified" : "Hash mismatch"}</Badge>}
            />
            <CardBody className="space-y-3 text-sm">
              <p className="break-all font-mono text-ink-900" data-testid="content-hash">
                {report.contentHash}
              </p>
              <div className="flex flex-wrap gap-x-4 gap-y-1">
                <a href={report.verificationUrl} className="font-semibold text-ink-900 underline underline-offset-2">
                  Verification page
                </a>
                <a href={`/api/v1/reports/${report.id}`} className="font-semibold text-ink-900 underline underline-offset-2">
                  JSON
                </a>
                <a href={`/api/v1/reports/${report.id}/credential`} download className="font-semibold text-ink-900 underline underline-offset-2" data-testid="credential-link">
                  Signed credential
                </a>
              </div>
              {report.revisions.length > 1 ? (
                <div>
                  <h3 className="mt-2 font-bold text-ink-900">Revisions</h3>
                  <ol className="mt-1 space-y-1">
                    {report.revisions.map((revision) => (
                      <li key={revision.id} className="flex flex-wrap items-center gap-2">
                        <Link to={`/reports/${revision.id}`} className={revision.id === report.id ? "font-bold text-ink-900" : "text-ink-700 underline underline-offset-2"}>
                          Revision {revision.revision}
                        </Link>
                        <span className="text-ink-500">{revision.signedAt ? formatSignedAt(revision.signedAt) : ""}</span>
                        <Badge tone={revision.status === "signed" ? "within" : "caution"}>{revision.status}</Badge>
                      </li>
                    ))}
                  </ol>
                </div>
              ) : null}
            </CardBody>
          </Card>
          <Card className="flex items-center justify-center p-4">
            <div className="w-full max-w-56" role="img" aria-label="QR code of the verification page" dangerouslySetInnerHTML={{ __html: qrSvg }} />
          </Card>
        </div>

        {report.isInspector && report.status === "signed" ? (
          <Card>
            <CardBody className="flex flex-wrap items-center justify-between gap-3">
              <p className="text-sm text-ink-700">Found a mistake? A correction files a new revision; this one stays readable, marked superseded.</p>
              <Form method="post" action={`/inspector/reports/${report.id}/correct`}>
                <Button type="submit" variant="secondary">
                  Start a correction
                </Button>
              </Form>
            </CardBody>
          </Card>
        ) : null}
        <ButtonLink to={`/machines/${content.machine.slug}`} variant="quiet">
          ← Back to the machine
        </ButtonLink>
      </div>
    </div>
  );
}
