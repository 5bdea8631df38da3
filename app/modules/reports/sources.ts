// Where a report's tolerances come from, in the words the report page, the certificate and the listing use.
// Pure: reports scored before confidences were recorded carry source lines alone, read by confidenceOfLabel.
import type { ReportScore, SourceConfidence, TestResult } from "~/geometry";
import { CONFIDENCE_LABELS, confidenceOfLabel, testsScoredFromMemory } from "~/geometry/sources";

export const HOW_SCORING_WORKS_SOURCES = "/how-scoring-works#sources";

export type SourceLine = { label: string; confidence: SourceConfidence; confidenceLabel: string };

function line(label: string, confidence: SourceConfidence | undefined): SourceLine {
  const known = confidence ?? confidenceOfLabel(label);
  return { label, confidence: known, confidenceLabel: CONFIDENCE_LABELS[known] };
}

/** The tolerance's, local tolerance's and direction rule's sources of one result. */
export function resultSources(result: TestResult): { tolerance: SourceLine; local: SourceLine | null; direction: SourceLine } {
  return {
    tolerance: line(result.sources.tolerance, result.confidence?.tolerance),
    local: result.sources.local ? line(result.sources.local, result.confidence?.local) : null,
    direction: line(result.sources.direction, result.confidence?.direction),
  };
}

/**
 * One line a buyer can read when any value the report was scored with is recalled rather than read in a
 * source; null when every value has a source.
 */
export function fromMemoryNotice(score: Pick<ReportScore, "results">): string | null {
  const codes = testsScoredFromMemory(score);
  if (!codes.length) return null;
  const tests = codes.length === 1 ? "1 test" : `${codes.length} tests`;
  return `Some tolerances here are recalled from memory and not yet checked against the published standard (${tests}); read them as a guide.`;
}

/** "Scored against the maker's chart …" for a report scored with a maker's own chart; null otherwise. */
export function makersChartLine(profile: { makersChart?: string | null } | null | undefined): string | null {
  return profile?.makersChart ? `Scored against the maker's chart “${profile.makersChart}”.` : null;
}
