// The search stand-in's filter language: parser cases, evaluation cases, and a property test comparing the
// stand-in's parse-and-evaluate with a plain evaluation of random expression trees over random documents.
// Expected semantics: the hosted engine's documented filter expressions (AND binds tighter than OR, `!=` and
// `NOT` also match documents without the attribute, arrays match if any element does, strings compare
// case-insensitively) — source: the engine's "filter expression reference", from memory.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { filterExpressionArbitrary } from "../../support/filter-arbitraries";
import {
  evaluateFilter,
  FilterSyntaxError,
  parseFilter,
  parseFilterExpression,
  type ComparisonOperator,
  type FilterNode,
} from "../../../search/stand-in/filter.ts";

const parse = (expression: string) => parseFilterExpression(expression);
const eq = (attribute: string, value: string): FilterNode => ({ kind: "comparison", attribute, operator: "=", value });

function syntaxError(expression: string): FilterSyntaxError {
  try {
    parseFilterExpression(expression);
  } catch (error) {
    if (error instanceof FilterSyntaxError) return error;
    throw error;
  }
  throw new Error(`"${expression}" parsed without error`);
}

describe("filter parser", () => {
  it("binds AND tighter than OR", () => {
    expect(parse("a = 1 OR b = 2 AND c = 3")).toEqual({ kind: "or", operands: [eq("a", "1"), { kind: "and", operands: [eq("b", "2"), eq("c", "3")] }] });
    expect(parse("a = 1 AND b = 2 OR c = 3")).toEqual({ kind: "or", operands: [{ kind: "and", operands: [eq("a", "1"), eq("b", "2")] }, eq("c", "3")] });
  });

  it("lets parentheses override precedence and keeps their grouping", () => {
    expect(parse("(a = 1 OR b = 2) AND c = 3")).toEqual({ kind: "and", operands: [{ kind: "or", operands: [eq("a", "1"), eq("b", "2")] }, eq("c", "3")] });
    expect(parse("((a = 1))")).toEqual(eq("a", "1"));
    expect(parse("a = 1 AND (b = 2 AND c = 3)")).toEqual({ kind: "and", operands: [eq("a", "1"), { kind: "and", operands: [eq("b", "2"), eq("c", "3")] }] });
  });

  it("applies NOT to the condition or group that follows", () => {
    expect(parse("NOT a = 1 AND b = 2")).toEqual({ kind: "and", operands: [{ kind: "not", operand: eq("a", "1") }, eq("b", "2")] });
    expect(parse("NOT (a = 1 OR b = 2)")).toEqual({ kind: "not", operand: { kind: "or", operands: [eq("a", "1"), eq("b", "2")] } });
    expect(parse("NOT NOT a = 1")).toEqual({ kind: "not", operand: { kind: "not", operand: eq("a", "1") } });
  });

  it("reads every comparison operator", () => {
    for (const operator of ["=", "!=", ">", ">=", "<", "<="] as ComparisonOperator[]) {
      expect(parse(`priceMinor ${operator} 250000`)).toEqual({ kind: "comparison", attribute: "priceMinor", operator, value: "250000" });
      expect(parse(`priceMinor${operator}250000`)).toEqual({ kind: "comparison", attribute: "priceMinor", operator, value: "250000" });
    }
  });

  it("reads single- and double-quoted values, escapes and keywords inside quotes", () => {
    expect(parse("city = 'Port Halden'")).toEqual(eq("city", "Port Halden"));
    expect(parse('city = "Port Halden"')).toEqual(eq("city", "Port Halden"));
    expect(parse(String.raw`model = "the \"Ferro\" 300"`)).toEqual(eq("model", 'the "Ferro" 300'));
    expect(parse(String.raw`model = 'it\'s'`)).toEqual(eq("model", "it's"));
    expect(parse('status = "AND"')).toEqual(eq("status", "AND"));
    expect(parse("'seller name' = Orvik")).toEqual(eq("seller name", "Orvik"));
  });

  it("reads ranges, lists and the presence tests with their NOT forms", () => {
    expect(parse("swingMm 300 TO 450")).toEqual({ kind: "range", attribute: "swingMm", from: "300", to: "450" });
    expect(parse("grade IN [A, 'B', \"C\"]")).toEqual({ kind: "in", attribute: "grade", values: ["A", "B", "C"], negated: false });
    expect(parse("grade NOT IN [D,]")).toEqual({ kind: "in", attribute: "grade", values: ["D"], negated: true });
    expect(parse("grade IN []")).toEqual({ kind: "in", attribute: "grade", values: [], negated: false });
    expect(parse("reportDate EXISTS")).toEqual({ kind: "exists", attribute: "reportDate", negated: false });
    expect(parse("reportDate NOT EXISTS")).toEqual({ kind: "exists", attribute: "reportDate", negated: true });
    expect(parse("grade IS NULL")).toEqual({ kind: "isNull", attribute: "grade", negated: false });
    expect(parse("grade IS NOT NULL")).toEqual({ kind: "isNull", attribute: "grade", negated: true });
    expect(parse("description IS EMPTY")).toEqual({ kind: "isEmpty", attribute: "description", negated: false });
    expect(parse("description IS NOT EMPTY")).toEqual({ kind: "isEmpty", attribute: "description", negated: true });
  });

  it("reads nested attributes and negative or decimal numbers as words", () => {
    expect(parse("seller.city = Aldmoor")).toEqual(eq("seller.city", "Aldmoor"));
    expect(parse("centreHeightUm >= -2.5")).toEqual({ kind: "comparison", attribute: "centreHeightUm", operator: ">=", value: "-2.5" });
  });

  it("treats a blank filter as no filter", () => {
    expect(parse("")).toBeNull();
    expect(parse("   ")).toBeNull();
    expect(parseFilter(undefined)).toBeNull();
    expect(parseFilter(["", []])).toBeNull();
  });

  it("combines the array form: outer items ANDed, inner arrays ORed", () => {
    expect(parseFilter(["a = 1", ["b = 2", "c = 3"]])).toEqual({
      kind: "and",
      operands: [eq("a", "1"), { kind: "or", operands: [eq("b", "2"), eq("c", "3")] }],
    });
    expect(parseFilter([["b = 2"]])).toEqual(eq("b", "2"));
  });

  it("names the position and what was expected when the syntax is bad", () => {
    const cases: Array<[string, number, RegExp]> = [
      ["price >", 8, /expected a value after `>`, found the end of the filter/],
      ["price 10", 9, /expected `TO` after `price 10`/],
      ["price", 6, /expected an operator after `price`.*IS NOT EMPTY/],
      ["(a = 1", 7, /expected `\)` to close the `\(` at column 1/],
      ["a = 1)", 6, /found a `\)` that closes nothing/],
      ["a = 1 b = 2", 7, /expected `AND`, `OR` or the end of the filter, found `b`/],
      ["a ! 3", 3, /found `!` alone; the operator for “not equal” is `!=`/],
      ["a = 'open", 5, /never closed/],
      ["a IN [1 2]", 9, /expected `,` or `\]` in the list that opens at column 6/],
      ["a IN 1", 6, /expected `\[` to open the list/],
      ["a IS MAYBE", 6, /expected `NULL` or `EMPTY` after `a IS`/],
      ["a NOT LIKE x", 7, /expected `IN` or `EXISTS` after `a NOT`/],
      ["AND a = 1", 1, /expected an attribute, `NOT` or `\(`, found the keyword `AND`/],
      ["a = OR", 5, /expected a value after `=`, found the keyword `OR` \(quote it/],
      ["a = 1 AND", 10, /expected an attribute, `NOT` or `\(`, found the end of the filter/],
      ["_geoRadius(1, 2, 3)", 1, /not supported by the search stand-in/],
    ];
    for (const [expression, column, problem] of cases) {
      const error = syntaxError(expression);
      expect(error.position + 1, expression).toBe(column);
      expect(error.message, expression).toMatch(new RegExp(`^Filter syntax error at column ${column}: `));
      expect(error.message, expression).toMatch(problem);
    }
  });
});

describe("filter evaluation", () => {
  const lathe = {
    id: "l-1",
    priceMinor: 1_250_000,
    make: "Orvik",
    grade: "A",
    verified: true,
    tags: ["Camlock", "collet chuck"],
    description: "",
    report: null,
    seller: { city: "Aldmoor", ratings: [4, 5] },
    fittings: [{ name: "steady rest" }, { name: "follow rest" }],
  };
  const matches = (expression: string) => evaluateFilter(parse(expression)!, lathe);

  it("compares numbers as numbers and strings case-insensitively", () => {
    expect(matches("priceMinor = 1250000")).toBe(true);
    expect(matches("priceMinor = '1250000.0'")).toBe(true);
    expect(matches("priceMinor > 999999")).toBe(true);
    expect(matches("priceMinor < 999999")).toBe(false);
    expect(matches("make = orvik")).toBe(true);
    expect(matches("make = ' ORVIK '")).toBe(true);
    expect(matches("make > 5")).toBe(false);
    expect(matches("grade < B")).toBe(true);
    expect(matches("verified = true")).toBe(true);
    expect(matches("verified = false")).toBe(false);
  });

  it("matches arrays when any element matches, and reaches nested attributes", () => {
    expect(matches("tags = camlock")).toBe(true);
    expect(matches("tags IN [faceplate, 'Collet Chuck']")).toBe(true);
    expect(matches("tags NOT IN [faceplate]")).toBe(true);
    expect(matches("seller.city = aldmoor")).toBe(true);
    expect(matches("seller.ratings 5 TO 9")).toBe(true);
    expect(matches("fittings.name = 'follow rest'")).toBe(true);
  });

  it("lets != and NOT match documents without the attribute", () => {
    expect(matches("colour != red")).toBe(true);
    expect(matches("NOT colour = red")).toBe(true);
    expect(matches("colour = red")).toBe(false);
    expect(matches("make != Orvik")).toBe(false);
  });

  it("tells existence, null and emptiness apart", () => {
    expect(matches("report EXISTS")).toBe(true);
    expect(matches("report IS NULL")).toBe(true);
    expect(matches("colour EXISTS")).toBe(false);
    expect(matches("colour IS NULL")).toBe(false);
    expect(matches("colour IS NOT NULL")).toBe(true);
    expect(matches("description IS EMPTY")).toBe(true);
    expect(matches("tags IS NOT EMPTY")).toBe(true);
    expect(matches("report IS EMPTY")).toBe(false);
  });
});

// ---------------------------------------------------------------------------------------------------------
// Property: the stand-in agrees with a plain reference evaluation of random trees over random documents.

const attributes = ["price", "maker", "tags", "verified", "seller.city", "seller.rating"] as const;
const stringPool = ["orvik", "Orvik", "BRENNA", "lathe", "a b", "it's", 'say "x"', "back\\slash", "AND", "10", "", "zeta"];
const valuePool = [...stringPool, "-3", "0", "2.5", "7", "12", "true", "false"];

const scalar = fc.oneof(
  fc.integer({ min: -4, max: 14 }),
  fc.constantFrom(2.5, -0.5),
  fc.constantFrom(...stringPool),
  fc.boolean(),
  fc.constant(null),
);
const fieldValue = fc.oneof(scalar, fc.array(scalar, { maxLength: 3 }));
const seller = fc.record({ city: fieldValue, rating: fieldValue }, { requiredKeys: [] });
const documentArbitrary = fc.record(
  {
    price: fieldValue,
    maker: fieldValue,
    tags: fieldValue,
    verified: fieldValue,
    seller: fc.oneof(seller, fc.array(seller, { maxLength: 2 }), fc.constant(null)),
  },
  { requiredKeys: [] },
);

const expression = filterExpressionArbitrary(attributes, valuePool);

const keywordSet = new Set(["AND", "OR", "NOT", "TO", "IN", "EXISTS", "IS", "NULL", "EMPTY", "CONTAINS", "STARTS", "WITH"]);

/** Values print bare when they can, single-quoted when that needs no escape, double-quoted otherwise. */
function printValue(text: string): string {
  if (/^[A-Za-z0-9_.-]+$/.test(text) && !keywordSet.has(text)) return text;
  if (!text.includes("'") && !text.includes("\\")) return `'${text}'`;
  return `"${text.replace(/\\/g, "\\\\").replace(/"/g, '\\"')}"`;
}

function print(node: FilterNode): string {
  // An OR inside anything, and an AND inside anything but an OR, keep their grouping with parentheses.
  const group = (child: FilterNode, parent: "and" | "or" | "not") => {
    const needsParentheses = child.kind === "or" || (child.kind === "and" && parent !== "or");
    return needsParentheses ? `(${print(child)})` : print(child);
  };
  switch (node.kind) {
    case "or":
      return node.operands.map((child) => group(child, "or")).join(" OR ");
    case "and":
      return node.operands.map((child) => group(child, "and")).join(" AND ");
    case "not":
      return `NOT ${group(node.operand, "not")}`;
    case "comparison":
      return `${node.attribute} ${node.operator} ${printValue(node.value)}`;
    case "range":
      return `${node.attribute} ${printValue(node.from)} TO ${printValue(node.to)}`;
    case "in":
      return `${node.attribute} ${node.negated ? "NOT IN" : "IN"} [${node.values.map(printValue).join(", ")}]`;
    case "exists":
      return `${node.attribute} ${node.negated ? "NOT EXISTS" : "EXISTS"}`;
    case "isNull":
      return `${node.attribute} IS ${node.negated ? "NOT NULL" : "NULL"}`;
    case "isEmpty":
      return `${node.attribute} IS ${node.negated ? "NOT EMPTY" : "EMPTY"}`;
  }
}

// The reference: direct recursion over the generated tree, with its own reading of the document.
function rawValues(document: unknown, path: string[]): unknown[] {
  if (Array.isArray(document)) return document.flatMap((item) => (item !== null && typeof item === "object" ? rawValues(item, path) : []));
  if (document === null || typeof document !== "object") return [];
  const value = (document as Record<string, unknown>)[path[0]!];
  if (value === undefined) return [];
  return path.length === 1 ? [value] : rawValues(value, path.slice(1));
}
const leaves = (raw: unknown[]): unknown[] => raw.flatMap((value) => (Array.isArray(value) ? leaves(value) : [value]));
const asNumber = (text: string): number | null => (/^-?\d+(\.\d+)?$/.test(text) ? Number(text) : null);
// The engine's facet strings (milli `normalize_facet`, `extract_facets.rs`): trimmed, NFKD, lower case;
// booleans are the strings "true" and "false"; an empty string is no facet value.
const lower = (text: string) => text.trim().normalize("NFKD").toLowerCase();
const asText = (leaf: unknown): string | null =>
  typeof leaf === "boolean" ? String(leaf) : typeof leaf === "string" && leaf !== "" ? lower(leaf) : null;

function referenceEquals(leaf: unknown, text: string): boolean {
  if (typeof leaf === "number") return asNumber(text) === leaf;
  const own = asText(leaf);
  return own !== null && own === lower(text);
}

function referenceOrder(leaf: unknown, text: string): number | null {
  const number = asNumber(text);
  if (number !== null) return typeof leaf === "number" ? Math.sign(leaf - number) : null;
  const own = asText(leaf);
  if (own === null) return null;
  return own === lower(text) ? 0 : own < lower(text) ? -1 : 1;
}

function reference(node: FilterNode, document: Record<string, unknown>): boolean {
  if (node.kind === "or") return node.operands.some((child) => reference(child, document));
  if (node.kind === "and") return node.operands.every((child) => reference(child, document));
  if (node.kind === "not") return !reference(node.operand, document);
  const raw = rawValues(document, node.attribute.split("."));
  const values = leaves(raw);
  switch (node.kind) {
    case "exists":
      return node.negated ? raw.length === 0 : raw.length > 0;
    case "isNull":
      return node.negated ? !raw.includes(null) : raw.includes(null);
    case "isEmpty": {
      const empty = raw.some((v) => v === "" || (Array.isArray(v) && v.length === 0) || (v !== null && typeof v === "object" && !Array.isArray(v) && Object.keys(v).length === 0));
      return node.negated ? !empty : empty;
    }
    case "in": {
      const found = values.some((leaf) => node.values.some((text) => referenceEquals(leaf, text)));
      return node.negated ? !found : found;
    }
    case "range": {
      const [from, to] = [asNumber(node.from), asNumber(node.to)];
      return values.some((leaf) =>
        from !== null && to !== null
          ? typeof leaf === "number" && from <= leaf && leaf <= to
          : asText(leaf) !== null && lower(node.from) <= asText(leaf)! && asText(leaf)! <= lower(node.to),
      );
    }
    case "comparison": {
      if (node.operator === "=") return values.some((leaf) => referenceEquals(leaf, node.value));
      if (node.operator === "!=") return !values.some((leaf) => referenceEquals(leaf, node.value));
      const operator = node.operator;
      return values.some((leaf) => {
        const order = referenceOrder(leaf, node.value);
        if (order === null) return false;
        return { ">": order > 0, ">=": order >= 0, "<": order < 0, "<=": order <= 0 }[operator];
      });
    }
  }
}

describe("filter language against a reference evaluation", () => {
  it("parses what the printer writes back into the same tree", () => {
    fc.assert(
      fc.property(expression, (tree) => {
        expect(parseFilterExpression(print(tree))).toEqual(tree);
      }),
      { numRuns: 600 },
    );
  });

  it("agrees with the reference on random documents and expressions", () => {
    const outcomes = { matched: 0, missed: 0 };
    fc.assert(
      fc.property(expression, fc.array(documentArbitrary, { minLength: 1, maxLength: 8 }), (tree, documents) => {
        const parsed = parseFilterExpression(print(tree))!;
        for (const document of documents) {
          const expected = reference(tree, document);
          expect(evaluateFilter(parsed, document), `${print(tree)} on ${JSON.stringify(document)}`).toBe(expected);
          outcomes[expected ? "matched" : "missed"] += 1;
        }
      }),
      { numRuns: 800 },
    );
    // Both answers must be common, or the comparison proves little.
    expect(outcomes.matched).toBeGreaterThan(500);
    expect(outcomes.missed).toBeGreaterThan(500);
  });
});
