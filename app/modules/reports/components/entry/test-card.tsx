// One test of the profile: what it measures, a reading form that fits its kind, the instrument, a set-up
// photo, notes, and the live verdict from the engine as the readings go in.
import { memo, useId, useState, type ReactNode } from "react";
import { Badge, Button, cx, SelectField, TextAreaField } from "~/components/ui";
import { KINDS_FOR_METHOD, toMetric, type MeasurementKind, type ProfileTest } from "~/geometry";
import { DIRECTION_LABELS, formatDeviation, formatRatio, isSignedValue } from "../../format";
import { emptyTestEntry, isEntryKind, parseStationTable, unitLabels, type EntryUnits, type InstrumentEntry, type TestEntry, type TestEntryCheck, type TestPreview } from "../../form";
import { GridFields } from "./grid-fields";
import { RatioBar } from "../grade";
import { TestPlot } from "../plots";
import { SetupPhoto, type SetupPhotoView } from "./setup-photo";
import { lengthsInText } from "~/modules/units/format";
import { PositioningFields, type PositioningImportProps } from "./positioning-import";

const KIND_LABELS: Record<MeasurementKind, string> = {
  sweep: "Readings around a revolution",
  extremes: "Highest and lowest only",
  profile: "Stations along the travel",
  level: "Level readings along the travel",
  mandrel: "Near and far, 0° and 180°",
  "near-far": "Near and far",
  "centre-height": "Both ends",
  surface: "Heights over a grid",
  positioning: "Interferometer runs along the axis",
  circular: "Radial deviations around a circle",
};

type Errors = Record<string, string[]>;

