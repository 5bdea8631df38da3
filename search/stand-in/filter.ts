// The search stand-in's filter language: a tokenizer and a recursive-descent parser that turn a filter
// expression into an AST, then an evaluator over one document. The grammar follows the hosted engine's
// documented filter expressions; keywords are upper case, as in its documentation.
//
//   expression := or END
//   or         := and ( "OR" and )*
//   and        := not ( "AND" not )*
//   not        := "NOT" not | primary
//   primary    := "(" or ")" | condition
//   condition  := attribute ( compare value | value "TO" value | "IN" list | "NOT" "IN" list
//                 | "EXISTS" | "NOT" "EXISTS" | "IS" ["NOT"] "NULL" | "IS" ["NOT"] "EMPTY" )
//   list       := "[" [ value ( "," value )* [","] ] "]"
//   attribute, value := unquoted word | 'single quoted' | "double quoted"
//
// As in the engine's parser (its `filter-parser` crate): an unquoted word is letters, digits, `_`, `-` and
// `.` only; keywords (and CONTAINS, STARTS, WITH) must be quoted to be values; inside quotes a backslash
// escapes the quote and the sequences \b \f \n \r \t \' \" \\ \xHH \u{H…} and octal, any other
// escape is refused; nesting deeper than 150 levels (each parenthesis four, each NOT one) is refused.

export type ComparisonOperator = "=" | "!=" | ">" | ">=" | "<" | "<=";

export type FilterNode =
  | { kind: "or"; operands: FilterNode[] }
  | { kind: "and"; operands: FilterNode[] }
  | { kind: "not"; operand: FilterNode }
  | { kind: "comparison"; attribute: string; operator: ComparisonOperator; value: string }
  | { kind: "range"; attribute: string; from: string; to: string }
  | { kind: "in"; attribute: string; values: string[]; negated: boolean }
  | { kind: "exists"; attribute: string; negated: boolean }
  | { kind: "isNull"; attribute: string; negated: boolean }
  | { kind: "isEmpty"; attribute: string; negated: boolean };

export type ConditionNode = Exclude<FilterNode, { kind: "or" | "and" | "not" }>;

export const FILTER_KEYWORDS = ["AND", "OR", "NOT", "TO", "IN", "EXISTS", "IS", "NULL", "EMPTY", "CONTAINS", "STARTS", "WITH"] as const;

/** The engine's `MAX_FILTER_DEPTH`. */
export const MAX_FILTER_DEPTH = 150;
const keywords = new Set<string>(FILTER_KEYWORDS);

/** A bad filter: `position` is the 0-based offset in the expression where the parser gave up. */
export class FilterSyntaxError extends Error {
  override name = "FilterSyntaxError";
  constructor(
    readonly expression: string,
    readonly position: number,
    readonly problem: string,
  ) {
    super(`Filter syntax error at column ${position + 1}: ${problem}\n${expression}\n${" ".repeat(position)}^`);
  }
}

type TokenKind = "word" | "quoted" | "(" | ")" | "[" | "]" | "," | "operator" | "end";
type Token = { kind: TokenKind; text: string; start: number; end: number };

// What an unquoted word may hold (Rust's `char::is_alphanumeric`, `_`, `-`, `.`).
const wordCharacter = /[\p{Alphabetic}\p{N}_.\-]/u;

const simpleEscapes: Record<string, string> = { b: "\b", f: "\f", n: "\n", r: "\r", t: "\t", "'": "'", '"': '"', "\\": "\\" };

/** The text between quotes with its escapes resolved, or the offset (in `body`) of a refused escape. */
function unescapeQuoted(body: string): string | number {
  let text = "";
  for (let i = 0; i < body.length; i += 1) {
    const char = body[i]!;
    if (char !== "\\") {
      text += char;
      continue;
    }
    const next = body[i + 1];
    if (next === undefined) return i;
    if (next in simpleEscapes) {
      text += simpleEscapes[next];
      i += 1;
    } else if (next === "x") {
      const hex = /^[0-9a-fA-F]{2}/.exec(body.slice(i + 2));
      if (!hex || parseInt(hex[0], 16) > 0x7f) return i;
      text += String.fromCharCode(parseInt(hex[0], 16));
      i += 3;
    } else if (next === "u") {
      const braced = /^\{([0-9a-fA-F]{1,6})\}/.exec(body.slice(i + 2));
      const plain = /^[0-9a-fA-F]{4}/.exec(body.slice(i + 2));
      const code = braced ? parseInt(braced[1]!, 16) : plain ? parseInt(plain[0], 16) : NaN;
      if (!Number.isFinite(code) || code > 0x10ffff || (code >= 0xd800 && code <= 0xdfff)) return i;
      text += String.fromCodePoint(code);
      i += 1 + (braced ? braced[0].length : 4);
    } else if (/[0-7]/.test(next)) {
      const octal = /^[0-7]{1,3}/.exec(body.slice(i + 1))![0];
      const code = parseInt(octal, 8);
      if (code > 0x7f) return i;
      text += String.fromCharCode(code);
      i += octal.length;
    } else {
      return i;
    }
  }
  return text;
}

