import type { ReactNode } from "react";
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE } from "../safety";

/** The cautions for geometry tests, shown before the readings and on every report. */
export function SafetyCautions({ children, heading = "Before you start: safety" }: { children?: ReactNode; heading?: string }) {
  return (
    <section aria-labelledby="safety-heading" className="rounded-panel border border-caution/40 bg-caution-soft p-4 text-sm text-ink-800 sm:p-5" data-testid="safety-cautions">
      <h2 id="safety-heading" className="text-base font-bold text-caution">
        {heading}
      </h2>
      <ul className="mt-2 list-disc space-y-1.5 pl-5">
        {SAFETY_CAUTIONS.map((caution) => (
          <li key={caution}>{caution}</li>
        ))}
      </ul>
      <p className="mt-2 font-semibold text-ink-800">{SAFETY_DEFERENCE}</p>
      {children}
    </section>
  );
}
