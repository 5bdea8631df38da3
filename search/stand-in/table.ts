// The search stand-in's read side: an index's documents numbered in insertion order, with per-attribute
// columns built once (on first use after a change) instead of reading every document for every search.
// A filter runs as set operations over bitsets: equality through a value → documents map, comparisons and
// ranges by binary search over sorted values, EXISTS / IS NULL / IS EMPTY from precomputed sets. The
// results are exactly those of `evaluateFilter` (filter.ts), which stays the reference; facet counts and
// sort keys come from the same columns, so a search costs about the size of its result, not of the index.
import { facetString, filterNumber, leafValues, lookUp, normalizeFilterString, type ConditionNode, type FieldLookup, type FilterNode } from "./filter.ts";

type Document = Record<string, unknown>;

// ------------------------------------------------------------------------------------------------------
// Bitsets over document numbers

export class Bitset {
  readonly words: Uint32Array;
  constructor(readonly size: number) {
    this.words = new Uint32Array((size + 31) >>> 5);
  }

  static full(size: number): Bitset {
    const set = new Bitset(size);
    set.words.fill(0xffffffff);
    set.clearTail();
    return set;
  }

  static of(size: number, members: ArrayLike<number>): Bitset {
    const set = new Bitset(size);
    for (let i = 0; i < members.length; i += 1) set.add(members[i]!);
    return set;
  }

  add(member: number) {
    this.words[member >>> 5]! |= 1 << (member & 31);
  }

  has(member: number): boolean {
    return (this.words[member >>> 5]! & (1 << (member & 31))) !== 0;
  }

  private clearTail() {
    const extra = this.words.length * 32 - this.size;
    if (extra > 0) this.words[this.words.length - 1]! &= 0xffffffff >>> extra;
  }

  copy(): Bitset {
    const set = new Bitset(this.size);
    set.words.set(this.words);
    return set;
  }

  and(other: Bitset): this {
    for (let i = 0; i < this.words.length; i += 1) this.words[i]! &= other.words[i]!;
    return this;
  }

  or(other: Bitset): this {
    for (let i = 0; i < this.words.length; i += 1) this.words[i]! |= other.words[i]!;
    return this;
  }

  not(): this {
    for (let i = 0; i < this.words.length; i += 1) this.words[i] = ~this.words[i]!;
    this.clearTail();
    return this;
  }

  /** Members in ascending order. */
  members(): number[] {
    const members: number[] = [];
    for (let w = 0; w < this.words.length; w += 1) {
      let word = this.words[w]!;
      while (word !== 0) {
        const low = word & -word;
        members.push((w << 5) + 31 - Math.clz32(low));
        word ^= low;
      }
    }
    return members;
  }
}

// ------------------------------------------------------------------------------------------------------
// Columns

/** What the engine's field lookup finds, without walking the whole document for a plain top-level key. */
function lookUpFast(document: Document, path: string): FieldLookup {
  if (!path.includes(".")) {
    const value = Object.hasOwn(document, path) ? document[path] : undefined;
    return value === undefined ? { found: false, raw: [] } : { found: true, raw: [value] };
  }
  return lookUp(document, path);
}

function isEmptyValue(value: unknown): boolean {
  if (value === "") return true;
  if (Array.isArray(value)) return value.length === 0;
  return value !== null && typeof value === "object" && Object.keys(value).length === 0;
}

/** The keys under which a leaf equals a filter value (see `equals` in filter.ts). */
function equalityKey(leaf: unknown): string | null {
  if (typeof leaf === "number") return `n:${String(leaf)}`;
  const text = facetString(leaf);
  return text === null ? null : `s:${text}`;
}

function valueKeys(value: string): string[] {
  const keys = [`s:${normalizeFilterString(value)}`];
  const number = filterNumber(value);
  if (number !== null) keys.push(`n:${String(number)}`);
  return keys;
}

type SortedNumbers = { values: Float64Array; documents: Int32Array };
type SortedStrings = { values: string[]; documents: Int32Array };
type Facets = {
  /** Document n's distinct facet keys are keyIds[offsets[n]] … keyIds[offsets[n + 1] - 1], with their labels. */
  offsets: Int32Array;
  keyIds: Int32Array;
  labels: string[];
  keys: string[];
  /** Whether every document shows a key with the same label (else the first met in result order wins). */
  oneLabel: boolean[];
  /** The label of each key as the first document shows it. */
  keyLabels: string[];
  /** Smallest and largest number the document holds (NaN without numbers). */
  min: Float64Array;
  max: Float64Array;
};
type SortKeys = { group: Uint8Array; numbers: Float64Array; strings: (string | undefined)[] };
/** Each document's place in the column's sort order (equal keys share a rank), and the highest rank. */
type SortRanks = { ranks: Int32Array; top: number };

