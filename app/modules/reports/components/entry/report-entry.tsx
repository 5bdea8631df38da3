// The inspector's report entry, built for a tablet in a workshop: safety first, then profile, conditions,
// instruments and one card per test with its live verdict; the grade preview follows every keystroke.
import { useDeferredValue, useMemo, useState } from "react";
import { Form, Link, useNavigation, useSearchParams } from "react-router";
import { Badge, Button, Card, CardBody, CardHeader, CheckboxField, cx, SelectField, TextAreaField, TextField } from "~/components/ui";
import { formatDeviation } from "../../format";
import { KINDS_FOR_METHOD, positioningGroups, type EvaluationMethod, type ReportScore, type ToleranceProfile } from "~/geometry";
import type { ColumnMapping } from "../../positioning-import";
import type { ImportedReadings } from "./positioning-import";
import {
  emptyTestEntry,
  measuredOnCheck,
  previewReport,
  profileOf,
  type ReportForm,
  type ReportPreview,
  type TestEntry,
} from "../../form";
import { GradeMark, KeyFigureList } from "../grade";
import { SafetyCautions } from "../safety";
import type { SetupPhotoView } from "./setup-photo";
import { InstrumentsCard } from "./instruments-card";
import { TestCard } from "./test-card";
import { useDraftSync, type SyncStatus } from "./use-draft-sync";
import { lengthsInText } from "~/modules/units/format";

export type EntryData = {
  booking: { id: string; reference: string; status: string; startsAt: string; days: { today: string; visitDay: string } };
  machine: { title: string; slug: string; categoryLabel: string; year: number | null; swingOverBedMm: number | null; distanceBetweenCentresMm: number | null; location: string };
  suggestion: { profile: { key: string; version: number; title: string; makersChart: string | null } | null; reason: string; uncovered: boolean };
  /** The versions this form may score with, its own (if since retired) included and marked, by name. */
  profiles: Array<{ key: string; version: number; title: string; makersChart: boolean; retired: boolean }>;
  /** The one version whose tests and tolerances the page has: the form's own, or the one just chosen. */
  profile: ToleranceProfile | null;
  form: ReportForm;
  draft: { version: number; updatedAt: string; correctsReportId: string | null } | null;
  mode: { kind: "first" | "correction" } | { kind: "locked"; reason: string; signedReportId: string | null };
  submitted: { reportId: string } | null;
  photos: Array<{ id: string; testCode: string; thumbnailUrl: string }>;
  /** The inspector's saved column mapping for instrument tables. */
  columnMapping: ColumnMapping | null;
};

type Errors = Record<string, string[]>;

function under(errors: Errors, prefix: string): Errors {
  const found: Errors = {};
  for (const [key, messages] of Object.entries(errors)) if (key.startsWith(`${prefix}.`)) found[key.slice(prefix.length + 1)] = messages;
  return found;
}

function SaveStatus({ status, restored }: { status: SyncStatus; restored: boolean }) {
  const text =
    status.kind === "saved"
      ? `Saved ${new Date(status.at).toLocaleTimeString("en-GB", { hour: "2-digit", minute: "2-digit", second: "2-digit" })}`
      : status.kind === "saving"
        ? "Saving…"
        : status.kind === "pending"
          ? "Changes kept on this device…"
          : status.message;
  const tone = status.kind === "offline" ? "text-caution" : status.kind === "refused" ? "text-beyond" : "text-ink-500";
  return (
    <p className={cx("text-sm font-medium", tone)} role="status" aria-live="polite" data-testid="save-status" data-state={status.kind}>
      {restored ? "Restored unsaved readings from this device. " : ""}
      {text}
    </p>
  );
}

function hasReadings(form: ReportForm) {
  return Object.values(form.tests).some((entry) =>
    entry.runs !== null ||
    entry.radial !== null ||
    [entry.max, entry.min, entry.near0, entry.near180, entry.far0, entry.far180, entry.near, entry.far, entry.headstockEnd, entry.tailstockEnd, ...entry.readings, ...entry.points.flatMap((p) => [p.station, p.reading])].some((value) => value.trim() !== ""),
  );
}