function tokenize(expression: string): Token[] {
  const tokens: Token[] = [];
  let index = 0;
  while (index < expression.length) {
    const char = expression[index]!;
    if (/\s/.test(char)) {
      index += 1;
      continue;
    }
    const start = index;
    if ("()[],".includes(char)) {
      tokens.push({ kind: char as TokenKind, text: char, start, end: index + 1 });
      index += 1;
    } else if (char === "=" || char === "<" || char === ">" || char === "!") {
      const two = expression.slice(index, index + 2);
      if (two === "!=" || two === "<=" || two === ">=") {
        tokens.push({ kind: "operator", text: two, start, end: index + 2 });
        index += 2;
      } else if (char === "!") {
        throw new FilterSyntaxError(expression, start, "found `!` alone; the operator for “not equal” is `!=`.");
      } else {
        tokens.push({ kind: "operator", text: char, start, end: index + 1 });
        index += 1;
      }
    } else if (char === "'" || char === '"') {
      index += 1;
      let closed = false;
      while (index < expression.length) {
        const inner = expression[index]!;
        if (inner === "\\" && index + 1 < expression.length) {
          index += 2;
        } else if (inner === char) {
          closed = true;
          break;
        } else {
          index += 1;
        }
      }
      if (!closed) throw new FilterSyntaxError(expression, start, `the value quoted with ${char} that opens here is never closed.`);
      const text = unescapeQuoted(expression.slice(start + 1, index));
      if (typeof text === "number") {
        throw new FilterSyntaxError(expression, start + 1 + text, "this escape is not one the filter language knows (write a backslash as `\\\\`).");
      }
      index += 1;
      tokens.push({ kind: "quoted", text, start, end: index });
    } else if (wordCharacter.test(codePointAt(expression, index))) {
      while (index < expression.length && wordCharacter.test(codePointAt(expression, index))) index += codePointAt(expression, index).length;
      tokens.push({ kind: "word", text: expression.slice(start, index), start, end: index });
    } else {
      throw new FilterSyntaxError(expression, start, `\`${codePointAt(expression, index)}\` cannot be part of an unquoted value or attribute; put the value in quotes.`);
    }
  }
  tokens.push({ kind: "end", text: "", start: expression.length, end: expression.length });
  return tokens;
}

/** The whole character at `index` (two code units for one outside the basic plane). */
function codePointAt(text: string, index: number): string {
  return String.fromCodePoint(text.codePointAt(index)!);
}

const attributePositions = new WeakMap<ConditionNode, number>();

/** Where the attribute of a parsed condition starts in its expression (for “not filterable” messages). */
export function attributePosition(node: ConditionNode): number | undefined {
  return attributePositions.get(node);
}

class Parser {
  private index = 0;
  constructor(
    private readonly expression: string,
    private readonly tokens: Token[],
  ) {}

  parse(): FilterNode {
    const node = this.parseOr(0);
    const next = this.peek();
    if (next.kind !== "end") {
      this.fail(next, next.kind === ")" ? "found a `)` that closes nothing." : `expected \`AND\`, \`OR\` or the end of the filter, found ${describe(next)}.`);
    }
    return node;
  }

  private peek(offset = 0): Token {
    return this.tokens[Math.min(this.index + offset, this.tokens.length - 1)]!;
  }

  private advance(): Token {
    const token = this.peek();
    if (token.kind !== "end") this.index += 1;
    return token;
  }

  private isKeyword(token: Token, keyword: (typeof FILTER_KEYWORDS)[number]): boolean {
    return token.kind === "word" && token.text === keyword;
  }

  private fail(token: Token, problem: string): never {
    throw new FilterSyntaxError(this.expression, token.start, problem);
  }

  /** Depth is counted as the engine counts it: one per level of or, and, not and primary. */
  private checkDepth(depth: number) {
    if (depth > MAX_FILTER_DEPTH) {
      this.fail(this.peek(), `the filter nests deeper than the ${MAX_FILTER_DEPTH} levels allowed; rewrite it with fewer nested conditions.`);
    }
  }

