import type { ReportScore, SourceConfidence, SourceLabel, ValueSource } from "./types";

export const SOURCE_CONFIDENCES = ["published", "manufacturer", "common-practice", "from-memory"] as const satisfies readonly SourceConfidence[];

/** How each confidence reads beside a value. */
export const CONFIDENCE_LABELS: Readonly<Record<SourceConfidence, string>> = {
  published: "published",
  manufacturer: "maker's chart",
  "common-practice": "common practice",
  "from-memory": "from memory",
};

/**
 * A source as one line: "IS 6040:1993, clause 3.5", "maker's chart: <title>", "common practice (why)",
 * "ISO 1708:1989, from memory". Stored reports keep these lines, so the wording is part of the format.
 */
export function sourceLabel(source: ValueSource): SourceLabel {
  const note = source.note ? ` (${source.note})` : "";
  switch (source.confidence) {
    case "published": {
      const document = [source.document, source.edition].filter(Boolean).join(":");
      return [document, source.clause].filter(Boolean).join(", ") + note;
    }
    case "manufacturer":
      return [`maker's chart: ${source.document ?? ""}`, source.clause].filter(Boolean).join(", ") + note;
    case "common-practice":
      return `common practice${note}`;
    case "from-memory":
      return `${source.document ? `${source.document}, ` : ""}from memory${note}`;
  }
}

/** A stored line's confidence; reports scored before confidences were recorded carry the line alone. */
export function confidenceOfLabel(label: SourceLabel): SourceConfidence {
  if (/from memory/i.test(label)) return "from-memory";
  if (/^maker's chart/i.test(label)) return "manufacturer";
  if (/^common practice/i.test(label)) return "common-practice";
  return "published";
}

/** Test codes of a score whose tolerance, local tolerance or direction rule was recalled, not read. */
export function testsScoredFromMemory(score: Pick<ReportScore, "results">): string[] {
  return score.results
    .filter((result) => {
      const confidence = result.confidence ?? {
        tolerance: confidenceOfLabel(result.sources.tolerance),
        direction: confidenceOfLabel(result.sources.direction),
        ...(result.sources.local ? { local: confidenceOfLabel(result.sources.local) } : {}),
      };
      return [confidence.tolerance, confidence.local, confidence.direction].includes("from-memory");
    })
    .map((result) => result.code);
}
