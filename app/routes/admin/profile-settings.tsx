import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Button, Card, CardBody, CheckboxField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { MACHINE_CATEGORIES } from "~/geometry";
import { FormMessage } from "~/modules/accounts/components/auth-card";
import { StaffNav } from "~/modules/accounts/components/staff-nav";
import { Choice, Field, SourceFields } from "~/modules/profiles/components/fields";
import { settingsFormSchema, settingsToForm } from "~/modules/profiles/editor";
import { requireOwnDraft } from "~/modules/profiles/guards.server";
import { ProfileRuleError, saveDraftSettings } from "~/modules/profiles/service.server";
import type { Route } from "./+types/profile-settings";

export const meta: Route.MetaFunction = () => [{ title: "Scope and rules — Tenthmark staff" }];

function draftOf(request: Request, context: Route.LoaderArgs["context"], params: Route.LoaderArgs["params"]) {
  return requireOwnDraft(request, context.get(databaseContext), params.key, params.version);
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { found } = await draftOf(request, context, params);
  return { base: `/admin/profiles/${found.summary.key}/${found.summary.version}`, title: found.summary.title, version: found.summary.version, revision: found.summary.revision, defaults: settingsToForm(found.definition) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { staff, version } = await draftOf(request, context, params);
  const formData = await request.formData();
  const submission = parseWithZod(formData, { schema: settingsFormSchema, disableAutoCoercion: true });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 422 });
  try {
    await saveDraftSettings(context.get(databaseContext), staff, params.key, version, submission.value, Number(formData.get("revision")));
  } catch (error) {
    if (error instanceof ProfileRuleError) return data({ result: submission.reply({ formErrors: [error.message], fieldErrors: error.errors }) }, { status: error.status });
    throw error;
  }
  return redirect(`/admin/profiles/${params.key}/${version}`);
}

export default function ProfileSettingsPage() {
  const loaded = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>()?.result;
  const navigation = useNavigation();
  const [form] = useForm({
    id: "profile-settings",
    lastResult,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: settingsFormSchema, disableAutoCoercion: true }),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
  });
  const errors = form.allErrors;
  const values = loaded.defaults as unknown as Record<string, unknown>;
  return (
    <div className="mx-auto max-w-4xl px-4 py-10 sm:px-6">
      <StaffNav current="profiles" />
      <p className="mt-4 text-sm">
        <Link to={loaded.base} className="text-ink-600 underline underline-offset-2">
          Back to {loaded.title}, version {loaded.version}
        </Link>
      </p>
      <h1 className="mt-2 text-3xl font-extrabold tracking-tight text-ink-950">Scope and rules</h1>
      <Form method="post" {...getFormProps(form)} className="mt-6 space-y-6">
        <input type="hidden" name="revision" value={loaded.revision} />
        {form.errors?.length ? <FormMessage>{form.errors.join(" ")}</FormMessage> : null}
        <Card>
          <CardBody className="grid gap-4 sm:grid-cols-2">
            <Field name="title" label="Title" className="sm:col-span-2" values={values} errors={errors} />
            <Choice name="category" label="Machine category" options={MACHINE_CATEGORIES.map((category) => ({ value: category, label: category }))} values={values} errors={errors} />
            <Choice name="accuracyClass" label="Accuracy class" options={[{ value: "normal", label: "normal" }, { value: "precision", label: "precision" }]} values={values} errors={errors} />
            {/* The schema checks the limits as a list; the first given is [0]. */}
            <Field name="scope.limits.swingOverBedMm" label="Largest swing over the bed (mm)" hint="Empty: not limited" inputMode="decimal" values={values} errors={{ ...errors, "scope.limits.swingOverBedMm": errors["scope.limits[0].maxMm"] }} />
            <Field
              name="scope.limits.distanceBetweenCentresMm"
              label="Longest distance between centres (mm)"
              hint="Empty: not limited"
              inputMode="decimal"
              values={values}
              errors={{ ...errors, "scope.limits.distanceBetweenCentresMm": errors["scope.limits[1].maxMm"] }}
            />
            <Field name="scope.limits.tableLengthMm" label="Longest table (mm)" hint="Empty: not limited. Milling machines and grinders" inputMode="decimal" values={values} errors={{ ...errors, "scope.limits.tableLengthMm": errors["scope.limits[2].maxMm"] }} />
            <div className="sm:col-span-2">
              <SourceFields name="scope.source" legend="Source of the scope" values={values} errors={errors} />
            </div>
          </CardBody>
        </Card>
        <Card>
          <CardBody className="space-y-4">
            <h2 className="text-lg font-bold text-ink-900">Maker's chart</h2>
            <CheckboxField label="This profile is a maker's own acceptance chart for one make and model" name="hasMaker" defaultChecked={values.hasMaker === "on"} />
            <div className="grid gap-4 sm:grid-cols-2">
              <Field name="scope.maker.make" label="Make" values={values} errors={errors} />
              <Field name="scope.maker.model" label="Model" values={values} errors={errors} />
              <Field name="scope.maker.serialFrom" label="From serial number (optional)" values={values} errors={errors} />
              <Field name="scope.maker.serialTo" label="To serial number (optional)" values={values} errors={errors} />
              <Field name="scope.maker.chart" label="Title of the chart, as printed" className="sm:col-span-2" values={values} errors={errors} />
            </div>
          </CardBody>
        </Card>
        <Card>
          <CardBody className="space-y-4">
            <h2 className="text-lg font-bold text-ink-900">Rules of the whole profile</h2>
            <Field name="rules.minimumTolerance.value" label="Minimum tolerance (µm)" inputMode="decimal" values={values} errors={errors} />
            <SourceFields name="rules.minimumTolerance.source" legend="Source of the minimum" values={values} errors={errors} />
            <Field name="rules.rounding.step" label="Round proportional tolerances to the nearest (µm)" hint="Empty: no rounding" inputMode="decimal" values={values} errors={errors} />
            <SourceFields name="rules.rounding.source" legend="Source of the rounding" values={values} errors={errors} />
            <Field name="rules.leastCount.value" label="Instruments need not read finer than (µm)" hint="Empty: the ten-to-one rule alone" inputMode="decimal" values={values} errors={errors} />
            <SourceFields name="rules.leastCount.source" legend="Source of the least count" values={values} errors={errors} />
          </CardBody>
        </Card>
        <Button type="submit" disabled={navigation.state === "submitting"}>
          {navigation.state === "submitting" ? "Saving…" : "Save scope and rules"}
        </Button>
      </Form>
    </div>
  );
}
