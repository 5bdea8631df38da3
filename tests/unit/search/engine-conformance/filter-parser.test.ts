// The stand-in's filter parser against the engine's own parser tests (see filter-parser.cases.ts for the
// source, commit and licence): every expression the engine accepts gives the same tree, printed the way
// the engine prints it, and every expression it refuses is refused.
import { describe, expect, it } from "vitest";
import { FilterSyntaxError, parseFilterExpression, type FilterNode } from "../../../../search/stand-in/filter.ts";
import { errorCases, parseCases } from "./filter-parser.cases.ts";

/** The engine's reading of a tree: NOT of NOT cancels out, and the negated conditions are NOT (…). */
function normalise(node: FilterNode): FilterNode {
  switch (node.kind) {
    case "and":
    case "or":
      return { ...node, operands: node.operands.map(normalise) };
    case "not": {
      const inner = normalise(node.operand);
      return inner.kind === "not" ? inner.operand : { kind: "not", operand: inner };
    }
    case "in":
    case "exists":
    case "isNull":
    case "isEmpty":
      return node.negated ? { kind: "not", operand: { ...node, negated: false } } : node;
    default:
      return node;
  }
}

/** The engine's `Display` of a filter condition (filter-parser `impl Display for FilterCondition`). */
function print(node: FilterNode): string {
  const token = (text: string) => `{${text}}`;
  switch (node.kind) {
    case "and":
      return `AND[${node.operands.map((operand) => `${print(operand)}, `).join("")}]`;
    case "or":
      return `OR[${node.operands.map((operand) => `${print(operand)}, `).join("")}]`;
    case "not":
      return `NOT (${print(node.operand)})`;
    case "comparison":
      return `${token(node.attribute)} ${node.operator} ${token(node.value)}`;
    case "range":
      return `${token(node.attribute)} ${token(node.from)} TO ${token(node.to)}`;
    case "in":
      return `${token(node.attribute)} IN[${node.values.map((value) => `${token(value)}, `).join("")}]`;
    case "exists":
      return `${token(node.attribute)} EXISTS`;
    case "isNull":
      return `${token(node.attribute)} IS NULL`;
    case "isEmpty":
      return `${token(node.attribute)} IS EMPTY`;
  }
}

describe("filter parser against the engine's parser tests", () => {
  it.each(parseCases)("reads %j as the engine does", (expression, expected) => {
    const parsed = parseFilterExpression(expression);
    expect(parsed).not.toBeNull();
    expect(print(normalise(parsed!))).toBe(expected);
  });

  it.each(errorCases.map((expression) => [expression]))("refuses %j as the engine does", (expression) => {
    expect(() => parseFilterExpression(expression)).toThrow(FilterSyntaxError);
  });
});
