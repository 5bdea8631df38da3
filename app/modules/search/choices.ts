// The search page's fixed choices (kinds, grades, limits, report ages, prices, supply, countries, sorts),
// sent by the loader as data: the page's script carries none of these lists, since it is held to a budget
// (docs/benchmarks.md). Pure.
import { countryOptions, machineCategories } from "~/modules/listings/catalogue";
import { currencies } from "~/modules/units/format";
import { supplyClasses } from "../../../search/query.ts";
import type { DraftKey } from "./components/search-form";
import { accuracyFilters } from "./figures";

type Choice = { value: string; label: string };

export type FilterChoices = {
  categories: ReadonlyArray<Choice>;
  grades: ReadonlyArray<Choice>;
  /** The accuracy limits, each by its address parameter and label. */
  accuracy: ReadonlyArray<{ param: DraftKey; label: string }>;
  reportAges: ReadonlyArray<Choice>;
  currencies: ReadonlyArray<string>;
  /** The supply classes as the server words them. */
  supplies: ReadonlyArray<Choice>;
  countries: ReadonlyArray<Choice>;
  /** The sorts offered beside "Best match" (which only a search with words has). */
  sorts: ReadonlyArray<Choice>;
};

export function filterChoices(): FilterChoices {
  return {
    categories: machineCategories,
    grades: ["A", "B", "C", "D"].map((grade) => ({ value: grade, label: grade })),
    accuracy: accuracyFilters.map(({ param, label }) => ({ param, label })),
    reportAges: [
      { value: "", label: "Any age" },
      { value: "90", label: "Last 3 months" },
      { value: "180", label: "Last 6 months" },
      { value: "365", label: "Last 12 months" },
    ],
    currencies,
    supplies: supplyClasses.map(({ value, label }) => ({ value, label })),
    countries: countryOptions,
    sorts: [
      { value: "newest", label: "Newest first" },
      { value: "best-accuracy", label: "Best accuracy first" },
      { value: "price-ascending", label: "Price, lowest first" },
      { value: "price-descending", label: "Price, highest first" },
    ],
  };
}
