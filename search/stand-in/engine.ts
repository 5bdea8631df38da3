// The search stand-in's state: indexes with their settings and documents, an asynchronous task queue
// (enqueued → processing → succeeded | failed), search with filters, facets, sort and pagination, and a
// JSON snapshot on disk written after every task so that a restart keeps the indexes.
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import { ApiError, indexNotFound, type ApiErrorBody } from "./errors.ts";
import { attributePosition, conditionsOf, evaluateFilter, FilterShapeError, FilterSyntaxError, parseFilter, type ConditionNode, type FilterNode } from "./filter.ts";
import { applySettingsPatch, attributeMatches, defaultSettings, filterablePatterns, filterableRules, ruleMatches } from "./index-settings.ts";
import { DocumentTable, type Bitset, type SortRule } from "./table.ts";
import { bucketSort, rankingSteps } from "./ranking.ts";
import { TextIndex, type TextMatch, type TypoSettings } from "./text-index.ts";

type Document = Record<string, unknown>;

type IndexState = {
  uid: string;
  primaryKey: string | null;
  createdAt: string;
  updatedAt: string;
  settings: Record<string, unknown>;
  documents: Map<string, Document>;
  text: TextIndex;
  /** The documents' columns for searching, built on the first search after a change (null until then). */
  table: DocumentTable | null;
};

export type TaskStatus = "enqueued" | "processing" | "succeeded" | "failed" | "canceled";
export type TaskType = "indexCreation" | "indexUpdate" | "indexDeletion" | "documentAdditionOrUpdate" | "documentDeletion" | "settingsUpdate";

export type TaskView = {
  uid: number;
  batchUid: number | null;
  indexUid: string | null;
  status: TaskStatus;
  type: TaskType;
  canceledBy: null;
  details: Record<string, unknown>;
  error: ApiErrorBody | null;
  duration: string | null;
  enqueuedAt: string;
  startedAt: string | null;
  finishedAt: string | null;
};

export type EnqueuedTaskView = Pick<TaskView, "indexUid" | "status" | "type" | "enqueuedAt"> & { taskUid: number };

type Work = (task: TaskView) => void;

type Snapshot = {
  version: 1;
  nextTaskUid: number;
  indexes: Array<Omit<IndexState, "documents" | "text" | "table"> & { documents: Document[] }>;
  tasks: TaskView[];
};

/** How many finished tasks are kept (and written to the snapshot). */
const keptTasks = 2_000;

export class SearchEngine {
  private readonly indexes = new Map<string, IndexState>();
  private tasks: TaskView[] = [];
  private readonly work = new Map<number, Work>();
  private nextTaskUid = 0;
  private processing: Promise<void> | null = null;
  private writing: Promise<void> = Promise.resolve();

  private constructor(
    private readonly snapshotFile: string,
    private readonly snapshots: boolean,
  ) {}

