import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import type { ReactNode } from "react";
import { Form, useNavigation } from "react-router";
import { Button, Card, CardBody, CardHeader, SelectField, TextAreaField, TextField } from "~/components/ui";
import { countryOptions, isLathe, machineCategories, machineConditions } from "~/modules/listings/catalogue";
import { listingFormSchema } from "~/modules/listings/validation";
import { currencies, lengthUnitLabel, type DisplayUnits } from "~/modules/units/format";
import { powerUnitLabel, weightUnitLabel } from "~/modules/units/weight-power";

// Spindle nose forms sellers most often name; the field stays free text for anything else.
const spindleNoseSuggestions = [
  "D1-3 camlock",
  "D1-4 camlock",
  "D1-5 camlock",
  "D1-6 camlock",
  "D1-8 camlock",
  "A1-5",
  "A1-6",
  "A2-5",
  "A2-6",
  "A2-8",
  "L0 long taper",
  "L1 long taper",
  "Threaded 1½\"-8",
  "Threaded 2¼\"-8",
  "Morse taper 5 bore",
] as const;

// Tailstock quill tapers as sellers write them (Morse tapers: ISO 296); free text for anything else.
const tailstockTaperSuggestions = ["Morse taper 2", "Morse taper 3", "Morse taper 4", "Morse taper 5", "Morse taper 6", "Metric taper 80"] as const;

const phaseOptions = [
  { value: "3", label: "Three-phase" },
  { value: "1", label: "Single-phase" },
];
const frequencyOptions = [
  { value: "50", label: "50 Hz" },
  { value: "60", label: "60 Hz" },
];

type Props = {
  units: DisplayUnits;
  defaultValue?: Record<string, string>;
  lastResult?: SubmissionResult<string[]> | null;
  submitLabel: string;
  /** Extra buttons beside the submit button. */
  aside?: ReactNode;
};