export function ReportEntry({
  data,
  errors: serverErrors,
  draftUrl,
  photosUrl,
  columnMappingUrl,
}: {
  data: EntryData;
  errors: Errors | null;
  draftUrl: string;
  photosUrl: string;
  columnMappingUrl: string;
}) {
  const [columnMapping, setColumnMapping] = useState<ColumnMapping | null>(data.columnMapping);
  const locked = data.mode.kind === "locked";
  const [form, setForm] = useState<ReportForm>(data.form);
  const [photos, setPhotos] = useState<Record<string, SetupPhotoView>>(() => Object.fromEntries(data.photos.map((photo) => [photo.id, photo])));
  const { status, restored, flushNow } = useDraftSync({
    bookingId: data.booking.id,
    draftUrl,
    form,
    setForm,
    serverUpdatedAt: data.draft?.updatedAt ?? null,
    serverVersion: data.draft?.version ?? null,
    enabled: !locked,
  });
  const profiles = data.profiles;
  // Until the page has loaded a newly chosen profile, there is none to score with (no preview for a moment).
  const profile = profileOf(form, data.profile ? [data.profile] : []);
  const [, setSearchParams] = useSearchParams();
  // Scoring the whole form follows the typing rather than holding it up: a keystroke repaints its own field
  // (and card) first, and the verdicts are scored in a render React may interrupt for the next keystroke.
  const scoredForm = useDeferredValue(form);
  const preview = useMemo(() => previewReport(scoredForm, profile), [scoredForm, profile]);
  const navigation = useNavigation();
  const submitting = navigation.state === "submitting" && navigation.formData?.get("intent") === "submit";
  const errors = serverErrors ?? {};
  const dated = measuredOnCheck(form.measuredOn, data.booking.days);
  const suggested = data.suggestion.profile;
  const differs = !suggested || suggested.key !== form.profile.key || suggested.version !== form.profile.version;

  const change = (mutate: (draft: ReportForm) => void) =>
    setForm((previous) => {
      const next = structuredClone(previous);
      mutate(next);
      return next;
    });
  // Only the changed test's entry is copied: the other cards keep their entries and are not drawn again.
  const changeTest = (code: string, kind: TestEntry["kind"]) => (mutate: (entry: TestEntry) => void) =>
    setForm((previous) => {
      const entry = structuredClone(previous.tests[code] ?? emptyEntryFor(kind)) as TestEntry;
      mutate(entry);
      return { ...previous, tests: { ...previous.tests, [code]: entry } };
    });

  const axes = useMemo(() => positioningGroups(profile?.tests ?? []), [profile]);
  const axisOf = (code: string) => [...axes.values()].find((codes) => codes.includes(code));
  // One set of runs serves every test of the axis; the mapping is kept for the inspector's next import.
  const acceptReadings = (codes: string[]) => (readings: ImportedReadings, mapping: ColumnMapping) => {
    const kind = "runs" in readings ? "positioning" : "circular";
    change((draft) => {
      for (const code of codes) {
        const entry = draft.tests[code]?.kind === kind ? draft.tests[code]! : (structuredClone(emptyEntryFor(kind)) as TestEntry);
        if ("runs" in readings) entry.runs = structuredClone(readings.runs);
        else entry.radial = structuredClone(readings.radial);
        draft.tests[code] = entry;
      }
    });
    // The saved mapping is an axis table's; a circular test's columns are read with it but do not replace it.
    if (kind === "circular") return;
    setColumnMapping(mapping);
    void fetch(columnMappingUrl, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(mapping) }).catch(() => undefined);
  };

  const score = preview?.score ?? null;
  return (
    <div className="mx-auto max-w-6xl px-4 py-6 pb-32 sm:px-6 lg:pb-10">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <p className="text-sm font-bold uppercase tracking-wide text-brass-600">
            {data.mode.kind === "correction" ? "Correction" : "Accuracy report"} · <span className="whitespace-nowrap">{data.booking.reference}</span>
          </p>
          <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">{data.machine.title}</h1>
          <p className="text-ink-600">
            {data.machine.categoryLabel}
            {data.machine.year ? ` · ${data.machine.year}` : ""} · {data.machine.location}
          </p>
        </div>
        {!locked ? <SaveStatus status={status} restored={restored} /> : null}
      </div>

      {locked ? (
        <Card className="mt-6 border-ink-300">
          <CardBody className="space-y-3">
            <p className="font-semibold text-ink-900">{data.mode.kind === "locked" ? data.mode.reason : ""}</p>
            {data.mode.kind === "locked" && data.mode.signedReportId ? (
              <div className="flex flex-wrap gap-3">
                <Link to={`/reports/${data.mode.signedReportId}`} className="font-semibold text-ink-900 underline underline-offset-2">
                  Read the signed report
                </Link>
                <Form method="post" action={`/inspector/reports/${data.mode.signedReportId}/correct`}>
                  <Button type="submit" variant="secondary" size="sm">
                    Start a correction
                  </Button>
                </Form>
              </div>
            ) : null}
          </CardBody>
        </Card>
      ) : null}

      <div className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0 space-y-6">
          <SafetyCautions>
            <CheckboxField
              className="mt-3"
              label="I have read these cautions; I follow the machine's manual and the local rules on this visit."
              checked={form.safetyAcknowledged}
              disabled={locked}
              errors={errors.safetyAcknowledged}
              onChange={(event) => change((draft) => void (draft.safetyAcknowledged = event.target.checked))}
            />
          </SafetyCautions>

          <fieldset disabled={locked} className="space-y-6">
            <Card>
              <CardHeader title="Tolerance profile" description="Suggested from the machine's category and size; change it if the machine calls for another." />
              <CardBody className="space-y-4">
                <div className={cx("rounded-control px-3 py-2 text-sm text-ink-700", data.suggestion.uncovered ? "bg-caution/10 ring-1 ring-caution/40" : "bg-ink-50")} data-testid="profile-suggestion">
                  <p>
                    <span className="font-semibold text-ink-900">Suggested: </span>
                    {suggested ? `${suggested.makersChart ? "the maker's chart — " : ""}${lengthsInText(suggested.title, form.units)} (v${suggested.version})` : "none"}
                  </p>
                  <p className="mt-1">{lengthsInText(data.suggestion.reason, form.units)}</p>
                </div>
                <SelectField
                  label="Profile used"
                  value={`${form.profile.key}@${form.profile.version}`}
                  options={profiles.map((option) => ({
                    value: `${option.key}@${option.version}`,
                    label: `${option.makersChart ? "Maker's chart: " : ""}${lengthsInText(option.title, form.units)} — v${option.version}${option.retired ? " (retired)" : ""}`,
                  }))}
                  errors={errors["profile.key"]}
                  onChange={(event) => {
                    const chosen = event.target.value;
                    change((draft) => {
                      const [key, version] = chosen.split("@");
                      draft.profile.key = key!;
                      draft.profile.version = Number(version);
                    });
                    // The page loads the chosen profile's tests and tolerances; the readings typed stay.
                    setSearchParams({ profile: chosen }, { replace: true, preventScrollReset: true });
                  }}
                />
                {differs ? (
                  <TextAreaField
                    label={suggested ? "Why another profile than the one suggested" : "Why this profile fits the machine"}
                    rows={2}
                    value={form.profile.reason}
                    errors={errors["profile.reason"]}
                    onChange={(event) => change((draft) => void (draft.profile.reason = event.target.value))}
                  />
                ) : null}
                <div>
                  <p className="text-sm font-semibold text-ink-800">Readings entered in</p>
                  <div className="mt-1 inline-flex rounded-control ring-1 ring-ink-300" role="radiogroup" aria-label="Units of the readings">
                    {(["mm", "inch"] as const).map((units) => (
                      <button
                        key={units}
                        type="button"
                        role="radio"
                        aria-checked={form.units === units}
                        disabled={locked || (hasReadings(form) && form.units !== units)}
                        onClick={() => change((draft) => void (draft.units = units))}
                        className={cx("px-4 py-2 text-sm font-semibold first:rounded-l-control last:rounded-r-control disabled:opacity-50", form.units === units ? "bg-ink-900 text-white" : "bg-white text-ink-700")}
                      >
                        {units === "mm" ? "mm and µm" : "inches"}
                      </button>
                    ))}
                  </div>
                  <p className="mt-1 text-xs text-ink-500">
                    {hasReadings(form) ? "Units are fixed once readings are in, so no reading changes its meaning. " : ""}
                    {form.units === "mm" ? "Stations in mm, readings in µm." : "Stations and readings in inches (0.0001 in = 2.54 µm)."} Level tilts are µm/m either way.
                  </p>
                </div>
              </CardBody>
            </Card>

            <Card>
              <CardHeader title="Date and conditions" description="Record them: the engine warns on any left out." />
              <CardBody className="grid gap-4 sm:grid-cols-2">
                <div>
                  <TextField
                    label="Date of the tests"
                    type="date"
                    max={data.booking.days.today}
                    value={form.measuredOn}
                    errors={errors.measuredOn ?? (dated.error && form.measuredOn ? [dated.error] : undefined)}
                    onChange={(event) => change((draft) => void (draft.measuredOn = event.target.value))}
                  />
                  {dated.warning ? (
                    <p className="mt-1 text-sm font-medium text-caution" role="status" data-testid="date-warning">
                      {dated.warning}
                    </p>
                  ) : null}
                </div>
                <TextField
                  label="Ambient temperature (°C)"
                  inputMode="decimal"
                  value={form.conditions.ambientTemperatureC}
                  hint="Reference 20 °C (ISO 1:2016)"
                  errors={errors["conditions.ambientTemperatureC"] ?? preview?.conditions.errors.ambientTemperatureC}
                  onChange={(event) => change((draft) => void (draft.conditions.ambientTemperatureC = event.target.value))}
                />
                <TextField
                  label="Warm-up run (minutes)"
                  inputMode="numeric"
                  value={form.conditions.warmUpMinutes}
                  errors={errors["conditions.warmUpMinutes"] ?? preview?.conditions.errors.warmUpMinutes}
                  onChange={(event) => change((draft) => void (draft.conditions.warmUpMinutes = event.target.value))}
                />
                <SelectField
                  label="Levelled before the tests"
                  value={form.conditions.levelled}
                  placeholder="Not recorded"
                  options={[
                    { value: "yes", label: "Yes" },
                    { value: "no", label: "No" },
                  ]}
                  onChange={(event) => change((draft) => void (draft.conditions.levelled = event.target.value as ReportForm["conditions"]["levelled"]))}
                />
                <TextAreaField className="sm:col-span-2" label="Notes on the conditions" rows={2} value={form.conditions.notes} onChange={(event) => change((draft) => void (draft.conditions.notes = event.target.value))} />
              </CardBody>
            </Card>

            <InstrumentsCard instruments={form.instruments} units={form.units} measuredOn={form.measuredOn} onChange={(mutate) => change((draft) => mutate(draft.instruments))} />
          </fieldset>

          <section aria-labelledby="tests-heading" className="space-y-4">
            <h2 id="tests-heading" className="text-xl font-bold text-ink-900">
              Tests
            </h2>
            {errors.tests ? <p className="text-sm font-medium text-beyond">{errors.tests.join(" ")}</p> : null}
            {preview?.tests.map((testPreview) => {
              const code = testPreview.test.code;
              const entry = form.tests[code];
              const photoId = entry?.photoId ?? null;
              return (
                <TestCard
                  key={code}
                  preview={testPreview}
                  entry={entry}
                  units={form.units}
                  instruments={form.instruments}
                  serverErrors={under(errors, `tests.${code}`)}
                  onChange={changeTest(code, entry?.kind ?? defaultKindOf(testPreview.test.method))}
                  onClear={() => change((draft) => void delete draft.tests[code])}
                  photo={photoId && photos[photoId] ? photos[photoId]! : null}
                  photosUrl={photosUrl}
                  onPhoto={(photo) => {
                    if (photo) setPhotos((current) => ({ ...current, [photo.id]: photo }));
                    changeTest(code, entry?.kind ?? defaultKindOf(testPreview.test.method))((draft) => void (draft.photoId = photo?.id ?? null));
                  }}
                  disabled={locked}
                  positioning={(() => {
                    if (testPreview.test.method === "circular-deviation") return { kind: "circular" as const, mapping: columnMapping, axisTests: [code], onAccept: acceptReadings([code]) };
                    const codes = axisOf(code);
                    return codes ? { kind: "positioning" as const, mapping: columnMapping, axisTests: codes, onAccept: acceptReadings(codes) } : undefined;
                  })()}
                />
              );
            })}
          </section>

          <Card>
            <CardHeader title="Notes" description="Anything a buyer should know: wear seen, adjustments advised, tests not possible and why." />
            <CardBody>
              <TextAreaField label="Notes for the report" rows={4} value={form.notes} disabled={locked} onChange={(event) => change((draft) => void (draft.notes = event.target.value))} />
            </CardBody>
          </Card>

          {!locked ? (
            <Form method="post" className="space-y-3" onSubmit={() => void flushNow()}>
              <input type="hidden" name="form" value={JSON.stringify(form)} />
              {Object.keys(errors).length ? (
                <div role="alert" className="rounded-control border border-beyond/30 bg-beyond-soft px-4 py-3 text-sm text-beyond">
                  <p className="font-bold">The report cannot be submitted yet:</p>
                  <ul className="mt-1 list-disc pl-5">
                    {Object.entries(errors)
                      .slice(0, 12)
                      .map(([key, messages]) => (
                        <li key={key}>
                          {key.startsWith("tests.") ? <a href={`#test-${key.split(".")[1]}`} className="underline">{key.split(".")[1]}</a> : key}: {messages.join(" ")}
                        </li>
                      ))}
                  </ul>
                </div>
              ) : null}
              <Button type="submit" name="intent" value="submit" size="lg" className="w-full sm:w-auto" disabled={submitting}>
                {submitting ? "Scoring on the server…" : "Submit for review"}
              </Button>
              <p className="text-sm text-ink-500">The server checks and scores the readings itself; you review its result before signing.</p>
            </Form>
          ) : null}
        </div>

        <aside className="hidden lg:block">
          <div className="sticky top-20 space-y-4">
            <GradePreview score={score} preview={preview} units={form.units} category={profile?.category} />
          </div>
        </aside>
      </div>

      <div className="fixed inset-x-0 bottom-0 z-20 border-t border-ink-200 bg-white/95 px-4 py-2 backdrop-blur lg:hidden" data-testid="preview-bar">
        <div className="mx-auto flex max-w-6xl items-center gap-3">
          {score ? <GradeMark grade={score.grade} size="sm" /> : null}
          <div className="min-w-0 flex-1 text-sm">
            <p className="font-semibold text-ink-900">
              Preview: grade {score?.grade ?? "—"} · {preview?.requiredMeasured ?? 0} of {preview?.requiredCount ?? 0} required
            </p>
            <p className="truncate text-ink-500">
              {score?.keyFigures.spindleRunOut !== null && score?.keyFigures.spindleRunOut !== undefined ? `Run-out ${formatDeviation(score.keyFigures.spindleRunOut, form.units)} · ` : ""}
              {(score?.outOfTolerance.length ?? 0) > 0 ? `${score!.outOfTolerance.length} failing` : "none failing"}
            </p>
          </div>
          <a href="#tests-heading" className="text-sm font-semibold text-ink-700 underline underline-offset-2">
            Tests
          </a>
        </div>
      </div>
    </div>
  );
}

