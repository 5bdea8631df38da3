import { conditionWarnings, evaluateTest, withinLimit } from "./acceptance-tests";
import { GeometryInputError } from "./errors";
import { KEY_FIGURE_NAMES } from "./profile-schema";
import type { Grade, KeyFigures, ReportMeasurements, ReportScore, TestResult, ToleranceProfile } from "./types";

export interface GradedOutcome {
  ratio: number;
  pass: boolean;
}

/**
 * GEOMETRY.md's scheme: A all r ≤ 0.5; B all r ≤ 1; C at most two tests out and none beyond r = 1.5;
 * D otherwise; incomplete when a required test has no reading. A direction failure counts as out.
 */
export function gradeOf(outcomes: readonly GradedOutcome[], missingRequired = 0): Grade {
  if (missingRequired > 0) return "incomplete";
  const out = outcomes.filter((outcome) => !outcome.pass);
  if (out.length === 0) {
    return outcomes.every((outcome) => withinLimit(outcome.ratio, 0.5)) ? "A" : "B";
  }
  if (out.length <= 2 && outcomes.every((outcome) => withinLimit(outcome.ratio, 1.5))) return "C";
  return "D";
}

/**
 * Scores a report against a profile. The grade comes from the required tests alone (PRODUCT.md), so that
 * two reports of one profile are graded on the same tests; a measured optional test still shows its own
 * verdict and, when out of tolerance, is listed in `outOfTolerance`.
 */
export function scoreReport(profile: ToleranceProfile, measurements: ReportMeasurements): ReportScore {
  const tests = measurements?.tests;
  if (!tests || typeof tests !== "object") {
    throw new GeometryInputError("The report has no tests; give the readings keyed by test code.", ["tests"]);
  }
  const known = new Set(profile.tests.map((test) => test.code));
  for (const code of Object.keys(tests)) {
    if (!known.has(code)) {
      throw new GeometryInputError(
        `"${code}" is not a test of ${profile.key} v${profile.version}; its tests are ${[...known].join(", ")}.`,
        ["tests", code],
      );
    }
  }

  const results: TestResult[] = [];
  const missing: string[] = [];
  for (const test of profile.tests) {
    const measurement = tests[test.code];
    if (measurement === undefined) {
      if (test.required) missing.push(test.code);
      continue;
    }
    try {
      results.push(evaluateTest(test, measurement, measurements.conditions, profile.rules));
    } catch (error) {
      if (error instanceof GeometryInputError) {
        throw new GeometryInputError(`${test.code} (${test.title}): ${error.message}`, ["tests", test.code, ...error.path]);
      }
      throw error;
    }
  }

  const required = new Set(profile.tests.filter((test) => test.required).map((test) => test.code));
  const grade = gradeOf(
    results.filter((result) => required.has(result.code)),
    missing.length,
  );
  const byCode = new Map(results.map((result) => [result.code, result]));
  const keyFigures = {} as KeyFigures;
  for (const name of KEY_FIGURE_NAMES) {
    const code = profile.keyFigures[name];
    keyFigures[name] = code ? (byCode.get(code)?.value ?? null) : null;
  }

  return {
    profile: {
      key: profile.key,
      version: profile.version,
      title: profile.title,
      ...(profile.scope.maker ? { makersChart: profile.scope.maker.chart } : {}),
    },
    measuredOn: measurements.measuredOn ?? null,
    grade,
    worstRatio: results.length > 0 ? Math.max(...results.map((result) => result.ratio)) : null,
    keyFigures,
    missing,
    outOfTolerance: results.filter((result) => !result.pass).map((result) => result.code),
    results,
    warnings: conditionWarnings(measurements.conditions),
  };
}