/** The machine's details, validated in the browser as the seller types and again on the server. */
export function ListingForm({ units, defaultValue, lastResult, submitLabel, aside }: Props) {
  const schema = listingFormSchema(units);
  const [form, fields] = useForm({
    lastResult,
    defaultValue: { units, currency: "EUR", ...defaultValue },
    constraint: getZodConstraint(schema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema }),
  });
  const navigation = useNavigation();
  const saving = navigation.state === "submitting" && navigation.formData?.get("intent") === "save";
  const length = lengthUnitLabel(units);
  const field = (name: keyof typeof fields) => ({
    name: fields[name].name,
    defaultValue: fields[name].initialValue as string | undefined,
    errors: fields[name].errors,
  });
  const numeric = { inputMode: "decimal" as const, autoComplete: "off" };
  // The lathe's own figures show until another kind of machine is chosen (and without script, always).
  const category = fields.category.value as string | undefined;
  const showLatheDetails = !category || isLathe(category);

  return (
    <Form method="post" {...getFormProps(form)} className="space-y-6">
      <input type="hidden" name="units" value={units} />
      {form.errors?.length ? (
        <p role="alert" className="rounded-control bg-beyond-soft px-4 py-3 text-sm font-medium text-beyond">
          {form.errors.join(" ")}
        </p>
      ) : null}

      <Card>
        <CardHeader title="The machine" description="What it is, who made it, and when." />
        <CardBody className="grid gap-5 sm:grid-cols-2">
          <SelectField label="Kind of machine" options={machineCategories} placeholder="Choose…" {...field("category")} />
          <SelectField
            label="Condition"
            hint="Reconditioned: rebuilt, with the work described. Used: working, as taken out of production. As is: for repair or parts."
            options={machineConditions}
            placeholder="Choose…"
            {...field("condition")}
          />
          <TextField label="Make" autoComplete="off" {...field("make")} />
          <TextField label="Model" autoComplete="off" {...field("model")} />
          <TextField label="Year of manufacture" hint="Optional" inputMode="numeric" autoComplete="off" {...field("year")} />
          <TextField label="Serial number" hint="Optional; shown on the listing" autoComplete="off" {...field("serialNumber")} />
        </CardBody>
      </Card>

      <Card>
        <CardHeader title="Size and drive" description={`Sizes in ${length}, weight in ${weightUnitLabel(units)}, power in ${powerUnitLabel(units)} (change your units on your account page).`} />
        <CardBody className="grid gap-5 sm:grid-cols-2">
          <TextField label={`Swing over bed (${length})`} hint="Largest diameter that clears the bed; needed for lathes" {...numeric} {...field("swingOverBed")} />
          <TextField label={`Distance between centres (${length})`} hint="Needed for lathes" {...numeric} {...field("distanceBetweenCentres")} />
          <TextField label={`Spindle bore (${length})`} hint="Optional" {...numeric} {...field("spindleBore")} />
          <TextField label={`Table length (${length})`} hint="Working surface, for mills and grinders; chooses the tolerance profile" {...numeric} {...field("tableLength")} />
          <TextField label={`Table width (${length})`} hint="For mills and grinders" {...numeric} {...field("tableWidth")} />
          <TextField label="Spindle nose" hint="e.g. D1-6 camlock, A2-5, threaded; optional" list="spindle-nose-forms" autoComplete="off" {...field("spindleNose")} />
          <TextField label={`Main motor power (${powerUnitLabel(units)})`} hint="Optional" {...numeric} {...field("motorPower")} />
          <TextField label={`Weight (${weightUnitLabel(units)})`} hint="Optional; riggers ask for it first" {...numeric} {...field("weight")} />
          <datalist id="spindle-nose-forms">
            {spindleNoseSuggestions.map((form) => (
              <option key={form} value={form} />
            ))}
          </datalist>
        </CardBody>
      </Card>

      <Card>
        <CardHeader title="Supply, speeds and floor space" description="Optional; buyers ask for these before they arrange a visit." />
        <CardBody className="grid gap-5 sm:grid-cols-2">
          <fieldset className="grid grid-cols-[minmax(0,1fr)_minmax(0,1.3fr)_minmax(0,1fr)] gap-3 sm:col-span-2">
            <legend className="mb-1 text-sm font-semibold text-ink-800">Electrical supply</legend>
            <TextField label="Voltage (V)" hint="e.g. 400" inputMode="numeric" autoComplete="off" {...field("supplyVoltage")} />
            <SelectField label="Phases" options={phaseOptions} placeholder="Choose…" {...field("supplyPhases")} />
            <SelectField label="Frequency" options={frequencyOptions} placeholder="Choose…" {...field("supplyFrequency")} />
          </fieldset>
          <TextField label="Lowest spindle speed (rpm)" {...numeric} {...field("spindleSpeedMin")} />
          <TextField label="Highest spindle speed (rpm)" hint="The same as the lowest for a single speed" {...numeric} {...field("spindleSpeedMax")} />
          <TextField label={`Footprint length (${length})`} hint="Floor space, with guards and pendant" {...numeric} {...field("footprintLength")} />
          <TextField label={`Footprint width (${length})`} {...numeric} {...field("footprintWidth")} />
        </CardBody>
      </Card>

      <Card hidden={!showLatheDetails} data-testid="lathe-details">
        <CardHeader title="Lathe details" description="Optional; for lathes only. Thread pitches in mm and inch threads per inch, as the gearbox plate gives them." />
        <CardBody className="grid gap-5 sm:grid-cols-2">
          <TextField label={`Swing over the cross-slide (${length})`} {...numeric} {...field("swingOverCrossSlide")} />
          <TextField label="Tailstock taper" hint="e.g. Morse taper 4" list="tailstock-tapers" autoComplete="off" {...field("tailstockTaper")} />
          <TextField label="Finest metric pitch (mm)" hint="e.g. 0.2" {...numeric} {...field("threadPitchMin")} />
          <TextField label="Coarsest metric pitch (mm)" hint="e.g. 14" {...numeric} {...field("threadPitchMax")} />
          <TextField label="Coarsest inch thread (threads per inch)" hint="e.g. 2" {...numeric} {...field("threadTpiMin")} />
          <TextField label="Finest inch thread (threads per inch)" hint="e.g. 112" {...numeric} {...field("threadTpiMax")} />
          <datalist id="tailstock-tapers">
            {tailstockTaperSuggestions.map((taper) => (
              <option key={taper} value={taper} />
            ))}
          </datalist>
        </CardBody>
      </Card>

      <Card>
        <CardHeader title="Where it stands and the price" />
        <CardBody className="grid gap-5 sm:grid-cols-2">
          <TextField label="Town or city" autoComplete="address-level2" {...field("city")} />
          <TextField label="Region" hint="Optional: state, county or province" autoComplete="address-level1" {...field("region")} />
          <SelectField label="Country" options={countryOptions} placeholder="Choose…" {...field("country")} />
          <div className="grid grid-cols-[1fr_7rem] gap-3">
            <TextField label="Asking price" hint="Before tax, without transport" {...numeric} {...field("price")} />
            <SelectField label="Currency" options={currencies.map((code) => ({ value: code, label: code }))} {...field("currency")} />
          </div>
        </CardBody>
      </Card>

      <Card>
        <CardHeader title="Description" />
        <CardBody className="grid gap-5">
          <TextAreaField
            label="Description"
            hint="Its history, the work done on it (what was reground, replaced, re-scraped), and how it can be seen running."
            rows={7}
            {...field("description")}
          />
          <TextAreaField label="Tooling included" hint="Optional: chucks, faceplate, steadies, tool posts, collets…" rows={3} {...field("toolingIncluded")} />
        </CardBody>
      </Card>

      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" name="intent" value="save" size="lg" disabled={saving}>
          {saving ? "Saving…" : submitLabel}
        </Button>
        {aside}
      </div>
    </Form>
  );
}
