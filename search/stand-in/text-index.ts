// Full-text matching for the search stand-in, following the engine's documented and coded rules:
// words split on separators and normalised (compatibility decomposition, marks removed, lower case); the
// last query word matches as a prefix; typos by word length (none under `oneTypo` letters, one from
// `oneTypo`, two from `twoTypos`), where a swap of two adjacent letters is one typo and a typo on the first
// letter counts as two (so it needs a word long enough for two); the matching strategies `last`,
// `frequency` and `all`. For each matching document it returns what the engine's ranking rules compare
// (words, typo, proximity, attribute rank, word position, exactness); `ranking.ts` orders by them.
//
// Our own code rather than a text-search package: none on npm applies the engine's typo rules (first
// letter, transpositions) or reports per-word typo counts and positions for its bucket sort.
import { leafValues, lookUp } from "./filter.ts";

export type TypoSettings = {
  enabled: boolean;
  oneTypo: number;
  twoTypos: number;
  /** Words matched exactly only (`typoTolerance.disableOnWords`). */
  disableOnWords: string[];
  /** Attributes matched exactly only (`typoTolerance.disableOnAttributes`). */
  disableOnAttributes: string[];
  /** No typos on numbers (`typoTolerance.disableOnNumbers`). */
  disableOnNumbers: boolean;
};

export type MatchingStrategy = "last" | "all" | "frequency";

/** What the ranking rules compare for one matching document; lower is better everywhere. */
export type TextMatch = {
  /** How many query words had to be dropped for the document to match (the `words` rule). */
  dropped: number;
  /** Typos summed over the words kept (`typo`). */
  typos: number;
  /** Distance between consecutive kept words, 0 (adjacent) to 3 (apart or in other attributes) each (`proximity`). */
  proximity: number;
  /** Rank of the best searchable attribute of each kept word, summed (`attributeRank`). */
  attributeRank: number;
  /** Position of each kept word in its attribute, summed (`wordPosition`). */
  wordPosition: number;
  /** 0: an attribute is exactly the query; 1: one starts with it; 2: neither (first half of `exactness`). */
  exactAttribute: number;
  /** Kept words matched by a typo or as a prefix rather than as typed (second half of `exactness`). */
  inexactWords: number;
};

/** How many query words' derivations are kept between searches. */
const MAX_CACHED_DERIVATIONS = 10_000;

/** The engine considers the first ten words of a query. */
export const MAX_QUERY_WORDS = 10;
/** The proximity cost of two words that are not near each other, as the engine caps it. */
const FAR = 3;

/** Lower case, compatibility-decomposed, without marks: “Präzision”, “PRÄZISION” and “prazision” are one word. */
export function normalizeText(text: string): string {
  return text.normalize("NFKD").replace(/\p{M}/gu, "").toLowerCase();
}

/** The normalised words of a text, in order (separators are anything but letters and digits). */
export function tokenize(text: string): string[] {
  return normalizeText(text)
    .split(/[^\p{L}\p{N}]+/u)
    .filter((word) => word !== "");
}

// The engine's hard separators (its documentation, “Data types”): words they part are 8 positions apart,
// as are the values of an array; other separators part words by 1.
const hardSeparator = /[.;,!?()[\]{}|]/;
const HARD_GAP = 8;

/** The words of a text with their positions, the first at `start`; returns the position after the last. */
function positionedWords(text: string, start: number, into: Array<[string, number]>): number {
  const pieces = normalizeText(text).split(/([^\p{L}\p{N}]+)/u);
  let position = start;
  let first = true;
  for (let i = 0; i < pieces.length; i += 2) {
    const word = pieces[i]!;
    const separator = pieces[i - 1] ?? "";
    if (word === "") continue;
    if (!first) position += hardSeparator.test(separator) ? HARD_GAP : 1;
    into.push([word, position]);
    first = false;
  }
  return first ? start : position + HARD_GAP;
}

/**
 * Optimal-string-alignment distance between `word` and `candidate` (a swap of adjacent letters is one
 * edit), or — with `prefix` — the smallest distance between `word` and any prefix of `candidate`, as the
 * engine's Levenshtein automata with transpositions compute it. Returns `limit + 1` past `limit`.
 */
