// The stand-in's typo rules and ranking rules, checked against the engine's source (milli
// `search/new/query_term/compute_derivations.rs`, `search/new/query_term/parse_query.rs`,
// `search/new/mod.rs`, and the typo-tolerance settings as its documentation states them).
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SearchEngine, type SearchRequest } from "../../../search/stand-in/engine.ts";
import { rankingSteps } from "../../../search/stand-in/ranking.ts";
import { derivationTypos, normalizeText, TextIndex, typoDistance, typosAllowed, type TypoSettings } from "../../../search/stand-in/text-index.ts";

const defaults: TypoSettings = { enabled: true, oneTypo: 5, twoTypos: 9, disableOnWords: [], disableOnAttributes: [], disableOnNumbers: false };

describe("typo rules", () => {
  it("allows none under 5 letters, one from 5, two from 9, and follows minWordSizeForTypos and enabled", () => {
    expect(typosAllowed("lath", defaults)).toBe(0);
    expect(typosAllowed("lathe", defaults)).toBe(1);
    expect(typosAllowed("spindles", defaults)).toBe(1);
    expect(typosAllowed("precision", defaults)).toBe(2);
    expect(typosAllowed("lathe", { ...defaults, oneTypo: 6 })).toBe(0);
    expect(typosAllowed("spindles", { ...defaults, twoTypos: 8 })).toBe(2);
    expect(typosAllowed("precision", { ...defaults, enabled: false })).toBe(0);
    expect(typosAllowed("precision", { ...defaults, disableOnWords: ["Precision"] })).toBe(0);
    expect(typosAllowed("123456", { ...defaults, disableOnNumbers: true })).toBe(0);
  });

  it("counts a swap of two adjacent letters as one typo", () => {
    expect(typoDistance([..."lahtex"], [..."lathex"], 2, false)).toBe(1);
    expect(typoDistance([..."lathex"], [..."lathex"], 2, false)).toBe(0);
    expect(typoDistance([..."lthex"], [..."lathex"], 2, false)).toBe(1);
    expect(typoDistance([..."abcd"], [..."badc"], 2, false)).toBe(2);
    expect(typoDistance([..."spind"], [..."spindle"], 1, true)).toBe(0);
    expect(typoDistance([..."spimd"], [..."spindle"], 1, true)).toBe(1);
  });

  it("tolerates a typo on the first letter only where two typos are allowed, and counts it as two", () => {
    // "bathex" (6 letters, one typo) does not find "lathex": its typo is on the first letter.
    expect(derivationTypos("bathex", "lathex", 1, false)).toBeNull();
    // "lahtex" does: the swap of h and t is one typo.
    expect(derivationTypos("lahtex", "lathex", 1, false)).toBe(1);
    // From 9 letters a first-letter typo is tolerated and costs two.
    expect(derivationTypos("bathexxxx", "lathexxxx", 2, false)).toBe(2);
    expect(derivationTypos("bathexxyx", "lathexxxx", 2, false)).toBeNull();
    expect(derivationTypos("lathexxyx", "lathexxxx", 2, false)).toBe(1);
    expect(derivationTypos("lathe", "lathes", 0, true)).toBe(0);
    expect(derivationTypos("lathe", "lathes", 0, false)).toBeNull();
  });

  it("normalises compatibility forms and marks before comparing", () => {
    expect(normalizeText("I\u0302le")).toBe(normalizeText("Île"));
    expect(normalizeText("Präzision")).toBe("prazision");
    expect(normalizeText("ﬁne")).toBe("fine");
  });
});

describe("ranking rules", () => {
  it("assembles the steps as the engine does", () => {
    const byPrice = [{ attribute: "price", descending: false }];
    const keys = (rules: string[], withWords = true, strategy: "last" | "all" = "last") =>
      rankingSteps(rules, byPrice, withWords, strategy).map((step) => (step.kind === "sort" ? `sort:${step.rule.attribute}` : step.key));
    expect(keys(["sort", "words", "typo", "proximity", "attribute", "exactness"])).toEqual([
      "sort:price", "dropped", "typos", "proximity", "attributeRank", "wordPosition", "exactAttribute", "inexactWords",
    ]);
    expect(keys(["words", "typo", "proximity", "attribute", "sort", "exactness"])[5]).toBe("sort:price");
    // `words` is put before the first rule that needs it.
    expect(keys(["typo", "sort"])).toEqual(["dropped", "typos", "sort:price"]);
    expect(keys(["typo", "sort"], true, "all")).toEqual(["typos", "sort:price"]);
    expect(keys(["attributeRank", "wordPosition", "attribute"])).toEqual(["dropped", "attributeRank", "wordPosition"]);
    // Without words only sort rules count; an attribute is sorted once.
    expect(keys(["words", "sort", "price:desc", "year:desc"], false)).toEqual(["sort:price", "sort:year"]);
  });
});