  private parseOr(depth: number): FilterNode {
    this.checkDepth(depth);
    const operands = [this.parseAnd(depth + 1)];
    while (this.isKeyword(this.peek(), "OR")) {
      this.advance();
      operands.push(this.parseAnd(depth + 1));
    }
    return operands.length === 1 ? operands[0]! : { kind: "or", operands };
  }

  private parseAnd(depth: number): FilterNode {
    this.checkDepth(depth);
    const operands = [this.parseNot(depth + 1)];
    while (this.isKeyword(this.peek(), "AND")) {
      this.advance();
      operands.push(this.parseNot(depth + 1));
    }
    return operands.length === 1 ? operands[0]! : { kind: "and", operands };
  }

  private parseNot(depth: number): FilterNode {
    this.checkDepth(depth);
    if (this.isKeyword(this.peek(), "NOT")) {
      this.advance();
      return { kind: "not", operand: this.parseNot(depth + 1) };
    }
    return this.parsePrimary(depth + 1);
  }

  private parsePrimary(depth: number): FilterNode {
    this.checkDepth(depth);
    const token = this.peek();
    if (token.kind === "(") {
      this.advance();
      const inner = this.parseOr(depth + 1);
      const closing = this.peek();
      if (closing.kind !== ")") this.fail(closing, `expected \`)\` to close the \`(\` at column ${token.start + 1}, found ${describe(closing)}.`);
      this.advance();
      return inner;
    }
    return this.parseCondition();
  }

  private parseCondition(): ConditionNode {
    const attributeToken = this.peek();
    if (!this.isOperand(attributeToken)) {
      this.fail(attributeToken, `expected an attribute, \`NOT\` or \`(\`, found ${describe(attributeToken)}.`);
    }
    if (attributeToken.kind === "word" && attributeToken.text.startsWith("_geo")) {
      this.fail(attributeToken, `\`${attributeToken.text}\` (geographic filtering) is not supported by the search stand-in.`);
    }
    this.advance();
    const attribute = attributeToken.text;
    const node = this.parseOperation(attribute, attributeToken);
    attributePositions.set(node, attributeToken.start);
    return node;
  }

  private parseOperation(attribute: string, attributeToken: Token): ConditionNode {
    const token = this.peek();
    if (token.kind === "operator") {
      this.advance();
      const value = this.parseValue(`after \`${token.text}\``);
      return { kind: "comparison", attribute, operator: token.text as ComparisonOperator, value };
    }
    if (this.isKeyword(token, "IN")) {
      this.advance();
      return { kind: "in", attribute, values: this.parseList(), negated: false };
    }
    if (this.isKeyword(token, "EXISTS")) {
      this.advance();
      return { kind: "exists", attribute, negated: false };
    }
    if (this.isKeyword(token, "NOT")) {
      this.advance();
      const next = this.peek();
      if (this.isKeyword(next, "IN")) {
        this.advance();
        return { kind: "in", attribute, values: this.parseList(), negated: true };
      }
      if (this.isKeyword(next, "EXISTS")) {
        this.advance();
        return { kind: "exists", attribute, negated: true };
      }
      this.fail(next, `expected \`IN\` or \`EXISTS\` after \`${attribute} NOT\`, found ${describe(next)}.`);
    }
    if (this.isKeyword(token, "IS")) {
      this.advance();
      let negated = false;
      if (this.isKeyword(this.peek(), "NOT")) {
        this.advance();
        negated = true;
      }
      const next = this.peek();
      if (this.isKeyword(next, "NULL")) {
        this.advance();
        return { kind: "isNull", attribute, negated };
      }
      if (this.isKeyword(next, "EMPTY")) {
        this.advance();
        return { kind: "isEmpty", attribute, negated };
      }
      this.fail(next, `expected \`NULL\` or \`EMPTY\` after \`${attribute} IS${negated ? " NOT" : ""}\`, found ${describe(next)}.`);
    }
    if (this.isOperand(token) && this.isKeyword(this.peek(1), "TO")) {
      this.advance();
      this.advance();
      const to = this.parseValue("after `TO`");
      return { kind: "range", attribute, from: token.text, to };
    }
    if (this.isOperand(token)) {
      this.fail(this.peek(1), `expected \`TO\` after \`${attribute} ${token.text}\` (a range is written \`${attribute} 10 TO 20\`), found ${describe(this.peek(1))}.`);
    }
    return this.fail(
      token,
      `expected an operator after \`${attributeToken.text}\` (one of =, !=, >, >=, <, <=, TO, IN, NOT IN, EXISTS, NOT EXISTS, IS NULL, IS NOT NULL, IS EMPTY, IS NOT EMPTY), found ${describe(token)}.`,
    );
  }

