// Entry of heights over a surface: a grid of indicator heights, or level tilts along the grid's rows and columns
// or along the diagonal layout's eight lines; paste from a spreadsheet; the closure of level readings shown as
// they go in. The engine turns them into heights (grid-entry.ts); the live verdict and colour map follow.
import { useState } from "react";
import { Button, cx, SelectField } from "~/components/ui";
import { UNION_JACK_LINES } from "~/geometry";
import type { EntryUnits, TestEntry, TestEntryCheck } from "../../form";
import { GRID_MAX_LINES, parseHeightTable, parseTiltLines, tiltTexts, UNION_JACK_LINE_LABELS, type GridEntry, type GridLayout } from "../../grid-entry";
import { formatDeviation } from "../../format";
import { ReadingInput } from "./test-card";

type Errors = Record<string, string[]>;
type Change = (mutate: (entry: TestEntry) => void) => void;

const LAYOUTS: { value: GridLayout; label: string }[] = [
  { value: "heights", label: "Heights at grid points" },
  { value: "rows-columns", label: "Level along rows and columns" },
  { value: "union-jack", label: "Level along diagonals, edges and centre lines" },
];

const clampLines = (value: number) => Math.min(GRID_MAX_LINES, Math.max(2, Math.round(Number.isFinite(value) ? value : 2)));

function LineCount({ label, value, onChange }: { label: string; value: number; onChange: (value: number) => void }) {
  return (
    <label className="block text-sm font-semibold text-ink-800">
      {label}
      <input
        type="number"
        min={2}
        max={GRID_MAX_LINES}
        step={1}
        value={value}
        onChange={(event) => onChange(clampLines(event.target.valueAsNumber))}
        className="mt-1 block w-24 rounded-control border border-ink-300 bg-white px-3 py-2 text-base tabular"
      />
    </label>
  );
}

function PasteBox({ label, hint, placeholder, onUse }: { label: string; hint: string; placeholder: string; onUse: (text: string) => void }) {
  const [text, setText] = useState<string | null>(null);
  if (text === null) {
    return (
      <Button variant="quiet" size="sm" onClick={() => setText("")}>
        {label}
      </Button>
    );
  }
  const use = (value: string) => {
    onUse(value);
    setText(null);
  };
  return (
    <div className="w-full space-y-2 rounded-control border border-ink-200 bg-ink-50 p-3">
      <label className="block text-sm font-semibold text-ink-800">
        {label}
        <textarea
          className="mt-1 block min-h-28 w-full rounded-control border border-ink-300 bg-white px-3 py-2 font-mono text-sm"
          value={text}
          placeholder={placeholder}
          onChange={(event) => setText(event.target.value)}
          onPaste={(event) => {
            const pasted = event.clipboardData.getData("text");
            if (pasted) {
              event.preventDefault();
              use(pasted);
            }
          }}
        />
      </label>
      <div className="flex gap-2">
        <Button size="sm" onClick={() => use(text)}>
          Use these rows
        </Button>
        <Button size="sm" variant="quiet" onClick={() => setText(null)}>
          Cancel
        </Button>
      </div>
      <p className="text-xs text-ink-500">{hint}</p>
    </div>
  );
}

