// What a signed report says: the exact object whose RFC 8785 canonical JSON is hashed. Pure types and
// helpers, shared by the report page, the certificate and the API.
import type { MachineCategory, ReportMeasurements, ReportScore } from "~/geometry";
import { isLathe } from "~/modules/listings/catalogue";
import type { EntryUnits } from "./form";

export const REPORT_FORMAT = "tenthmark.accuracy-report/1";

export interface ReportContent {
  format: typeof REPORT_FORMAT;
  reportId: string;
  revision: number;
  /** The signed revision this one corrects, with its hash, so revisions form a chain. */
  supersedes: { reportId: string; contentHash: string } | null;
  booking: { id: string; reference: string };
  machine: {
    listingId: string;
    slug: string;
    title: string;
    category: string;
    make: string;
    model: string;
    year: number | null;
    serialNumber: string | null;
    swingOverBedMm: number | null;
    distanceBetweenCentresMm: number | null;
    location: string;
  };
  /** `id` is the public id of the inspector's profile (/inspectors/:id), never an account id. */
  inspector: { id: string; name: string };
  measuredOn: string;
  profile: {
    key: string;
    version: number;
    title: string;
    /** The title of the maker's own acceptance chart, when the profile is one. */
    makersChart?: string;
    /** What the machine's category and size suggested, and why this profile was used. */
    suggested: { key: string; version: number } | null;
    reason: string;
  };
  entryUnits: EntryUnits;
  conditions: { ambientTemperatureC: number | null; warmUpMinutes: number | null; levelled: boolean | null; notes: string };
  instruments: Array<{
    id: string;
    kind: string;
    kindLabel: string;
    description: string;
    /** Smallest step, in µm (µm/m for a level); null when not given. */
    resolution: number | null;
    resolutionUnit: "µm" | "µm/m" | null;
    calibrationDue: string | null;
    calibrationOverdue: boolean;
  }>;
  /** Per test; a set-up photo's `sha256` is that of its large variant as stored (absent for photos kept before it was recorded). */
  tests: Record<string, { instrumentId: string | null; notes: string; photo: { id: string; width: number; height: number; sha256?: string } | null }>;
  /** The readings in the units they were typed in (stations mm or in; readings µm or in). */
  measurementsAsEntered: ReportMeasurements;
  /** The readings the engine scored: stations in mm, readings in µm (µm/m for levels). */
  measurements: ReportMeasurements;
  score: ReportScore;
  notes: string;
  safety: { acknowledged: boolean; cautions: readonly string[] };
  submittedAt: string;
  signedAt: string | null;
}

/** Machine categories of listings mapped to the engine's, where it has profiles. */
/** Swing and distance between centres size a lathe; on other machines they are left out unless given. */
export function latheSizeRows(machine: Pick<ReportContent["machine"], "category" | "swingOverBedMm" | "distanceBetweenCentresMm">, format: (mm: number) => string): Array<[string, string]> {
  const lathe = isLathe(machine.category);
  const rows: Array<[string, number | null]> = [
    ["Swing over bed", machine.swingOverBedMm],
    ["Distance between centres", machine.distanceBetweenCentresMm],
  ];
  return rows.flatMap(([label, mm]) => (mm ? [[label, format(mm)] as [string, string]] : lathe ? [[label, "not given"] as [string, string]] : []));
}

export function engineCategory(listingCategory: string): MachineCategory | null {
  if (listingCategory === "centre_lathe") return "centre-lathe";
  if (listingCategory === "toolroom_lathe") return "toolroom-lathe";
  if (listingCategory === "milling_machine") return "milling-machine";
  if (listingCategory === "surface_grinder") return "surface-grinder";
  if (listingCategory === "cnc_lathe") return "cnc-lathe";
  if (listingCategory === "machining_centre") return "machining-centre";
  return null;
}