  static async open(directory: string, options: { snapshots?: boolean } = {}): Promise<SearchEngine> {
    await mkdir(directory, { recursive: true });
    const engine = new SearchEngine(path.join(directory, "snapshot.json"), options.snapshots ?? true);
    let text: string | null = null;
    try {
      text = await readFile(engine.snapshotFile, "utf8");
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "ENOENT") throw error;
    }
    if (text !== null) engine.restore(JSON.parse(text) as Snapshot);
    return engine;
  }

  private restore(snapshot: Snapshot) {
    this.nextTaskUid = snapshot.nextTaskUid;
    for (const saved of snapshot.indexes) {
      const state = this.newIndex(saved.uid, saved.primaryKey, saved.createdAt);
      state.updatedAt = saved.updatedAt;
      state.settings = { ...defaultSettings(), ...saved.settings };
      for (const document of saved.documents) state.documents.set(documentKey(document[saved.primaryKey!]), document);
      this.configureText(state);
      this.indexes.set(saved.uid, state);
    }
    // Tasks that had not run when the snapshot was written can no longer run: say so instead of hanging.
    this.tasks = snapshot.tasks.map((task) =>
      task.status === "enqueued" || task.status === "processing"
        ? { ...task, status: "failed", finishedAt: new Date().toISOString(), error: new ApiError(500, "internal", "The search stand-in stopped before this task ran.", "internal").toJSON() }
        : task,
    );
  }

  private newIndex(uid: string, primaryKey: string | null, createdAt = new Date().toISOString()): IndexState {
    const settings = defaultSettings();
    const documents = new Map<string, Document>();
    const state: IndexState = {
      uid,
      primaryKey,
      createdAt,
      updatedAt: createdAt,
      settings,
      documents,
      text: new TextIndex(["*"], typoSettings(settings), () => documents.entries()),
      table: null,
    };
    return state;
  }

  private configureText(state: IndexState) {
    state.text.configure(state.settings.searchableAttributes as string[], typoSettings(state.settings));
  }

  // ----------------------------------------------------------------------------------------------------
  // Tasks

  enqueue(indexUid: string | null, type: TaskType, details: Record<string, unknown>, work: Work): EnqueuedTaskView {
    const task: TaskView = {
      uid: this.nextTaskUid++,
      batchUid: null,
      indexUid,
      status: "enqueued",
      type,
      canceledBy: null,
      details,
      error: null,
      duration: null,
      enqueuedAt: new Date().toISOString(),
      startedAt: null,
      finishedAt: null,
    };
    this.tasks.push(task);
    this.work.set(task.uid, work);
    this.processing ??= this.processQueue();
    return { taskUid: task.uid, indexUid, status: task.status, type, enqueuedAt: task.enqueuedAt };
  }

  private async processQueue() {
    // Let the client see the task enqueued before it is processed, as with the hosted engine.
    await new Promise((resolve) => setTimeout(resolve, 1));
    for (;;) {
      const task = this.tasks.find((candidate) => candidate.status === "enqueued");
      if (!task) break;
      task.status = "processing";
      task.batchUid = task.uid;
      const started = performance.now();
      task.startedAt = new Date().toISOString();
      await new Promise((resolve) => setImmediate(resolve));
      try {
        this.work.get(task.uid)!(task);
        task.status = "succeeded";
      } catch (error) {
        task.status = "failed";
        task.error = (error instanceof ApiError ? error : new ApiError(500, "internal", String(error), "internal")).toJSON();
      }
      this.work.delete(task.uid);
      task.finishedAt = new Date().toISOString();
      task.duration = `PT${((performance.now() - started) / 1000).toFixed(6)}S`;
      this.trimTasks();
      await this.persist();
    }
    this.processing = null;
  }

  private trimTasks() {
    if (this.tasks.length > keptTasks) this.tasks = this.tasks.slice(this.tasks.length - keptTasks);
  }

  /** Resolves once every enqueued task has run and its result is on disk. */
  async idle(): Promise<void> {
    while (this.processing) await this.processing;
    await this.writing;
  }

  getTask(uid: number): TaskView {
    const task = this.tasks.find((candidate) => candidate.uid === uid);
    if (!task) throw new ApiError(404, "task_not_found", `Task \`${uid}\` not found.`);
    return task;
  }

  listTasks(query: URLSearchParams) {
    const list = (name: string) => query.get(name)?.split(",").map((item) => item.trim()).filter(Boolean);
    const limit = integerParameter(query, "limit", 20, "invalid_task_limit");
    const from = query.has("from") ? integerParameter(query, "from", 0, "invalid_task_from") : null;
    const reverse = query.get("reverse") === "true";
    const [uids, statuses, types, indexUids] = [list("uids"), list("statuses"), list("types"), list("indexUids")];
    const matching = this.tasks.filter(
      (task) =>
        (!uids || uids.includes("*") || uids.includes(String(task.uid))) &&
        (!statuses || statuses.includes("*") || statuses.includes(task.status)) &&
        (!types || types.includes("*") || types.includes(task.type)) &&
        (!indexUids || indexUids.includes("*") || (task.indexUid !== null && indexUids.includes(task.indexUid))),
    );
    const ordered = reverse ? matching : [...matching].reverse();
    const start = from === null ? 0 : ordered.findIndex((task) => (reverse ? task.uid >= from : task.uid <= from));
    const page = start < 0 ? [] : ordered.slice(start, start + limit);
    const next = start < 0 ? null : (ordered[start + limit]?.uid ?? null);
    return { results: page, total: matching.length, limit, from: page[0]?.uid ?? null, next };
  }

  private persist(): Promise<void> {
    if (!this.snapshots) return this.writing;
    const snapshot: Snapshot = {
      version: 1,
      nextTaskUid: this.nextTaskUid,
      indexes: [...this.indexes.values()].map(({ documents, text: _text, table: _table, ...rest }) => ({ ...rest, documents: [...documents.values()] })),
      tasks: this.tasks,
    };
    const text = JSON.stringify(snapshot);
    // Written to a temporary file and renamed, so that a crash never leaves half a snapshot.
    this.writing = this.writing.then(async () => {
      const temporary = `${this.snapshotFile}.${process.pid}.tmp`;
      try {
        await writeFile(temporary, text);
        await rename(temporary, this.snapshotFile);
      } catch (error) {
        // The index stays usable in memory; the next task's snapshot tries again.
        process.stderr.write(`search stand-in: could not write ${this.snapshotFile}: ${(error as Error).message}\n`);
      }
    });
    return this.writing;
  }

  // ----------------------------------------------------------------------------------------------------
  // Indexes

  requireIndex(uid: string): IndexState {
    const state = this.indexes.get(uid);
    if (!state) throw indexNotFound(uid);
    return state;
  }

  hasIndex(uid: string): boolean {
    return this.indexes.has(uid);
  }

  indexView(state: IndexState) {
    return { uid: state.uid, primaryKey: state.primaryKey, createdAt: state.createdAt, updatedAt: state.updatedAt };
  }

  listIndexes(offset: number, limit: number) {
    const all = [...this.indexes.values()].sort((a, b) => a.uid.localeCompare(b.uid)).map((state) => this.indexView(state));
    return { results: all.slice(offset, offset + limit), offset, limit, total: all.length };
  }

  createIndex(uid: string, primaryKey: string | null): EnqueuedTaskView {
    return this.enqueue(uid, "indexCreation", { primaryKey }, () => {
      if (this.indexes.has(uid)) throw new ApiError(409, "index_already_exists", `Index \`${uid}\` already exists.`);
      this.indexes.set(uid, this.newIndex(uid, primaryKey));
    });
  }

  updateIndex(uid: string, primaryKey: string | null): EnqueuedTaskView {
    return this.enqueue(uid, "indexUpdate", { primaryKey }, () => {
      const state = this.requireIndex(uid);
      if (primaryKey !== null && primaryKey !== state.primaryKey) {
        if (state.documents.size > 0) {
          throw new ApiError(400, "index_primary_key_already_exists", `Index \`${uid}\`: Index already has a primary key: \`${state.primaryKey}\`.`);
        }
        state.primaryKey = primaryKey;
      }
      state.updatedAt = new Date().toISOString();
    });
  }

  deleteIndex(uid: string): EnqueuedTaskView {
    return this.enqueue(uid, "indexDeletion", { deletedDocuments: 0 }, (task) => {
      const state = this.requireIndex(uid);
      task.details.deletedDocuments = state.documents.size;
      this.indexes.delete(uid);
    });
  }

  private indexForWrite(uid: string): IndexState {
    let state = this.indexes.get(uid);
    if (!state) {
      state = this.newIndex(uid, null);
      this.indexes.set(uid, state);
    }
    return state;
  }

  stats(state: IndexState) {
    const fieldDistribution: Record<string, number> = {};
    for (const document of state.documents.values()) for (const key of Object.keys(document)) fieldDistribution[key] = (fieldDistribution[key] ?? 0) + 1;
    return { numberOfDocuments: state.documents.size, isIndexing: this.tasks.some((task) => task.indexUid === state.uid && (task.status === "enqueued" || task.status === "processing")), fieldDistribution };
  }

  allStats() {
    const indexes = Object.fromEntries([...this.indexes.values()].map((state) => [state.uid, this.stats(state)]));
    const lastUpdate = [...this.indexes.values()].map((state) => state.updatedAt).sort().at(-1) ?? null;
    return { databaseSize: 0, lastUpdate, indexes };
  }

  // ----------------------------------------------------------------------------------------------------
  // Settings

  getSettings(uid: string): Record<string, unknown> {
    return this.requireIndex(uid).settings;
  }

  updateSettings(uid: string, patch: Record<string, unknown>): EnqueuedTaskView {
    // Checked now, so that a bad setting is a 400 rather than a failed task.
    applySettingsPatch(this.indexes.get(uid)?.settings ?? defaultSettings(), patch);
    return this.enqueue(uid, "settingsUpdate", { ...patch }, () => {
      const state = this.indexForWrite(uid);
      state.settings = applySettingsPatch(state.settings, patch);
      state.updatedAt = new Date().toISOString();
      this.configureText(state);
    });
  }

  // ----------------------------------------------------------------------------------------------------
  // Documents

  addDocuments(uid: string, documents: unknown[], primaryKey: string | null, mode: "replace" | "update"): EnqueuedTaskView {
    return this.enqueue(uid, "documentAdditionOrUpdate", { receivedDocuments: documents.length, indexedDocuments: null }, (task) => {
      const state = this.indexForWrite(uid);
      if (primaryKey !== null && state.primaryKey !== null && primaryKey !== state.primaryKey) {
        throw new ApiError(400, "index_primary_key_already_exists", `Index \`${uid}\`: Index already has a primary key: \`${state.primaryKey}\`.`);
      }
      const key = state.primaryKey ?? primaryKey ?? inferPrimaryKey(documents);
      const prepared: Array<[string, Document]> = [];
      for (const document of documents) {
        if (document === null || typeof document !== "object" || Array.isArray(document)) {
          throw new ApiError(400, "malformed_payload", "Each document must be a JSON object.");
        }
        const id = (document as Document)[key];
        if (id === undefined) {
          throw new ApiError(400, "missing_document_id", `Document doesn't have a \`${key}\` attribute: \`${JSON.stringify(document)}\`.`);
        }
        if (!validDocumentId(id)) {
          throw new ApiError(
            400,
            "invalid_document_id",
            `Document identifier \`${JSON.stringify(id)}\` is invalid. A document identifier can be of type integer or string, only composed of alphanumeric characters (a-z A-Z 0-9), hyphens (-) and underscores (_), and can not be more than 511 bytes.`,
          );
        }
        prepared.push([documentKey(id), document as Document]);
      }
      state.primaryKey = key;
      for (const [id, document] of prepared) {
        const existing = state.documents.get(id);
        const next = mode === "update" && existing ? { ...existing, ...document } : document;
        state.documents.set(id, next);
        state.text.upsert(id, next, existing !== undefined);
      }
      state.table = null;
      state.updatedAt = new Date().toISOString();
      task.details.indexedDocuments = prepared.length;
    });
  }

  getDocument(uid: string, id: string, fields: string[] | null): Document {
    const state = this.requireIndex(uid);
    const document = state.documents.get(id);
    if (!document) throw new ApiError(404, "document_not_found", `Document \`${id}\` not found.`);
    return pickAttributes(document, fields, state.settings);
  }

  listDocuments(uid: string, request: { offset: number; limit: number; fields: string[] | null; filter: unknown; ids: string[] | null }) {
    const state = this.requireIndex(uid);
    const filter = this.parseIndexFilter(state, request.filter, "invalid_document_filter");
    const ids = request.ids ? new Set(request.ids.map(String)) : null;
    const matching = [...state.documents.entries()].filter(([id, document]) => (!ids || ids.has(id)) && (!filter || evaluateFilter(filter, document)));
    const results = matching.slice(request.offset, request.offset + request.limit).map(([, document]) => pickAttributes(document, request.fields, state.settings));
    return { results, offset: request.offset, limit: request.limit, total: matching.length };
  }

  deleteDocuments(uid: string, ids: string[]): EnqueuedTaskView {
    return this.enqueue(uid, "documentDeletion", { providedIds: ids.length, deletedDocuments: null, originalFilter: null }, (task) => {
      const state = this.requireIndex(uid);
      let deleted = 0;
      for (const id of ids) {
        if (state.documents.delete(id)) {
          state.text.remove(id);
          deleted += 1;
        }
      }
      state.table = null;
      state.updatedAt = new Date().toISOString();
      task.details.deletedDocuments = deleted;
    });
  }

  deleteDocumentsByFilter(uid: string, filter: unknown): EnqueuedTaskView {
    // Syntax is checked now (400); whether the attributes are filterable is checked when the task runs.
    const parsed = parseOrThrow(filter, "invalid_document_filter");
    if (!parsed) throw new ApiError(400, "invalid_document_filter", "Invalid syntax for the filter parameter: the filter is empty.");
    return this.enqueue(uid, "documentDeletion", { providedIds: 0, deletedDocuments: null, originalFilter: JSON.stringify(filter) }, (task) => {
      const state = this.requireIndex(uid);
      this.checkFilterable(state, parsed, "invalid_document_filter");
      let deleted = 0;
      for (const [id, document] of [...state.documents.entries()]) {
        if (evaluateFilter(parsed, document)) {
          state.documents.delete(id);
          state.text.remove(id);
          deleted += 1;
        }
      }
      state.table = null;
      state.updatedAt = new Date().toISOString();
      task.details.deletedDocuments = deleted;
    });
  }

  deleteAllDocuments(uid: string): EnqueuedTaskView {
    return this.enqueue(uid, "documentDeletion", { providedIds: 0, deletedDocuments: null, originalFilter: null }, (task) => {
      const state = this.requireIndex(uid);
      task.details.deletedDocuments = state.documents.size;
      state.documents.clear();
      state.text.invalidate();
      state.table = null;
      state.updatedAt = new Date().toISOString();
    });
  }

  // ----------------------------------------------------------------------------------------------------
  // Search

  private parseIndexFilter(state: IndexState, filter: unknown, code: string): FilterNode | null {
    const parsed = parseOrThrow(filter, code);
    if (parsed) this.checkFilterable(state, parsed, code);
    return parsed;
  }

  private checkFilterable(state: IndexState, node: FilterNode, code: string) {
    const rules = filterableRules(state.settings);
    for (const condition of conditionsOf(node)) {
      // The first rule that names the attribute decides what may be done with it, as in the engine.
      const ruleIndex = rules.findIndex((rule) => ruleMatches(rule, condition.attribute));
      const rule = rules[ruleIndex];
      const operator = operatorOf(condition);
      const kind = operator === "=" || operator === "!=" || operator === "IN" ? "equality" : operator === "EXISTS" || operator === "IS NULL" || operator === "IS EMPTY" ? "any" : "comparison";
      if (rule && (rule.equality || rule.comparison) && kind !== "any" && !rule[kind]) {
        const allowed = ["OR", "AND", "NOT", ...(rule.equality ? ["=", "!=", "IN"] : []), ...(rule.comparison ? ["<", ">", "<=", ">=", "TO"] : []), "IS EMPTY", "IS NULL", "EXISTS"];
        throw new ApiError(
          400,
          code,
          `Index \`${state.uid}\`: Filter operator \`${operator}\` is not allowed for the attribute \`${condition.attribute}\`.\n  - Note: allowed operators: ${allowed.join(", ")}.\n  - Note: field \`${condition.attribute}\` matched rule #${ruleIndex} in \`filterableAttributes\`\n  - Hint: enable ${kind} in rule #${ruleIndex} by modifying the features.filter object\n  - Hint: prepend another rule matching \`${condition.attribute}\` with appropriate filter features before rule #${ruleIndex}`,
        );
      }
      if (!rule || !(rule.equality || rule.comparison)) {
        const position = attributePosition(condition);
        const usable = rules.filter((candidate) => candidate.equality || candidate.comparison).flatMap((candidate) => candidate.patterns);
        throw new ApiError(
          400,
          code,
          `Index \`${state.uid}\`: Attribute \`${condition.attribute}\` is not filterable. ${availableList("filterable attribute patterns", usable)}${position === undefined ? "" : ` (at column ${position + 1})`}`,
        );
      }
    }
  }

  private tableOf(state: IndexState): DocumentTable {
    state.table ??= new DocumentTable(state.documents.entries());
    return state.table;
  }

  /**
   * One search. `memo` (per index) lets the searches of one multi-search share the document sets of
   * the conditions they have in common.
   */
  search(uid: string, request: SearchRequest, memo?: Map<string, Bitset>) {
    const started = performance.now();
    const state = this.requireIndex(uid);
    const filter = this.parseIndexFilter(state, request.filter, "invalid_search_filter");
    const sortRules = parseSort(state, request.sort);
    const facets = facetAttributes(state, request.facets);
    const table = this.tableOf(state);
    const allowed = filter ? table.match(filter, memo) : null;

    const query = request.q ?? "";
    const withWords = query.trim() !== "";
    // Candidates in insertion order (the engine's document ids), which breaks the ranking rules' last ties.
    let matches: number[];
    let textMatches: Map<string, TextMatch> | null = null;
    if (!withWords) {
      matches = allowed ? allowed.members() : Array.from({ length: table.size }, (_, n) => n);
    } else {
      const order = rankingSteps(state.settings.rankingRules as string[], [], true, request.matchingStrategy).flatMap((step) => (step.kind === "text" ? [step.key] : []));
      const firstPositional = order.findIndex((key) => key === "proximity" || key === "attributeRank" || key === "wordPosition");
      const before = (key: keyof TextMatch) => firstPositional >= 0 && order.indexOf(key) >= 0 && order.indexOf(key) < firstPositional;
      textMatches = state.text.search(query, request.matchingStrategy, new Set(order), { byTypo: before("typos"), byExactness: before("inexactWords") });
      matches = [];
      for (const id of textMatches.keys()) {
        const n = table.numberOfKey(id);
        if (n !== undefined && (!allowed || allowed.has(n))) matches.push(n);
      }
      matches.sort((a, b) => a - b);
    }
    const steps = rankingSteps(state.settings.rankingRules as string[], sortRules, withWords, request.matchingStrategy);
    const maxTotalHits = (state.settings.pagination as { maxTotalHits: number }).maxTotalHits;
    const reachable = Math.min(matches.length, maxTotalHits);
    const pageMode = request.page !== undefined || request.hitsPerPage !== undefined;
    const response: Record<string, unknown> = {};
    let [start, end] = [0, 0];
    if (pageMode) {
      const page = request.page ?? 1;
      const hitsPerPage = request.hitsPerPage ?? 20;
      // Page 0 and 0 hits per page answer the counts without hits, as the engine does.
      [start, end] = hitsPerPage === 0 || page === 0 ? [0, 0] : [(page - 1) * hitsPerPage, page * hitsPerPage];
      Object.assign(response, { hitsPerPage, page, totalPages: hitsPerPage === 0 ? 0 : Math.ceil(reachable / hitsPerPage), totalHits: reachable });
    } else {
      const offset = request.offset ?? 0;
      const limit = request.limit ?? 20;
      [start, end] = [offset, offset + limit];
      Object.assign(response, { limit, offset, estimatedTotalHits: reachable });
    }
    end = Math.min(end, reachable);
    let ordered = matches;
    if (end > start && steps.length) {
      if (steps.every((step) => step.kind === "sort")) {
        // Sort rules alone (a search without words): only the page's part of the order is needed.
        ordered = table.sort(matches, steps.map((step) => (step as { rule: SortRule }).rule), end);
      } else {
        ordered = bucketSort(matches, steps, (rule) => table.sortRanksOf(rule), (n) => textMatches!.get(table.keys[n]!));
      }
    }
    const hits = end > start ? ordered.slice(start, end) : [];

    const result: Record<string, unknown> = {
      // Not copied: the server serializes the answer at once, and nothing here changes a stored document.
      hits: hits.map((n) => pickAttributes(table.documents[n]!, request.attributesToRetrieve, state.settings, { copy: false })),
      query,
      processingTimeMs: 0,
      ...response,
    };
    if (facets) {
      const maxValues = (state.settings.faceting as { maxValuesPerFacet: number }).maxValuesPerFacet;
      Object.assign(result, table.facetSummary(matches, facets, maxValues));
    }
    result.processingTimeMs = Math.round(performance.now() - started);
    return result;
  }

  /**
   * Several searches in one request, answered in order as `{ results: [{ indexUid, …search }] }`. Stops
   * early when `gone()` says the client has left. A failing query fails the whole request, naming it.
   */
  multiSearch(queries: Array<{ indexUid: string; request: SearchRequest }>, gone: () => boolean = () => false) {
    const memos = new Map<string, Map<string, Bitset>>();
    const results: Record<string, unknown>[] = [];
    for (const [position, { indexUid, request }] of queries.entries()) {
      if (gone()) throw new ClientGoneError();
      let memo = memos.get(indexUid);
      if (!memo) memos.set(indexUid, (memo = new Map()));
      try {
        results.push({ indexUid, ...this.search(indexUid, request, memo) });
      } catch (error) {
        if (error instanceof ApiError) throw new ApiError(error.status, error.code, `Inside \`.queries[${position}]\`: ${error.message}`, error.type);
        throw error;
      }
    }
    return { results };
  }
}