class Column {
  private leavesCache: unknown[][] | null = null;
  private equalityCache: Map<string, number[]> | null = null;
  private numbersCache: SortedNumbers | null = null;
  private stringsCache: SortedStrings | null = null;
  private presence: { exists: Bitset; isNull: Bitset; isEmpty: Bitset } | null = null;
  private facetsCache: Facets | null = null;
  private readonly sortCache = new Map<boolean, SortRanks>();
  private readonly bitsetCache = new Map<string, Bitset>();

  constructor(
    private readonly documents: Document[],
    private readonly path: string,
  ) {}

  get size() {
    return this.documents.length;
  }

  private leaves(): unknown[][] {
    if (!this.leavesCache) {
      const leaves: unknown[][] = new Array(this.documents.length);
      const presence = { exists: new Bitset(this.size), isNull: new Bitset(this.size), isEmpty: new Bitset(this.size) };
      for (let n = 0; n < this.documents.length; n += 1) {
        const lookup = lookUpFast(this.documents[n]!, this.path);
        if (lookup.found) presence.exists.add(n);
        if (lookup.raw.some((value) => value === null)) presence.isNull.add(n);
        if (lookup.raw.some(isEmptyValue)) presence.isEmpty.add(n);
        leaves[n] = lookup.found ? leafValues(lookup) : [];
      }
      this.leavesCache = leaves;
      this.presence = presence;
    }
    return this.leavesCache;
  }

  presenceOf(kind: "exists" | "isNull" | "isEmpty"): Bitset {
    this.leaves();
    return this.presence![kind];
  }

  private equality(): Map<string, number[]> {
    if (!this.equalityCache) {
      const map = new Map<string, number[]>();
      const leaves = this.leaves();
      for (let n = 0; n < leaves.length; n += 1) {
        for (const leaf of leaves[n]!) {
          const key = equalityKey(leaf);
          if (key === null) continue;
          let list = map.get(key);
          if (!list) map.set(key, (list = []));
          if (list[list.length - 1] !== n) list.push(n);
        }
      }
      this.equalityCache = map;
    }
    return this.equalityCache;
  }

  /** Documents with a leaf equal to any of the values (a new set, which the caller may change). */
  equalTo(values: string[]): Bitset {
    const set = new Bitset(this.size);
    const map = this.equality();
    for (const value of values) {
      for (const key of valueKeys(value)) {
        const list = map.get(key);
        if (!list) continue;
        // Common values (a status, a category) keep their set, so that a search ORs words, not documents.
        if (list.length * 32 >= this.size) {
          let cached = this.bitsetCache.get(key);
          if (!cached) this.bitsetCache.set(key, (cached = Bitset.of(this.size, list)));
          set.or(cached);
        } else {
          for (const n of list) set.add(n);
        }
      }
    }
    return set;
  }

  private numbers(): SortedNumbers {
    if (!this.numbersCache) {
      const pairs: Array<[number, number]> = [];
      const leaves = this.leaves();
      for (let n = 0; n < leaves.length; n += 1) for (const leaf of leaves[n]!) if (typeof leaf === "number") pairs.push([leaf, n]);
      pairs.sort((a, b) => a[0] - b[0]);
      this.numbersCache = { values: Float64Array.from(pairs, (pair) => pair[0]), documents: Int32Array.from(pairs, (pair) => pair[1]) };
    }
    return this.numbersCache;
  }

