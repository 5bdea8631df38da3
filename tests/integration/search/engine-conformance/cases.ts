// Test cases ported from the search engine's own test suites, with the results its tests expect, to run
// against the search stand-in. Source: github.com/meilisearch/meilisearch at the commit below; each case
// names the file and test it comes from. Those files are under the MIT licence (LICENSE-MIT of that
// repository; none is Enterprise Edition code). Only cases and their documents are copied, not the
// engine's code. Left out, because the stand-in does not offer them (search/README.md): vector, geo,
// CONTAINS/STARTS WITH filters, phrase search, split and concatenated words, synonyms, stop words, ranking
// scores, distinct attribute, facet search, and facets on an object attribute expanded to its fields.

export const ENGINE_COMMIT = "5cb2f2e94befc717bbea60fec4a31ee64d2f60fd";

type Json = Record<string, unknown>;

export type Expectation = {
  /** The hits' ids in this order. */
  ids?: Array<string | number>;
  /** The hits' ids in any order. */
  idsInAnyOrder?: Array<string | number>;
  /** How many hits. */
  count?: number;
  status?: number;
  code?: string;
  /** Top-level fields of the answer. */
  fields?: Json;
  /** Fields that must be absent from the answer. */
  absent?: string[];
  facetDistribution?: Record<string, Record<string, number>>;
  /** How many values each facet shows. */
  facetSizes?: Record<string, number>;
};

export type EngineCase = {
  from: string;
  documents: Json[];
  settings: Json;
  searches: Array<{ request: Json; expect: Expectation; note?: string }>;
};

const TESTS = "crates/meilisearch/tests";
const MILLI_NEW = "crates/milli/src/search/new/tests";

// crates/meilisearch/tests/common/mod.rs — DOCUMENTS and NESTED_DOCUMENTS (their `_vectors` left out).
const DOCUMENTS: Json[] = [
  { title: "Shazam!", id: "287947", color: ["green", "blue"] },
  { title: "Captain Marvel", id: "299537", color: ["yellow", "blue"] },
  { title: "Escape Room", id: "522681", color: ["yellow", "red"] },
  { title: "How to Train Your Dragon: The Hidden World", id: "166428", color: ["green", "red"] },
  { title: "Gläss", id: "450465", color: ["blue", "red"] },
];

const NESTED_DOCUMENTS: Json[] = [
  { id: 852, father: "jean", mother: "michelle", doggos: [{ name: "bobby", age: 2 }, { name: "buddy", age: 4 }], cattos: "pésti" },
  { id: 654, father: "pierre", mother: "sabine", doggos: [{ name: "gros bill", age: 8 }], cattos: ["simba", "pestiféré"] },
  { id: 750, father: "romain", mother: "michelle", cattos: ["enigma"] },
  { id: 951, father: "jean-baptiste", mother: "sophie", doggos: [{ name: "turbo", age: 5 }, { name: "fast", age: 6 }], cattos: ["moumoute", "gomez"] },
];

// The shared indexes of crates/meilisearch/tests/common/mod.rs.
const SHARED_SETTINGS = { filterableAttributes: ["id", "title"], sortableAttributes: ["id", "title"] };
const SHARED_NESTED_SETTINGS = { filterableAttributes: ["father", "doggos", "cattos"], sortableAttributes: ["doggos"] };

// crates/milli/src/search/new/tests/typo.rs — create_index().
const TYPO_DOCUMENTS: Json[] = [
  "the quick brown fox jumps over the lazy dog",
  "the quick brown foxes jump over the lazy dog",
  "the quick brown fax sends a letter to the dog",
  "the quickest brownest fox jumps over the laziest dog",
  "a fox doesn't quack, that crown goes to the duck.",
  "the quicker browner fox jumped over the lazier dog",
  "the extravagant fox skyrocketed over the languorous dog",
  "the quick brown fox jumps over the lazy",
  "the quick brown fox jumps over the",
  "the quick brown fox jumps over",
  "the quick brown fox jumps",
  "the quick brown fox",
  "the quick brown",
  "the quick",
  "netwolk interconections sunflawar",
  "network interconnections sunflawer",
  "network interconnection sunflower",
  "network interconnection sun flower",
  "network interconnection sunflowering",
  "network interconnection sun flowering",
  "network interconnection sunflowar",
  "the fast brownish fox jumps over the lackadaisical dog",
  "the quick brown fox jumps over the lackadaisical dog",
  "the quivk brown fox jumps over the lazy dog",
]
  .map((text, id): Json => ({ id, text }))
  .concat([
    { id: 24, tolerant_text: "the quick brown fox jumps over the lazy dog" },
    { id: 25, tolerant_text: "the quivk brown fox jumps over the lazy dog" },
  ]);