export const KEY_FIGURE_LABELS = {
  spindleRunOut: "Spindle run-out",
  axialSlip: "Axial slip",
  spindleParallelismVertical: "Spindle axis, vertical",
  spindleParallelismHorizontal: "Spindle axis, horizontal",
  centreHeight: "Centre height",
  bedStraightness: "Bed straightness",
  tableFlatness: "Table flatness",
  travelSquareness: "Squareness of travels",
  xPositioningAccuracy: "X axis, positioning accuracy",
  xRepeatability: "X axis, repeatability",
  yPositioningAccuracy: "Y axis, positioning accuracy",
  yRepeatability: "Y axis, repeatability",
  zPositioningAccuracy: "Z axis, positioning accuracy",
  zRepeatability: "Z axis, repeatability",
} as const;

export type KeyFigureKey = keyof typeof KEY_FIGURE_LABELS;

/** Figures with a sign: which way a part leans or is out of square. */
export const SIGNED_KEY_FIGURES: ReadonlySet<KeyFigureKey> = new Set(["spindleParallelismVertical", "spindleParallelismHorizontal", "centreHeight", "travelSquareness"]);

const LATHE_FIGURES: readonly KeyFigureKey[] = ["spindleRunOut", "axialSlip", "spindleParallelismVertical", "spindleParallelismHorizontal", "centreHeight", "bedStraightness"];
const SURFACE_FIGURES: readonly KeyFigureKey[] = ["tableFlatness", "travelSquareness", "spindleRunOut", "axialSlip"];
const CNC_LATHE_FIGURES: readonly KeyFigureKey[] = ["xPositioningAccuracy", "xRepeatability", "zPositioningAccuracy", "zRepeatability", "spindleRunOut"];
const MACHINING_CENTRE_FIGURES: readonly KeyFigureKey[] = ["xPositioningAccuracy", "xRepeatability", "yPositioningAccuracy", "yRepeatability", "zPositioningAccuracy", "zRepeatability", "spindleRunOut"];

/**
 * The key figures that mean something for a machine category (the listing's, e.g. "milling_machine", or the
 * engine's, e.g. "milling-machine"): a lathe's spindle and bed, a mill's or grinder's table and travels.
 */
export function keyFigureNamesFor(category: string | null | undefined): readonly KeyFigureKey[] {
  const engine = category ? (engineCategory(category) ?? category) : null;
  if (engine === "milling-machine" || engine === "surface-grinder") return SURFACE_FIGURES;
  if (engine === "centre-lathe" || engine === "toolroom-lathe") return LATHE_FIGURES;
  if (engine === "cnc-lathe") return CNC_LATHE_FIGURES;
  if (engine === "machining-centre") return MACHINING_CENTRE_FIGURES;
  return Object.keys(KEY_FIGURE_LABELS) as KeyFigureKey[];
}

/** A report older than this is shown as expired: accuracy drifts with use (PRODUCT.md). */
export const REPORT_FRESH_MONTHS = 12;

export function monthsBetween(fromIsoDate: string, to: Date): number {
  const from = new Date(`${fromIsoDate}T00:00:00Z`);
  return (to.getUTCFullYear() - from.getUTCFullYear()) * 12 + (to.getUTCMonth() - from.getUTCMonth()) - (to.getUTCDate() < from.getUTCDate() ? 1 : 0);
}

/** "measured 3 months ago" and whether the report is past its 12 months. */
export function reportAge(measuredOn: string, now: Date): { months: number; label: string; expired: boolean } {
  const months = Math.max(0, monthsBetween(measuredOn, now));
  const label =
    months === 0 ? "this month" : months < 12 ? `${months} month${months === 1 ? "" : "s"} ago` : `${Math.floor(months / 12)} year${months >= 24 ? "s" : ""}${months % 12 ? ` ${months % 12} month${months % 12 === 1 ? "" : "s"}` : ""} ago`;
  return { months, label, expired: months >= REPORT_FRESH_MONTHS };
}

/** Where a set-up photo is served (access is checked there). */
export function setupPhotoUrl(photoId: string, variant: "thumb" | "large") {
  return `/reports/photos/${photoId}/${variant}`;
}
