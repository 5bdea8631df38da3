// The engine's bucket sort, as the stand-in applies it: the index's `rankingRules`, in their order, each
// splitting the ties the rules before it left; documents still tied keep the order they were added in.
// Which rules take part follows the engine's own assembly of them (milli `search/new/mod.rs`):
//  - a search without words uses only `sort` (the request's sort) and custom `attribute:asc|desc` rules;
//  - with words, `words` is put before the first of typo, proximity, attribute, attributeRank,
//    wordPosition or exactness if it was not listed earlier (and left out with `matchingStrategy: all`);
//  - `attribute` is attributeRank then wordPosition; `exactness` is exact attribute then exact words;
//  - an attribute sorted once (by the request or an earlier custom rule) is not sorted again.
import type { SortRule } from "./table.ts";
import type { MatchingStrategy, TextMatch } from "./text-index.ts";

export const RANKING_RULE_NAMES = ["words", "typo", "proximity", "attribute", "attributeRank", "wordPosition", "sort", "exactness"] as const;

type TextStep = Exclude<keyof TextMatch, never>;
export type RankingStep = { kind: "text"; key: TextStep } | { kind: "sort"; rule: SortRule };

const customRule = /^(.+):(asc|desc)$/;

/** Whether a `rankingRules` entry is one the engine accepts. */
export function isValidRankingRule(rule: string): boolean {
  return (RANKING_RULE_NAMES as readonly string[]).includes(rule) || (customRule.test(rule) && !/\s/.test(rule));
}

export function rankingSteps(rules: string[], requestSort: SortRule[], withWords: boolean, matchingStrategy: MatchingStrategy): RankingStep[] {
  const steps: RankingStep[] = [];
  const sorted = new Set<string>();
  const seen = new Set<string>();
  let words = matchingStrategy === "all";
  const text = (key: TextStep) => steps.push({ kind: "text", key });
  const sortBy = (rule: SortRule) => {
    if (sorted.has(rule.attribute)) return;
    sorted.add(rule.attribute);
    steps.push({ kind: "sort", rule });
  };
  for (const rule of rules) {
    const custom = customRule.exec(rule);
    if (custom && !(RANKING_RULE_NAMES as readonly string[]).includes(rule)) {
      sortBy({ attribute: custom[1]!, descending: custom[2] === "desc" });
      continue;
    }
    if (rule === "sort") {
      if (!seen.has("sort")) requestSort.forEach(sortBy);
      seen.add("sort");
      continue;
    }
    if (!withWords) continue;
    if (rule !== "words" && !words) {
      text("dropped");
      words = true;
    }
    switch (rule) {
      case "words":
        if (!words) text("dropped");
        words = true;
        break;
      case "typo":
      case "proximity":
        if (!seen.has(rule)) text(rule === "typo" ? "typos" : "proximity");
        break;
      case "attribute":
        if (!seen.has("attribute") && !seen.has("attributeRank") && !seen.has("wordPosition")) {
          text("attributeRank");
          text("wordPosition");
        }
        break;
      case "attributeRank":
        if (!seen.has("attribute") && !seen.has("attributeRank")) text("attributeRank");
        break;
      case "wordPosition":
        if (!seen.has("attribute") && !seen.has("wordPosition")) text("wordPosition");
        break;
      case "exactness":
        if (!seen.has("exactness")) {
          text("exactAttribute");
          text("inexactWords");
        }
        break;
    }
    seen.add(rule);
  }
  return steps;
}

/**
 * Orders document numbers by the steps; `numbers` come in insertion order, which breaks the last ties.
 * `ranks(rule)` gives every document's place in a sort rule's order; `matchOf(n)` what its words matched.
 */
export function bucketSort(
  numbers: number[],
  steps: RankingStep[],
  ranks: (rule: SortRule) => Int32Array,
  matchOf: (n: number) => TextMatch | undefined,
): number[] {
  if (steps.length === 0) return numbers;
  const keys = steps.map((step) => {
    if (step.kind === "sort") {
      const all = ranks(step.rule);
      return Float64Array.from(numbers, (n) => all[n]!);
    }
    return Float64Array.from(numbers, (n) => matchOf(n)?.[step.key] ?? 0);
  });
  const order = Array.from(numbers, (_, i) => i);
  order.sort((a, b) => {
    for (const key of keys) if (key[a] !== key[b]) return key[a]! - key[b]!;
    return a - b;
  });
  return order.map((i) => numbers[i]!);
}
