import type { ReactNode } from "react";
import { Button } from "~/components/ui/button";
import { cx } from "~/components/ui/cx";
import { lengthUnitLabel, type DisplayUnits } from "~/modules/units/lengths";
import { deviationUnitLabel } from "../figures";
import type { FilterChoices } from "../choices";
import type { MachineSearch } from "../service.server";
import { inputName, type DraftKey, type SearchDraft } from "./search-form";

// Text fields and menus: `ui-control` in app/app.css.
const control = "ui-control";

function invalid(errors: Record<string, string[]> | null, ...keys: string[]) {
  return keys.flatMap((key) => errors?.[key] ?? []);
}

function Group({ title, children }: { title: string; children: ReactNode }) {
  return (
    <fieldset className="border-t border-ink-200 pt-4">
      <legend className="search-group-title">{title}</legend>
      <div className="clear-both space-y-2">{children}</div>
    </fieldset>
  );
}

function FieldErrors({ messages }: { messages: string[] }) {
  return messages.length ? (
    <p className="text-sm font-medium text-beyond" role="alert">
      {messages.join(" ")}
    </p>
  ) : null;
}

type PanelProps = {
  draft: SearchDraft;
  units: DisplayUnits;
  facets: MachineSearch["facets"] | null;
  choices: FilterChoices;
  errors: Record<string, string[]> | null;
  /** A field changed; `commit` when the change should search at once (boxes, menus). */
  onChange: (key: DraftKey, value: SearchDraft[DraftKey], commit: boolean) => void;
  onCommit: () => void;
  onClear: () => void;
};

