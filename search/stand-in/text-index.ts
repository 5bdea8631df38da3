// Full-text matching for the search stand-in, delegated to MiniSearch: prefix search on the last query
// word, typo tolerance by word length, and the “last” matching strategy (documents holding every query
// word first, then those missing the last word, and so on).
import MiniSearch from "minisearch";
import { lookUp, leafValues } from "./filter.ts";

export type TypoSettings = { enabled: boolean; oneTypo: number; twoTypos: number };

type Entry = { key: string; document: Record<string, unknown> };

const tokenizeText: (text: string) => string[] = MiniSearch.getDefault("tokenize");

/** Lower case without accents, so that “Präzision” finds “prazision”. */
function normalizeTerm(term: string): string | null {
  const normalized = term.normalize("NFD").replace(/\p{Diacritic}/gu, "").toLowerCase();
  return normalized === "" ? null : normalized;
}

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

export class TextIndex {
  private miniSearch: MiniSearch<Entry> | null = null;
  private fields: string[] = [];

  constructor(
    private searchableAttributes: string[],
    private typo: TypoSettings,
    private readonly allDocuments: () => Iterable<[string, Record<string, unknown>]>,
  ) {}

  configure(searchableAttributes: string[], typo: TypoSettings) {
    this.searchableAttributes = searchableAttributes;
    this.typo = typo;
    this.miniSearch = null;
  }

  /** Index changes are applied lazily: the next search rebuilds what changed. */
  invalidate() {
    this.miniSearch = null;
  }

  upsert(key: string, document: Record<string, unknown>, replaced: boolean) {
    if (!this.miniSearch) return;
    if (this.wildcard() && [...searchablePaths(document)].some((path) => !this.fields.includes(path))) {
      this.miniSearch = null;
      return;
    }
    if (replaced) this.miniSearch.discard(key);
    this.miniSearch.add({ key, document });
  }

  remove(key: string) {
    if (this.miniSearch?.has(key)) this.miniSearch.discard(key);
  }

  private wildcard() {
    return this.searchableAttributes.includes("*");
  }

  private build(): MiniSearch<Entry> {
    const documents = [...this.allDocuments()];
    if (this.wildcard()) {
      const paths = new Set<string>();
      for (const [, document] of documents) searchablePaths(document, "", paths);
      this.fields = [...paths];
    } else {
      this.fields = [...this.searchableAttributes];
    }
    // Earlier searchable attributes weigh more, as the order of `searchableAttributes` means.
    const boost = Object.fromEntries(this.fields.map((field, i) => [field, 1 + (this.fields.length - i) / this.fields.length]));
    const miniSearch = new MiniSearch<Entry>({
      idField: "key",
      fields: this.fields.length ? this.fields : ["__none__"],
      storeFields: [],
      extractField: (entry, field) => {
        if (field === "key") return entry.key;
        const leaves = leafValues(lookUp(entry.document, field)).filter((value) => typeof value === "string" || typeof value === "number");
        return leaves.length ? leaves.join(" ") : undefined;
      },
      processTerm: normalizeTerm,
      searchOptions: { boost },
    });
    miniSearch.addAll(documents.map(([key, document]) => ({ key, document })));
    return miniSearch;
  }

  /** Keys of the matching documents, best first. */
  search(query: string, matchingStrategy: "last" | "all" | "frequency"): string[] {
    this.miniSearch ??= this.build();
    const terms = tokenizeText(query).map(normalizeTerm).filter((term): term is string => !!term);
    if (terms.length === 0) return [];
    const ranked: string[] = [];
    const seen = new Set<string>();
    const shortest = matchingStrategy === "all" ? terms.length : 1;
    for (let count = terms.length; count >= shortest; count -= 1) {
      const isWholeQuery = count === terms.length;
      const results = this.miniSearch.search(terms.slice(0, count).join(" "), {
        combineWith: "AND",
        // The last word may still be being typed, so it matches as a prefix.
        prefix: (_term, index, all) => isWholeQuery && index === all.length - 1,
        fuzzy: (term) => this.typosAllowed(term),
      });
      for (const result of results) {
        const key = String(result.id);
        if (!seen.has(key)) {
          seen.add(key);
          ranked.push(key);
        }
      }
    }
    return ranked;
  }

  private typosAllowed(term: string): number | false {
    if (!this.typo.enabled) return false;
    const length = [...term].length;
    if (length >= this.typo.twoTypos) return 2;
    if (length >= this.typo.oneTypo) return 1;
    return false;
  }
}
