// What every planner card shares: typed fields in the reader's units, the engine's refusal shown at its field,
// and a result block with the sketch and the formula.
import { useId, useState, type ReactNode } from "react";
import { GeometryInputError } from "~/geometry";
import { TextField } from "~/components/ui";
import { parseTyped } from "./units";

export type FieldSpec = { name: string; label: string; hint?: string; initial: string };

export type Outcome<R> = { result: R } | { errors: Record<string, string[]> } | { missing: true };

/** Parses every field; null for a blank, NaN for text that is no number (the engine refuses it at its field). */
export function useFields(specs: readonly FieldSpec[]) {
  const [values, setValues] = useState<Record<string, string>>(() => Object.fromEntries(specs.map((spec) => [spec.name, spec.initial])));
  const numbers = Object.fromEntries(specs.map((spec) => [spec.name, parseTyped(values[spec.name] ?? "")])) as Record<string, number | null>;
  const set = (name: string, value: string) => setValues((current) => ({ ...current, [name]: value.slice(0, 40) }));
  return { values, numbers, set };
}

/** Runs the engine; its refusal becomes a message at the field its path names. */
export function attempt<R>(numbers: Record<string, number | null>, fieldOfPath: (path: readonly (string | number)[]) => string, run: () => R): Outcome<R> {
  if (Object.values(numbers).some((value) => value === null)) return { missing: true };
  try {
    return { result: run() };
  } catch (error) {
    if (error instanceof GeometryInputError) return { errors: { [fieldOfPath(error.path)]: [error.message] } };
    throw error;
  }
}

export function Fields({ specs, values, set, errors }: { specs: readonly FieldSpec[]; values: Record<string, string>; set: (name: string, value: string) => void; errors: Record<string, string[]> }) {
  return (
    <div className="grid gap-4 sm:grid-cols-2">
      {specs.map((spec) => (
        <TextField
          key={spec.name}
          name={spec.name}
          label={spec.label}
          hint={spec.hint}
          inputMode="decimal"
          autoComplete="off"
          maxLength={40}
          className="[&_input]:py-3 [&_input]:text-lg"
          value={values[spec.name] ?? ""}
          onChange={(event) => set(spec.name, event.currentTarget.value)}
          errors={errors[spec.name]}
        />
      ))}
    </div>
  );
}

export function PlannerCard({ id, title, intro, children }: { id: string; title: string; intro: ReactNode; children: ReactNode }) {
  const headingId = useId();
  return (
    <section id={id} aria-labelledby={headingId} className="scroll-mt-24 rounded-panel border border-ink-200 bg-white shadow-panel">
      <div className="border-b border-ink-100 px-5 py-4">
        <h2 id={headingId} className="text-xl font-bold text-ink-900">
          {title}
        </h2>
        <div className="mt-1 text-sm text-ink-600">{intro}</div>
      </div>
      <div className="space-y-5 px-5 py-5">{children}</div>
    </section>
  );
}

export function ResultBlock({ outcome, answer, formula, sketch }: { outcome: Outcome<unknown>; answer: ReactNode; formula: ReactNode; sketch: ReactNode }) {
  if ("missing" in outcome) return <p className="text-sm text-ink-500">Fill in every field to see the correction.</p>;
  if ("errors" in outcome) return <p className="text-sm text-ink-500">Correct the marked field to see the correction.</p>;
  return (
    <div className="grid items-start gap-4 md:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]" data-testid="planner-result">
      <div className="space-y-3">
        <div role="status" className="rounded-control bg-brass-100 px-4 py-3 text-lg font-semibold text-ink-900">
          {answer}
        </div>
        <div className="rounded-control border border-ink-200 px-4 py-3 font-mono text-sm text-ink-800">{formula}</div>
      </div>
      <div className="rounded-control border border-ink-100 bg-paper p-2">{sketch}</div>
    </div>
  );
}

export function Caution({ children }: { children: ReactNode }) {
  return (
    <div role="note" className="rounded-control border-l-4 border-beyond bg-white px-4 py-3 text-sm text-ink-800">
      <p className="font-semibold text-ink-900">Safety</p>
      <p className="mt-1">{children}</p>
    </div>
  );
}
