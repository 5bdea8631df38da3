import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useFetcher, useLoaderData, type ShouldRevalidateFunctionArgs } from "react-router";
import { Badge, Button, Card, TextAreaField } from "~/components/ui";
import { FormMessage } from "~/modules/accounts/components/auth-card";
import { StaffNav } from "~/modules/accounts/components/staff-nav";
import { failureReply, invalidReply } from "~/modules/accounts/forms.server";
import { requireRole } from "~/modules/accounts/guards.server";
import { decideApplication, listPendingApplications } from "~/modules/accounts/service.server";
import { applicationDecisionSchema, INSPECTION_CATEGORIES } from "~/modules/accounts/validation";
import type { Route } from "./+types/inspector-applications";
import { formatDate } from "~/modules/units/dates";

export const meta: Route.MetaFunction = () => [{ title: "Inspector applications — Tenthmark staff" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const applications = await listPendingApplications();
  return { applications: applications.map((application) => ({ ...application, createdAt: application.createdAt.toISOString() })) };
}

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const submission = parseWithZod(await request.formData(), { schema: applicationDecisionSchema });
  if (submission.status !== "success") return invalidReply(submission, { extra: { decided: null } });
  const outcome = await decideApplication(admin.id, submission.value);
  if (!outcome.ok) return failureReply(submission, outcome, { extra: { decided: null } });
  return { result: submission.reply(), errors: {}, decided: outcome.approved ? ("approved" as const) : ("rejected" as const) };
}

// Keep a decided card on screen with its outcome; the list is fresh again on the next visit.
export function shouldRevalidate({ actionResult, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  if (actionResult && typeof actionResult === "object" && "decided" in actionResult && actionResult.decided) return false;
  return defaultShouldRevalidate;
}

const categoryLabel = (value: string) => INSPECTION_CATEGORIES.find((category) => category.value === value)?.label ?? value;

export default function InspectorApplications() {
  const { applications } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <StaffNav current="applications" />
      <h1 className="mt-4 text-3xl font-extrabold tracking-tight text-ink-950">Inspector applications</h1>
      <p className="mt-1 text-ink-600">
        {applications.length === 0
          ? "No application is waiting."
          : `${applications.length} waiting, oldest first. Approving certifies the person as an inspector; either way they get an e-mail with your reason.`}
      </p>
      <div className="mt-6 space-y-5">
        {applications.map((application) => (
          <ApplicationCard key={application.id} application={application} />
        ))}
      </div>
    </div>
  );
}

type Application = ReturnType<typeof useLoaderData<typeof loader>>["applications"][number];

function ApplicationCard({ application }: { application: Application }) {
  const fetcher = useFetcher<typeof action>();
  const [form, fields] = useForm({
    id: `decision-${application.id}`,
    lastResult: fetcher.data?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: applicationDecisionSchema }),
    shouldValidate: "onSubmit",
  });
  const pendingDecision = fetcher.state !== "idle" ? fetcher.formData?.get("decision") : null;
  return (
    <Card className="p-5 sm:p-6" data-application={application.id}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-lg font-bold text-ink-900">{application.name}</h2>
        <p className="tabular text-sm text-ink-500">applied {formatDate(application.createdAt)}</p>
      </div>
      <p className="break-all text-sm text-ink-600">
        {application.email}
        {application.emailVerified ? null : <span className="ml-2 font-semibold text-caution">address not confirmed</span>}
      </p>
      <div className="mt-4 grid gap-4 md:grid-cols-[1.6fr_1fr]">
        <div>
          <h3 className="text-sm font-semibold text-ink-800">Qualifications</h3>
          <p className="mt-1 whitespace-pre-line text-sm text-ink-700">{application.qualifications}</p>
        </div>
        <div className="space-y-3">
          <div>
            <h3 className="text-sm font-semibold text-ink-800">Regions</h3>
            <p className="mt-1 text-sm text-ink-700">{application.regions.join(", ")}</p>
          </div>
          <div>
            <h3 className="text-sm font-semibold text-ink-800">Machines</h3>
            <div className="mt-1 flex flex-wrap gap-1.5">
              {application.categories.map((category) => (
                <Badge key={category}>{categoryLabel(category)}</Badge>
              ))}
            </div>
          </div>
        </div>
      </div>
      {fetcher.data?.decided ? (
        <div className="mt-5">
          <FormMessage tone="within">{fetcher.data.decided === "approved" ? "Approved: the applicant is now a certified inspector." : "Rejected: the applicant was told why."}</FormMessage>
        </div>
      ) : (
        <fetcher.Form method="post" {...getFormProps(form)} className="mt-5 space-y-4 border-t border-ink-100 pt-4">
          {form.errors?.length ? <FormMessage>{form.errors.join(" ")}</FormMessage> : null}
          <input type="hidden" name="applicationId" value={application.id} />
          <TextAreaField
            label="Reason (sent to the applicant)"
            hint="Needed to reject; optional to approve."
            name={fields.reason.name}
            key={fields.reason.key}
            errors={fields.reason.errors}
            rows={2}
          />
          <div className="flex flex-wrap gap-3">
            <Button type="submit" name="decision" value="approve" disabled={Boolean(pendingDecision)}>
              {pendingDecision === "approve" ? "Approving…" : "Approve and certify"}
            </Button>
            <Button type="submit" name="decision" value="reject" variant="secondary" disabled={Boolean(pendingDecision)}>
              {pendingDecision === "reject" ? "Rejecting…" : "Reject"}
            </Button>
          </div>
        </fetcher.Form>
      )}
    </Card>
  );
}