  private strings(): SortedStrings {
    if (!this.stringsCache) {
      const pairs: Array<[string, number]> = [];
      const leaves = this.leaves();
      for (let n = 0; n < leaves.length; n += 1) {
        for (const leaf of leaves[n]!) {
          const text = facetString(leaf);
          if (text !== null) pairs.push([text, n]);
        }
      }
      pairs.sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0));
      this.stringsCache = { values: pairs.map((pair) => pair[0]), documents: Int32Array.from(pairs, (pair) => pair[1]) };
    }
    return this.stringsCache;
  }

  /** Documents with a number leaf in [low, high] (either bound may be open or exclusive). */
  numberRange(low: number | null, lowInclusive: boolean, high: number | null, highInclusive: boolean): Bitset {
    const { values, documents } = this.numbers();
    const start = low === null ? 0 : lowerBound(values.length, (i) => (lowInclusive ? values[i]! < low : values[i]! <= low));
    const end = high === null ? values.length : lowerBound(values.length, (i) => (highInclusive ? values[i]! <= high : values[i]! < high));
    const set = new Bitset(this.size);
    for (let i = start; i < end; i += 1) set.add(documents[i]!);
    return set;
  }

  /** Documents with a string leaf whose normalized text is in the range. */
  stringRange(low: string | null, lowInclusive: boolean, high: string | null, highInclusive: boolean): Bitset {
    const { values, documents } = this.strings();
    const start = low === null ? 0 : lowerBound(values.length, (i) => (lowInclusive ? values[i]! < low : values[i]! <= low));
    const end = high === null ? values.length : lowerBound(values.length, (i) => (highInclusive ? values[i]! <= high : values[i]! < high));
    const set = new Bitset(this.size);
    for (let i = start; i < end; i += 1) set.add(documents[i]!);
    return set;
  }

  facets(): Facets {
    if (!this.facetsCache) {
      const leaves = this.leaves();
      const offsets = new Int32Array(leaves.length + 1);
      const keyIds: number[] = [];
      const labels: string[] = [];
      const keyIndex = new Map<string, number>();
      const keys: string[] = [];
      const firstLabel: string[] = [];
      const oneLabel: boolean[] = [];
      const min = new Float64Array(leaves.length).fill(NaN);
      const max = new Float64Array(leaves.length).fill(NaN);
      for (let n = 0; n < leaves.length; n += 1) {
        offsets[n] = keyIds.length;
        const seen = new Set<string>();
        for (const leaf of leaves[n]!) {
          if (typeof leaf === "number") {
            min[n] = Number.isNaN(min[n]!) ? leaf : Math.min(min[n]!, leaf);
            max[n] = Number.isNaN(max[n]!) ? leaf : Math.max(max[n]!, leaf);
          }
          if (typeof leaf !== "number" && facetString(leaf) === null) continue;
          const label = String(leaf);
          const key = typeof leaf === "number" ? label : facetString(leaf)!;
          if (seen.has(key)) continue;
          seen.add(key);
          let id = keyIndex.get(key);
          if (id === undefined) {
            id = keys.length;
            keyIndex.set(key, id);
            keys.push(key);
            firstLabel.push(label);
            oneLabel.push(true);
          } else if (firstLabel[id] !== label) {
            oneLabel[id] = false;
          }
          keyIds.push(id);
          labels.push(label);
        }
      }
      offsets[leaves.length] = keyIds.length;
      this.facetsCache = { offsets, keyIds: Int32Array.from(keyIds), labels, keys, oneLabel, keyLabels: firstLabel, min, max };
    }
    return this.facetsCache;
  }

  /** The sort key of every document (see `sortKey`: numbers before strings, missing last). */
  private sortKeys(descending: boolean): SortKeys {
    const leaves = this.leaves();
    const keys: SortKeys = { group: new Uint8Array(leaves.length), numbers: new Float64Array(leaves.length), strings: new Array(leaves.length) };
    for (let n = 0; n < leaves.length; n += 1) {
      const numbers = leaves[n]!.filter((leaf): leaf is number => typeof leaf === "number");
      if (numbers.length) {
        keys.numbers[n] = descending ? Math.max(...numbers) : Math.min(...numbers);
        continue;
      }
      const strings = leaves[n]!.map(facetString).filter((text): text is string => text !== null).sort();
      if (strings.length) {
        keys.group[n] = 1;
        keys.strings[n] = descending ? strings.at(-1)! : strings[0]!;
      } else {
        keys.group[n] = 2;
      }
    }
    return keys;
  }

  /** Every document's rank in this column's order, computed once, so that a search sorts integers. */
  sortRanks(descending: boolean): SortRanks {
    let cached = this.sortCache.get(descending);
    if (!cached) {
      const { group, numbers, strings } = this.sortKeys(descending);
      const compare = (a: number, b: number) => {
        if (group[a] !== group[b]) return group[a]! - group[b]!;
        if (group[a] === 2) return 0;
        const [left, right] = group[a] === 0 ? [numbers[a]!, numbers[b]!] : [strings[a]!, strings[b]!];
        if (left === right) return 0;
        const ascending = left < right ? -1 : 1;
        return descending ? -ascending : ascending;
      };
      const order = Array.from({ length: this.size }, (_, n) => n).sort(compare);
      const ranks = new Int32Array(this.size);
      let rank = 0;
      for (let i = 0; i < order.length; i += 1) {
        if (i > 0 && compare(order[i - 1]!, order[i]!) !== 0) rank += 1;
        ranks[order[i]!] = rank;
      }
      this.sortCache.set(descending, (cached = { ranks, top: rank }));
    }
    return cached;
  }
}

