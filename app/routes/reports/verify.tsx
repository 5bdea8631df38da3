import { data, Form, Link, useLoaderData } from "react-router";
import { Badge, Button, Card, CardBody, TextField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { CredentialCheck } from "~/modules/reports/components/credential-check";
import { formatReportDate, formatSignedAt } from "~/modules/reports/format";
import { ReportRuleError, verifyReportHash } from "~/modules/reports/service.server";
import type { Route } from "./+types/verify";

export const meta: Route.MetaFunction = () => [{ title: "Verify a report — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const hash = new URL(request.url).searchParams.get("hash")?.trim().toLowerCase() ?? "";
  if (!hash) return { hash, result: null, error: null };
  try {
    return { hash, result: await verifyReportHash(context.get(databaseContext), hash), error: null };
  } catch (error) {
    if (error instanceof ReportRuleError) return data({ hash, result: null, error: error.message }, { status: error.status });
    throw error;
  }
}

export default function VerifyPage() {
  const { hash, result, error } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-3xl px-4 py-10 sm:px-6">
      <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Verify a report</h1>
      <CredentialCheck />
      <h2 className="mt-10 text-xl font-extrabold tracking-tight text-ink-950">Check a report's hash</h2>
      <p className="mt-2 text-ink-600">
        Every signed report carries the SHA-256 hash of its canonical JSON (RFC 8785). Paste the hash from a certificate, or scan its QR code, to see whether it belongs to a report signed on Tenthmark.
      </p>
      <Form method="get" className="mt-6 flex flex-col gap-3 sm:flex-row sm:items-end">
        <TextField className="flex-1" label="SHA-256 hash" name="hash" defaultValue={hash} autoComplete="off" spellCheck={false} errors={error ? [error] : null} />
        <Button type="submit">Check</Button>
      </Form>
      {result ? (
        <Card className="mt-6" data-testid="verification-result">
          <CardBody className="space-y-2">
            {result.match && !result.report ? (
              <>
                <Badge tone="beyond">Stored report no longer matches what was signed</Badge>
                <p className="text-sm text-ink-700" data-testid="seal-mismatch">
                  {result.reason} Tenthmark does not show it until this is put right.
                </p>
              </>
            ) : result.match ? (
              <>
                <div className="flex flex-wrap items-center gap-2">
                  <Badge tone={result.intact ? "within" : "beyond"}>{result.intact ? "Matches a signed report" : "Stored report fails its own hash"}</Badge>
                  {result.report.status === "superseded" ? <Badge tone="caution">Superseded</Badge> : null}
                </div>
                <p className="text-lg font-bold text-ink-900">{result.report.machine}</p>
                <p className="text-sm text-ink-700">
                  Grade {result.report.grade} · measured {formatReportDate(result.report.measuredOn)} by {result.report.inspector} · signed {formatSignedAt(result.report.signedAt)} · revision {result.report.revision}
                </p>
                {result.photos?.sealed ? (
                  <p className={`text-sm ${result.photos.changed.length ? "font-semibold text-beyond" : "text-ink-700"}`} data-testid="photo-check">
                    {!result.photos.checked
                      ? `Its ${result.photos.sealed} set-up photo(s) could not be checked just now: file storage is not answering. Try again in a moment.`
                      : result.photos.changed.length
                        ? `${result.photos.changed.length} of its ${result.photos.sealed} set-up photo(s) no longer match what was signed.`
                        : `Its ${result.photos.sealed} set-up photo(s) are as they were signed.`}
                  </p>
                ) : null}
                <Link to={`/reports/${result.report.id}`} className="font-semibold text-ink-900 underline underline-offset-2">
                  Read the report
                </Link>
                {result.report.supersededBy ? (
                  <p className="text-sm text-caution">
                    A later revision corrects it:{" "}
                    <Link to={`/reports/${result.report.supersededBy}`} className="underline">
                      read the current one
                    </Link>
                    .
                  </p>
                ) : null}
              </>
            ) : (
              <>
                <Badge tone="beyond">No signed report has this hash</Badge>
                <p className="text-sm text-ink-700">Check that it was copied whole. A certificate whose hash does not match was not issued by Tenthmark, or was altered.</p>
              </>
            )}
          </CardBody>
        </Card>
      ) : null}
    </div>
  );
}
