// The search stand-in's column store (search/stand-in/table.ts) against the plain per-document readings
// it replaced: filters against `evaluateFilter` (itself checked against a reference in filter.test.ts),
// sort order and facet counts against direct implementations of the engine's documented rules (sort:
// numbers before strings, documents without the attribute last, stable; facets: values counted
// case-insensitively, shown as first met) — source: the engine's sorting and faceting reference, from memory.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { filterExpressionArbitrary } from "../../support/filter-arbitraries";
import { evaluateFilter, leafValues, lookUp, type FilterNode } from "../../../search/stand-in/filter.ts";
import { DocumentTable, smallestSorted, type SortRule } from "../../../search/stand-in/table.ts";

type Document = Record<string, unknown>;

const attributes = ["price", "maker", "tags", "verified", "seller.city", "seller.rating", "seller"] as const;
const stringPool = ["orvik", "Orvik", " orvik ", "BRENNA", "lathe", "a b", "it's", "10", "", "zeta", "true"];
const valuePool = [...stringPool, "-3", "0", "2.5", "7", "12", "true", "false", "1e1"];

const scalar = fc.oneof(fc.integer({ min: -4, max: 14 }), fc.constantFrom(2.5, -0.5, 10), fc.constantFrom(...stringPool), fc.boolean(), fc.constant(null));
const fieldValue = fc.oneof(scalar, fc.array(scalar, { maxLength: 3 }), fc.constant({}));
const seller = fc.record({ city: fieldValue, rating: fieldValue }, { requiredKeys: [] });
const documentArbitrary = fc.record(
  {
    price: fieldValue,
    maker: fieldValue,
    tags: fieldValue,
    verified: fieldValue,
    seller: fc.oneof(seller, fc.array(seller, { maxLength: 2 }), fc.constant(null)),
    "seller.city": fieldValue,
  },
  { requiredKeys: [] },
);
const documentsArbitrary = fc.array(documentArbitrary, { minLength: 0, maxLength: 40 });

const attribute = fc.constantFrom(...attributes);
const expression = filterExpressionArbitrary(attributes, valuePool);

const tableOf = (documents: Document[]) => new DocumentTable(documents.map((document, n) => [`d${n}`, document] as [string, Document]));

// The engine's facet strings (milli `normalize_facet`, `extract_facets.rs`): trimmed, NFKD, lower case;
// booleans are the strings "true" and "false"; an empty string is no value (sorts last, no facet).
const engineString = (leaf: unknown): string | null =>
  typeof leaf === "boolean" ? String(leaf) : typeof leaf === "string" && leaf !== "" ? leaf.trim().normalize("NFKD").toLowerCase() : null;

// The per-document readings the stand-in used before the column store.
function referenceSortKey(document: Document, rule: SortRule): { group: number; value: number | string } {
  const leaves = leafValues(lookUp(document, rule.attribute));
  const numbers = leaves.filter((leaf): leaf is number => typeof leaf === "number");
  if (numbers.length) return { group: 0, value: rule.descending ? Math.max(...numbers) : Math.min(...numbers) };
  const strings = leaves.map(engineString).filter((text): text is string => text !== null).sort();
  if (strings.length) return { group: 1, value: rule.descending ? strings.at(-1)! : strings[0]! };
  return { group: 2, value: 0 };
}

function referenceCompare(a: Document, b: Document, rules: SortRule[]): number {
  for (const rule of rules) {
    const [left, right] = [referenceSortKey(a, rule), referenceSortKey(b, rule)];
    if (left.group !== right.group) return left.group - right.group;
    if (left.group === 2 || left.value === right.value) continue;
    const ascending = left.value < right.value ? -1 : 1;
    return rule.descending ? -ascending : ascending;
  }
  return 0;
}