export function typoDistance(word: string[], candidate: string[], limit: number, prefix: boolean): number {
  const [n, m] = [word.length, candidate.length];
  if (!prefix && Math.abs(n - m) > limit) return limit + 1;
  if (n === 0) return prefix ? 0 : Math.min(m, limit + 1);
  let before: number[] = [];
  let previous = Array.from({ length: m + 1 }, (_, j) => j);
  for (let i = 1; i <= n; i += 1) {
    const current = new Array<number>(m + 1);
    current[0] = i;
    let rowMinimum = i;
    for (let j = 1; j <= m; j += 1) {
      const cost = word[i - 1] === candidate[j - 1] ? 0 : 1;
      let value = Math.min(previous[j]! + 1, current[j - 1]! + 1, previous[j - 1]! + cost);
      if (i > 1 && j > 1 && word[i - 1] === candidate[j - 2] && word[i - 2] === candidate[j - 1]) value = Math.min(value, before[j - 2]! + 1);
      current[j] = value;
      if (value < rowMinimum) rowMinimum = value;
    }
    // Every later row is at least this row's minimum (a swap reaches back one row, at a cost of one).
    if (rowMinimum > limit) return limit + 1;
    [before, previous] = [previous, current];
  }
  const best = prefix ? Math.min(...previous) : previous[m]!;
  return Math.min(best, limit + 1);
}

/** How many typos a query word may have (the engine's `number_of_typos_allowed`). */
export function typosAllowed(word: string, settings: TypoSettings): number {
  const length = [...word].length;
  if (!settings.enabled || length < settings.oneTypo) return 0;
  if (settings.disableOnWords.some((exact) => normalizeText(exact) === word)) return 0;
  if (settings.disableOnNumbers && /^\p{N}+$/u.test(word)) return 0;
  return length < settings.twoTypos ? 1 : 2;
}

/**
 * The typos a dictionary word costs as a derivation of the query word, or null when it is not one. A
 * different first letter is only tolerated where two typos are, and then counts as two.
 */
export function derivationTypos(word: string, candidate: string, allowed: number, prefix: boolean): number | null {
  if (candidate === word || (prefix && candidate.startsWith(word))) return 0;
  if (allowed === 0) return null;
  const [a, b] = [[...word], [...candidate]];
  const sameFirst = a[0] === b[0];
  if (!sameFirst) {
    if (allowed < 2) return null;
    return typoDistance(a, b, 1, prefix) <= 1 ? 2 : null;
  }
  const distance = typoDistance(a, b, allowed, prefix);
  return distance >= 1 && distance <= allowed ? distance : null;
}

type Occurrence = { field: number; position: number };
type Posting = Map<string, Occurrence[]>;

/** Every dotted path in a document that leads to text or numbers (what `searchableAttributes: ["*"]` means). */
function searchablePaths(document: unknown, prefix = "", into = new Set<string>()): Set<string> {
  if (Array.isArray(document)) {
    for (const item of document) searchablePaths(item, prefix, into);
  } else if (document !== null && typeof document === "object") {
    for (const [key, value] of Object.entries(document)) searchablePaths(value, prefix ? `${prefix}.${key}` : key, into);
  } else if ((typeof document === "string" || typeof document === "number") && prefix) {
    into.add(prefix);
  }
  return into;
}

type Built = {
  fields: string[];
  postings: Map<string, Posting>;
  /** Each document's words per field, for the exact-attribute rule. */
  fieldWords: Map<string, string[][]>;
  /** The dictionary, for typo derivations. */
  words: string[];
  derivations: Map<string, Array<[string, number]>>;
};

export class TextIndex {
  private built: Built | null = null;

  constructor(
    private searchableAttributes: string[],
    private typo: TypoSettings,
    private readonly allDocuments: () => Iterable<[string, Record<string, unknown>]>,
  ) {}

  configure(searchableAttributes: string[], typo: TypoSettings) {
    this.searchableAttributes = searchableAttributes;
    this.typo = typo;
    this.built = null;
  }

  /** Index changes are applied lazily: the next search rebuilds. */
  invalidate() {
    this.built = null;
  }

  upsert(_key: string, _document: Record<string, unknown>, _replaced: boolean) {
    this.built = null;
  }

  remove(_key: string) {
    this.built = null;
  }