const TYPO_SETTINGS = { searchableAttributes: ["text"], rankingRules: ["words"] };

// crates/milli/src/search/new/tests/sort.rs — create_index().
const SORT_DOCUMENTS: Json[] = [
  { id: 0, letter: "A", rank: 0, vague: 0 },
  { id: 1, letter: "A", rank: 1, vague: "0" },
  { id: 2, letter: "B", rank: 0, vague: 1 },
  { id: 3, letter: "B", rank: 1, vague: "1" },
  { id: 4, letter: "B", rank: 2, vague: [1, 2] },
  { id: 5, letter: "C", rank: 0, vague: [1, "2"] },
  { id: 6, letter: "C", rank: 1 },
  { id: 7, letter: "C", rank: 2, vague: null },
  { id: 8, letter: "D", rank: 0, vague: [null, null, ""] },
  { id: 9, letter: "E", rank: 0, vague: "" },
  { id: 10, letter: "E", rank: 1, vague: { sub: 0 } },
  { id: 11, letter: "E", rank: 2, vague: true },
  { id: 12, letter: "E", rank: 3, vague: false },
  { id: 13, letter: "E", rank: 4, vague: 1.5673 },
  { id: 14, letter: "E", rank: 5 },
  { id: 15, letter: "F", rank: 0 },
  { id: 16, letter: "F", rank: 1 },
  { id: 17, letter: "F", rank: 2 },
  { id: 18, letter: "G", rank: 0 },
  { id: 19, letter: "G", rank: 1 },
  { id: 20, letter: "H", rank: 0, vague: true },
  { id: 21, letter: "I", rank: 0, vague: false },
  { id: 22, letter: "I", rank: 1, vague: [1.1367, "help", null] },
  { id: 23, letter: "I", rank: 2, vague: [1.2367, "hello"] },
];
const SORT_SETTINGS = { searchableAttributes: ["text"], sortableAttributes: ["rank", "vague", "letter"], rankingRules: ["sort"] };

const allTypo = (q: string) => ({ q, matchingStrategy: "all" });

// crates/milli/tests/assets/test_set.ndjson — the searchable fields of its documents, as
// crates/milli/tests/search/mod.rs indexes them (searchable: title, description).
const TEST_SET: Json[] = [
  { id: "A", title: "hell o", description: "hell o is the fourteenth episode of the american television series glee performing songs with this word" },
  { id: "B", title: "hello", description: "hello is a song recorded by english singer songwriter adele" },
  { id: "C", title: "hell on earth", description: "hell on earth is the third studio album by american hip hop duo mobb deep" },
  { id: "D", title: "hell on wheels tv series", description: "the construction of the first transcontinental railroad across the united states in the world" },
  { id: "E", title: "hello kitty", description: "also known by her full name kitty white is a fictional character produced by the japanese company sanrio" },
  { id: "F", title: "laptop orchestra", description: "a laptop orchestra lork or lo is a chamber music ensemble consisting primarily of laptops like helo huddersfield experimental laptop orchestra" },
  { id: "G", title: "hello world film", description: "hello world is a 2019 japanese animated sci fi romantic drama film directed by tomohiko ito and produced by graphinica" },
  { id: "H", title: "world hello day", description: "holiday observed on november 21 to express that conflicts should be resolved through communication rather than the use of force" },
  { id: "I", title: "hello world song", description: "hello world is a song written by tom douglas tony lane and david lee and recorded by american country music group lady antebellum" },
  { id: "J", title: "hello cruel world", description: "hello cruel world is an album by new zealand band tall dwarfs" },
  { id: "K", title: "hallo creation system", description: "in few word hallo was a construction toy created by the american company mattel to engage girls in construction play" },
  { id: "L", title: "good morning world", description: "good morning world is an american sitcom broadcast on cbs tv during the 1967 1968 season" },
  { id: "M", title: "hello world america", description: "a perfect match for a perfect engine using the query hello world america" },
  { id: "N", title: "hello world america unleashed", description: "a very good match for a very good engine using the query hello world america" },
  { id: "O", title: "a perfect match for a perfect engine using the query hello world america", description: "hello world america" },
  { id: "P", title: "a very good match for a very good engine using the query hello world america", description: "hello world america unleashed" },
  { id: "Q", title: "hello world", description: "a hello world program generally is a computer program that outputs or displays the message hello world" },
];
// crates/milli/src/search/new/tests/exactness.rs — the indexes its tests below use (searchable: text).
const texts = (list: string[]): Json[] => list.map((text, id) => ({ id, text }));
const ORDERED_WITH_TYPOS = texts([
  "",
  "the",
  "the quack",
  "the quack briwn",
  "the quack briwn fox",
  "the quack briwn fox jlmps",
  "the quack briwn fox jlmps over",
  "the quack briwn fox jlmps over the",
  "the quack briwn fox jlmps over the lazy",
  "the quack briwn fox jlmps over the lazy dog",
  "",
  "the",
  "the quick",
  "the quick brown",
  "the quick brown fox",
  "the quick brown fox jumps",
  "the quick brown fox jumps over",
  "the quick brown fox jumps over the",
  "the quick brown fox jumps over the lazy",
  "the quick brown fox jumps over the lazy dog",
]);
const VARYING_PROXIMITIES = texts([
  "lazy jumps dog brown quick the over fox the",
  "the quick brown fox jumps over the very lazy dog",
  "the quick brown fox jumps over the lazy dog",
  "dog brown quick the over fox the lazy",
  "the quick brown fox over the very lazy dog",
  "the quick brown fox over the lazy dog",
  "brown quick the over fox",
  "the very quick brown fox over",
  "the quick brown fox over",
]);
const TYPO_AND_PREFIX = texts([
  "expraordinarily quick brown fox",
  "extraordinarily quick brown fox",
  "extra quick brown fox",
  "expraordinarily quack brown fox",
  "expraordinapily quick brown fox",
]);
const PROXIMITY_BETWEEN_IGNORED = texts([
  "lazy jumps dog brown quick the over fox the",
  "lazy jumps dog brown quick the over fox the. quack briwn jlmps",
  "lazy jumps dog brown quick the over fox the. quack briwn jlmps overt",
]);
const MILLI_EXACTNESS = `${MILLI_NEW}/exactness.rs`;