/** Facets, ranges and accuracy limits. A plain GET form underneath, so it also works before JavaScript loads. */
export function FilterPanel({ draft, units, facets, choices, errors, onChange, onCommit, onClear }: PanelProps) {
  const length = lengthUnitLabel(units);
  const deviation = deviationUnitLabel(units);
  const toggle = (key: "category" | "grade", value: string, checked: boolean) =>
    onChange(key, checked ? [...draft[key], value] : draft[key].filter((item) => item !== value), true);
  const numberInput = (key: DraftKey, label: string, placeholder: string, step: string) => {
    const wrong = invalid(errors, key, `${key}In`).length > 0;
    return (
      <input
        name={inputName(key, units)}
        type="number"
        inputMode="decimal"
        min="0"
        step={step}
        placeholder={placeholder}
        aria-label={label}
        aria-invalid={wrong || undefined}
        className={cx(control, "min-w-0 flex-1 tabular", wrong ? "border-beyond" : "border-ink-300")}
        value={draft[key] as string}
        onChange={(event) => onChange(key, event.target.value, false)}
        onBlur={onCommit}
      />
    );
  };
  return (
    <div className="space-y-4">
      <Group title="Verification">
        <label className="search-check rounded-control bg-within-soft/60 px-3 py-2">
          <span className="flex items-center gap-2 text-sm font-semibold text-ink-900">
            <input type="checkbox" name="verified" value="1" className="search-box" checked={draft.verified} onChange={(event) => onChange("verified", event.target.checked, true)} />
            Verified only
          </span>
          {facets ? <span className="search-figure">{facets.verified}</span> : null}
        </label>
        <p className="text-xs text-ink-500">A signed inspection report that graded the machine.</p>
      </Group>

      <Group title="Kind of machine">
        {choices.categories.map((category) => {
          const counted = facets?.category[category.value] ?? 0;
          return (
            <label key={category.value} className={cx("search-check", counted === 0 && !draft.category.includes(category.value) && "text-ink-400")}>
              <span className="flex items-center gap-2">
                <input
                  type="checkbox"
                  name="category"
                  value={category.value}
                  className="search-box"
                  checked={draft.category.includes(category.value)}
                  onChange={(event) => toggle("category", category.value, event.target.checked)}
                />
                {category.label}
              </span>
              {facets ? <span className="search-count">{counted}</span> : null}
            </label>
          );
        })}
      </Group>

      <Group title="Accuracy grade">
        <div className="grid grid-cols-4 gap-2">
          {choices.grades.map((grade) => (
            <label
              key={grade.value}
              className="search-grade"
            >
              <input
                type="checkbox"
                name="grade"
                value={grade.value}
                className="sr-only"
                checked={draft.grade.includes(grade.value)}
                onChange={(event) => toggle("grade", grade.value, event.target.checked)}
              />
              <span aria-hidden="true">{grade.label}</span>
              <span className="sr-only">Grade {grade.label}</span>
              {facets ? <span className="text-[11px] font-medium opacity-75 tabular">{facets.grade[grade.value] ?? 0}</span> : null}
            </label>
          ))}
        </div>
      </Group>

      <Group title={`Accuracy, at most (${deviation})`}>
        {choices.accuracy.map((filter) => (
          <div key={filter.param}>
            <div className="flex items-baseline justify-between gap-2">
              <span className="search-field-label" id={`${filter.param}-label`}>
                {filter.label}
              </span>
              <span className="text-xs text-ink-500">{deviation}</span>
            </div>
            {numberInput(filter.param, `${filter.label} at most (${deviation})`, units === "inch" ? "e.g. 0.0002" : "e.g. 5", units === "inch" ? "0.00001" : "0.1")}
            <FieldErrors messages={invalid(errors, filter.param, `${filter.param}In`)} />
          </div>
        ))}
        <label className="block">
          <span className="search-field-label">Report measured</span>
          <select
            name="reportAgeMax"
            className={cx(control, "border-ink-300")}
            value={draft.reportAgeMax}
            onChange={(event) => onChange("reportAgeMax", event.target.value, true)}
          >
            {choices.reportAges.map((age) => (
              <option key={age.value} value={age.value}>
                {age.label}
              </option>
            ))}
          </select>
        </label>
      </Group>

      <Group title="Size">
        <p className="search-field-label">Swing over bed ({length})</p>
        <div className="flex items-center gap-2">
          {numberInput("swingMin", `Smallest swing over bed (${length})`, "from", "any")}
          <span className="text-ink-400">–</span>
          {numberInput("swingMax", `Largest swing over bed (${length})`, "to", "any")}
        </div>
        <FieldErrors messages={invalid(errors, "swingMin", "swingMax", "swingMinIn", "swingMaxIn")} />
        <p className="search-field-label pt-1">Between centres ({length})</p>
        <div className="flex items-center gap-2">
          {numberInput("centresMin", `Shortest distance between centres (${length})`, "from", "any")}
          <span className="text-ink-400">–</span>
          {numberInput("centresMax", `Longest distance between centres (${length})`, "to", "any")}
        </div>
        <FieldErrors messages={invalid(errors, "centresMin", "centresMax", "centresMinIn", "centresMaxIn")} />
      </Group>

      <Group title="Price">
        <div className="flex items-center gap-2">
          {numberInput("priceMin", "Lowest price", "from", "any")}
          <span className="text-ink-400">–</span>
          {numberInput("priceMax", "Highest price", "to", "any")}
        </div>
        <label className="search-inline-label">
          Currency
          <select
            name="currency"
            className={cx(control, "w-auto border-ink-300 py-1.5")}
            value={draft.currency}
            onChange={(event) => onChange("currency", event.target.value, Boolean(draft.priceMin || draft.priceMax))}
          >
            {choices.currencies.map((currency) => (
              <option key={currency} value={currency}>
                {currency}
              </option>
            ))}
          </select>
        </label>
        <p className="text-xs text-ink-500">Listings in other currencies are left out, not converted.</p>
        <FieldErrors messages={invalid(errors, "priceMin", "priceMax", "currency")} />
      </Group>

      <Group title="Electrical supply">
        <label className="block">
          <span className="sr-only">Runs on</span>
          <select name="supply" className={cx(control, "border-ink-300")} value={draft.supply} onChange={(event) => onChange("supply", event.target.value, true)}>
            <option value="">Any supply</option>
            {choices.supplies.map((supply) => (
              <option key={supply.value} value={supply.value}>
                {supply.label}
              </option>
            ))}
          </select>
        </label>
        <FieldErrors messages={invalid(errors, "supply")} />
      </Group>

      <Group title="Location">
        <label className="block">
          <span className="sr-only">Country</span>
          <select name="country" className={cx(control, "border-ink-300")} value={draft.country} onChange={(event) => onChange("country", event.target.value, true)}>
            <option value="">Any country</option>
            {choices.countries.map((country) => (
              <option key={country.value} value={country.value}>
                {country.label}
                {facets?.country[country.value] ? ` (${facets.country[country.value]})` : ""}
              </option>
            ))}
          </select>
        </label>
      </Group>

      <div className="flex gap-2 border-t border-ink-200 pt-4">
        <Button type="submit" className="flex-1">
          Show machines
        </Button>
        <Button type="button" variant="quiet" onClick={onClear}>
          Clear all
        </Button>
      </div>
    </div>
  );
}