/** A reading box sized for a gloved-off thumb, with a sign key: tablet number pads often lack a minus. */
export function ReadingInput({
  label,
  value,
  onChange,
  unit,
  errors,
  signed = true,
  compact = false,
  name,
}: {
  label: ReactNode;
  value: string;
  onChange: (value: string) => void;
  unit: string;
  errors?: string[];
  signed?: boolean;
  compact?: boolean;
  name?: string;
}) {
  const id = useId();
  const invalid = Boolean(errors?.length);
  const flip = () => {
    const trimmed = value.trim();
    if (!trimmed) onChange("-");
    else onChange(trimmed.startsWith("-") || trimmed.startsWith("\u2212") ? trimmed.slice(1) : `-${trimmed}`);
  };
  return (
    <div className={compact ? "" : "space-y-1"}>
      <label htmlFor={id} className={compact ? "sr-only" : "block text-sm font-semibold text-ink-800"}>
        {label}
      </label>
      <div className="flex items-stretch">
        {signed ? (
          <button type="button" onClick={flip} className="rounded-l-control border border-r-0 border-ink-300 bg-ink-50 px-2.5 text-base font-bold text-ink-700 hover:bg-ink-100" aria-label={`± change the sign of ${typeof label === "string" ? label : "this reading"}`} tabIndex={-1}>
            ±
          </button>
        ) : null}
        <input
          id={id}
          name={name}
          inputMode="decimal"
          autoComplete="off"
          value={value}
          onChange={(event) => onChange(event.target.value)}
          aria-invalid={invalid || undefined}
          aria-describedby={invalid ? `${id}-error` : undefined}
          className={cx(
            "block w-full min-w-0 border bg-white px-3 py-2 text-base text-ink-900 tabular shadow-xs focus:outline-none focus:ring-2 focus:ring-brass-400",
            signed ? "" : "rounded-l-control",
            invalid ? "border-beyond" : "border-ink-300",
          )}
        />
        <span className="inline-flex items-center rounded-r-control border border-l-0 border-ink-300 bg-ink-50 px-2 text-sm text-ink-500">{unit}</span>
      </div>
      {invalid ? (
        <p id={`${id}-error`} className="text-sm font-medium text-beyond" role="alert">
          {errors!.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

function StationTable({ entry, change, units, errors, readingUnit }: { entry: TestEntry; change: (mutate: (entry: TestEntry) => void) => void; units: EntryUnits; errors: Errors; readingUnit: string }) {
  const [paste, setPaste] = useState<string | null>(null);
  const [pasteNote, setPasteNote] = useState<string | null>(null);
  const labels = unitLabels(units);
  const rows = entry.points.length ? entry.points : [{ station: "", reading: "" }];
  const applyPaste = (text: string) => {
    const { points, skipped } = parseStationTable(text);
    if (!points.length) {
      setPasteNote("No rows of two numbers (station, reading) found.");
      return;
    }
    change((draft) => {
      draft.points = points;
    });
    setPaste(null);
    setPasteNote(`${points.length} station${points.length === 1 ? "" : "s"} pasted${skipped ? `, ${skipped} line${skipped === 1 ? "" : "s"} skipped` : ""}.`);
  };
  const nextStation = () => {
    const last = entry.points.at(-1);
    const before = entry.points.at(-2);
    const a = Number(last?.station);
    const b = Number(before?.station);
    return last && before && Number.isFinite(a) && Number.isFinite(b) ? String(Number((a + (a - b)).toFixed(4))) : "";
  };
  return (
    <div className="space-y-2">
      <div className="overflow-x-auto rounded-control border border-ink-200">
        <table className="min-w-full text-sm">
          <thead className="bg-ink-50 text-left text-xs font-bold uppercase tracking-wide text-ink-600">
            <tr>
              <th className="w-10 px-2 py-2">#</th>
              {/* Units stay as written: uppercase would turn µm into a Greek capital, read as "MM". */}
              <th className="px-2 py-2">
                Station (<span className="normal-case">{labels.station}</span>)
              </th>
              <th className="px-2 py-2">
                Reading (<span className="normal-case">{readingUnit}</span>)
              </th>
              <th className="w-12 px-2 py-2">
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((row, i) => (
              <tr key={i} className="border-t border-ink-100" data-row={i}>
                <td className="px-2 py-1.5 text-ink-500 tabular">{i + 1}</td>
                <td className="px-2 py-1.5">
                  <ReadingInput
                    compact
                    signed={false}
                    label={`Station ${i + 1}`}
                    unit={labels.station}
                    value={row.station}
                    errors={errors[`points.${i}.station`]}
                    onChange={(value) =>
                      change((draft) => {
                        if (!draft.points[i]) draft.points[i] = { station: "", reading: "" };
                        draft.points[i]!.station = value;
                      })
                    }
                  />
                </td>
                <td className="px-2 py-1.5">
                  <ReadingInput
                    compact
                    label={`Reading ${i + 1}`}
                    unit={readingUnit}
                    value={row.reading}
                    errors={errors[`points.${i}.reading`]}
                    onChange={(value) =>
                      change((draft) => {
                        if (!draft.points[i]) draft.points[i] = { station: "", reading: "" };
                        draft.points[i]!.reading = value;
                      })
                    }
                  />
                </td>
                <td className="px-2 py-1.5 text-right">
                  <button
                    type="button"
                    className="rounded-control px-2 py-1 text-lg text-ink-500 hover:bg-beyond-soft hover:text-beyond"
                    aria-label={`× remove station ${i + 1}`}
                    onClick={() =>
                      change((draft) => {
                        draft.points.splice(i, 1);
                      })
                    }
                  >
                    ×
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap gap-2">
        <Button
          variant="secondary"
          size="sm"
          onClick={() =>
            change((draft) => {
              if (!draft.points.length) draft.points.push({ station: "", reading: "" });
              draft.points.push({ station: nextStation(), reading: "" });
            })
          }
        >
          + Add a station
        </Button>
        <Button variant="quiet" size="sm" onClick={() => setPaste(paste === null ? "" : null)}>
          Paste from a spreadsheet or CSV
        </Button>
      </div>
      {paste !== null ? (
        <div className="space-y-2 rounded-control border border-ink-200 bg-ink-50 p-3">
          <label className="block text-sm font-semibold text-ink-800">
            Two columns, station then reading; one row per line
            <textarea
              className="mt-1 block min-h-28 w-full rounded-control border border-ink-300 bg-white px-3 py-2 font-mono text-sm"
              value={paste}
              placeholder={"0\t0\n100\t-4\n200\t2"}
              onChange={(event) => setPaste(event.target.value)}
              onPaste={(event) => {
                const text = event.clipboardData.getData("text");
                if (text) {
                  event.preventDefault();
                  applyPaste(text);
                }
              }}
            />
          </label>
          <div className="flex gap-2">
            <Button size="sm" onClick={() => applyPaste(paste)}>
              Use these rows
            </Button>
            <Button size="sm" variant="quiet" onClick={() => setPaste(null)}>
              Cancel
            </Button>
          </div>
          <p className="text-xs text-ink-500">Tabs or semicolons between columns allow a decimal comma; a header line is skipped. The rows replace the table.</p>
        </div>
      ) : null}
      {pasteNote ? (
        <p className="text-sm text-ink-600" role="status">
          {pasteNote}
        </p>
      ) : null}
    </div>
  );
}

function ReadingsFields({
  test,
  entry,
  change,
  units,
  errors,
  check,
  positioning,
}: {
  test: ProfileTest;
  entry: TestEntry;
  change: (mutate: (entry: TestEntry) => void) => void;
  units: EntryUnits;
  errors: Errors;
  check: TestEntryCheck;
  positioning?: PositioningImportProps;
}) {
  const labels = unitLabels(units);
  const field = (name: keyof TestEntry, label: string, signed = true) => (
    <ReadingInput
      label={label}
      unit={labels.reading}
      value={String(entry[name] ?? "")}
      errors={errors[name as string]}
      signed={signed}
      onChange={(value) =>
        change((draft) => {
          (draft as Record<string, unknown>)[name] = value;
        })
      }
    />
  );
  const lengthField = (hint: string) => (
    <ReadingInput
      label={`Distance near to far (${labels.station})`}
      unit={labels.station}
      signed={false}
      value={entry.length}
      errors={errors.length}
      onChange={(value) =>
        change((draft) => {
          draft.length = value;
        })
      }
      name={hint}
    />
  );
  switch (entry.kind) {
    case "sweep": {
      const readings = entry.readings.length >= 4 ? entry.readings : [...entry.readings, ...Array(4 - entry.readings.length).fill("")];
      return (
        <div className="space-y-2">
          <p className="text-sm text-ink-600">Turn the spindle through a full revolution and note the indicator at each position.</p>
          <div className="grid grid-cols-2 gap-2 sm:grid-cols-4">
            {readings.map((value, i) => (
              <ReadingInput
                key={i}
                label={`Reading ${i + 1}`}
                unit={labels.reading}
                value={value}
                errors={errors[`readings.${i}`]}
                onChange={(next) =>
                  change((draft) => {
                    while (draft.readings.length < readings.length) draft.readings.push("");
                    draft.readings[i] = next;
                  })
                }
              />
            ))}
          </div>
          <Button
            variant="secondary"
            size="sm"
            onClick={() =>
              change((draft) => {
                while (draft.readings.length < readings.length) draft.readings.push("");
                draft.readings.push("");
              })
            }
          >
            + Add a reading
          </Button>
        </div>
      );
    }
    case "extremes":
      return (
        <div className="grid grid-cols-2 gap-3">
          {field("max", "Highest reading")}
          {field("min", "Lowest reading")}
        </div>
      );
    case "profile":
    case "level":
      return (
        <div className="space-y-3">
          {entry.kind === "profile" && test.method === "straightness" ? (
            <SelectField
              label="Reference line"
              className="sm:w-72"
              value={entry.reference}
              options={[
                { value: "", label: `Profile's choice (${test.reference ?? "end-points"})` },
                { value: "end-points", label: "End points" },
                { value: "least-squares", label: "Least squares" },
                { value: "minimum-zone", label: "Minimum zone" },
              ]}
              onChange={(event) =>
                change((draft) => {
                  draft.reference = event.target.value as TestEntry["reference"];
                })
              }
            />
          ) : null}
          <StationTable entry={entry} change={change} units={units} errors={errors} readingUnit={entry.kind === "level" ? "µm/m" : labels.reading} />
        </div>
      );
    case "mandrel":
      return (
        <div className="space-y-3">
          <div className="grid grid-cols-2 gap-3">
            <fieldset className="space-y-2 rounded-control border border-ink-200 p-3">
              <legend className="px-1 text-sm font-bold text-ink-800">Near the spindle nose</legend>
              {field("near0", "Near, spindle at 0°")}
              {field("near180", "Near, turned 180°")}
            </fieldset>
            <fieldset className="space-y-2 rounded-control border border-ink-200 p-3">
              <legend className="px-1 text-sm font-bold text-ink-800">At the far end</legend>
              {field("far0", "Far, spindle at 0°")}
              {field("far180", "Far, turned 180°")}
            </fieldset>
          </div>
          <div className="sm:w-64">{lengthField("length")}</div>
          <p className="text-xs text-ink-500">Leave the distance empty for the profile's {test.measuringLength.nominal ?? ""} mm. Averaging 0° and 180° cancels the mandrel's own run-out.</p>
        </div>
      );
    case "near-far":
      return (
        <div className="space-y-3">
          <div className="grid grid-cols-2 gap-3">
            {field("near", "Near reading")}
            {field("far", "Far reading")}
          </div>
          <div className="sm:w-64">{lengthField("length")}</div>
        </div>
      );
    case "centre-height":
      return (
        <div className="grid grid-cols-2 gap-3">
          {field("headstockEnd", "At the headstock end")}
          {field("tailstockEnd", "At the tailstock end")}
        </div>
      );
    case "surface":
      return <GridFields entry={entry} change={change} units={units} errors={errors} check={check} />;
    case "positioning":
    case "circular":
      return (
        <>
          <PositioningFields entry={entry} units={units} importer={positioning} />
          {errors.runs ? (
            <p className="text-sm font-medium text-beyond" role="alert">
              {errors.runs.join(" ")}
            </p>
          ) : null}
        </>
      );
  }
}

function LiveVerdict({ preview, units }: { preview: TestPreview; units: EntryUnits }) {
  const { result, check, engineError } = preview;
  if (engineError) return <p className="rounded-control bg-beyond-soft px-3 py-2 text-sm font-medium text-beyond">{engineError}</p>;
  if (!result) {
    if (check.state === "incomplete") return <p className="text-sm text-ink-500">{check.errors.entry?.[0] ?? "Not complete yet."}</p>;
    return null;
  }
  const signed = isSignedValue(result.method);
  return (
    <div className={cx("space-y-2 rounded-control border p-3", result.pass ? "border-within/30 bg-within-soft/50" : "border-beyond/30 bg-beyond-soft/60")} data-testid="live-verdict" data-pass={String(result.pass)}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-sm text-ink-800">
          <span className="font-bold tabular">{formatDeviation(result.value, units, { signed, unit: result.unit })}</span>
          <span className="text-ink-500"> of </span>
          <span className="tabular">{formatDeviation(result.tolerance, units, { unit: result.unit })}</span>
          {result.measuringLength ? <span className="text-ink-500"> over {units === "inch" ? `${(result.measuringLength / 25.4).toFixed(1)} in` : `${Math.round(result.measuringLength)} mm`}</span> : null}
          <span className="text-ink-500"> · ratio {formatRatio(result.ratio)}</span>
        </p>
        <Badge tone={result.pass ? "within" : "beyond"}>{result.pass ? "Within" : result.direction.pass ? "Beyond tolerance" : "Leans the wrong way"}</Badge>
      </div>
      <RatioBar ratio={result.ratio} pass={result.pass} />
      {!result.direction.pass ? (
        <p className="text-sm font-semibold text-beyond">
          This test allows {DIRECTION_LABELS[result.direction.allowed]}: the readings go {formatDeviation(result.direction.against, units)} the other way, beyond the instrument's resolution. It fails however small that is.
        </p>
      ) : null}
      {result.local && !result.local.pass ? (
        <p className="text-sm text-beyond">
          Local: {formatDeviation(result.local.value, units)} over {result.local.window} mm ({result.local.from}–{result.local.to} mm) against {formatDeviation(result.local.tolerance, units)}.
        </p>
      ) : null}
      {result.warnings
        .filter((warning) => !["temperature-missing", "warm-up-missing", "levelling-missing"].includes(warning.code))
        .map((warning) => (
          <p key={warning.code} className="text-xs text-caution">
            {warning.message}
          </p>
        ))}
    </div>
  );
}

function TestCardView({
  preview,
  entry,
  onChange,
  onClear,
  units,
  instruments,
  serverErrors,
  photo,
  photosUrl,
  onPhoto,
  disabled,
  positioning,
}: {
  preview: TestPreview;
  entry: TestEntry | undefined;
  onChange: (mutate: (entry: TestEntry) => void) => void;
  onClear: () => void;
  units: EntryUnits;
  instruments: InstrumentEntry[];
  serverErrors: Errors;
  photo: SetupPhotoView | null;
  /** Where set-up photos go; without it the card takes readings only (e.g. a rebuild record's). */
  photosUrl?: string;
  onPhoto?: (photo: SetupPhotoView | null) => void;
  disabled: boolean;
  /** A positioning test: how its runs are imported and which tests of the axis share them. */
  positioning?: PositioningImportProps;
}) {
  const { test, result } = preview;
  const kinds = KINDS_FOR_METHOD[test.method].filter(isEntryKind);
  // A test whose readings the form cannot take yet (the circular test's radial deviations) is shown, not entered.
  if (!kinds.length) {
    return (
      <article id={`test-${test.code}`} className="rounded-panel border border-ink-200 bg-white px-4 py-3 shadow-panel sm:px-5" data-test-code={test.code}>
        <h3 className="text-base font-bold text-ink-900">
          {lengthsInText(test.title, units)} <span className="text-sm font-semibold text-ink-400">{test.code}</span>
        </h3>
        <p className="text-sm text-ink-600">{test.measures}</p>
        <p className="mt-2 text-sm text-ink-500">{test.required ? "Required, but" : "Optional;"} its readings cannot be entered on this form yet. Note what you read in the report's notes.</p>
      </article>
    );
  }
  const current = entry ?? emptyTestEntry(kinds[0]!);
  const errors = { ...preview.check.errors, ...serverErrors };
  const labels = unitLabels(units);
  const metric = preview.check.measurement ? toMetric({ tests: { [test.code]: preview.check.measurement } }, units).tests[test.code]! : null;
  return (
    <article id={`test-${test.code}`} className="rounded-panel border border-ink-200 bg-white shadow-panel" data-test-code={test.code}>
      <header className="flex flex-wrap items-start justify-between gap-2 border-b border-ink-100 px-4 py-3 sm:px-5">
        <div className="min-w-0">
          <h3 className="text-base font-bold text-ink-900">
            {lengthsInText(test.title, units)} <span className="text-sm font-semibold text-ink-400">{test.code}</span>
          </h3>
          <p className="text-sm text-ink-600">{test.measures}</p>
        </div>
        <div className="flex items-center gap-2">
          {test.required ? <Badge>Required</Badge> : <Badge tone="neutral">Optional</Badge>}
          {result ? <Badge tone={result.pass ? "within" : "beyond"}>{result.pass ? "Within" : "Fails"}</Badge> : null}
        </div>
      </header>
      <fieldset disabled={disabled} className="min-w-0 space-y-4 px-4 py-4 sm:px-5">
        <div className="grid gap-1 text-xs text-ink-500 sm:grid-cols-2">
          <p>
            <span className="font-semibold text-ink-700">Set-up: </span>
            {test.instrument}
          </p>
          <p>
            <span className="font-semibold text-ink-700">Sign: </span>
            {test.direction.positive}
            {test.direction.allowed !== "any" && test.direction.allowed !== "either" ? ` · allowed: ${DIRECTION_LABELS[test.direction.allowed]}` : ""}
          </p>
        </div>
        {kinds.length > 1 ? (
          <div className="flex flex-wrap gap-2" role="radiogroup" aria-label="How the readings were taken">
            {kinds.map((kind) => (
              <button
                key={kind}
                type="button"
                role="radio"
                aria-checked={current.kind === kind}
                onClick={() =>
                  onChange((draft) => {
                    draft.kind = kind;
                  })
                }
                className={cx("rounded-full px-3 py-1.5 text-sm font-semibold ring-1 ring-inset", current.kind === kind ? "bg-ink-900 text-white ring-ink-900" : "bg-white text-ink-700 ring-ink-300 hover:bg-ink-50")}
              >
                {KIND_LABELS[kind]}
              </button>
            ))}
          </div>
        ) : null}
        <ReadingsFields test={test} entry={current} change={onChange} units={units} errors={errors} check={preview.check} positioning={positioning} />
        {errors.entry && preview.check.state === "invalid" ? <p className="text-sm font-medium text-beyond">{errors.entry.join(" ")}</p> : null}
        <LiveVerdict preview={preview} units={units} />
        {metric && result && (metric.kind === "profile" || metric.kind === "mandrel" || metric.kind === "surface" || metric.kind === "positioning") ? <TestPlot measurement={metric} result={result} units={units} /> : null}
        <div className="grid gap-3 sm:grid-cols-2">
          <SelectField
            label="Instrument"
            value={current.instrumentId}
            placeholder="Choose…"
            errors={errors.instrumentId}
            options={instruments.map((instrument, i) => ({
              value: instrument.id,
              label: `${i + 1}. ${instrument.description || instrument.kind.replace("-", " ")}${instrument.resolution ? ` (${instrument.resolution} ${instrument.kind.includes("level") ? "µm/m" : labels.resolution})` : ""}`,
            }))}
            onChange={(event) =>
              onChange((draft) => {
                draft.instrumentId = event.target.value;
              })
            }
          />
          <ReadingInput
            label="Resolution for this test (if not the instrument's)"
            unit={current.kind === "level" ? "µm/m" : labels.resolution}
            signed={false}
            value={current.resolution}
            errors={errors.resolution}
            onChange={(value) =>
              onChange((draft) => {
                draft.resolution = value;
              })
            }
          />
        </div>
        {photosUrl && onPhoto ? <SetupPhoto testCode={test.code} photo={photo} photosUrl={photosUrl} onChange={onPhoto} error={errors.photoId?.join(" ")} disabled={disabled} /> : null}
        <TextAreaField
          label="Notes on this test"
          rows={2}
          className="[&_textarea]:min-h-16"
          value={current.notes}
          onChange={(event) =>
            onChange((draft) => {
              draft.notes = event.target.value;
            })
          }
        />
        {entry ? (
          <button type="button" className="text-sm font-semibold text-ink-500 underline underline-offset-2 hover:text-beyond" onClick={onClear}>
            Clear this test's readings
          </button>
        ) : null}
      </fieldset>
    </article>
  );
}

type TestCardProps = Parameters<typeof TestCardView>[0];

/**
 * A card is drawn again only when what it shows changes. Its callbacks are left out of the comparison: they
 * update the form through state setters, so an older one does the same as a newer one. Server errors are
 * compared by content (the form picks them out of the page's errors on every render).
 */
function sameCard(before: TestCardProps, after: TestCardProps): boolean {
  for (const key of Object.keys({ ...before, ...after }) as (keyof TestCardProps)[]) {
    const [a, b] = [before[key], after[key]];
    if (typeof a === "function" && typeof b === "function") continue;
    if (key === "serverErrors") {
      if (JSON.stringify(a) !== JSON.stringify(b)) return false;
    } else if (key === "positioning") {
      const [x, y] = [a as TestCardProps["positioning"], b as TestCardProps["positioning"]];
      if (x?.mapping !== y?.mapping || x?.axisTests !== y?.axisTests || Boolean(x) !== Boolean(y)) return false;
    } else if (!Object.is(a, b)) return false;
  }
  return true;
}

export const TestCard = memo(TestCardView, sameCard);
