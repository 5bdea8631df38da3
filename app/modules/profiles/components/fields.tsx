// Form pieces of the profile editor. Names follow the profile's own paths ("tolerance.source.clause"), so the
// shared schema's messages land at their fields; `errors` is Conform's map of every field's messages.
import type { ReactNode } from "react";
import { SelectField, TextField } from "~/components/ui";
import { CONFIDENCE_LABELS, SOURCE_CONFIDENCES } from "~/geometry";

export type Errors = Record<string, string[] | undefined>;

type Values = Record<string, unknown>;

/** The value at a dotted path of the defaults ("tolerance.steps[2].upTo"). */
export function valueAt(values: Values, path: string): string {
  let current: unknown = values;
  for (const part of path.replace(/\[(\d+)\]/g, ".$1").split(".")) {
    if (current === null || typeof current !== "object") return "";
    current = (current as Values)[part];
  }
  return typeof current === "string" ? current : current === undefined || current === null ? "" : String(current);
}

export function Field({ name, label, hint, values, errors, className, inputMode = "text" }: { name: string; label: string; hint?: string; values: Values; errors: Errors; className?: string; inputMode?: "text" | "decimal" }) {
  return <TextField className={className} label={label} hint={hint} name={name} defaultValue={valueAt(values, name)} errors={errors[name]} inputMode={inputMode} />;
}

export function Choice({ name, label, options, values, errors, className, hint }: { name: string; label: string; options: ReadonlyArray<{ value: string; label: string }>; values: Values; errors: Errors; className?: string; hint?: string }) {
  return <SelectField className={className} label={label} hint={hint} name={name} defaultValue={valueAt(values, name)} options={[...options]} errors={errors[name]} />;
}

/** Where a value comes from and how far it can be trusted. */
export function SourceFields({ name, legend, values, errors }: { name: string; legend: ReactNode; values: Values; errors: Errors }) {
  return (
    <fieldset className="grid gap-3 rounded-control border border-ink-200 p-3 sm:grid-cols-2">
      <legend className="px-1 text-sm font-semibold text-ink-800">{legend}</legend>
      <Choice
        name={`${name}.confidence`}
        label="Confidence"
        options={SOURCE_CONFIDENCES.map((confidence) => ({ value: confidence, label: CONFIDENCE_LABELS[confidence] }))}
        values={values}
        errors={errors}
      />
      <Field name={`${name}.document`} label="Standard, chart title, or what it was recalled from" values={values} errors={errors} />
      <Field name={`${name}.edition`} label="Edition (year)" hint="For a standard, e.g. 1993" values={values} errors={errors} />
      <Field name={`${name}.clause`} label="Clause or test number" hint="e.g. clause 3.5, test G4" values={values} errors={errors} />
      <Field name={`${name}.note`} label="Note" className="sm:col-span-2" values={values} errors={errors} />
    </fieldset>
  );
}