function HeightGrid({ grid, change, errors, readingUnit }: { grid: GridEntry; change: Change; errors: Errors; readingUnit: string }) {
  const [note, setNote] = useState<string | null>(null);
  const setCell = (r: number, c: number, value: string) =>
    change((draft) => {
      const heights = draft.grid.heights;
      while (heights.length <= r) heights.push([]);
      const row = heights[r]!;
      while (row.length <= c) row.push("");
      row[c] = value;
    });
  const flip = (r: number, c: number) => {
    const value = (grid.heights[r]?.[c] ?? "").trim();
    setCell(r, c, !value ? "-" : value.startsWith("-") || value.startsWith("\u2212") ? value.slice(1) : `-${value}`);
  };
  return (
    <div className="space-y-2">
      <div className="max-h-[28rem] overflow-auto rounded-control border border-ink-200" data-testid="height-grid">
        <table className="text-sm">
          <caption className="sr-only">Heights ({readingUnit}); row 1 along the front edge, column 1 at the left</caption>
          <thead className="sticky top-0 bg-ink-50 text-xs font-bold text-ink-600">
            <tr>
              <th className="px-2 py-1.5 text-left">Row</th>
              {Array.from({ length: grid.columns }, (_, c) => (
                <th key={c} scope="col" className="px-1 py-1.5">
                  {c + 1}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {Array.from({ length: grid.rows }, (_, r) => (
              <tr key={r} className="border-t border-ink-100">
                <th scope="row" className="px-2 py-1 text-left text-xs font-bold text-ink-600">
                  {r + 1}
                </th>
                {Array.from({ length: grid.columns }, (_, c) => {
                  const invalid = Boolean(errors[`grid.heights.${r}.${c}`]);
                  return (
                    <td key={c} className="px-0.5 py-0.5">
                      <input
                        inputMode="decimal"
                        autoComplete="off"
                        aria-label={`Height, row ${r + 1}, column ${c + 1}`}
                        aria-invalid={invalid || undefined}
                        title={errors[`grid.heights.${r}.${c}`]?.join(" ")}
                        value={grid.heights[r]?.[c] ?? ""}
                        onChange={(event) => setCell(r, c, event.target.value)}
                        onKeyDown={(event) => {
                          // A sign key for tablet number pads without a minus: "±" or F2 flips the cell's sign.
                          if (event.key === "±" || event.key === "F2") {
                            event.preventDefault();
                            flip(r, c);
                          }
                        }}
                        className={cx("w-16 rounded border bg-white px-1.5 py-1.5 text-right text-sm tabular focus:outline-none focus:ring-2 focus:ring-brass-400", invalid ? "border-beyond" : "border-ink-300")}
                      />
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <PasteBox
        label="Paste the grid from a spreadsheet or CSV"
        hint="One row of heights per line, front row first; tabs or semicolons between cells allow a decimal comma. A header line and a first column of row labels are skipped. The grid takes the pasted size."
        placeholder={"0\t2\t3\n-1\t0\t4\n1\t2\t1"}
        onUse={(text) => {
          const { heights, skipped, tooLarge } = parseHeightTable(text);
          if (!heights.length) return setNote("No rows of numbers found.");
          const columns = Math.max(...heights.map((row) => row.length));
          if (heights.length < 2 || columns < 2) return setNote("A grid needs at least 2 rows and 2 columns.");
          change((draft) => {
            draft.grid.rows = heights.length;
            draft.grid.columns = columns;
            draft.grid.heights = heights;
          });
          setNote(
            `${heights.length} × ${columns} heights pasted${skipped ? `, ${skipped} line${skipped === 1 ? "" : "s"} skipped` : ""}${tooLarge ? `; cut to ${GRID_MAX_LINES} × ${GRID_MAX_LINES}` : ""}.`,
          );
        }}
      />
      {note ? (
        <p className="text-sm text-ink-600" role="status">
          {note}
        </p>
      ) : null}
    </div>
  );
}

function TiltLine({ label, hint, value, errors, onChange }: { label: string; hint: string; value: string; errors?: string[]; onChange: (value: string) => void }) {
  const invalid = Boolean(errors?.length);
  const count = tiltTexts(value).length;
  return (
    <label className="block text-sm">
      <span className="flex flex-wrap justify-between gap-2 font-semibold text-ink-800">
        {label}
        <span className="font-normal text-ink-500">
          {count} of {hint}
        </span>
      </span>
      <input
        autoComplete="off"
        value={value}
        aria-invalid={invalid || undefined}
        onChange={(event) => onChange(event.target.value)}
        placeholder="e.g. 12 -4 3,5"
        className={cx("mt-1 block w-full rounded-control border bg-white px-3 py-2 font-mono text-sm", invalid ? "border-beyond" : "border-ink-300")}
      />
      {invalid ? (
        <span className="mt-0.5 block text-sm font-medium text-beyond" role="alert">
          {errors!.join(" ")}
        </span>
      ) : null}
    </label>
  );
}

function Closure({ check, units }: { check: TestEntryCheck; units: EntryUnits }) {
  if (!check.closure) return null;
  const worst = check.closure.lines.reduce((a, b) => (Math.abs(b.closureUm) > Math.abs(a.closureUm) ? b : a));
  return (
    <p className="rounded-control bg-ink-50 px-3 py-2 text-sm text-ink-700" data-testid="closure-error">
      <span className="font-semibold">Closure error {formatDeviation(check.closure.errorUm, units)}</span> (largest at {worst.line}): how far lines that meet disagree. Much
      more than the level's resolution over a step suggests a misread line; read it again.
    </p>
  );
}

export function GridFields({ entry, change, units, errors, check }: { entry: TestEntry; change: Change; units: EntryUnits; errors: Errors; check: TestEntryCheck }) {
  const grid = entry.grid;
  const station = units === "inch" ? "in" : "mm";
  const reading = units === "inch" ? "in" : "µm";
  const spacing = (field: "stepX" | "stepY" | "length" | "width", label: string) => (
    <ReadingInput
      label={label}
      unit={station}
      signed={false}
      value={grid[field]}
      errors={errors[`grid.${field}`]}
      onChange={(value) =>
        change((draft) => {
          draft.grid[field] = value;
        })
      }
    />
  );
  return (
    <div className="space-y-3" data-testid="grid-entry">
      <div className="flex flex-wrap gap-2" role="radiogroup" aria-label="How the surface was read">
        {LAYOUTS.map((layout) => (
          <button
            key={layout.value}
            type="button"
            role="radio"
            aria-checked={grid.layout === layout.value}
            onClick={() =>
              change((draft) => {
                draft.grid.layout = layout.value;
              })
            }
            className={cx("rounded-full px-3 py-1.5 text-sm font-semibold ring-1 ring-inset", grid.layout === layout.value ? "bg-ink-900 text-white ring-ink-900" : "bg-white text-ink-700 ring-ink-300 hover:bg-ink-50")}
          >
            {layout.label}
          </button>
        ))}
      </div>
      <p className="text-xs text-ink-500">
        x runs along the table from the left (column 1), y away from you from the front edge (row 1).
        {grid.layout === "heights" ? " Heights are indicator readings, higher is positive." : " Tilts in µm/m, positive when the level's leading end stands higher."}
      </p>
      {grid.layout !== "union-jack" ? (
        <div className="flex flex-wrap items-end gap-3">
          <LineCount
            label="Rows"
            value={grid.rows}
            onChange={(value) =>
              change((draft) => {
                draft.grid.rows = value;
              })
            }
          />
          <LineCount
            label="Columns"
            value={grid.columns}
            onChange={(value) =>
              change((draft) => {
                draft.grid.columns = value;
              })
            }
          />
          <div className="w-44">{spacing("stepX", grid.layout === "heights" ? "Spacing of columns" : "Step along a row")}</div>
          <div className="w-44">{spacing("stepY", grid.layout === "heights" ? "Spacing of rows" : "Step along a column")}</div>
        </div>
      ) : (
        <div className="flex flex-wrap items-end gap-3">
          <div className="w-44">{spacing("length", "Length A → B")}</div>
          <div className="w-44">{spacing("width", "Width A → D")}</div>
        </div>
      )}
      {grid.layout === "heights" ? <HeightGrid grid={grid} change={change} errors={errors} readingUnit={reading} /> : null}
      {grid.layout === "rows-columns" ? (
        <div className="grid gap-4 lg:grid-cols-2">
          {(["rowTilts", "columnTilts"] as const).map((field) => {
            const isRow = field === "rowTilts";
            const lines = isRow ? grid.rows : grid.columns;
            const steps = isRow ? grid.columns - 1 : grid.rows - 1;
            return (
              <fieldset key={field} className="space-y-2 rounded-control border border-ink-200 p-3">
                <legend className="px-1 text-sm font-bold text-ink-800">{isRow ? "Along each row (towards +x)" : "Along each column (towards +y)"}</legend>
                {Array.from({ length: lines }, (_, i) => (
                  <TiltLine
                    key={i}
                    label={`${isRow ? "Row" : "Column"} ${i + 1}`}
                    hint={`${steps} tilts`}
                    value={grid[field][i] ?? ""}
                    errors={errors[`grid.${field}.${i}`]}
                    onChange={(value) =>
                      change((draft) => {
                        while (draft.grid[field].length <= i) draft.grid[field].push("");
                        draft.grid[field][i] = value;
                      })
                    }
                  />
                ))}
                <PasteBox
                  label={`Paste the ${isRow ? "rows" : "columns"}`}
                  hint={`One ${isRow ? "row" : "column"} of tilts per line, in order.`}
                  placeholder={"12\t-4\t3\n8\t0\t-2"}
                  onUse={(text) =>
                    change((draft) => {
                      draft.grid[field] = parseTiltLines(text);
                    })
                  }
                />
              </fieldset>
            );
          })}
        </div>
      ) : null}
      {grid.layout === "union-jack" ? (
        <div className="grid gap-3 sm:grid-cols-2">
          {UNION_JACK_LINES.map((line) => (
            <TiltLine
              key={line}
              label={UNION_JACK_LINE_LABELS[line]}
              hint="an even number of steps"
              value={grid.lines[line]}
              errors={errors[`grid.lines.${line}`]}
              onChange={(value) =>
                change((draft) => {
                  draft.grid.lines[line] = value;
                })
              }
            />
          ))}
          <p className="text-xs text-ink-500 sm:col-span-2">Corners: A front left, B front right, C back right, D back left. Each line in equal steps; the diagonals fix the reference, the other lines close on them.</p>
        </div>
      ) : null}
      <Closure check={check} units={units} />
      {errors.grid ? <p className="text-sm font-medium text-beyond">{errors.grid.join(" ")}</p> : null}
      <SelectField
        label="Reference plane"
        className="sm:w-72"
        value={grid.reference}
        options={[
          { value: "", label: "Minimum zone (the profile's choice)" },
          { value: "minimum-zone", label: "Minimum zone" },
          { value: "least-squares", label: "Least squares" },
        ]}
        onChange={(event) =>
          change((draft) => {
            draft.grid.reference = event.target.value as GridEntry["reference"];
          })
        }
      />
    </div>
  );
}
