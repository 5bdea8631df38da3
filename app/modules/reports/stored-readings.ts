// Each test's readings as the inspector typed them, whatever their shape: the report page shows them in place
// of results for a signed report whose numbers cannot be scored or drawn (see unrenderable.ts), and the
// certificate prints them. Pure, and free of the engine so that the report page's script stays small.
import type { ReportContent } from "./content";

export interface StoredTestReadings {
  code: string;
  title: string;
  kind: string;
  lines: string[];
}

function text(value: unknown): string {
  if (typeof value === "number") return String(value);
  if (value === null) return "not a number";
  if (typeof value === "string") return value;
  return JSON.stringify(value) ?? "—";
}

const FIELD_LABELS: Record<string, string> = {
  max: "Highest",
  min: "Lowest",
  near: "Near",
  far: "Far",
  headstockEnd: "Headstock end",
  tailstockEnd: "Tailstock end",
  length: "Between near and far",
  resolution: "Resolution",
  reference: "Reference line",
  at0: "at 0°",
  at180: "at 180°",
};

/** Each test's readings as typed (the units of `entryUnits`), one line per station or field, whatever their shape. */
export function storedReadings(content: ReportContent): StoredTestReadings[] {
  const entered = content?.measurementsAsEntered?.tests ?? content?.measurements?.tests ?? {};
  const inch = content.entryUnits === "inch";
  const titles = new Map((Array.isArray(content?.score?.results) ? content.score.results : []).map((result) => [result.code, result.title]));
  return Object.entries(entered).map(([code, measurement]) => {
    const fields = (measurement ?? {}) as unknown as Record<string, unknown>;
    const kind = String(fields.kind ?? "");
    const readingUnit = kind === "level" ? "µm/m" : inch ? "in" : "µm";
    const stationUnit = inch ? "in" : "mm";
    const lines: string[] = [];
    for (const [field, value] of Object.entries(fields)) {
      if (field === "kind") continue;
      if (field === "points" && Array.isArray(value)) {
        for (const point of value as Array<Record<string, unknown> | null>) {
          lines.push(`Station ${text(point?.station)} ${stationUnit}: ${text(point?.reading)} ${readingUnit}`);
        }
      } else if (field === "readings" && Array.isArray(value)) {
        lines.push(`Readings (${readingUnit}): ${value.map(text).join(", ")}`);
      } else if (value && typeof value === "object" && !Array.isArray(value)) {
        const parts = Object.entries(value as Record<string, unknown>).map(([key, inner]) => `${FIELD_LABELS[key] ?? key} ${text(inner)}`);
        lines.push(`${FIELD_LABELS[field] ?? field}: ${parts.join(", ")}`);
      } else {
        lines.push(`${FIELD_LABELS[field] ?? field}: ${text(value)}`);
      }
    }
    return { code, title: titles.get(code) ?? code, kind, lines };
  });
}