function referenceFacets(documents: Document[], facets: string[], maxValues: number) {
  const facetDistribution: Record<string, Record<string, number>> = {};
  const facetStats: Record<string, { min: number; max: number }> = {};
  for (const facet of facets) {
    const counts = new Map<string, { label: string; count: number }>();
    let [min, max] = [Infinity, -Infinity];
    for (const document of documents) {
      const seen = new Set<string>();
      for (const leaf of leafValues(lookUp(document, facet))) {
        if (typeof leaf === "number") [min, max] = [Math.min(min, leaf), Math.max(max, leaf)];
        if (typeof leaf !== "number" && engineString(leaf) === null) continue;
        const label = String(leaf);
        const key = typeof leaf === "number" ? label : engineString(leaf)!;
        if (seen.has(key)) continue;
        seen.add(key);
        const entry = counts.get(key) ?? { label, count: 0 };
        entry.count += 1;
        counts.set(key, entry);
      }
    }
    const sorted = [...counts.entries()].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).slice(0, maxValues);
    facetDistribution[facet] = Object.fromEntries(sorted.map(([, { label, count }]) => [label, count]));
    if (min !== Infinity) facetStats[facet] = { min, max };
  }
  return { facetDistribution, facetStats };
}

const sortRule = fc.record({ attribute, descending: fc.boolean() });

describe("the stand-in's column store", () => {
  it("lets through exactly the documents evaluateFilter accepts", () => {
    const outcomes = { matched: 0, missed: 0 };
    fc.assert(
      fc.property(expression, documentsArbitrary, (tree, documents) => {
        const expected = documents.flatMap((document, n) => (evaluateFilter(tree, document) ? [n] : []));
        expect(tableOf(documents).match(tree).members(), JSON.stringify(tree)).toEqual(expected);
        outcomes.matched += expected.length;
        outcomes.missed += documents.length - expected.length;
      }),
      { numRuns: 800 },
    );
    expect(outcomes.matched).toBeGreaterThan(1000);
    expect(outcomes.missed).toBeGreaterThan(1000);
  });

  it("gives the same sets when identical conditions are shared between searches", () => {
    fc.assert(
      fc.property(fc.array(expression, { minLength: 2, maxLength: 4 }), documentsArbitrary, (trees, documents) => {
        const table = tableOf(documents);
        const memo = new Map();
        for (const tree of trees) {
          const expected = documents.flatMap((document, n) => (evaluateFilter(tree, document) ? [n] : []));
          expect(table.match(tree, memo).members()).toEqual(expected);
        }
      }),
      { numRuns: 300 },
    );
  });

  it("sorts like the per-document comparison, stable among equals", () => {
    fc.assert(
      fc.property(fc.array(sortRule, { minLength: 1, maxLength: 3 }), documentsArbitrary, fc.infiniteStream(fc.boolean()), (rules, documents, keep) => {
        const table = tableOf(documents);
        const candidates = documents.map((_, n) => n).filter(() => keep.next().value);
        const expected = [...candidates].sort((a, b) => referenceCompare(documents[a]!, documents[b]!, rules));
        expect(table.sort(candidates, rules)).toEqual(expected);
      }),
      { numRuns: 500 },
    );
  });

  it("gives the first `limit` of that order when asked for a page's top only", () => {
    fc.assert(
      fc.property(fc.array(sortRule, { minLength: 1, maxLength: 3 }), documentsArbitrary, fc.infiniteStream(fc.boolean()), fc.nat({ max: 40 }), (rules, documents, keep, limit) => {
        const table = tableOf(documents);
        const candidates = documents.map((_, n) => n).filter(() => keep.next().value);
        const expected = [...candidates].sort((a, b) => referenceCompare(documents[a]!, documents[b]!, rules)).slice(0, limit);
        expect(table.sort(candidates, rules, limit)).toEqual(expected);
      }),
      { numRuns: 500 },
    );
  });

  it("picks the smallest keys like a full sort, for every limit", () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 0, max: 2 ** 40 }), { maxLength: 200 }), fc.nat({ max: 220 }), (values, limit) => {
        const expected = [...values].sort((a, b) => a - b).slice(0, limit);
        expect(Array.from(smallestSorted(Float64Array.from(values), limit))).toEqual(expected);
      }),
      { numRuns: 500 },
    );
  });

  it("counts facets and their numeric ranges like a pass over the documents in result order", () => {
    fc.assert(
      fc.property(documentsArbitrary, fc.subarray([...attributes]), fc.integer({ min: 1, max: 6 }), fc.infiniteStream(fc.boolean()), (documents, facets, maxValues, keep) => {
        const table = tableOf(documents);
        const order = documents.map((_, n) => n).filter(() => keep.next().value).reverse();
        const expected = referenceFacets(order.map((n) => documents[n]!), facets, maxValues);
        expect(table.facetSummary(order, facets, maxValues)).toEqual(expected);
      }),
      { numRuns: 500 },
    );
  });
});