const TEST_SET_SETTINGS = { searchableAttributes: ["title", "description"], rankingRules: ["typo"] };
const MILLI_TYPO = "crates/milli/tests/search/typo_tolerance.rs";

// crates/milli/src/search/new/tests/words_tms.rs — create_index().
const WORDS_DOCUMENTS: Json[] = [
  "",
  "the",
  "the quick",
  "the quick brown",
  "the quick brown fox",
  "the quick brown fox jumps",
  "the quick brown fox jumps over",
  "the quick brown fox jumps over the",
  "the quick brown fox jumps over the lazy",
  "the quick brown fox jumps over the lazy dog",
  "the brown quick fox jumps over the lazy dog",
  "the quick brown fox talks to the lazy and slow dog",
  "the quick brown fox talks to the lazy dog",
  "the mighty and quick brown fox jumps over the lazy dog",
  "the great quick brown fox jumps over the lazy dog",
  "this quick brown and very scary fox jumps over the lazy dog",
  "this quick brown and scary fox jumps over the lazy dog",
  "the quick brown fox jumps over the really lazy dog",
  "the brown quick fox jumps over the really lazy dog",
  "the brown quick fox immediately jumps over the really lazy dog",
  "the brown quick fox immediately jumps over the really lazy blue dog",
  "the quick brown. quick brown fox. brown fox jumps. fox jumps over. over the lazy. the lazy dog.",
  "the, quick, brown, fox, jumps, over, the, lazy, dog",
].map((text, id): Json => ({ id, text }));
const WORDS_SETTINGS = { searchableAttributes: ["text"], rankingRules: ["words"] };
const FOX = "the quick brown fox jumps over the lazy dog";

