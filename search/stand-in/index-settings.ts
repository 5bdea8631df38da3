// Index settings as the stand-in keeps them: every setting the SDK can send is accepted and stored; the
// ones that shape results here are searchable, filterable, sortable and displayed attributes, typo
// tolerance, faceting.maxValuesPerFacet and pagination.maxTotalHits.
import { ApiError, badRequest } from "./errors.ts";
import { isValidRankingRule } from "./ranking.ts";

export const defaultRankingRules = ["words", "typo", "proximity", "attribute", "sort", "exactness"];

export function defaultSettings(): Record<string, unknown> {
  return {
    displayedAttributes: ["*"],
    searchableAttributes: ["*"],
    filterableAttributes: [],
    sortableAttributes: [],
    rankingRules: [...defaultRankingRules],
    stopWords: [],
    nonSeparatorTokens: [],
    separatorTokens: [],
    dictionary: [],
    synonyms: {},
    distinctAttribute: null,
    proximityPrecision: "byWord",
    typoTolerance: {
      enabled: true,
      minWordSizeForTypos: { oneTypo: 5, twoTypos: 9 },
      disableOnWords: [],
      disableOnAttributes: [],
      disableOnNumbers: false,
    },
    faceting: { maxValuesPerFacet: 100, sortFacetValuesBy: { "*": "alpha" } },
    pagination: { maxTotalHits: 1000 },
    embedders: {},
    searchCutoffMs: null,
    localizedAttributes: null,
    facetSearch: true,
    prefixSearch: "indexingTime",
  };
}

/** The per-setting routes, `/settings/<kebab-case>`, and the settings key each stands for. */
export const settingRoutes: Record<string, string> = Object.fromEntries(
  Object.keys(defaultSettings()).map((key) => [key.replace(/[A-Z]/g, (letter) => `-${letter.toLowerCase()}`), key]),
);

const kebab = (key: string) => key.replace(/[A-Z]/g, (letter) => `-${letter.toLowerCase()}`).replace(/-/g, "_");

function invalid(key: string, message: string): ApiError {
  return new ApiError(400, `invalid_settings_${kebab(key)}`, `Invalid value at \`.${key}\`: ${message}`);
}

function stringList(key: string, value: unknown): string[] {
  if (!Array.isArray(value) || value.some((item) => typeof item !== "string")) throw invalid(key, "expected an array of strings.");
  return value;
}

/** Checks a settings patch and returns the settings it leads to; `null` resets a setting. */
export function applySettingsPatch(current: Record<string, unknown>, patch: unknown): Record<string, unknown> {
  if (patch === null || typeof patch !== "object" || Array.isArray(patch)) throw badRequest("Invalid value type: expected an object of settings.");
  const defaults = defaultSettings();
  const next = structuredClone(current);
  for (const [key, value] of Object.entries(patch as Record<string, unknown>)) {
    if (!(key in defaults)) {
      throw badRequest(`Unknown field \`${key}\`: expected one of ${Object.keys(defaults).map((name) => `\`${name}\``).join(", ")}`);
    }
    if (value === null) {
      next[key] = defaults[key];
      continue;
    }
    switch (key) {
      case "displayedAttributes":
      case "searchableAttributes":
      case "sortableAttributes":
      case "stopWords":
      case "nonSeparatorTokens":
      case "separatorTokens":
      case "dictionary":
        next[key] = stringList(key, value);
        break;
      case "filterableAttributes":
        if (!Array.isArray(value) || value.some((item) => typeof item !== "string" && !isPatternObject(item))) {
          throw invalid(
            key,
            "expected an array of attribute names or `{ attributePatterns: [...], features: { facetSearch, filter: { equality, comparison } } }` objects.",
          );
        }
        next[key] = value;
        break;
      case "rankingRules": {
        const rules = stringList(key, value);
        for (const rule of rules) {
          if (!isValidRankingRule(rule)) {
            throw invalid(key, `\`${rule}\` ranking rule is invalid. Valid ranking rules are words, typo, sort, proximity, attribute, exactness and custom ranking rules.`);
          }
        }
        next[key] = rules;
        break;
      }
      case "typoTolerance":
      case "faceting":
      case "pagination": {
        if (typeof value !== "object" || Array.isArray(value)) throw invalid(key, "expected an object.");
        next[key] = mergeDeep(current[key] as Record<string, unknown>, value as Record<string, unknown>);
        validateNumbers(key, next[key] as Record<string, unknown>);
        break;
      }
      default:
        next[key] = value;
    }
  }
  return next;
}

const isPlainObject = (value: unknown): value is Record<string, unknown> => value !== null && typeof value === "object" && !Array.isArray(value);
const onlyKeys = (value: Record<string, unknown>, keys: string[]) => Object.keys(value).every((key) => keys.includes(key));
const optionalBoolean = (value: unknown) => value === undefined || typeof value === "boolean";

