// Random filter expression trees for the search stand-in's property tests: every condition kind of its
// filter language over the given attributes and values, combined with NOT, AND and OR.
import fc from "fast-check";
import type { ComparisonOperator, FilterNode } from "../../search/stand-in/filter.ts";

export function filterExpressionArbitrary(attributes: readonly string[], values: readonly string[]): fc.Arbitrary<FilterNode> {
  const attribute = fc.constantFrom(...attributes);
  const value = fc.constantFrom(...values);
  const condition: fc.Arbitrary<FilterNode> = fc.oneof(
    fc.record({ kind: fc.constant("comparison" as const), attribute, operator: fc.constantFrom<ComparisonOperator>("=", "!=", ">", ">=", "<", "<="), value }),
    fc.record({ kind: fc.constant("range" as const), attribute, from: value, to: value }),
    fc.record({ kind: fc.constant("in" as const), attribute, values: fc.array(value, { maxLength: 3 }), negated: fc.boolean() }),
    fc.record({ kind: fc.constant("exists" as const), attribute, negated: fc.boolean() }),
    fc.record({ kind: fc.constant("isNull" as const), attribute, negated: fc.boolean() }),
    fc.record({ kind: fc.constant("isEmpty" as const), attribute, negated: fc.boolean() }),
  );
  return fc.letrec<{ expression: FilterNode }>((tie) => ({
    expression: fc.oneof(
      { depthSize: "small", withCrossShrink: true },
      condition,
      fc.record({ kind: fc.constant("not" as const), operand: tie("expression") }),
      fc.record({ kind: fc.constant("and" as const), operands: fc.array(tie("expression"), { minLength: 2, maxLength: 3 }) }),
      fc.record({ kind: fc.constant("or" as const), operands: fc.array(tie("expression"), { minLength: 2, maxLength: 3 }) }),
    ),
  })).expression;
}