  private build(): Built {
    const documents = [...this.allDocuments()];
    let fields: string[];
    if (this.searchableAttributes.includes("*")) {
      const paths = new Set<string>();
      for (const [, document] of documents) searchablePaths(document, "", paths);
      fields = [...paths];
    } else {
      fields = [...this.searchableAttributes];
    }
    const postings = new Map<string, Posting>();
    const fieldWords = new Map<string, string[][]>();
    for (const [key, document] of documents) {
      const perField: string[][] = [];
      fields.forEach((field, fieldIndex) => {
        const leaves = leafValues(lookUp(document, field)).filter((value) => typeof value === "string" || typeof value === "number");
        const positioned: Array<[string, number]> = [];
        let next = 0;
        for (const leaf of leaves) next = positionedWords(String(leaf), next, positioned);
        perField.push(positioned.map(([word]) => word));
        positioned.forEach(([word, position]) => {
          let posting = postings.get(word);
          if (!posting) postings.set(word, (posting = new Map()));
          let occurrences = posting.get(key);
          if (!occurrences) posting.set(key, (occurrences = []));
          occurrences.push({ field: fieldIndex, position });
        });
      });
      fieldWords.set(key, perField);
    }
    return { fields, postings, fieldWords, words: [...postings.keys()], derivations: new Map() };
  }

  /** Dictionary words a query word matches, with the typos each costs. */
  private derive(built: Built, word: string, prefix: boolean): Array<[string, number]> {
    const cacheKey = `${prefix ? "p" : "w"}:${word}`;
    const cached = built.derivations.get(cacheKey);
    if (cached) return cached;
    const allowed = typosAllowed(word, this.typo);
    const found: Array<[string, number]> = [];
    for (const candidate of built.words) {
      const typos = derivationTypos(word, candidate, allowed, prefix);
      if (typos !== null) found.push([candidate, typos]);
    }
    // Bounded, so that a stream of distinct query words cannot grow it without end.
    if (built.derivations.size >= MAX_CACHED_DERIVATIONS) built.derivations.clear();
    built.derivations.set(cacheKey, found);
    return found;
  }