/** The client closed its connection before its searches ran: nothing is computed or sent. */
export class ClientGoneError extends Error {
  override name = "ClientGoneError";
}

// ------------------------------------------------------------------------------------------------------
// Helpers

export type SearchRequest = {
  q: string | null;
  filter: unknown;
  facets: string[] | null;
  sort: string[] | null;
  limit?: number;
  offset?: number;
  page?: number;
  hitsPerPage?: number;
  attributesToRetrieve: string[] | null;
  matchingStrategy: "last" | "all" | "frequency";
};

function typoSettings(settings: Record<string, unknown>): TypoSettings {
  const typo = settings.typoTolerance as {
    enabled: boolean;
    minWordSizeForTypos: { oneTypo: number; twoTypos: number };
    disableOnWords?: string[];
    disableOnAttributes?: string[];
    disableOnNumbers?: boolean;
  };
  return {
    enabled: typo.enabled,
    oneTypo: typo.minWordSizeForTypos.oneTypo,
    twoTypos: typo.minWordSizeForTypos.twoTypos,
    disableOnWords: typo.disableOnWords ?? [],
    disableOnAttributes: typo.disableOnAttributes ?? [],
    disableOnNumbers: typo.disableOnNumbers ?? false,
  };
}

/** The operator of a condition as the engine's messages name it. */
function operatorOf(condition: ConditionNode): string {
  switch (condition.kind) {
    case "comparison":
      return condition.operator;
    case "range":
      return "TO";
    case "in":
      return "IN";
    case "exists":
      return "EXISTS";
    case "isNull":
      return "IS NULL";
    case "isEmpty":
      return "IS EMPTY";
  }
}

