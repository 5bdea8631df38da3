import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { Badge, Button, Card, TextAreaField } from "~/components/ui";
import { FormMessage } from "~/modules/accounts/components/auth-card";
import { failureReply, invalidReply } from "~/modules/accounts/forms.server";
import { requireVerifiedUser } from "~/modules/accounts/guards.server";
import { latestApplicationOf, submitInspectorApplication } from "~/modules/accounts/service.server";
import { INSPECTION_CATEGORIES, inspectorApplicationSchema } from "~/modules/accounts/validation";
import type { Route } from "./+types/inspector-application";
import { SafetyCautions } from "~/modules/reports/components/safety";

export const meta: Route.MetaFunction = () => [{ title: "Inspect machines — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireVerifiedUser(request);
  const application = await latestApplicationOf(user.id);
  return {
    status: user.inspectorStatus,
    application: application && {
      qualifications: application.qualifications,
      regions: application.regions,
      categories: application.categories,
      decisionReason: application.decisionReason,
      createdAt: application.createdAt.toISOString(),
    },
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireVerifiedUser(request);
  const submission = parseWithZod(await request.formData(), { schema: inspectorApplicationSchema });
  if (submission.status !== "success") return invalidReply(submission);
  const outcome = await submitInspectorApplication(user.id, submission.value);
  if (!outcome.ok) return failureReply(submission, outcome);
  return { result: submission.reply(), errors: {} };
}

const categoryLabel = (value: string) => INSPECTION_CATEGORIES.find((category) => category.value === value)?.label ?? value;

export default function InspectorApplication() {
  const { status, application } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useForm({
    id: "inspector-application",
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: inspectorApplicationSchema }),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
  });
  const canApply = status === "none" || status === "rejected";
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <div className="max-w-3xl">
        <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Inspectors</p>
        <h1 className="mt-1 text-3xl font-extrabold tracking-tight text-ink-950">Inspect machines on Tenthmark</h1>
        <p className="mt-3 text-ink-600">
          Certified inspectors are booked by buyers and sellers for on-site geometry checks. Tell us about your training
          and instruments; our staff read every application and certify you or tell you why not.
        </p>
      </div>

      <div className="mt-8 grid gap-6 lg:grid-cols-[1.4fr_1fr]">
        <div>
          {status === "certified" ? (
            <FormMessage tone="within">You are a certified inspector. Buyers and sellers can book you.</FormMessage>
          ) : null}
          {status === "pending" ? (
            <FormMessage tone="caution">Your application is waiting for a decision. We will e-mail you when it is made.</FormMessage>
          ) : null}
          {status === "rejected" && application ? (
            <FormMessage>
              Your last application was not approved{application.decisionReason ? `: ${application.decisionReason}` : "."} You may apply again.
            </FormMessage>
          ) : null}

          {application && !canApply ? (
            <Card className="mt-4 p-5">
              <h2 className="text-lg font-bold text-ink-900">Your application</h2>
              <dl className="mt-3 space-y-3 text-sm">
                <div>
                  <dt className="font-semibold text-ink-800">Qualifications</dt>
                  <dd className="mt-1 whitespace-pre-line text-ink-700">{application.qualifications}</dd>
                </div>
                <div>
                  <dt className="font-semibold text-ink-800">Regions</dt>
                  <dd className="mt-1 text-ink-700">{application.regions.join(", ")}</dd>
                </div>
                <div>
                  <dt className="font-semibold text-ink-800">Machines</dt>
                  <dd className="mt-1 flex flex-wrap gap-1.5">
                    {application.categories.map((category) => (
                      <Badge key={category}>{categoryLabel(category)}</Badge>
                    ))}
                  </dd>
                </div>
              </dl>
            </Card>
          ) : null}

          {canApply ? (
            <Card className="mt-4 p-5 sm:p-7">
              <Form method="post" {...getFormProps(form)} className="space-y-6">
                {form.errors?.length ? <FormMessage>{form.errors.join(" ")}</FormMessage> : null}
                <TextAreaField
                  label="Qualifications and experience"
                  hint="Trade training, years of fitting or inspection work, the instruments you own and when they were last calibrated."
                  name={fields.qualifications.name}
                  key={fields.qualifications.key}
                  defaultValue={fields.qualifications.initialValue}
                  errors={fields.qualifications.errors}
                  rows={6}
                  required
                />
                <TextAreaField
                  label="Regions you travel to"
                  hint="One per line, or separated by commas."
                  name={fields.regions.name}
                  key={fields.regions.key}
                  defaultValue={typeof fields.regions.initialValue === "string" ? fields.regions.initialValue : undefined}
                  errors={fields.regions.errors}
                  rows={3}
                  required
                />
                <fieldset>
                  <legend className="text-sm font-semibold text-ink-800">Machines you inspect</legend>
                  <div className="mt-2 grid gap-2 sm:grid-cols-2">
                    {INSPECTION_CATEGORIES.map((category) => (
                      <label key={category.value} className="flex cursor-pointer items-center gap-3 rounded-control border border-ink-200 bg-white px-3 py-2.5 has-[:checked]:border-ink-900 has-[:checked]:bg-ink-50">
                        <input
                          type="checkbox"
                          name={fields.categories.name}
                          value={category.value}
                          defaultChecked={[fields.categories.initialValue].flat().includes(category.value)}
                          className="size-4 accent-ink-900"
                        />
                        <span className="text-sm font-semibold text-ink-800">{category.label}</span>
                      </label>
                    ))}
                  </div>
                  {fields.categories.errors ? (
                    <p className="mt-1 text-sm font-medium text-beyond" role="alert">
                      {fields.categories.errors.join(" ")}
                    </p>
                  ) : null}
                </fieldset>
                <Button type="submit" size="lg" disabled={busy} className="w-full sm:w-auto">
                  {busy ? "Sending…" : "Send application"}
                </Button>
              </Form>
            </Card>
          ) : null}
        </div>

        <div className="h-fit">
          <SafetyCautions heading="Working safely at the machine" />
        </div>
      </div>
    </div>
  );
}