  /**
   * The matching documents (by key) with what the ranking rules compare; `wanted` names the measures the
   * index's ranking rules use (the others are left at 0, which saves their cost).
   */
  search(
    query: string,
    matchingStrategy: MatchingStrategy,
    wanted: ReadonlySet<keyof TextMatch> = allMeasures,
    narrowing: Narrowing = { byTypo: false, byExactness: false },
  ): Map<string, TextMatch> {
    this.built ??= this.build();
    const built = this.built;
    const terms = tokenize(query).slice(0, MAX_QUERY_WORDS);
    const result = new Map<string, TextMatch>();
    if (terms.length === 0) return result;
    // The last word may still be being typed, unless a separator follows it.
    const lastIsPrefix = !/[^\p{L}\p{N}\p{M}]$/u.test(query.normalize("NFKD"));
    const exactOnly = new Set(this.typo.disableOnAttributes.map((attribute) => built.fields.indexOf(attribute)).filter((index) => index >= 0));

    // Per query word: for each document, the fewest typos it matched with, whether it matched as typed,
    // and where (`own` once the occurrences list is a copy that may be extended).
    // `occurrences` are those of the derivations the positional measures may use: as the engine's rules
    // hand a narrower query to the rules after them, a `typo` rule before them keeps each word's
    // fewest-typo derivations, an `exactness` rule its as-typed one.
    type WordHit = { typos: number; asTyped: boolean; occurrences: Occurrence[]; own: boolean; rank: number };
    const rankOf = (typos: number, asTyped: boolean) => (narrowing.byExactness && asTyped ? -1 : narrowing.byTypo ? typos : 0);
    const hits = terms.map((term, index) => {
      const prefix = lastIsPrefix && index === terms.length - 1;
      const perDocument = new Map<string, WordHit>();
      for (const [candidate, typos] of this.derive(built, term, prefix)) {
        const asTyped = candidate === term;
        for (const [key, occurrences] of built.postings.get(candidate)!) {
          // Attributes without typo tolerance only count matches without typos.
          const usable = typos > 0 && exactOnly.size ? occurrences.filter((occurrence) => !exactOnly.has(occurrence.field)) : occurrences;
          if (!usable.length) continue;
          const hit = perDocument.get(key);
          if (!hit) {
            perDocument.set(key, { typos, asTyped, occurrences: usable, own: false, rank: rankOf(typos, asTyped) });
          } else {
            hit.typos = Math.min(hit.typos, typos);
            hit.asTyped ||= asTyped;
            const rank = rankOf(typos, asTyped);
            if (rank < hit.rank) {
              [hit.occurrences, hit.own, hit.rank] = [usable, false, rank];
            } else if (rank === hit.rank) {
              if (!hit.own) [hit.occurrences, hit.own] = [[...hit.occurrences], true];
              for (const occurrence of usable) hit.occurrences.push(occurrence);
            }
          }
        }
      }
      return perDocument;
    });

    // The order in which words are dropped: from the end (`last`), the most frequent first (`frequency`),
    // none (`all`). The first word kept by `last` and the rarest by `frequency` are never dropped.
    const indexes = terms.map((_, index) => index);
    const removal =
      matchingStrategy === "all"
        ? []
        : matchingStrategy === "last"
          ? indexes.slice(1).reverse()
          : [...indexes].sort((a, b) => hits[b]!.size - hits[a]!.size || b - a).slice(0, -1);
    // How many words must be dropped before word i is: never-dropped words cannot be missing.
    const dropsBefore = indexes.map((index) => removal.indexOf(index));

    const candidates = new Set<string>();
    for (const perDocument of hits) for (const key of perDocument.keys()) candidates.add(key);
    const keptHits: WordHit[] = [];
    const keptTerms: string[] = [];
    const keptIndexes: number[] = [];
    for (const key of candidates) {
      // The fewest words dropped: every missing word must be among them.
      let dropped = 0;
      let matches = true;
      for (const index of indexes) {
        if (hits[index]!.has(key)) continue;
        if (dropsBefore[index]! < 0) {
          matches = false;
          break;
        }
        dropped = Math.max(dropped, dropsBefore[index]! + 1);
      }
      if (!matches) continue;
      keptHits.length = 0;
      keptTerms.length = 0;
      keptIndexes.length = 0;
      for (const index of indexes) {
        if (dropsBefore[index]! >= 0 && dropsBefore[index]! < dropped) continue;
        keptHits.push(hits[index]!.get(key)!);
        keptTerms.push(terms[index]!);
        keptIndexes.push(index);
      }
      const match: TextMatch = { dropped, typos: 0, proximity: 0, attributeRank: 0, wordPosition: 0, exactAttribute: 0, inexactWords: 0 };
      for (const hit of keptHits) {
        match.typos += hit.typos;
        if (!hit.asTyped) match.inexactWords += 1;
        if (wanted.has("attributeRank") || wanted.has("wordPosition")) {
          let [field, position] = [Infinity, Infinity];
          for (const occurrence of hit.occurrences) {
            if (occurrence.field < field) field = occurrence.field;
            if (occurrence.position < position) position = occurrence.position;
          }
          match.attributeRank += field;
          match.wordPosition += position;
        }
      }
      // Only words next to each other in the query count (a dropped word between them leaves no pair).
      if (wanted.has("proximity")) {
        for (let i = 1; i < keptHits.length; i += 1) {
          if (keptIndexes[i] === keptIndexes[i - 1]! + 1) match.proximity += pairProximity(keptHits[i - 1]!.occurrences, keptHits[i]!.occurrences);
        }
      }
      if (wanted.has("exactAttribute")) match.exactAttribute = exactAttribute(built.fieldWords.get(key) ?? [], keptTerms);
      result.set(key, match);
    }
    return result;
  }
}

/** Which earlier rules narrow the words the positional measures (proximity, attribute rank, position) see. */
export type Narrowing = { byTypo: boolean; byExactness: boolean };

const allMeasures: ReadonlySet<keyof TextMatch> = new Set(["dropped", "typos", "proximity", "attributeRank", "wordPosition", "exactAttribute", "inexactWords"]);

/**
 * The engine's proximity cost of two consecutive query words (milli `proximity.rs`, `MAX_DISTANCE` 4, and
 * `ranking_rule_graph/proximity/`): 0 when the second follows the first, one more per word between them,
 * 1 more when in reverse order; 3 at most, and 3 when they are not in the same attribute.
 */
function pairProximity(left: Occurrence[], right: Occurrence[]): number {
  let best = FAR;
  for (const a of left) {
    for (const b of right) {
      if (a.field !== b.field) continue;
      const cost = b.position > a.position ? b.position - a.position - 1 : a.position - b.position;
      if (cost < best) best = cost;
    }
  }
  return Math.min(best, FAR);
}

function exactAttribute(fields: string[][], terms: string[]): number {
  let best = 2;
  for (const words of fields) {
    if (words.length < terms.length || !terms.every((term, i) => words[i] === term)) continue;
    if (words.length === terms.length) return 0;
    best = 1;
  }
  return best;
}