  private parseValue(where: string): string {
    const token = this.peek();
    if (token.kind === "word" && (token.text === "_geoRadius" || token.text === "_geoBoundingBox")) {
      this.fail(token, `\`${token.text}\` is a reserved keyword; quote it to use it as a value.`);
    }
    if (!this.isOperand(token)) {
      this.fail(token, `expected a value ${where}, found ${describe(token)}${token.kind === "word" ? " (quote it to use a keyword as a value)" : ""}.`);
    }
    this.advance();
    return token.text;
  }

  private parseList(): string[] {
    const opening = this.peek();
    if (opening.kind !== "[") this.fail(opening, `expected \`[\` to open the list of values, found ${describe(opening)}.`);
    this.advance();
    const values: string[] = [];
    while (this.peek().kind !== "]") {
      values.push(this.parseValue("in the list"));
      const separator = this.peek();
      if (separator.kind === ",") this.advance();
      else if (separator.kind !== "]") this.fail(separator, `expected \`,\` or \`]\` in the list that opens at column ${opening.start + 1}, found ${describe(separator)}.`);
    }
    this.advance();
    return values;
  }

  /** A word that is not a keyword, or any quoted text. */
  private isOperand(token: Token): boolean {
    return token.kind === "quoted" || (token.kind === "word" && !keywords.has(token.text));
  }
}

function describe(token: Token): string {
  if (token.kind === "end") return "the end of the filter";
  if (token.kind === "quoted") return `the quoted value "${token.text}"`;
  if (token.kind === "word" && keywords.has(token.text)) return `the keyword \`${token.text}\``;
  return `\`${token.text}\``;
}

/** Parses one filter expression; an empty or blank expression means “no filter” (null). */
export function parseFilterExpression(expression: string): FilterNode | null {
  if (expression.trim() === "") return null;
  return new Parser(expression, tokenize(expression)).parse();
}

/** The request form: a string, or an array whose items are ANDed and whose inner arrays are ORed. */
export type FilterInput = string | Array<string | string[]> | null | undefined;

export class FilterShapeError extends Error {
  override name = "FilterShapeError";
}

export function parseFilter(input: unknown): FilterNode | null {
  if (input === null || input === undefined) return null;
  if (typeof input === "string") return parseFilterExpression(input);
  if (!Array.isArray(input)) throw new FilterShapeError("A filter must be a string or an array of strings and arrays of strings.");
  const operands: FilterNode[] = [];
  for (const item of input) {
    if (typeof item === "string") {
      const node = parseFilterExpression(item);
      if (node) operands.push(node);
    } else if (Array.isArray(item)) {
      const alternatives: FilterNode[] = [];
      for (const inner of item) {
        if (typeof inner !== "string") throw new FilterShapeError("The inner arrays of a filter may only hold strings.");
        const node = parseFilterExpression(inner);
        if (node) alternatives.push(node);
      }
      if (alternatives.length === 1) operands.push(alternatives[0]!);
      else if (alternatives.length > 1) operands.push({ kind: "or", operands: alternatives });
    } else {
      throw new FilterShapeError("A filter array may only hold strings and arrays of strings.");
    }
  }
  if (operands.length === 0) return null;
  return operands.length === 1 ? operands[0]! : { kind: "and", operands };
}

/** Every condition in the tree, for the “is this attribute filterable” check. */
export function conditionsOf(node: FilterNode): ConditionNode[] {
  switch (node.kind) {
    case "or":
    case "and":
      return node.operands.flatMap(conditionsOf);
    case "not":
      return conditionsOf(node.operand);
    default:
      return [node];
  }
}

// ---------------------------------------------------------------------------------------------------------
// Evaluation

/** What a document holds at a (possibly dotted) attribute: the raw values found and whether any was found. */
export type FieldLookup = { found: boolean; raw: unknown[] };

/**
 * Finds `path` in a document the way the engine flattens nested objects: `a.b` reaches `{ a: { b } }`,
 * `{ "a.b": … }` and `{ a: [{ b }, { b }] }` alike.
 */
export function lookUp(document: unknown, path: string): FieldLookup {
  const raw: unknown[] = [];
  collect(document, path, raw);
  return { found: raw.length > 0, raw };
}

