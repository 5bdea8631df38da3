// A positioning test's readings: the interferometer's table pasted or chosen as a file, its columns mapped
// (run, direction, target, deviation; units; decimal comma; header), the parsed runs previewed with the
// axis's figures and plot, and accepted into every test of the axis. The mapping is kept for next time.
import { useMemo, useState } from "react";
import { Button, CheckboxField, SelectField } from "~/components/ui";
import type { EntryUnits, PositioningRuns, RadialEntry, TestEntry } from "../../form";
import { formatDeviation } from "../../format";
import { defaultMapping, importRadial, importRuns, IMPORT_LIMITS, previewCells, type ColumnMapping } from "../../positioning-import";
import { PositioningPlot } from "../positioning-plot";

export type ImportedReadings = { runs: PositioningRuns } | { radial: RadialEntry };

export interface PositioningImportProps {
  /** An axis's positioning runs, or a circular test's radial deviations. */
  kind: "positioning" | "circular";
  /** The inspector's saved mapping, if any. */
  mapping: ColumnMapping | null;
  /** The codes of the tests that take the same readings (an axis's A, R and B; a circular test alone). */
  axisTests: string[];
  onAccept: (readings: ImportedReadings, mapping: ColumnMapping) => void;
}

const COLUMN_ROLES = {
  positioning: [
    ["run", "Run"],
    ["direction", "Direction (+ or −)"],
    ["target", "Target position"],
    ["deviation", "Deviation"],
  ],
  circular: [
    ["direction", "Direction (cw or ccw)"],
    ["target", "Angle (degrees)"],
    ["deviation", "Deviation"],
  ],
} as const;

function RunsSummary({ runs, units }: { runs: PositioningRuns; units: EntryUnits }) {
  const unit = units === "inch" ? "in" : "mm";
  return (
    <p className="text-sm text-ink-700" data-testid="positioning-runs">
      {runs.targets.length} targets from {runs.targets[0]} to {runs.targets.at(-1)} {unit} · {runs.forward.length} runs approaching in +, {runs.reverse.length} in −
    </p>
  );
}

export function PositioningFields({ entry, units, importer }: { entry: TestEntry; units: EntryUnits; importer?: PositioningImportProps }) {
  const [open, setOpen] = useState(false);
  const imported = entry.kind === "circular" ? entry.radial : entry.runs;
  return (
    <div className="space-y-3">
      {entry.kind === "circular" ? (
        entry.radial ? (
          <p className="text-sm text-ink-700" data-testid="circular-readings">
            {entry.radial.clockwise.length} readings clockwise, {entry.radial.counterClockwise.length} counter-clockwise
          </p>
        ) : (
          <p className="text-sm text-ink-600">No readings yet. Import the instrument's table of radial deviations, both directions round the circle.</p>
        )
      ) : entry.runs ? (
        <RunsSummary runs={entry.runs} units={units} />
      ) : (
        <p className="text-sm text-ink-600">No runs yet. Import the instrument's table of deviations for this axis.</p>
      )}
      {importer ? (
        open ? (
          <ImportPanel units={units} importer={importer} onDone={() => setOpen(false)} />
        ) : (
          <Button variant="secondary" size="sm" onClick={() => setOpen(true)}>
            {imported ? "Import another table" : "Import the instrument's table"}
          </Button>
        )
      ) : null}
    </div>
  );
}

