// A signed report is never changed, so one stored before readings were bounded may hold a number no page can
// draw (±1e308, or a result that overflowed to Infinity and was stored as null). Such a report is shown as
// signed: its readings as typed and its seal, with a notice, instead of results, grade and plots. Pure:
// shared by the report page, its JSON and its certificate.
import { measurementLimitIssues, testMeasurementSchema } from "~/geometry";
import type { ReportContent } from "./content";

const isFiniteNumber = (value: unknown): value is number => typeof value === "number" && Number.isFinite(value);

/** The first number of a stored result that is not finite, as "path", or null. */
function nonFiniteIn(value: unknown, path: string, optional = false): string | null {
  if (value === undefined || (optional && value === null)) return null;
  return isFiniteNumber(value) ? null : path;
}

/** "point 2, reading" for ["points", 1, "reading"]: positions counted from 1, as the page lists them. */
function fieldName(path: readonly (string | number)[]): string {
  return path
    .map((part, i) => (typeof part === "number" ? `${part + 1}` : i === 0 && typeof path[1] === "number" ? part.replace(/s$/, "") : part))
    .join(" ")
    .replace(/^(point \d+) /, "$1, ");
}

/**
 * Why a signed report's results cannot be scored or drawn, in words, or null when they can: a reading beyond
 * what the tests can read, or a result, ratio or key figure that is not a finite number.
 */
export function unrenderableReason(content: ReportContent): string | null {
  const tests = content?.measurements?.tests;
  if (!tests || typeof tests !== "object") return "the readings are missing";
  for (const [code, measurement] of Object.entries(tests)) {
    const parsed = testMeasurementSchema.safeParse(measurement);
    if (!parsed.success) return `${code}: ${parsed.error.issues[0]?.message ?? "the readings cannot be read"}`;
    const [beyond] = measurementLimitIssues(parsed.data, "mm");
    if (beyond) return `${code}, ${fieldName(beyond.path)}: ${beyond.message}`;
  }
  const score = content.score as unknown as Record<string, unknown> | undefined;
  if (!score || !Array.isArray(score.results)) return "the results are missing";
  for (const result of score.results as Array<Record<string, unknown>>) {
    const line = (result.straightness as { line?: Record<string, unknown> } | undefined)?.line;
    const local = result.local as Record<string, unknown> | null | undefined;
    const window = result.window as Record<string, unknown> | undefined;
    const bad =
      nonFiniteIn(result.value, "value") ??
      nonFiniteIn(result.tolerance, "tolerance") ??
      nonFiniteIn(result.ratio, "ratio") ??
      nonFiniteIn(result.measuringLength, "measuring length", true) ??
      nonFiniteIn(line?.slope, "reference line") ??
      nonFiniteIn(line?.intercept, "reference line") ??
      nonFiniteIn(local?.value, "local value") ??
      nonFiniteIn(local?.ratio, "local ratio") ??
      nonFiniteIn(window?.from, "window") ??
      nonFiniteIn(window?.to, "window");
    if (bad) return `${String(result.code)}: its ${bad} is not a number`;
  }
  for (const [name, value] of Object.entries((score.keyFigures as Record<string, unknown>) ?? {})) {
    if (nonFiniteIn(value, name, true)) return `the key figure ${name} is not a number`;
  }
  if (nonFiniteIn(score.worstRatio, "worst ratio", true)) return "the worst ratio is not a number";
  return null;
}

/** The notice shown in place of the results, or null for a report that renders. */
export function unrenderableNotice(content: ReportContent): string | null {
  const reason = unrenderableReason(content);
  if (!reason) return null;
  return (
    `This report was signed with a number that cannot be scored or drawn (${reason}). ` +
    "It is shown as it was signed: its readings and its seal, without results, grade or plots. " +
    "Its inspector can file a correction as a new revision."
  );
}