/** The first index in [0, length) for which `before` is false (it must be true, then false). */
function lowerBound(length: number, before: (index: number) => boolean): number {
  let [low, high] = [0, length];
  while (low < high) {
    const middle = (low + high) >>> 1;
    if (before(middle)) low = middle + 1;
    else high = middle;
  }
  return low;
}

// ------------------------------------------------------------------------------------------------------
// The table

export type SortRule = { attribute: string; descending: boolean };

export class DocumentTable {
  readonly keys: string[];
  readonly documents: Document[];
  private readonly numberOf: Map<string, number>;
  private readonly columns = new Map<string, Column>();

  constructor(entries: Iterable<[string, Document]>) {
    this.keys = [];
    this.documents = [];
    for (const [key, document] of entries) {
      this.keys.push(key);
      this.documents.push(document);
    }
    this.numberOf = new Map(this.keys.map((key, n) => [key, n]));
  }

  get size() {
    return this.documents.length;
  }

  numberOfKey(key: string): number | undefined {
    return this.numberOf.get(key);
  }

  /** Every document's place in one sort rule's order (equal values share a place). */
  sortRanksOf(rule: SortRule): Int32Array {
    return this.column(rule.attribute).sortRanks(rule.descending).ranks;
  }

  private column(path: string): Column {
    let column = this.columns.get(path);
    if (!column) this.columns.set(path, (column = new Column(this.documents, path)));
    return column;
  }

  /**
   * The documents a filter lets through. `memo` shares the sets of identical conditions between the
   * searches of one request (a multi-search's disjunctive facet counts repeat most conditions).
   */
  match(node: FilterNode, memo: Map<string, Bitset> = new Map()): Bitset {
    switch (node.kind) {
      case "and": {
        const [first, ...rest] = node.operands;
        const set = this.match(first!, memo).copy();
        for (const operand of rest) set.and(this.match(operand, memo));
        return set;
      }
      case "or": {
        const set = new Bitset(this.size);
        for (const operand of node.operands) set.or(this.match(operand, memo));
        return set;
      }
      case "not":
        return this.match(node.operand, memo).copy().not();
      default: {
        const key = JSON.stringify(node);
        let set = memo.get(key);
        if (!set) memo.set(key, (set = this.condition(node)));
        return set;
      }
    }
  }

  private condition(node: ConditionNode): Bitset {
    const column = this.column(node.attribute);
    switch (node.kind) {
      case "exists":
      case "isNull":
      case "isEmpty": {
        const set = column.presenceOf(node.kind);
        return node.negated ? set.copy().not() : set;
      }
      case "in": {
        const set = column.equalTo(node.values);
        return node.negated ? set.not() : set;
      }
      case "range": {
        const [low, high] = [filterNumber(node.from), filterNumber(node.to)];
        if (low !== null && high !== null) return column.numberRange(low, true, high, true);
        return column.stringRange(normalizeFilterString(node.from), true, normalizeFilterString(node.to), true);
      }
      case "comparison": {
        const { operator, value } = node;
        if (operator === "=") return column.equalTo([value]);
        if (operator === "!=") return column.equalTo([value]).not();
        const number = filterNumber(value);
        const bound = number ?? normalizeFilterString(value);
        const range = number !== null ? column.numberRange.bind(column) : column.stringRange.bind(column);
        const call = range as (low: number | string | null, lowInclusive: boolean, high: number | string | null, highInclusive: boolean) => Bitset;
        switch (operator) {
          case ">":
            return call(bound, false, null, false);
          case ">=":
            return call(bound, true, null, false);
          case "<":
            return call(null, false, bound, false);
          case "<=":
            return call(null, false, bound, true);
        }
      }
    }
  }

