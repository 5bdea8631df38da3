import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Button, Card, CardBody, CheckboxField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { ALLOWED_DIRECTIONS, EVALUATION_METHODS, STRAIGHTNESS_REFERENCES } from "~/geometry";
import { FormMessage } from "~/modules/accounts/components/auth-card";
import { StaffNav } from "~/modules/accounts/components/staff-nav";
import { Choice, Field, SourceFields } from "~/modules/profiles/components/fields";
import { blankTest, DIRECTION_NAMES, STEP_ROWS, testFormSchema, testToForm } from "~/modules/profiles/editor";
import { requireOwnDraft } from "~/modules/profiles/guards.server";
import { ProfileRuleError, saveDraftTest } from "~/modules/profiles/service.server";
import type { Route } from "./+types/profile-test";

export const meta: Route.MetaFunction = ({ data: loaded }) => [{ title: loaded ? `${loaded.isNew ? "New test" : loaded.code} — Tenthmark staff` : "Test — Tenthmark staff" }];

const NEW = "new";

function draftOf(request: Request, context: Route.LoaderArgs["context"], params: Route.LoaderArgs["params"]) {
  return requireOwnDraft(request, context.get(databaseContext), params.key, params.version);
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { found } = await draftOf(request, context, params);
  const isNew = params.code === NEW;
  const test = isNew ? blankTest(`X-${found.definition.tests.length + 1}`) : found.definition.tests.find((candidate) => candidate.code === params.code);
  if (!test) throw data("There is no such test in this draft.", { status: 404 });
  return { isNew, base: `/admin/profiles/${found.summary.key}/${found.summary.version}`, code: test.code, title: found.summary.title, version: found.summary.version, revision: found.summary.revision, defaults: testToForm(test) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { staff, version } = await draftOf(request, context, params);
  const formData = await request.formData();
  const submission = parseWithZod(formData, { schema: testFormSchema, disableAutoCoercion: true });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 422 });
  const revision = Number(formData.get("revision"));
  try {
    await saveDraftTest(context.get(databaseContext), staff, params.key, version, params.code === NEW ? null : params.code, submission.value, revision);
  } catch (error) {
    if (error instanceof ProfileRuleError) {
      const { "": whole, ...fieldErrors } = error.errors;
      return data({ result: submission.reply({ formErrors: [error.message, ...(whole ?? [])], fieldErrors }) }, { status: error.status });
    }
    throw error;
  }
  return redirect(`/admin/profiles/${params.key}/${version}`);
}

const METHOD_LABELS: Record<(typeof EVALUATION_METHODS)[number], string> = {
  "run-out": "Run-out: max − min over a revolution",
  straightness: "Straightness about a reference line",
  "range-along": "Range of readings along a travel",
  squareness: "Squareness over the travel",
  "level-range": "Range of level tilts (µm/m)",
  "mandrel-inclination": "Mandrel at 0° and 180°, near and far",
  "near-far": "Near and far reading",
  "centre-height": "Centre height, tailstock against headstock",
  flatness: "Flatness of a surface (zone holding its heights)",
  "positioning-accuracy": "Positioning accuracy A of an axis (interferometer runs)",
  "positioning-repeatability": "Positioning repeatability R of an axis (interferometer runs)",
  "positioning-reversal": "Reversal value B of an axis (interferometer runs)",
  "circular-deviation": "Circular deviation of two axes (both directions)",
};

