// The search page's form state: what each field shows, in the reader's units, read from the address and
// written back to it in µm and mm. No validation library here (the server validates every parameter): this
// runs in the browser on every change and must stay small.
import { lengthFromMillimetres, lengthToMillimetres, MILLIMETRES_PER_INCH, type DisplayUnits } from "~/modules/units/lengths";
import { accuracyParams, deviationFromInput, deviationInputValue } from "../figures";

export type SearchDraft = {
  q: string;
  category: string[];
  grade: string[];
  verified: boolean;
  country: string;
  currency: string;
  priceMin: string;
  priceMax: string;
  swingMin: string;
  swingMax: string;
  centresMin: string;
  centresMax: string;
  runoutMax: string;
  axialSlipMax: string;
  parallelismMax: string;
  centreHeightMax: string;
  flatnessMax: string;
  squarenessMax: string;
  xAccuracyMax: string;
  xRepeatabilityMax: string;
  yAccuracyMax: string;
  yRepeatabilityMax: string;
  zAccuracyMax: string;
  zRepeatabilityMax: string;
  reportAgeMax: string;
  supply: string;
  sort: string;
};

export type DraftKey = keyof SearchDraft;

const lengthKeys = ["swingMin", "swingMax", "centresMin", "centresMax"] as const;
const deviationKeys = accuracyParams;

function positive(text: string | null): number | undefined {
  if (text === null || text.trim() === "") return undefined;
  const value = Number(text);
  return Number.isFinite(value) && value >= 0 ? value : undefined;
}

/** The form as the address describes it (the `…In` twins are read too, as a form without JavaScript sends them). */
export function draftFromParams(params: URLSearchParams, units: DisplayUnits): SearchDraft {
  // A value that is not a usable number stays as it was typed, next to the server's message about it.
  const asTyped = (key: string) => params.get(`${key}In`) ?? params.get(key) ?? "";
  const length = (key: (typeof lengthKeys)[number]) => {
    const inches = positive(params.get(`${key}In`));
    const mm = inches !== undefined ? inches * MILLIMETRES_PER_INCH : positive(params.get(key));
    return mm === undefined ? asTyped(key) : String(lengthFromMillimetres(mm, units));
  };
  const deviation = (key: string) => {
    const inches = positive(params.get(`${key}In`));
    const um = inches !== undefined ? inches * 25_400 : positive(params.get(key));
    return um === undefined || um === 0 ? asTyped(key) : deviationInputValue(um, units);
  };
  const list = (key: string) => params.getAll(key).flatMap((value) => value.split(",")).filter(Boolean);
  const draft = {
    q: params.get("q") ?? "",
    category: list("category"),
    grade: list("grade"),
    verified: params.get("verified") === "1" || params.get("verified") === "true",
    country: list("country")[0] ?? "",
    currency: params.get("currency") ?? "EUR",
    priceMin: params.get("priceMin") ?? "",
    priceMax: params.get("priceMax") ?? "",
    reportAgeMax: params.get("reportAgeMax") ?? "",
    supply: params.get("supply") ?? "",
    sort: params.get("sort") ?? "",
  } as SearchDraft;
  // The lengths and limits by their lists, not one line each: this runs in the browser, whose script is held to a budget.
  for (const key of lengthKeys) draft[key] = length(key);
  for (const key of deviationKeys) draft[key] = deviation(key);
  return draft;
}

/** The address for a form state: µm and mm, in one fixed order, without empty fields; page 1. Values that are
 * not usable numbers go as typed, for the server to refuse with a message. */
export function paramsFromDraft(draft: SearchDraft, units: DisplayUnits): URLSearchParams {
  const params = new URLSearchParams();
  const put = (key: string, value: string | number | undefined) => {
    if (value !== undefined && String(value).trim() !== "") params.append(key, String(value).trim());
  };
  put("q", draft.q);
  for (const category of draft.category) put("category", category);
  for (const grade of draft.grade) put("grade", grade);
  if (draft.verified) put("verified", "1");
  put("country", draft.country);
  if (draft.priceMin.trim() || draft.priceMax.trim()) put("currency", draft.currency);
  put("priceMin", draft.priceMin);
  put("priceMax", draft.priceMax);
  for (const key of lengthKeys) {
    const value = positive(draft[key].replace(",", "."));
    if (value === undefined) put(inputName(key, units), draft[key]);
    else put(key, lengthToMillimetres(value, units));
  }
  for (const key of deviationKeys) {
    const micrometres = deviationFromInput(draft[key], units);
    if (micrometres === undefined) put(inputName(key, units), draft[key]);
    else put(key, micrometres);
  }
  put("reportAgeMax", draft.reportAgeMax);
  put("supply", draft.supply);
  put("sort", draft.sort);
  return params;
}

/** Input names as a form without JavaScript submits them: inch users' lengths and limits go to the `…In` twins. */
export function inputName(key: DraftKey, units: DisplayUnits): string {
  if (units !== "inch") return key;
  return (lengthKeys as readonly string[]).includes(key) || (deviationKeys as readonly string[]).includes(key) ? `${key}In` : key;
}
