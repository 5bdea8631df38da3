// Words pages use for the listing's fixed choices. Pure: shared by the server and the browser.

export const machineCategories = [
  { value: "centre_lathe", label: "Centre lathe" },
  { value: "toolroom_lathe", label: "Toolroom lathe" },
  { value: "cnc_lathe", label: "CNC lathe" },
  { value: "milling_machine", label: "Milling machine" },
  { value: "machining_centre", label: "Machining centre" },
  { value: "surface_grinder", label: "Surface grinder" },
  { value: "other", label: "Other machine tool" },
] as const;
export type MachineCategory = (typeof machineCategories)[number]["value"];

/** Lathes: sized by swing and centres, and the only machines with a tailstock, a cross-slide and a screw-cutting gearbox. */
export const latheCategories: readonly string[] = ["centre_lathe", "toolroom_lathe", "cnc_lathe"];
export const isLathe = (category: string | null | undefined) => latheCategories.includes(category ?? "");

export const machineConditions = [
  { value: "reconditioned", label: "Reconditioned" },
  { value: "used", label: "Used" },
  { value: "as_is", label: "As is" },
] as const;
export type MachineCondition = (typeof machineConditions)[number]["value"];

// ISO 3166-1 alpha-2 codes; names come from the browser's or server's own locale data.
export const countryCodes = [
  "AT", "AU", "BE", "BG", "CA", "CH", "CZ", "DE", "DK", "EE", "ES", "FI", "FR", "GB", "GR", "HR", "HU", "IE",
  "IT", "LT", "LU", "LV", "NL", "NO", "NZ", "PL", "PT", "RO", "SE", "SI", "SK", "US",
] as const;
export type CountryCode = (typeof countryCodes)[number];

const countryNames = new Intl.DisplayNames(["en"], { type: "region" });
export function countryName(code: string) {
  return countryNames.of(code) ?? code;
}
export const countryOptions = countryCodes
  .map((code) => ({ value: code, label: countryName(code) }))
  .sort((a, b) => a.label.localeCompare(b.label));

export function labelOf<T extends { value: string; label: string }>(options: readonly T[], value: string) {
  return options.find((option) => option.value === value)?.label ?? value;
}