export const engineCases: EngineCase[] = [
  // ---------------------------------------------------------------------------------------------------
  // Filters
  {
    from: `${TESTS}/search/filters.rs › search_with_filter_string_notation, search_with_filter_array_notation`,
    documents: DOCUMENTS,
    settings: SHARED_SETTINGS,
    searches: [
      { request: { filter: "title = Gläss" }, expect: { count: 1 } },
      { request: { filter: ["title = Gläss"] }, expect: { count: 1 } },
      { request: { filter: [["title = Gläss", 'title = "Shazam!"', 'title = "Escape Room"']] }, expect: { count: 3 } },
    ],
  },
  {
    from: `${TESTS}/search/filters.rs › search_with_filter_string_notation (nested)`,
    documents: NESTED_DOCUMENTS,
    settings: SHARED_NESTED_SETTINGS,
    searches: [
      { request: { filter: "cattos = pésti" }, expect: { ids: [852] } },
      { request: { filter: "doggos.age > 5" }, expect: { ids: [654, 951] } },
    ],
  },
  {
    from: `${TESTS}/search/filters.rs › search_with_pattern_filter_settings`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos", "doggos.age"] }] },
    searches: [{ request: { filter: "cattos = pésti" }, expect: { ids: [852] } }],
  },
  {
    from: `${TESTS}/search/filters.rs › search_with_pattern_filter_settings (equality only)`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos", "doggos.age"], features: { facetSearch: false, filter: { equality: true, comparison: false } } }] },
    searches: [{ request: { filter: "cattos = pésti" }, expect: { ids: [852] } }],
  },
  {
    from: `${TESTS}/search/filters.rs › search_with_pattern_filter_settings (comparison only)`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos", "doggos.age"], features: { facetSearch: false, filter: { equality: false, comparison: true } } }] },
    searches: [{ request: { filter: "doggos.age > 2" }, expect: { ids: [852, 654, 951] } }],
  },
  {
    from: `${TESTS}/search/filters.rs › search_with_pattern_filter_settings_scenario_1 (equality, no comparison)`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos", "doggos.age"], features: { facetSearch: false, filter: { equality: true, comparison: false } } }] },
    searches: [
      { request: { filter: "cattos = pésti" }, expect: { ids: [852] } },
      { request: { filter: "doggos.age > 2" }, expect: { status: 400, code: "invalid_search_filter" } },
    ],
  },
  {
    from: `${TESTS}/search/filters.rs › search_with_pattern_filter_settings_scenario_1 (equality and comparison)`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos", "doggos.age"], features: { facetSearch: false, filter: { equality: true, comparison: true } } }] },
    searches: [
      { request: { filter: "cattos = pésti" }, expect: { ids: [852] } },
      { request: { filter: "doggos.age > 2" }, expect: { ids: [852, 654, 951] } },
    ],
  },
  {
    from: `${TESTS}/search/filters.rs › search_with_pattern_filter_settings_scenario_1 (comparison, no equality)`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos", "doggos.age"], features: { facetSearch: false, filter: { equality: false, comparison: true } } }] },
    searches: [
      { request: { filter: "cattos = pésti" }, expect: { status: 400, code: "invalid_search_filter" } },
      { request: { filter: "doggos.age > 2" }, expect: { ids: [852, 654, 951] } },
    ],
  },
  {
    from: `${TESTS}/search/filters.rs › remove_comparison_feature_keeps_equality`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos"], features: { facetSearch: false, filter: { equality: true, comparison: false } } }] },
    searches: [{ request: { filter: "cattos = simba" }, expect: { ids: [654] } }],
  },
  {
    from: `${TESTS}/search/filters.rs › test_filterable_attributes_priority (doggos.a* off, doggos.* on)`,
    documents: NESTED_DOCUMENTS,
    settings: {
      filterableAttributes: [
        { attributePatterns: ["doggos.a*"], features: { facetSearch: false, filter: { equality: false, comparison: false } } },
        { attributePatterns: ["doggos.*"] },
      ],
    },
    searches: [
      { request: { filter: "doggos.name = bobby" }, expect: { ids: [852] } },
      { request: { filter: "doggos.age > 2" }, expect: { status: 400, code: "invalid_search_filter" } },
    ],
  },
  {
    from: `${TESTS}/search/filters.rs › test_filterable_attributes_priority (doggos off, doggos.* on)`,
    documents: NESTED_DOCUMENTS,
    settings: {
      filterableAttributes: [
        { attributePatterns: ["doggos"], features: { facetSearch: false, filter: { equality: false, comparison: false } } },
        { attributePatterns: ["doggos.*"] },
      ],
    },
    searches: [
      { request: { filter: "doggos.name = bobby" }, expect: { ids: [852] } },
      { request: { filter: "doggos EXISTS" }, expect: { status: 400, code: "invalid_search_filter" } },
    ],
  },
  {
    from: `${TESTS}/search/filters.rs › issue_6335`,
    documents: NESTED_DOCUMENTS,
    settings: { filterableAttributes: [{ attributePatterns: ["cattos"], features: { facetSearch: false, filter: { equality: true, comparison: true } } }] },
    searches: [{ request: { filter: "cattos < pestiféré" }, expect: { ids: [750, 951] } }],
  },

  // ---------------------------------------------------------------------------------------------------
  // Pagination
  {
    from: `${TESTS}/search/pagination.rs`,
    documents: DOCUMENTS,
    settings: SHARED_SETTINGS,
    searches: [
      {
        note: "default_search_should_return_estimated_total_hit",
        request: {},
        expect: { fields: { limit: 20, offset: 0 }, absent: ["totalHits", "page", "totalPages"] },
      },
      {
        note: "simple_search",
        request: { page: 1 },
        expect: { count: 5, fields: { page: 1, totalPages: 1 }, absent: ["estimatedTotalHits", "limit", "offset"] },
      },
      { note: "page_zero_should_not_return_any_result", request: { page: 0 }, expect: { count: 0, fields: { page: 0, totalPages: 1 } } },
      { note: "hits_per_page_1", request: { hitsPerPage: 1 }, expect: { count: 1, fields: { totalHits: 5, page: 1, totalPages: 5 } } },
      {
        note: "hits_per_page_0_should_not_return_any_result",
        request: { hitsPerPage: 0 },
        expect: { count: 0, fields: { totalHits: 5, page: 1, totalPages: 0 } },
      },
    ],
  },
  {
    from: `${TESTS}/search/mod.rs › placeholder_search_is_hard_limited, search_is_hard_limited`,
    documents: Array.from({ length: 1200 }, (_, id) => ({ id, text: "I am unique!" })),
    settings: {},
    searches: [
      { request: { limit: 1500 }, expect: { count: 1000 } },
      { request: { offset: 800, limit: 400 }, expect: { count: 200 } },
      { request: { q: "unique", limit: 1500 }, expect: { count: 1000 } },
      { request: { q: "unique", offset: 800, limit: 400 }, expect: { count: 200 } },
    ],
  },
  {
    from: `${TESTS}/search/mod.rs › placeholder_search_is_hard_limited, search_is_hard_limited (maxTotalHits 10 000)`,
    documents: Array.from({ length: 1200 }, (_, id) => ({ id, text: "I am unique!" })),
    settings: { pagination: { maxTotalHits: 10_000 } },
    searches: [
      { request: { limit: 1500 }, expect: { count: 1200 } },
      { request: { offset: 1000, limit: 400 }, expect: { count: 200 } },
      { request: { q: "unique", limit: 1500 }, expect: { count: 1200 } },
      { request: { q: "unique", offset: 1000, limit: 400 }, expect: { count: 200 } },
    ],
  },

  // ---------------------------------------------------------------------------------------------------
  // Facets
  {
    from: `${TESTS}/search/mod.rs › search_facet_distribution`,
    documents: DOCUMENTS,
    settings: SHARED_SETTINGS,
    searches: [{ request: { facets: ["title"] }, expect: { facetSizes: { title: 5 } } }],
  },
  {
    from: `${TESTS}/search/mod.rs › search_facet_distribution (nested)`,
    documents: NESTED_DOCUMENTS,
    settings: SHARED_NESTED_SETTINGS,
    searches: [
      { request: { facets: ["father"] }, expect: { facetDistribution: { father: { jean: 1, pierre: 1, romain: 1, "jean-baptiste": 1 } } } },
      { request: { facets: ["doggos.name"] }, expect: { facetDistribution: { "doggos.name": { bobby: 1, buddy: 1, "gros bill": 1, turbo: 1, fast: 1 } } } },
    ],
  },
  {
    from: "crates/milli/tests/search/facet_distribution.rs › test_facet_distribution_with_no_facet_values",
    documents: [
      { id: 123, title: "What a week, hu...", genres: [], tags: ["blue"] },
      { id: 345, title: "I am the pig!", tags: ["red"] },
    ],
    settings: { filterableAttributes: ["genres", "tags"] },
    searches: [{ request: { facets: ["genres", "tags"] }, expect: { facetSizes: { genres: 0, tags: 2 } } }],
  },
  {
    from: `${TESTS}/search/mod.rs › faceting_max_values_per_facet`,
    documents: Array.from({ length: 10_000 }, (_, id) => ({ id, number: id * 10 })),
    settings: { filterableAttributes: ["number"] },
    searches: [{ request: { facets: ["number"] }, expect: { facetSizes: { number: 100 } } }],
  },
  {
    from: `${TESTS}/search/mod.rs › faceting_max_values_per_facet (maxValuesPerFacet 10 000)`,
    documents: Array.from({ length: 10_000 }, (_, id) => ({ id, number: id * 10 })),
    settings: { filterableAttributes: ["number"], faceting: { maxValuesPerFacet: 10_000 } },
    searches: [{ request: { facets: ["number"] }, expect: { facetSizes: { number: 10_000 } } }],
  },

  // ---------------------------------------------------------------------------------------------------
  // Sort
  {
    from: `${TESTS}/search/mod.rs › search_with_sort_on_numbers, search_with_sort_on_strings, search_with_multiple_sort`,
    documents: DOCUMENTS,
    settings: SHARED_SETTINGS,
    searches: [
      { request: { sort: ["id:asc"] }, expect: { count: 5 } },
      { request: { sort: ["title:desc"] }, expect: { count: 5 } },
      { request: { sort: ["id:asc", "title:desc"] }, expect: { count: 5 } },
    ],
  },
  {
    from: `${TESTS}/search/mod.rs › search_with_sort_on_numbers, search_with_sort_on_strings (nested)`,
    documents: NESTED_DOCUMENTS,
    settings: SHARED_NESTED_SETTINGS,
    searches: [
      { request: { sort: ["doggos.age:asc"] }, expect: { count: 4 } },
      { request: { sort: ["doggos.name:asc"] }, expect: { count: 4 } },
    ],
  },
  {
    from: `${MILLI_NEW}/sort.rs › test_sort`,
    documents: SORT_DOCUMENTS,
    settings: SORT_SETTINGS,
    searches: [
      { request: { sort: ["letter:desc"] }, expect: { ids: [21, 22, 23, 20, 18, 19, 15, 16, 17, 9, 10, 11, 12, 13, 14, 8, 5, 6, 7, 2] } },
      { request: { sort: ["rank:desc"] }, expect: { ids: [14, 13, 12, 4, 7, 11, 17, 23, 1, 3, 6, 10, 16, 19, 22, 0, 2, 5, 8, 9] } },
      // Numbers, then strings (booleans as "true"/"false"), then no value ("" and null are none).
      { request: { sort: ["vague:asc"] }, expect: { ids: [0, 2, 4, 5, 22, 23, 13, 1, 3, 12, 21, 11, 20, 6, 7, 8, 9, 10, 14, 15] } },
      { request: { sort: ["vague:desc"] }, expect: { ids: [4, 13, 23, 22, 2, 5, 0, 11, 20, 12, 21, 3, 1, 6, 7, 8, 9, 10, 14, 15] } },
    ],
  },
  {
    from: `${MILLI_NEW}/sort.rs › test_redacted (the order only)`,
    documents: SORT_DOCUMENTS,
    settings: SORT_SETTINGS,
    searches: [{ request: { sort: ["vague:asc", "letter:asc"] }, expect: { ids: [0, 2, 4, 5, 22, 23, 13, 1, 3, 12, 21, 11, 20, 6, 7, 8, 9, 10, 14, 15] } }],
  },
  {
    from: "crates/milli/tests/search/sort.rs › sort_ranking_rule_missing",
    documents: SORT_DOCUMENTS,
    settings: { sortableAttributes: ["letter"], rankingRules: ["words", "typo", "proximity", "attribute", "exactness"] },
    searches: [{ request: { q: "hello", sort: ["letter:asc"] }, expect: { status: 400, code: "invalid_search_sort" } }],
  },

  // ---------------------------------------------------------------------------------------------------
  // Matching strategies and the words ranking rule
  {
    from: `${MILLI_NEW}/words_tms.rs › test_words_tms_last_simple`,
    documents: WORDS_DOCUMENTS,
    settings: WORDS_SETTINGS,
    searches: [
      { request: { q: FOX, matchingStrategy: "last" }, expect: { ids: [9, 10, 13, 14, 15, 16, 17, 18, 19, 20, 21, 22, 8, 6, 7, 5, 4, 11, 12, 3] } },
      { request: { q: `extravagant ${FOX}`, matchingStrategy: "last" }, expect: { ids: [] } },
    ],
  },
  {
    from: `${MILLI_NEW}/words_tms.rs › test_words_tms_attribute_rank_word_position_order_keeps_hits`,
    documents: WORDS_DOCUMENTS,
    settings: { ...WORDS_SETTINGS, rankingRules: ["attributeRank", "words", "typo", "proximity", "wordPosition", "exactness"] },
    searches: [{ request: { q: FOX, matchingStrategy: "last", limit: 100 }, expect: { count: 22 } }],
  },
  {
    from: `${MILLI_NEW}/words_tms.rs › test_words_tms_attribute_rank_word_position_order_keeps_hits (wordPosition first)`,
    documents: WORDS_DOCUMENTS,
    settings: { ...WORDS_SETTINGS, rankingRules: ["wordPosition", "words", "typo", "proximity", "attributeRank", "exactness"] },
    searches: [{ request: { q: FOX, matchingStrategy: "last", limit: 100 }, expect: { count: 22 } }],
  },
  {
    from: `${MILLI_NEW}/words_tms.rs › test_words_proximity_tms_last_simple`,
    documents: WORDS_DOCUMENTS,
    settings: { ...WORDS_SETTINGS, rankingRules: ["words", "proximity"] },
    searches: [
      { request: { q: FOX, matchingStrategy: "last" }, expect: { ids: [9, 21, 14, 17, 13, 10, 18, 16, 19, 15, 20, 22, 8, 7, 6, 5, 4, 11, 12, 3] } },
      {
        request: { q: "the brown quick fox jumps over the lazy dog", matchingStrategy: "last" },
        expect: { ids: [10, 18, 19, 9, 20, 21, 14, 17, 13, 15, 16, 22, 8, 7, 6, 5, 4, 11, 12, 3] },
      },
    ],
  },
  {
    from: `${MILLI_NEW}/words_tms.rs › test_words_tms_all`,
    documents: WORDS_DOCUMENTS,
    settings: { ...WORDS_SETTINGS, rankingRules: ["words", "proximity"] },
    searches: [
      { request: { q: FOX, matchingStrategy: "all" }, expect: { ids: [9, 21, 14, 17, 13, 10, 18, 16, 19, 15, 20, 22] } },
      { request: { q: "extravagant", matchingStrategy: "all" }, expect: { ids: [] } },
    ],
  },

  // ---------------------------------------------------------------------------------------------------
  // Exactness (and `words` put before it when it is listed first)
  {
    from: `${MILLI_EXACTNESS} › test_words_after_exactness`,
    documents: ORDERED_WITH_TYPOS,
    settings: { searchableAttributes: ["text"], rankingRules: ["exactness", "words"] },
    searches: [{ request: { q: FOX, matchingStrategy: "last" }, expect: { ids: [19, 9, 18, 8, 17, 16, 6, 7, 15, 5, 14, 4, 13, 3, 12, 2, 1, 11] } }],
  },
  {
    from: `${MILLI_EXACTNESS} › test_proximity_after_exactness`,
    documents: VARYING_PROXIMITIES,
    settings: { searchableAttributes: ["text"], rankingRules: ["exactness", "words", "proximity"] },
    searches: [{ request: { q: FOX, matchingStrategy: "last" }, expect: { ids: [2, 1, 0, 4, 5, 8, 7, 3, 6] } }],
  },
  {
    from: `${MILLI_EXACTNESS} › test_proximity_after_exactness (proximity between ignored terms)`,
    documents: PROXIMITY_BETWEEN_IGNORED,
    settings: { searchableAttributes: ["text"], rankingRules: ["exactness", "words", "proximity"] },
    searches: [{ request: { q: FOX, matchingStrategy: "last" }, expect: { ids: [0, 1, 2] } }],
  },
  {
    from: `${MILLI_EXACTNESS} › test_exactness_followed_by_typo_prefer_no_typo_prefix`,
    documents: TYPO_AND_PREFIX,
    settings: { searchableAttributes: ["text"], rankingRules: ["exactness", "words", "typo"] },
    searches: [{ request: { q: "quick brown fox extra", matchingStrategy: "last" }, expect: { ids: [2, 1, 0, 4, 3] } }],
  },

  // ---------------------------------------------------------------------------------------------------
  // Typo tolerance and the words and typo ranking rules
  {
    from: `${MILLI_TYPO} › test_typo_tolerance_one_typo`,
    documents: TEST_SET,
    settings: TEST_SET_SETTINGS,
    searches: [
      { request: { q: "zeal", limit: 10 }, expect: { count: 1 } },
      { request: { q: "zean", limit: 10 }, expect: { count: 0 } },
    ],
  },
  {
    from: `${MILLI_TYPO} › test_typo_tolerance_one_typo (minWordSizeForTypos.oneTypo 4)`,
    documents: TEST_SET,
    settings: { ...TEST_SET_SETTINGS, typoTolerance: { minWordSizeForTypos: { oneTypo: 4 } } },
    searches: [{ request: { q: "zean", limit: 10 }, expect: { count: 1 } }],
  },
  {
    from: `${MILLI_TYPO} › test_typo_tolerance_two_typo`,
    documents: TEST_SET,
    settings: TEST_SET_SETTINGS,
    searches: [
      { request: { q: "zealand", limit: 10 }, expect: { count: 1 } },
      { request: { q: "zealemd", limit: 10 }, expect: { count: 0 } },
    ],
  },
  {
    from: `${MILLI_TYPO} › test_typo_tolerance_two_typo (minWordSizeForTypos.twoTypos 7)`,
    documents: TEST_SET,
    settings: { ...TEST_SET_SETTINGS, typoTolerance: { minWordSizeForTypos: { twoTypos: 7 } } },
    searches: [{ request: { q: "zealemd", limit: 10 }, expect: { count: 1 } }],
  },
  {
    from: `${MILLI_TYPO} › test_typo_disabled_on_word`,
    documents: [{ id: 1, data: "zealand" }, { id: 2, data: "zearand" }],
    settings: {},
    searches: [{ request: { q: "zealand" }, expect: { count: 2 } }],
  },
  {
    from: `${MILLI_TYPO} › test_typo_disabled_on_word (disableOnWords)`,
    documents: [{ id: 1, data: "zealand" }, { id: 2, data: "zearand" }],
    settings: { typoTolerance: { disableOnWords: ["zealand"] } },
    searches: [{ request: { q: "zealand" }, expect: { count: 1 } }],
  },
  {
    from: `${MILLI_TYPO} › test_disable_typo_on_attribute`,
    documents: TEST_SET,
    settings: TEST_SET_SETTINGS,
    searches: [{ request: { q: "antebelum", limit: 10 }, expect: { count: 1 } }],
  },
  {
    from: `${MILLI_TYPO} › test_disable_typo_on_attribute (disableOnAttributes)`,
    documents: TEST_SET,
    settings: { ...TEST_SET_SETTINGS, typoTolerance: { disableOnAttributes: ["description"] } },
    searches: [{ request: { q: "antebelum", limit: 10 }, expect: { count: 0 } }],
  },
  {
    from: `${MILLI_NEW}/typo.rs › test_no_typo`,
    documents: TYPO_DOCUMENTS,
    settings: { ...TYPO_SETTINGS, typoTolerance: { enabled: false } },
    searches: [{ request: allTypo("the quick brown fox jumps over the lazy dog"), expect: { ids: [0] } }],
  },
  {
    from: `${MILLI_NEW}/typo.rs › test_default_typo`,
    documents: TYPO_DOCUMENTS,
    settings: TYPO_SETTINGS,
    searches: [
      { request: allTypo("the quick brown fox jumps over the lazy dog"), expect: { ids: [0, 23] } },
      { note: "1 typo on one word, replaced letter", request: allTypo("the quack brown fox jumps over the lazy dog"), expect: { ids: [0] } },
      { note: "1 typo on one word, missing letter, extra letter", request: allTypo("the quicest brownest fox jummps over the laziest dog"), expect: { ids: [3] } },
    ],
  },
  {
    from: `${MILLI_NEW}/typo.rs › test_typo_exact_word`,
    documents: TYPO_DOCUMENTS,
    settings: { ...TYPO_SETTINGS, typoTolerance: { disableOnWords: ["quick", "quack", "sunflower"] } },
    searches: [
      { request: allTypo("the quick brown fox jumps over the lazy dog"), expect: { ids: [0] } },
      { request: allTypo("the quack brown fox jumps over the lazy dog"), expect: { ids: [] } },
      { request: allTypo("the quicest brownest fox jummps over the laziest dog"), expect: { ids: [3] } },
    ],
  },
  {
    from: `${MILLI_NEW}/typo.rs › test_typo_exact_attribute`,
    documents: TYPO_DOCUMENTS,
    settings: { ...TYPO_SETTINGS, searchableAttributes: ["text", "tolerant_text"], typoTolerance: { disableOnAttributes: ["text"], disableOnWords: ["quivk"] } },
    searches: [
      { request: allTypo("the quick brown fox jumps over the lazy dog"), expect: { ids: [0, 24, 25] } },
      { request: allTypo("the quidk brown fox jumps over the lazy dog"), expect: { ids: [24, 25] } },
      { request: allTypo("the quivk brown fox jumps over the lazy dog"), expect: { ids: [23, 25] } },
      { request: allTypo("the quicest brownest fox jummps over the laziest dog"), expect: { ids: [] } },
    ],
  },
  {
    from: `${MILLI_NEW}/typo.rs › test_typo_ranking_rule_not_preceded_by_words_ranking_rule`,
    documents: TYPO_DOCUMENTS,
    settings: { ...TYPO_SETTINGS, rankingRules: ["typo"] },
    searches: [
      { request: { q: "the quick brown fox jumps over the lazy dog", matchingStrategy: "last" }, expect: { ids: [0, 23, 7, 8, 9, 22, 10, 11, 1, 2, 12, 13, 4, 3, 5, 6, 21] } },
    ],
  },
  {
    from: `${MILLI_NEW}/typo.rs › test_typo_ranking_rule_not_preceded_by_words_ranking_rule (words, typo)`,
    documents: TYPO_DOCUMENTS,
    settings: { ...TYPO_SETTINGS, rankingRules: ["words", "typo"] },
    searches: [
      { request: { q: "the quick brown fox jumps over the lazy dog", matchingStrategy: "last" }, expect: { ids: [0, 23, 7, 8, 9, 22, 10, 11, 1, 2, 12, 13, 4, 3, 5, 6, 21] } },
    ],
  },
];