function ImportPanel({ units, importer, onDone }: { units: EntryUnits; importer: PositioningImportProps; onDone: () => void }) {
  const [text, setText] = useState("");
  const [fileNote, setFileNote] = useState<string | null>(null);
  const [mapping, setMapping] = useState<ColumnMapping>(importer.mapping ?? defaultMapping(units));
  const circular = importer.kind === "circular";
  const cells = useMemo(() => previewCells(text, mapping.decimalComma), [text, mapping.decimalComma]);
  const result = useMemo(() => (text.trim() ? (circular ? importRadial(text, mapping, units) : importRuns(text, mapping, units)) : null), [text, mapping, units, circular]);
  const columnCount = Math.max(4, ...cells.map((row) => row.length));
  const set = <K extends keyof ColumnMapping>(key: K, value: ColumnMapping[K]) => setMapping((current) => ({ ...current, [key]: value }));

  const chooseFile = async (file: File | undefined) => {
    if (!file) return;
    // Checked before reading: a multi-megabyte file is not a table of one axis and would stall a tablet.
    if (file.size > IMPORT_LIMITS.characters * 4) {
      setFileNote(`${file.name} is larger than ${Math.round(IMPORT_LIMITS.characters / 1000)} kB of text; export one axis at a time.`);
      return;
    }
    const content = await file.text();
    if (content.length > IMPORT_LIMITS.characters) {
      setFileNote(`${file.name} is longer than ${IMPORT_LIMITS.characters.toLocaleString("en-GB")} characters; export one axis at a time.`);
      return;
    }
    setFileNote(`Read ${file.name}.`);
    setText(content);
  };

  return (
    <div className="min-w-0 space-y-4 rounded-control border border-ink-200 bg-ink-50 p-3 sm:p-4" data-testid="positioning-import">
      <div className="grid gap-3 lg:grid-cols-2">
        <label className="block text-sm font-semibold text-ink-800">
          Paste the table (one reading per line)
          <textarea
            className="mt-1 block min-h-32 w-full rounded-control border border-ink-300 bg-white px-3 py-2 font-mono text-sm"
            value={text}
            maxLength={IMPORT_LIMITS.characters}
            spellCheck={false}
            placeholder={circular ? "direction,angle,deviation\ncw,0,1.2\ncw,5,0.8" : "run,direction,target,deviation\n1,+,0,0.0\n1,+,100,-1.8"}
            onChange={(event) => setText(event.target.value)}
          />
        </label>
        <div className="space-y-2">
          <label className="block text-sm font-semibold text-ink-800">
            Or choose the exported file
            <input type="file" accept=".csv,.txt,.tsv,text/csv,text/plain,text/tab-separated-values" className="mt-1 block w-full text-sm text-ink-700 file:mr-3 file:rounded-control file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-semibold" onChange={(event) => void chooseFile(event.target.files?.[0])} />
          </label>
          {fileNote ? (
            <p className="text-sm text-ink-600" role="status">
              {fileNote}
            </p>
          ) : null}
          <p className="text-xs text-ink-500">
            {circular
              ? "Any instrument's export works once its columns are named below: one line per reading, with the direction round the circle (cw or ccw), the angle in degrees and the radial deviation."
              : "Any instrument's export works once its columns are named below: one line per reading, with the run, the direction of approach (+ or −), the target position and the deviation from it."}{" "}
            Up to {Math.round(IMPORT_LIMITS.characters / 1000)} kB.
          </p>
        </div>
      </div>

      {cells.length ? (
        <div className="overflow-x-auto rounded-control border border-ink-200 bg-white">
          <table className="min-w-full text-xs tabular" data-testid="import-first-lines">
            <caption className="px-2 py-1 text-left text-xs font-semibold text-ink-600">The first lines as the mapping cuts them</caption>
            <thead className="bg-ink-50 text-left text-ink-600">
              <tr>
                {Array.from({ length: columnCount }, (_, i) => (
                  <th key={i} scope="col" className="px-2 py-1 font-bold">
                    Column {i + 1}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {cells.map((row, i) => (
                <tr key={i} className="border-t border-ink-100">
                  {Array.from({ length: columnCount }, (_, j) => (
                    <td key={j} className="px-2 py-1 font-mono whitespace-nowrap text-ink-800">
                      {row[j] ?? ""}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}

      <fieldset className="space-y-3">
        <legend className="text-sm font-bold text-ink-800">Which column holds what</legend>
        <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          {COLUMN_ROLES[importer.kind].map(([role, label]) => (
            <SelectField
              key={role}
              label={label}
              value={String(mapping[role])}
              options={Array.from({ length: Math.max(columnCount, mapping[role] + 1) }, (_, i) => ({ value: String(i), label: `Column ${i + 1}` }))}
              onChange={(event) => set(role, Number(event.target.value))}
            />
          ))}
        </div>
        <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          {circular ? null : (
          <SelectField
            label="Targets in"
            value={mapping.targetUnit}
            options={[
              { value: "mm", label: "millimetres" },
              { value: "in", label: "inches" },
            ]}
            onChange={(event) => set("targetUnit", event.target.value as ColumnMapping["targetUnit"])}
          />
          )}
          <SelectField
            label="Deviations in"
            value={mapping.deviationUnit}
            options={[
              { value: "um", label: "micrometres (µm)" },
              { value: "mm", label: "millimetres" },
              { value: "in", label: "inches" },
            ]}
            onChange={(event) => set("deviationUnit", event.target.value as ColumnMapping["deviationUnit"])}
          />
          <CheckboxField label="Decimal comma" hint="Columns then split at ; or tabs." checked={mapping.decimalComma} onChange={(event) => set("decimalComma", event.target.checked)} />
          <CheckboxField label="First line is a header" checked={mapping.header} onChange={(event) => set("header", event.target.checked)} />
        </div>
      </fieldset>

      {result === null ? null : result.ok && "radial" in result ? (
        <div className="space-y-3 rounded-control border border-ink-200 bg-white p-3" data-testid="import-preview">
          <p className="text-sm font-semibold text-ink-900">
            Preview: {result.radial.clockwise.length} readings clockwise, {result.radial.counterClockwise.length} counter-clockwise
          </p>
          <p className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-ink-700" data-testid="circular-figures">
            <span>
              Circular deviation <span className="font-semibold tabular">{formatDeviation(result.evaluation.circularDeviation, units)}</span>
            </span>
            <span>
              clockwise <span className="font-semibold tabular">{formatDeviation(result.evaluation.circularDeviationClockwise, units)}</span>
            </span>
            <span>
              counter-clockwise <span className="font-semibold tabular">{formatDeviation(result.evaluation.circularDeviationCounterClockwise, units)}</span>
            </span>
            <span>
              hysteresis <span className="font-semibold tabular">{formatDeviation(result.evaluation.circularHysteresis, units)}</span>
            </span>
          </p>
          <div className="flex flex-wrap items-center gap-2">
            <Button
              size="sm"
              onClick={() => {
                importer.onAccept({ radial: result.radial }, mapping);
                onDone();
              }}
            >
              Accept these readings
            </Button>
            <Button size="sm" variant="quiet" onClick={onDone}>
              Cancel
            </Button>
          </div>
        </div>
      ) : result.ok && "runs" in result ? (
        <div className="space-y-3 rounded-control border border-ink-200 bg-white p-3" data-testid="import-preview">
          <p className="text-sm font-semibold text-ink-900">
            Preview: {result.summary.targets} targets over {units === "inch" ? `${((result.summary.to - result.summary.from) / 25.4).toFixed(2)} in` : `${Number((result.summary.to - result.summary.from).toFixed(3))} mm`} · {result.summary.forwardRuns} runs approaching in +, {result.summary.reverseRuns} in −
          </p>
          <PositioningPlot figures={{ ...result.evaluation, runsForward: result.summary.forwardRuns, runsReverse: result.summary.reverseRuns }} units={units} title="Imported runs" />
          {result.evaluation.warnings.map((warning) => (
            <p key={warning} className="text-xs text-caution">
              {warning}
            </p>
          ))}
          <div className="flex flex-wrap items-center gap-2">
            <Button
              size="sm"
              onClick={() => {
                importer.onAccept({ runs: result.runs }, mapping);
                onDone();
              }}
            >
              Accept these runs
            </Button>
            <Button size="sm" variant="quiet" onClick={onDone}>
              Cancel
            </Button>
            <span className="text-xs text-ink-500">
              Used for {importer.axisTests.join(", ")}; A is {formatDeviation(result.evaluation.accuracy, units)}. The column mapping is kept for your next import.
            </span>
          </div>
        </div>
      ) : !result.ok ? (
        <div className="space-y-2">
          <p className="rounded-control bg-beyond-soft px-3 py-2 text-sm font-medium text-beyond" role="alert" data-testid="import-refusal">
            {result.message}
          </p>
          <Button size="sm" variant="quiet" onClick={onDone}>
            Cancel
          </Button>
        </div>
      ) : null}
      {result === null ? (
        <Button size="sm" variant="quiet" onClick={onDone}>
          Cancel
        </Button>
      ) : null}
    </div>
  );
}
