// The search stand-in's state: indexes with their settings and documents, an asynchronous task queue
// (enqueued → processing → succeeded | failed), search with filters, facets, sort and pagination, and a
// JSON snapshot on disk written after every task so that a restart keeps the indexes.
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import { ApiError, indexNotFound, type ApiErrorBody } from "./errors.ts";
import {
  attributePosition,
  conditionsOf,
  evaluateFilter,
  FilterShapeError,
  FilterSyntaxError,
  leafValues,
  lookUp,
  parseFilter,
  type FilterNode,
} from "./filter.ts";
import { applySettingsPatch, attributeMatches, defaultSettings, filterablePatterns } from "./index-settings.ts";
import { TextIndex, type TypoSettings } from "./text-index.ts";

type Document = Record<string, unknown>;

type IndexState = {
  uid: string;
  primaryKey: string | null;
  createdAt: string;
  updatedAt: string;
  settings: Record<string, unknown>;
  documents: Map<string, Document>;
  text: TextIndex;
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
  indexes: Array<Omit<IndexState, "documents" | "text"> & { documents: Document[] }>;
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

  private constructor(private readonly snapshotFile: string) {}

  static async open(directory: string): Promise<SearchEngine> {
    await mkdir(directory, { recursive: true });
    const engine = new SearchEngine(path.join(directory, "snapshot.json"));
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
    const snapshot: Snapshot = {
      version: 1,
      nextTaskUid: this.nextTaskUid,
      indexes: [...this.indexes.values()].map(({ documents, text: _text, ...rest }) => ({ ...rest, documents: [...documents.values()] })),
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
    const patterns = filterablePatterns(state.settings);
    for (const condition of conditionsOf(node)) {
      if (!attributeMatches(condition.attribute, patterns)) {
        const position = attributePosition(condition);
        throw new ApiError(
          400,
          code,
          `Index \`${state.uid}\`: Attribute \`${condition.attribute}\` is not filterable. ${availableList("filterable attribute patterns", patterns)}${position === undefined ? "" : ` (at column ${position + 1})`}`,
        );
      }
    }
  }

  search(uid: string, request: SearchRequest) {
    const started = performance.now();
    const state = this.requireIndex(uid);
    const filter = this.parseIndexFilter(state, request.filter, "invalid_search_filter");
    const sortRules = parseSort(state, request.sort);
    const facets = facetAttributes(state, request.facets);

    const query = request.q ?? "";
    let candidates: Array<[string, Document]>;
    if (query.trim() === "") {
      candidates = [...state.documents.entries()];
    } else {
      candidates = state.text.search(query, request.matchingStrategy).flatMap((id) => {
        const document = state.documents.get(id);
        return document ? [[id, document] as [string, Document]] : [];
      });
    }
    let matches = filter ? candidates.filter(([, document]) => evaluateFilter(filter, document)) : candidates;
    // Sort first; the relevance order (or insertion order) of the candidates breaks ties, since sort is stable.
    if (sortRules.length) matches = [...matches].sort(([, a], [, b]) => compareBySort(a, b, sortRules));

    const maxTotalHits = (state.settings.pagination as { maxTotalHits: number }).maxTotalHits;
    const reachable = matches.slice(0, maxTotalHits);
    const pageMode = request.page !== undefined || request.hitsPerPage !== undefined;
    const response: Record<string, unknown> = {};
    let hits: Array<[string, Document]>;
    if (pageMode) {
      const page = request.page ?? 1;
      const hitsPerPage = request.hitsPerPage ?? 20;
      hits = hitsPerPage === 0 ? [] : reachable.slice((page - 1) * hitsPerPage, page * hitsPerPage);
      Object.assign(response, { hitsPerPage, page, totalPages: hitsPerPage === 0 ? 0 : Math.ceil(reachable.length / hitsPerPage), totalHits: reachable.length });
    } else {
      const offset = request.offset ?? 0;
      const limit = request.limit ?? 20;
      hits = reachable.slice(offset, offset + limit);
      Object.assign(response, { limit, offset, estimatedTotalHits: reachable.length });
    }

    const result: Record<string, unknown> = {
      hits: hits.map(([, document]) => pickAttributes(document, request.attributesToRetrieve, state.settings)),
      query,
      processingTimeMs: 0,
      ...response,
    };
    if (facets) {
      const maxValues = (state.settings.faceting as { maxValuesPerFacet: number }).maxValuesPerFacet;
      Object.assign(result, facetSummary(matches.map(([, document]) => document), facets, maxValues));
    }
    result.processingTimeMs = Math.round(performance.now() - started);
    return result;
  }
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
  const typo = settings.typoTolerance as { enabled: boolean; minWordSizeForTypos: { oneTypo: number; twoTypos: number } };
  return { enabled: typo.enabled, oneTypo: typo.minWordSizeForTypos.oneTypo, twoTypos: typo.minWordSizeForTypos.twoTypos };
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
export function pickAttributes(document: Document, attributes: string[] | null, settings: Record<string, unknown>): Document {
  const displayed = settings.displayedAttributes as string[];
  const wanted = !attributes || attributes.includes("*") ? (displayed.includes("*") ? null : displayed) : attributes.filter((attribute) => displayedAllows(attribute, settings));
  if (wanted === null) return structuredClone(document);
  const picked: Document = {};
  for (const attribute of wanted) copyPath(document, attribute, picked);
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

type SortRule = { attribute: string; descending: boolean };

function parseSort(state: IndexState, sort: string[] | null): SortRule[] {
  if (!sort) return [];
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

/** Numbers sort before strings, and documents without the attribute come last in either direction. */
function sortKey(document: Document, rule: SortRule): { group: number; value: number | string } {
  const leaves = leafValues(lookUp(document, rule.attribute));
  const numbers = leaves.filter((leaf): leaf is number => typeof leaf === "number");
  if (numbers.length) return { group: 0, value: rule.descending ? Math.max(...numbers) : Math.min(...numbers) };
  const strings = leaves.filter((leaf): leaf is string => typeof leaf === "string").map((leaf) => leaf.toLowerCase()).sort();
  if (strings.length) return { group: 1, value: rule.descending ? strings.at(-1)! : strings[0]! };
  return { group: 2, value: 0 };
}

function compareBySort(a: Document, b: Document, rules: SortRule[]): number {
  for (const rule of rules) {
    const [left, right] = [sortKey(a, rule), sortKey(b, rule)];
    if (left.group !== right.group) return left.group - right.group;
    if (left.group === 2 || left.value === right.value) continue;
    const ascending = left.value < right.value ? -1 : 1;
    return rule.descending ? -ascending : ascending;
  }
  return 0;
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

function facetSummary(documents: Document[], facets: string[], maxValues: number) {
  const facetDistribution: Record<string, Record<string, number>> = {};
  const facetStats: Record<string, { min: number; max: number }> = {};
  for (const facet of facets) {
    // Values are counted case-insensitively and shown as first met, as the engine does.
    const counts = new Map<string, { label: string; count: number }>();
    let min = Infinity;
    let max = -Infinity;
    for (const document of documents) {
      const seen = new Set<string>();
      for (const leaf of leafValues(lookUp(document, facet))) {
        if (typeof leaf === "number") {
          min = Math.min(min, leaf);
          max = Math.max(max, leaf);
        }
        if (typeof leaf !== "number" && typeof leaf !== "string" && typeof leaf !== "boolean") continue;
        const label = String(leaf);
        const key = typeof leaf === "string" ? leaf.trim().toLowerCase() : label;
        if (seen.has(key)) continue;
        seen.add(key);
        const entry = counts.get(key) ?? { label, count: 0 };
        entry.count += 1;
        counts.set(key, entry);
      }
    }
    const sorted = [...counts.entries()].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).slice(0, maxValues);
    facetDistribution[facet] = Object.fromEntries(sorted.map(([, { label, count }]) => [label, count]));
    if (min !== Infinity) facetStats[facet] = { min, max };
  }
  return { facetDistribution, facetStats };
}

function integerParameter(query: URLSearchParams, name: string, fallback: number, code: string): number {
  const raw = query.get(name);
  if (raw === null) return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 0) throw new ApiError(400, code, `Invalid value in parameter \`${name}\`: could not parse \`${raw}\` as a positive integer.`);
  return value;
}