describe("the stand-in's search", () => {
  let directory: string;
  let engine: SearchEngine;
  const search = (request: Partial<SearchRequest>) =>
    engine.search("machines", { q: null, filter: null, facets: null, sort: null, attributesToRetrieve: ["id"], matchingStrategy: "last", ...request });
  const ids = (request: Partial<SearchRequest>) => (search(request).hits as Array<{ id: number }>).map((hit) => hit.id);

  beforeAll(async () => {
    directory = mkdtempSync(path.join(os.tmpdir(), "tenthmark-ranking-"));
    engine = await SearchEngine.open(directory);
    engine.updateSettings("machines", { searchableAttributes: ["make", "description"], sortableAttributes: ["price"], filterableAttributes: ["price"] });
    engine.addDocuments(
      "machines",
      [
        { id: 1, make: "Lathex", description: "heavy centre lathe", price: 900 },
        { id: 2, make: "Orrin", description: "Lathex spares and a heavy bed", price: 100 },
        { id: 3, make: "Lathex", description: "toolroom", price: 500 },
        { id: 4, make: "Quarrow", description: "milling", price: 50 },
      ],
      "id",
      "replace",
    );
    await engine.idle();
  });

  afterAll(() => rmSync(directory, { recursive: true, force: true }));

  it("matches by the typo rules: “bathex” finds nothing, “lahtex” finds Lathex", () => {
    expect(ids({ q: "bathex" })).toEqual([]);
    expect(ids({ q: "lahtex" }).sort()).toEqual([1, 2, 3]);
  });

  it("ranks by the configured rules in order: words before attribute, then insertion order", () => {
    // Both words: 1 (make and description) and 2 (description only); “heavy” alone is not enough for 3.
    expect(ids({ q: "lathex heavy" })).toEqual([1, 2, 3]);
    expect(ids({ q: "lathex heavy", matchingStrategy: "all" })).toEqual([1, 2]);
  });

  it("keeps an explicit sort strict when `sort` comes first", async () => {
    engine.updateSettings("machines", { rankingRules: ["sort", "words", "typo", "proximity", "attribute", "exactness"] });
    await engine.idle();
    expect(ids({ q: "lathex heavy", sort: ["price:asc"] })).toEqual([2, 3, 1]);
    expect(ids({ q: "lathex heavy" })).toEqual([1, 2, 3]);
  });

  it("orders by relevance first and price among ties with the engine's default order", async () => {
    engine.updateSettings("machines", { rankingRules: ["words", "typo", "proximity", "attribute", "sort", "exactness"] });
    await engine.idle();
    expect(ids({ q: "lathex heavy", sort: ["price:asc"] })).toEqual([1, 2, 3]);
  });

  it("refuses a sort when `sort` is not among the ranking rules, and accepts the current rule names", async () => {
    engine.updateSettings("machines", { rankingRules: ["words", "typo", "attributeRank", "wordPosition", "exactness"] });
    await engine.idle();
    expect(() => search({ q: "lathex", sort: ["price:asc"] })).toThrow(/You must specify where `sort` is listed in the rankingRules setting/);
    expect(ids({ q: "lathex" })).toEqual([1, 3, 2]);
    expect(() => engine.updateSettings("machines", { rankingRules: ["relevance"] })).toThrow(/`relevance` ranking rule is invalid/);
  });

  it("answers page 0 with counts and no hits", () => {
    const answer = search({ page: 0, hitsPerPage: 2 });
    expect(answer).toMatchObject({ hits: [], page: 0, totalHits: 4, totalPages: 2 });
  });
});

describe("hostile queries", () => {
  it("take a very long word and hundreds of words", () => {
    const words = Array.from({ length: 2_000 }, (_, n) => `w${n.toString(36)}lathe`);
    const documents: Array<[string, Record<string, unknown>]> = words.map((word, n) => [String(n), { text: `${word} spindle` }]);
    const text = new TextIndex(["text"], defaults, () => documents);
    expect(text.search("x".repeat(50_000), "last").size).toBe(0);
    expect(text.search(Array.from({ length: 500 }, (_, n) => `spindel${n}`).join(" "), "last").size).toBe(0);
    expect(text.search("spindel", "last").size).toBe(2_000);
  });
});