function GradePreview({ score, preview, units, category }: { score: ReportScore | null; preview: ReportPreview | null; units: ReportForm["units"]; category?: string }) {
  if (!score || !preview) return null;
  return (
    <Card data-testid="grade-preview">
      <CardHeader title="Live preview" description="Computed here as you type; the server scores again on submit." />
      <CardBody className="space-y-4">
        <div className="flex items-center gap-3">
          <GradeMark grade={score.grade} />
          <div>
            <p className="font-bold text-ink-900" data-testid="preview-grade">
              Grade {score.grade}
            </p>
            <p className="text-sm text-ink-600">
              {preview.requiredMeasured} of {preview.requiredCount} required tests in
            </p>
          </div>
        </div>
        <KeyFigureList figures={score.keyFigures} units={units} columns={1} category={category} />
        <ol className="space-y-1 text-sm">
          {preview.tests.map(({ test, result, check }) => (
            <li key={test.code}>
              <a href={`#test-${test.code}`} className="flex items-center justify-between gap-2 rounded px-1 py-0.5 hover:bg-ink-50">
                <span className="truncate text-ink-700">
                  {lengthsInText(test.title, units)}
                  {test.required ? "" : " (opt.)"}
                </span>
                {result ? (
                  <Badge tone={result.pass ? "within" : "beyond"}>{result.pass ? "within" : "fails"}</Badge>
                ) : check.state === "invalid" || check.state === "incomplete" ? (
                  <Badge tone="caution">{check.state}</Badge>
                ) : (
                  <span className="text-xs text-ink-400">—</span>
                )}
              </a>
            </li>
          ))}
        </ol>
      </CardBody>
    </Card>
  );
}

function emptyEntryFor(kind: TestEntry["kind"]) {
  return emptyTestEntry(kind);
}

function defaultKindOf(method: EvaluationMethod) {
  return KINDS_FOR_METHOD[method][0]!;
}