function collect(node: unknown, path: string, into: unknown[]) {
  if (Array.isArray(node)) {
    for (const item of node) if (item !== null && typeof item === "object") collect(item, path, into);
    return;
  }
  if (node === null || typeof node !== "object") return;
  for (const [key, value] of Object.entries(node as Record<string, unknown>)) {
    if (value === undefined) continue;
    if (key === path) into.push(value);
    else if (path.startsWith(`${key}.`)) collect(value, path.slice(key.length + 1), into);
  }
}

/** The scalar values behind a lookup, arrays flattened: a condition matches if any one of them does. */
export function leafValues(lookup: FieldLookup): unknown[] {
  const leaves: unknown[] = [];
  const flatten = (value: unknown) => {
    if (Array.isArray(value)) value.forEach(flatten);
    else leaves.push(value);
  };
  lookup.raw.forEach(flatten);
  return leaves;
}

const numberPattern = /^[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?$/;

/** A filter value is compared as a number when it reads as one (quoted or not). */
export function filterNumber(value: string): number | null {
  const trimmed = value.trim();
  if (!numberPattern.test(trimmed)) return null;
  const number = Number(trimmed);
  return Number.isFinite(number) ? number : null;
}

/**
 * String values compare as the engine's `normalize_facet` makes them: without surrounding white space,
 * compatibility-decomposed (so a composed and a decomposed “Î” are one value), lower case.
 */
export function normalizeFilterString(value: string): string {
  return value.trim().normalize("NFKD").toLowerCase();
}

/**
 * The text a leaf is filtered, faceted and sorted by, or null: booleans are the strings `true` and
 * `false`, and an empty string is no value at all (the engine leaves it out of its facet values).
 */
export function facetString(leaf: unknown): string | null {
  if (typeof leaf === "boolean") return String(leaf);
  if (typeof leaf === "string" && leaf !== "") return normalizeFilterString(leaf);
  return null;
}

function equals(leaf: unknown, value: string): boolean {
  if (typeof leaf === "number") {
    const number = filterNumber(value);
    return number !== null && leaf === number;
  }
  const text = facetString(leaf);
  return text !== null && text === normalizeFilterString(value);
}

/** Orders a leaf against a filter value: numbers against numeric values, strings lexicographically otherwise. */
function compare(leaf: unknown, value: string): number | null {
  const number = filterNumber(value);
  if (number !== null) return typeof leaf === "number" ? leaf - number : null;
  const a = facetString(leaf);
  if (a === null) return null;
  const b = normalizeFilterString(value);
  return a < b ? -1 : a > b ? 1 : 0;
}

function inRange(leaf: unknown, from: string, to: string): boolean {
  const [low, high] = [filterNumber(from), filterNumber(to)];
  if (low !== null && high !== null) return typeof leaf === "number" && leaf >= low && leaf <= high;
  const text = facetString(leaf);
  if (text === null) return false;
  return text >= normalizeFilterString(from) && text <= normalizeFilterString(to);
}

function isEmptyValue(value: unknown): boolean {
  if (value === "") return true;
  if (Array.isArray(value)) return value.length === 0;
  return value !== null && typeof value === "object" && Object.keys(value).length === 0;
}

export function evaluateFilter(node: FilterNode, document: unknown): boolean {
  switch (node.kind) {
    case "or":
      return node.operands.some((operand) => evaluateFilter(operand, document));
    case "and":
      return node.operands.every((operand) => evaluateFilter(operand, document));
    case "not":
      return !evaluateFilter(node.operand, document);
    case "exists":
      return lookUp(document, node.attribute).found !== node.negated;
    case "isNull":
      return lookUp(document, node.attribute).raw.some((value) => value === null) !== node.negated;
    case "isEmpty":
      return lookUp(document, node.attribute).raw.some(isEmptyValue) !== node.negated;
    case "in": {
      const leaves = leafValues(lookUp(document, node.attribute));
      return leaves.some((leaf) => node.values.some((value) => equals(leaf, value))) !== node.negated;
    }
    case "range":
      return leafValues(lookUp(document, node.attribute)).some((leaf) => inRange(leaf, node.from, node.to));
    case "comparison": {
      const leaves = leafValues(lookUp(document, node.attribute));
      switch (node.operator) {
        case "=":
          return leaves.some((leaf) => equals(leaf, node.value));
        case "!=":
          return !leaves.some((leaf) => equals(leaf, node.value));
        default: {
          const test = { ">": (d: number) => d > 0, ">=": (d: number) => d >= 0, "<": (d: number) => d < 0, "<=": (d: number) => d <= 0 }[node.operator];
          return leaves.some((leaf) => {
            const difference = compare(leaf, node.value);
            return difference !== null && test(difference);
          });
        }
      }
    }
  }
}