/** `{ attributePatterns: [...], features?: { facetSearch?, filter?: { equality?, comparison? } } }`, nothing else. */
function isPatternObject(item: unknown): boolean {
  if (!isPlainObject(item) || !onlyKeys(item, ["attributePatterns", "features"])) return false;
  const { attributePatterns, features } = item;
  if (!Array.isArray(attributePatterns) || !attributePatterns.every((pattern) => typeof pattern === "string")) return false;
  if (features === undefined) return true;
  if (!isPlainObject(features) || !onlyKeys(features, ["facetSearch", "filter"]) || !optionalBoolean(features.facetSearch)) return false;
  const filter = features.filter;
  if (filter === undefined) return true;
  return isPlainObject(filter) && onlyKeys(filter, ["equality", "comparison"]) && optionalBoolean(filter.equality) && optionalBoolean(filter.comparison);
}

/** One entry of `filterableAttributes` with what it allows (the engine's `FilterableAttributesFeatures`). */
export type FilterableRule = { patterns: string[]; legacy: boolean; equality: boolean; comparison: boolean; facetSearch: boolean };

/**
 * A plain attribute name allows everything (the engine's legacy default); the object form allows
 * equality and not comparison unless its `features.filter` says otherwise, and no facet search.
 */
export function filterableRules(settings: Record<string, unknown>): FilterableRule[] {
  return (settings.filterableAttributes as unknown[]).map((item) => {
    if (typeof item === "string") return { patterns: [item], legacy: true, equality: true, comparison: true, facetSearch: true };
    const { attributePatterns, features } = item as { attributePatterns: string[]; features?: { facetSearch?: boolean; filter?: { equality?: boolean; comparison?: boolean } } };
    return {
      patterns: attributePatterns,
      legacy: false,
      equality: features?.filter?.equality ?? true,
      comparison: features?.filter?.comparison ?? false,
      facetSearch: features?.facetSearch ?? false,
    };
  });
}

function mergeDeep(base: Record<string, unknown>, patch: Record<string, unknown>): Record<string, unknown> {
  const merged: Record<string, unknown> = { ...base };
  for (const [key, value] of Object.entries(patch)) {
    const existing = merged[key];
    merged[key] =
      value && typeof value === "object" && !Array.isArray(value) && existing && typeof existing === "object" && !Array.isArray(existing)
        ? mergeDeep(existing as Record<string, unknown>, value as Record<string, unknown>)
        : value;
  }
  return merged;
}

function validateNumbers(key: string, value: Record<string, unknown>) {
  const check = (path: string, number: unknown) => {
    if (number !== undefined && (typeof number !== "number" || !Number.isInteger(number) || number < 0)) {
      throw invalid(key, `\`${path}\` must be a non-negative integer.`);
    }
  };
  if (key === "pagination") check("maxTotalHits", value.maxTotalHits);
  if (key === "faceting") check("maxValuesPerFacet", value.maxValuesPerFacet);
  if (key === "typoTolerance") {
    const sizes = (value.minWordSizeForTypos ?? {}) as Record<string, unknown>;
    check("minWordSizeForTypos.oneTypo", sizes.oneTypo);
    check("minWordSizeForTypos.twoTypos", sizes.twoTypos);
    if (typeof value.enabled !== "boolean") throw invalid(key, "`enabled` must be a boolean.");
  }
}

/** Attribute patterns of `filterableAttributes`, plain names and `{ attributePatterns }` alike. */
export function filterablePatterns(settings: Record<string, unknown>): string[] {
  return (settings.filterableAttributes as unknown[]).flatMap((item) =>
    typeof item === "string" ? [item] : ((item as { attributePatterns: string[] }).attributePatterns ?? []),
  );
}

/**
 * Whether a rule covers an attribute, as the engine matches them: a plain name also covers what is nested
 * under it (`seller` covers `seller.city`); an `attributePatterns` entry covers only what it names, with
 * `*` at its start, its end or both (milli `attribute_patterns.rs`).
 */
export function ruleMatches(rule: FilterableRule, attribute: string): boolean {
  if (rule.legacy) return attributeMatches(attribute, rule.patterns);
  return rule.patterns.some((pattern) => {
    if (pattern === "*" || pattern === attribute) return true;
    if (pattern.length > 1 && pattern.startsWith("*") && pattern.endsWith("*")) return attribute.includes(pattern.slice(1, -1));
    if (pattern.startsWith("*")) return attribute.endsWith(pattern.slice(1));
    if (pattern.endsWith("*")) return attribute.startsWith(pattern.slice(0, -1));
    return false;
  });
}

/** `seller.city` is covered by `seller.city`, by `seller` and by patterns such as `seller.*` or `*`. */
export function attributeMatches(attribute: string, patterns: string[]): boolean {
  return patterns.some((pattern) => {
    if (pattern === "*" || pattern === attribute || attribute.startsWith(`${pattern}.`)) return true;
    if (pattern.endsWith("*")) return attribute.startsWith(pattern.slice(0, -1));
    if (pattern.startsWith("*")) return attribute.endsWith(pattern.slice(1));
    return false;
  });
}