export default function ProfileTestPage() {
  const loaded = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>()?.result;
  const navigation = useNavigation();
  const [form] = useForm({
    id: `test-${loaded.code}`,
    lastResult,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: testFormSchema, disableAutoCoercion: true }),
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
      <h1 className="mt-2 text-3xl font-extrabold tracking-tight text-ink-950">{loaded.isNew ? "Add a test" : `Edit ${loaded.code}`}</h1>
      <p className="mt-1 text-ink-600">Lengths in mm, tolerances in µm (µm/m for level tilts). Every value needs its source.</p>
      <Form method="post" {...getFormProps(form)} className="mt-6 space-y-6">
        <input type="hidden" name="revision" value={loaded.revision} />
        {form.errors?.length ? <FormMessage>{form.errors.join(" ")}</FormMessage> : null}
        <Card>
          <CardBody className="grid gap-4 sm:grid-cols-2">
            <Field name="code" label="Code" hint="Capitals, digits and hyphens, e.g. L-SP-NOSE" values={values} errors={errors} />
            <Field name="title" label="Title" values={values} errors={errors} />
            <Field name="measures" label="What is measured" className="sm:col-span-2" values={values} errors={errors} />
            <Field name="instrument" label="Instrument and set-up" className="sm:col-span-2" values={values} errors={errors} />
            <Field name="measuringLength.nominal" label="Measuring length (mm)" hint="Empty when the tolerance does not depend on length" inputMode="decimal" values={values} errors={errors} />
            <Field name="measuringLength.description" label="Measuring length, in words" values={values} errors={errors} />
            <CheckboxField label="Required for a grade" name="required" defaultChecked={values.required === "on"} errors={errors.required} />
          </CardBody>
        </Card>

        <Card>
          <CardBody className="space-y-4">
            <h2 className="text-lg font-bold text-ink-900">Tolerance</h2>
            <div className="grid gap-4 sm:grid-cols-2">
              <Choice
                name="tolerance.type"
                label="Rule"
                hint="Fill in the fields of the rule chosen"
                options={[
                  { value: "fixed", label: "Fixed: one value" },
                  { value: "proportional", label: "Proportional to the measured length" },
                  { value: "stepped", label: "Stepped by the measured length" },
                ]}
                values={values}
                errors={errors}
              />
              <Field name="tolerance.tolerance" label="Tolerance (µm) — fixed, or per length for proportional" inputMode="decimal" values={values} errors={errors} />
              <Field name="tolerance.over" label="Given over (mm) — proportional" inputMode="decimal" values={values} errors={errors} />
              <Field name="tolerance.minimum" label="Never below (µm) — proportional" inputMode="decimal" values={values} errors={errors} />
              <Field name="tolerance.maximum" label="Never above (µm) — proportional, optional" inputMode="decimal" values={values} errors={errors} />
            </div>
            <fieldset className="rounded-control border border-ink-200 p-3">
              <legend className="px-1 text-sm font-semibold text-ink-800">Steps — stepped rule: up to each length, this tolerance</legend>
              {errors["tolerance.steps"] ? <p className="text-sm text-beyond">{errors["tolerance.steps"].join(" ")}</p> : null}
              <div className="grid gap-3 sm:grid-cols-2">
                {Array.from({ length: STEP_ROWS }, (_, i) => (
                  <div key={i} className="grid grid-cols-2 gap-2">
                    <Field name={`tolerance.steps[${i}].upTo`} label={`${i + 1}. up to (mm)`} inputMode="decimal" values={values} errors={errors} />
                    <Field name={`tolerance.steps[${i}].tolerance`} label="tolerance (µm)" inputMode="decimal" values={values} errors={errors} />
                  </div>
                ))}
              </div>
            </fieldset>
            <SourceFields name="tolerance.source" legend="Source of the tolerance" values={values} errors={errors} />
          </CardBody>
        </Card>

        <Card>
          <CardBody className="space-y-4">
            <h2 className="text-lg font-bold text-ink-900">Local tolerance</h2>
            <CheckboxField label="This test has a local tolerance (over any window of the travel)" name="hasLocal" defaultChecked={values.hasLocal === "on"} />
            <div className="grid gap-4 sm:grid-cols-2">
              <Field name="local.tolerance" label="Local tolerance (µm)" inputMode="decimal" values={values} errors={errors} />
              <Field name="local.window" label="Over any (mm)" inputMode="decimal" values={values} errors={errors} />
            </div>
            <SourceFields name="local.source" legend="Source of the local tolerance" values={values} errors={errors} />
          </CardBody>
        </Card>

        <Card>
          <CardBody className="space-y-4">
            <h2 className="text-lg font-bold text-ink-900">Evaluation and direction</h2>
            <div className="grid gap-4 sm:grid-cols-2">
              <Choice name="method" label="Evaluation method" options={EVALUATION_METHODS.map((method) => ({ value: method, label: METHOD_LABELS[method] }))} values={values} errors={errors} />
              <Choice name="reference" label="Reference line (straightness)" options={[{ value: "", label: "none" }, ...STRAIGHTNESS_REFERENCES.map((reference) => ({ value: reference, label: reference }))]} values={values} errors={errors} />
              <Field name="overAnyWindow" label="Worst over any window (mm) — range along a travel, optional" inputMode="decimal" values={values} errors={errors} />
              <Choice name="unit" label="Unit" options={[{ value: "µm", label: "µm" }, { value: "µm/m", label: "µm/m (level tilts)" }]} values={values} errors={errors} />
              <Choice name="direction.allowed" label="Allowed direction" options={ALLOWED_DIRECTIONS.map((allowed) => ({ value: allowed, label: DIRECTION_NAMES[allowed] }))} values={values} errors={errors} />
              <Field name="direction.positive" label="What + means" values={values} errors={errors} />
            </div>
            <SourceFields name="direction.source" legend="Source of the direction rule" values={values} errors={errors} />
          </CardBody>
        </Card>

        <div className="flex flex-wrap gap-3">
          <Button type="submit" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Saving…" : "Save the test"}
          </Button>
          <Link to={loaded.base} className="self-center text-sm font-semibold text-ink-700 underline underline-offset-2">
            Cancel
          </Link>
        </div>
      </Form>
    </div>
  );
}