function parseOrThrow(filter: unknown, code: string): FilterNode | null {
  try {
    return parseFilter(filter);
  } catch (error) {
    if (error instanceof FilterSyntaxError || error instanceof FilterShapeError) throw new ApiError(400, code, error.message);
    throw error;
  }
}

function availableList(what: string, names: string[]): string {
  return names.length ? `Available ${what} are: ${names.map((name) => `\`${name}\``).join(", ")}.` : `This index has no ${what}.`;
}

export function documentKey(id: unknown): string {
  return String(id);
}

function validDocumentId(id: unknown): boolean {
  if (typeof id === "number") return Number.isInteger(id);
  return typeof id === "string" && /^[a-zA-Z0-9_-]+$/.test(id) && Buffer.byteLength(id) <= 511;
}

function inferPrimaryKey(documents: unknown[]): string {
  const first = documents[0];
  const candidates = first && typeof first === "object" ? Object.keys(first).filter((key) => /id$/i.test(key)) : [];
  if (candidates.length === 1) return candidates[0]!;
  if (candidates.length > 1) {
    throw new ApiError(400, "index_primary_key_multiple_candidates_found", `The primary key inference failed as the engine found ${candidates.length} fields ending with \`id\` in their names: ${candidates.map((key) => `'${key}'`).join(" and ")}. Please specify the primary key manually using the \`primaryKey\` query parameter.`);
  }
  throw new ApiError(400, "index_primary_key_no_candidate_found", "The primary key inference failed as the engine did not find any field ending with `id` in its name. Please specify the primary key manually using the `primaryKey` query parameter.");
}