  /**
   * Sorts document numbers by the rules, keeping the given order among equals (the sort is stable). With
   * `limit`, only the first `limit` of that order are returned: a page needs its top, not the whole order.
   */
  sort(numbers: number[], rules: SortRule[], limit = numbers.length): number[] {
    const columns = rules.map((rule) => this.column(rule.attribute).sortRanks(rule.descending));
    // The rules' ranks folded into one number with the position as the last digit: a typed-array sort.
    let span = numbers.length;
    for (const { top } of columns) span *= top + 1;
    if (span <= Number.MAX_SAFE_INTEGER) {
      const keys = new Float64Array(numbers.length);
      for (let i = 0; i < numbers.length; i += 1) {
        let key = 0;
        for (const { ranks, top } of columns) key = key * (top + 1) + ranks[numbers[i]!]!;
        keys[i] = key * numbers.length + i;
      }
      const first = smallestSorted(keys, limit);
      return Array.from(first, (key) => numbers[key % numbers.length]!);
    }
    const sorted = [...numbers].sort((a, b) => {
      for (const { ranks } of columns) if (ranks[a] !== ranks[b]) return ranks[a]! - ranks[b]!;
      return 0;
    });
    return limit < sorted.length ? sorted.slice(0, limit) : sorted;
  }

  /** Facet counts (values case-insensitive, shown as first met in `numbers`' order) and numeric ranges. */
  facetSummary(numbers: number[], facets: string[], maxValues: number) {
    const facetDistribution: Record<string, Record<string, number>> = {};
    const facetStats: Record<string, { min: number; max: number }> = {};
    for (const facet of facets) {
      const { offsets, keyIds, labels, keys, oneLabel, keyLabels, min, max } = this.column(facet).facets();
      const counts = new Int32Array(keys.length);
      const shown: (string | undefined)[] = new Array(keys.length);
      let [low, high] = [Infinity, -Infinity];
      for (const n of numbers) {
        if (!Number.isNaN(min[n]!)) {
          if (min[n]! < low) low = min[n]!;
          if (max[n]! > high) high = max[n]!;
        }
        for (let i = offsets[n]!; i < offsets[n + 1]!; i += 1) {
          const id = keyIds[i]!;
          if (counts[id] === 0 && !oneLabel[id]) shown[id] = labels[i];
          counts[id]! += 1;
        }
      }
      const present: number[] = [];
      for (let id = 0; id < keys.length; id += 1) if (counts[id]! > 0) present.push(id);
      present.sort((a, b) => (keys[a]! < keys[b]! ? -1 : keys[a]! > keys[b]! ? 1 : 0));
      facetDistribution[facet] = Object.fromEntries(
        present.slice(0, maxValues).map((id) => [oneLabel[id] ? keyLabels[id]! : shown[id]!, counts[id]!]),
      );
      if (low !== Infinity) facetStats[facet] = { min: low, max: high };
    }
    return { facetDistribution, facetStats };
  }
}

/**
 * The `limit` smallest of distinct keys, ascending. A page of 20 out of thousands keeps a max-heap of 20
 * (n log k) instead of sorting all n; near the whole array a plain sort is quicker.
 */
export function smallestSorted(keys: Float64Array, limit: number): Float64Array {
  const k = Math.max(0, Math.min(limit, keys.length));
  if (k * 4 >= keys.length) return keys.sort().subarray(0, k);
  const heap = keys.slice(0, k);
  const siftDown = (start: number) => {
    for (let parent = start; ; ) {
      const left = 2 * parent + 1;
      if (left >= k) return;
      const child = left + 1 < k && heap[left + 1]! > heap[left]! ? left + 1 : left;
      if (heap[child]! <= heap[parent]!) return;
      [heap[parent], heap[child]] = [heap[child]!, heap[parent]!];
      parent = child;
    }
  };
  for (let i = (k >> 1) - 1; i >= 0; i -= 1) siftDown(i);
  for (let i = k; i < keys.length; i += 1) {
    if (keys[i]! < heap[0]!) {
      heap[0] = keys[i]!;
      siftDown(0);
    }
  }
  return heap.sort();
}
