import { useState } from "react";
import { requireRole } from "~/modules/accounts/guards.server";
import type { DisplayUnits } from "~/modules/units/format";
import { BearingCard, ScrapingCard, SetOverCard, TiltCard } from "~/components/corrections/planner-cards";
import type { Route } from "./+types/corrections";

export const meta: Route.MetaFunction = () => [{ title: "Correction planner — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, ["seller", "inspector", "admin"]);
  return { units: user.displayUnits as DisplayUnits };
}

const sections = [
  { id: "tilt", label: "Tilt: shim or move" },
  { id: "scraping", label: "Scraping" },
  { id: "set-over", label: "Tailstock set-over" },
  { id: "bearing", label: "Bearing clearance" },
];

export default function CorrectionPlanner({ loaderData }: Route.ComponentProps) {
  const [units, setUnits] = useState<DisplayUnits>(loaderData.units);
  return (
    <div className="mx-auto max-w-5xl px-4 py-8 sm:px-6">
      <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Rebuilding</p>
      <h1 className="mt-1 text-3xl font-extrabold text-ink-900">Correction planner</h1>
      <p className="mt-2 max-w-3xl text-ink-600">
        The arithmetic between measuring and measuring again: shims, sideways adjustment, scraping, tailstock set-over and bearing clearance. The formulas are common practice; the machine's manual comes
        first. Nothing you type here is saved.
      </p>
      <div className="mt-5 flex flex-wrap items-center gap-3">
        <fieldset className="flex gap-2">
          <legend className="sr-only">Units</legend>
          {(["mm", "inch"] as const).map((value) => (
            <label key={value} className="flex min-h-11 cursor-pointer items-center gap-2 rounded-control border border-ink-300 bg-white px-4 py-2 text-sm font-semibold has-[:checked]:border-brass-500 has-[:checked]:bg-brass-100">
              <input type="radio" name="units" value={value} checked={units === value} onChange={() => setUnits(value)} />
              {value === "mm" ? "mm and µm" : "inches"}
            </label>
          ))}
        </fieldset>
        <nav aria-label="Corrections" className="flex flex-wrap gap-2">
          {sections.map((section) => (
            <a key={section.id} href={`#${section.id}`} className="rounded-control px-3 py-2 text-sm font-semibold text-ink-700 underline-offset-2 hover:underline">
              {section.label}
            </a>
          ))}
        </nav>
      </div>
      {/* Keyed by units: switching units starts the fields afresh rather than reinterpreting typed numbers. */}
      <div key={units} className="mt-6 space-y-8">
        <TiltCard units={units} />
        <ScrapingCard units={units} />
        <SetOverCard units={units} />
        <BearingCard units={units} />
      </div>
    </div>
  );
}