function displayedAllows(attribute: string, settings: Record<string, unknown>): boolean {
  const displayed = settings.displayedAttributes as string[];
  return displayed.includes("*") || attributeMatches(attribute, displayed);
}

/** A copy of the document holding only the requested (and displayed) attributes; dotted paths reach into objects. */
export function pickAttributes(document: Document, attributes: string[] | null, settings: Record<string, unknown>, { copy = true } = {}): Document {
  const displayed = settings.displayedAttributes as string[];
  const wanted = !attributes || attributes.includes("*") ? (displayed.includes("*") ? null : displayed) : attributes.filter((attribute) => displayedAllows(attribute, settings));
  if (wanted === null) return copy ? structuredClone(document) : document;
  const picked: Document = {};
  for (const attribute of wanted) {
    // A plain top-level name (the common case) is one look-up; a number, string or null needs no clone.
    if (!attribute.includes(".")) {
      if (Object.hasOwn(document, attribute)) {
        const value = document[attribute];
        picked[attribute] = value !== null && typeof value === "object" ? structuredClone(value) : value;
      }
    } else {
      copyPath(document, attribute, picked);
    }
  }
  return picked;
}

function copyPath(source: Document, attribute: string, target: Document) {
  for (const [key, value] of Object.entries(source)) {
    if (key === attribute) {
      target[key] = structuredClone(value);
    } else if (attribute.startsWith(`${key}.`) && value !== null && typeof value === "object") {
      const rest = attribute.slice(key.length + 1);
      if (Array.isArray(value)) {
        const existing = Array.isArray(target[key]) ? (target[key] as Document[]) : value.map(() => ({}));
        value.forEach((item, i) => item !== null && typeof item === "object" && copyPath(item as Document, rest, existing[i]!));
        target[key] = existing;
      } else {
        const nested = (target[key] ?? {}) as Document;
        copyPath(value as Document, rest, nested);
        target[key] = nested;
      }
    }
  }
}


