import { useState } from "react";
import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { z } from "zod";
import { Badge, Button, ButtonLink, Card, CardBody, CardHeader, CheckboxField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { ConditionsAndInstruments, GradeCard, ResultsTable, TestDetails } from "~/modules/reports/components/report-body";
import { SafetyCautions } from "~/modules/reports/components/safety";
import { StoredReadings } from "~/modules/reports/components/stored-readings";
import { setupPhotoUrl } from "~/modules/reports/content";
import { getReviewReport, ReportRuleError, signReport } from "~/modules/reports/service.server";
import type { Route } from "./+types/review";

export const meta: Route.MetaFunction = () => [{ title: "Review and sign — Tenthmark" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const inspector = await requireRole(request, "inspector");
  try {
    const review = await getReviewReport(context.get(databaseContext), inspector, params.bookingId);
    if (review.kind === "signed") throw redirect(`/reports/${review.reportId}`);
    if (review.kind === "none") throw redirect(`/inspector/bookings/${params.bookingId}/report`);
    return { review, units: inspector.displayUnits, now: new Date().toISOString() };
  } catch (error) {
    if (error instanceof ReportRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}

const signSchema = z.object({
  intent: z.literal("sign"),
  reportId: z.uuid(),
  attest: z.literal("on", { error: "Tick the box to confirm the readings are yours and complete." }),
});

export async function action({ request, params, context }: Route.ActionArgs) {
  const inspector = await requireRole(request, "inspector");
  const parsed = signSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ error: parsed.error.issues.map((issue) => issue.message).join(" ") }, { status: 422 });
  try {
    const signed = await signReport(context.get(databaseContext), inspector, params.bookingId, parsed.data.reportId);
    return redirect(`/reports/${signed.reportId}?signed=1${signed.mailed ? "" : "&mail=failed"}`);
  } catch (error) {
    // Already signed or not theirs: an error page, since the review itself no longer exists.
    if (error instanceof ReportRuleError && error.status !== 422) throw data(error.message, { status: error.status });
    if (error instanceof ReportRuleError) return data({ error: error.message }, { status: error.status });
    throw error;
  }
}

export default function ReviewPage() {
  const { review, units, now } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const signing = useNavigation().state === "submitting";
  const [attested, setAttested] = useState(false);
  const { content } = review;
  const photoUrls = Object.fromEntries(
    Object.entries(content.tests)
      .filter(([, meta]) => meta.photo)
      .map(([code, meta]) => [code, { thumb: setupPhotoUrl(meta.photo!.id, "thumb"), large: setupPhotoUrl(meta.photo!.id, "large") }]),
  );
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6">
      <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Review before signing · <span className="whitespace-nowrap">{review.booking.reference}</span></p>
      <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">{content.machine.title}</h1>
      <p className="mt-1 text-ink-600">
        Scored by the server against {content.profile.title} (v{content.profile.version}). Once signed, the report cannot be changed; a correction makes a new revision.
      </p>
      {review.stale ? (
        <p role="alert" className="mt-4 rounded-control border border-caution/30 bg-caution-soft px-4 py-3 text-sm font-semibold text-caution">
          The readings changed after this result was scored. Go back and submit them again before signing.
        </p>
      ) : null}

      <div className="mt-6 space-y-6">
        {review.notice ? <StoredReadings content={content} notice={review.notice} /> : <GradeCard content={content} units={units} now={new Date(now)} />}
        {content.score.warnings.length || content.instruments.some((instrument) => instrument.calibrationOverdue) ? (
          <Card className="border-caution/40">
            <CardHeader title="Warnings" />
            <CardBody>
              <ul className="list-disc space-y-1 pl-5 text-sm text-ink-800">
                {content.score.warnings.map((warning) => (
                  <li key={warning.code}>{warning.message}</li>
                ))}
                {content.instruments
                  .filter((instrument) => instrument.calibrationOverdue)
                  .map((instrument) => (
                    <li key={instrument.id}>
                      {instrument.kindLabel} {instrument.description}: calibration was due {instrument.calibrationDue}, before the tests.
                    </li>
                  ))}
              </ul>
            </CardBody>
          </Card>
        ) : null}
        {review.notice ? null : (
          <>
            <section>
              <h2 className="mb-3 text-xl font-bold text-ink-900">Results</h2>
              <ResultsTable content={content} units={units} />
            </section>
            <TestDetails content={content} units={units} photoUrls={photoUrls} />
          </>
        )}
        <ConditionsAndInstruments content={content} units={units} />
        <SafetyCautions heading="Safety on this visit" />

        <Card>
          <CardHeader title="Sign the report" action={<Badge tone="brass">Revision {content.revision}</Badge>} />
          <CardBody>
            <Form method="post" className="space-y-4">
              <input type="hidden" name="intent" value="sign" />
              <input type="hidden" name="reportId" value={review.reportId} />
              <CheckboxField
                name="attest"
                label={`I took these readings on ${content.measuredOn} myself, with the instruments listed, and they are complete and true.`}
                checked={attested}
                onChange={(event) => setAttested(event.target.checked)}
              />
              {actionData?.error ? (
                <p role="alert" className="text-sm font-medium text-beyond">
                  {actionData.error}
                </p>
              ) : null}
              <div className="flex flex-wrap gap-3">
                <Button type="submit" size="lg" disabled={signing || review.stale || !attested || Boolean(review.notice)}>
                  {signing ? "Signing…" : "Sign and publish"}
                </Button>
                <ButtonLink to={`/inspector/bookings/${review.booking.id}/report`} variant="secondary" size="lg">
                  Back to the readings
                </ButtonLink>
              </div>
              <p className="text-sm text-ink-500">
                Signing seals the report with a SHA-256 hash, publishes it on the listing and e-mails the buyer and the seller.{" "}
                <Link to="/how-scoring-works" className="underline underline-offset-2">
                  How scoring works
                </Link>
              </p>
            </Form>
          </CardBody>
        </Card>
      </div>
    </div>
  );
}