function parseSort(state: IndexState, sort: string[] | null): SortRule[] {
  if (!sort || sort.length === 0) return [];
  if (!(state.settings.rankingRules as string[]).includes("sort")) {
    throw new ApiError(400, "invalid_search_sort", "You must specify where `sort` is listed in the rankingRules setting to use the sort parameter at search time.");
  }
  const sortable = state.settings.sortableAttributes as string[];
  return sort.map((expression) => {
    const match = /^(.+):(asc|desc)$/.exec(expression.trim());
    if (!match) {
      throw new ApiError(400, "invalid_search_sort", `Invalid syntax for the sort parameter: expected expression ending by \`:asc\` or \`:desc\`, found \`${expression}\`.`);
    }
    const attribute = match[1]!;
    if (!attributeMatches(attribute, sortable)) {
      throw new ApiError(400, "invalid_search_sort", `Index \`${state.uid}\`: Attribute \`${attribute}\` is not sortable. ${availableList("sortable attributes", sortable)}`);
    }
    return { attribute, descending: match[2] === "desc" };
  });
}

function facetAttributes(state: IndexState, facets: string[] | null): string[] | null {
  if (!facets) return null;
  const patterns = filterablePatterns(state.settings);
  if (facets.includes("*")) return patterns.filter((pattern) => !pattern.includes("*"));
  for (const facet of facets) {
    if (!attributeMatches(facet, patterns)) {
      throw new ApiError(400, "invalid_search_facets", `Index \`${state.uid}\`: Invalid facet distribution: Attribute \`${facet}\` is not filterable. ${availableList("filterable attribute patterns", patterns)}`);
    }
  }
  return facets;
}

function integerParameter(query: URLSearchParams, name: string, fallback: number, code: string): number {
  const raw = query.get(name);
  if (raw === null) return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 0) throw new ApiError(400, code, `Invalid value in parameter \`${name}\`: could not parse \`${raw}\` as a positive integer.`);
  return value;
}

