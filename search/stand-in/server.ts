// The search stand-in's HTTP face: the REST routes the `meilisearch` SDK calls, a master key checked as a
// Bearer token, errors in the engine's `{ message, code, type, link }` shape. Loopback only.
import { randomBytes } from "node:crypto";
import http from "node:http";
import path from "node:path";
import { ApiError, badRequest } from "./errors.ts";
import { ClientGoneError, SearchEngine, type SearchRequest } from "./engine.ts";
import { settingRoutes } from "./index-settings.ts";

/** `snapshots: false` keeps the index in memory only (nothing survives a restart). */
export type SearchStandInOptions = { port: number; dataDir: string; appOrigin?: string; masterKey?: string; snapshots?: boolean };

export type SearchStandIn = {
  name: "search";
  env: { MEILISEARCH_HOST: string; MEILISEARCH_API_KEY: string };
  /** Delays every answer by `ms` (0 to stop), to try out what the app does when search is slow. */
  setLatency: (ms: number) => void;
  /** Finishes the queued tasks, writes the snapshot and closes the port. */
  stop: () => Promise<void>;
};

const maxBodyBytes = 20 * 1024 * 1024;

/** `masterKey` is the key it accepts; a random one unless given (`npm start` and the tests pass theirs). */
export async function startSearchStandIn({ port, dataDir, masterKey = randomBytes(24).toString("hex"), snapshots = true }: SearchStandInOptions): Promise<SearchStandIn> {
  const engine = await SearchEngine.open(path.join(dataDir, "search"), { snapshots });
  let latencyMs = 0;

  const server = http.createServer((request, response) => {
    // A client that gave up (the app's search timeout) has closed its socket: its searches are not run.
    const gone = () => request.socket.destroyed || response.destroyed;
    handle(engine, masterKey, request, () => latencyMs, (ms) => (latencyMs = ms), gone)
      .then(({ status, body }) => send(response, status, body))
      .catch((error: unknown) => {
        if (error instanceof ClientGoneError) return;
        const apiError = error instanceof ApiError ? error : new ApiError(500, "internal", error instanceof Error ? error.message : String(error), "internal");
        send(response, apiError.status, apiError.toJSON());
      });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });

  let stopped: Promise<void> | null = null;
  return {
    name: "search",
    env: { MEILISEARCH_HOST: `http://127.0.0.1:${port}`, MEILISEARCH_API_KEY: masterKey },
    setLatency: (ms) => (latencyMs = ms),
    stop: () =>
      (stopped ??= (async () => {
        latencyMs = 0;
        await engine.idle();
        await new Promise<void>((resolve) => {
          server.close(() => resolve());
          server.closeAllConnections();
        });
      })()),
  };
}

function send(response: http.ServerResponse, status: number, body: unknown) {
  if (response.headersSent) return;
  const text = body === undefined ? "" : JSON.stringify(body);
  response.writeHead(status, { "content-type": "application/json", "content-length": Buffer.byteLength(text) });
  response.end(text);
}

type Reply = { status: number; body: unknown };
const ok = (body: unknown): Reply => ({ status: 200, body });
const accepted = (body: unknown): Reply => ({ status: 202, body });

async function handle(
  engine: SearchEngine,
  masterKey: string,
  request: http.IncomingMessage,
  latency: () => number,
  setLatency: (ms: number) => void,
  gone: () => boolean,
): Promise<Reply> {
  const url = new URL(request.url ?? "/", "http://127.0.0.1");
  const method = request.method ?? "GET";
  const segments = url.pathname.split("/").filter(Boolean).map(decodeURIComponent);

  if (method === "GET" && segments.length === 1 && segments[0] === "health") {
    await delay(latency());
    return ok({ status: "available" });
  }
  authorize(request, masterKey);
  const body = await readBody(request);

  if (segments[0] === "_stand-in" && segments[1] === "latency" && method === "POST") {
    const ms = (body as { ms?: unknown } | undefined)?.ms;
    if (typeof ms !== "number" || ms < 0) throw badRequest("Send `{ \"ms\": <non-negative number> }`.");
    setLatency(ms);
    return ok({ latencyMs: ms });
  }
  await delay(latency());

  const [root, uid, section, ...rest] = segments;
  if (root === "version" && segments.length === 1 && method === "GET") {
    return ok({ commitSha: "tenthmark-stand-in", commitDate: "1970-01-01T00:00:00Z", pkgVersion: "1.0.0-stand-in" });
  }
  if (root === "stats" && segments.length === 1 && method === "GET") return ok(engine.allStats());
  if (root === "multi-search" && segments.length === 1) {
    if (method !== "POST") throw methodNotAllowed(method, url.pathname);
    return ok(engine.multiSearch(multiSearchQueries(objectBody(body)), gone));
  }
  if (root === "tasks") {
    if (segments.length === 1 && method === "GET") return ok(engine.listTasks(url.searchParams));
    if (segments.length === 2 && method === "GET") {
      const taskUid = Number(uid);
      if (!Number.isInteger(taskUid) || taskUid < 0) throw new ApiError(400, "invalid_task_uids", `Invalid value in parameter \`taskUid\`: could not parse \`${uid}\` as a positive integer.`);
      return ok(engine.getTask(taskUid));
    }
  }
  if (root === "indexes") {
    if (uid === undefined) {
      if (method === "GET") return ok(engine.listIndexes(integer(url.searchParams, "offset", 0, "invalid_index_offset"), integer(url.searchParams, "limit", 20, "invalid_index_limit")));
      if (method === "POST") {
        const { uid: newUid, primaryKey } = objectBody(body) as { uid?: unknown; primaryKey?: unknown };
        if (newUid === undefined) throw new ApiError(400, "missing_index_uid", "Missing field `uid`.");
        return accepted(engine.createIndex(validIndexUid(newUid), optionalString(primaryKey, "invalid_index_primary_key")));
      }
      throw methodNotAllowed(method, url.pathname);
    }
    validIndexUid(uid);
    if (section === undefined) {
      if (method === "GET") return ok(engine.indexView(engine.requireIndex(uid)));
      if (method === "PATCH") return accepted(engine.updateIndex(uid, optionalString(objectBody(body).primaryKey, "invalid_index_primary_key")));
      if (method === "DELETE") return accepted(engine.deleteIndex(uid));
      throw methodNotAllowed(method, url.pathname);
    }
    if (section === "stats" && rest.length === 0 && method === "GET") return ok(engine.stats(engine.requireIndex(uid)));
    if (section === "search" && rest.length === 0) {
      if (gone()) throw new ClientGoneError();
      if (method === "POST") return ok(engine.search(uid, searchRequest(objectBody(body))));
      if (method === "GET") return ok(engine.search(uid, searchRequest(searchQueryToBody(url.searchParams))));
      throw methodNotAllowed(method, url.pathname);
    }
    if (section === "documents") return documentsRoute(engine, uid, method, rest, url, body, request);
    if (section === "settings") return settingsRoute(engine, uid, method, rest, body, url.pathname);
  }
  throw new ApiError(404, "not_found", `The search stand-in has no route \`${method} ${url.pathname}\`.`);
}

function documentsRoute(engine: SearchEngine, uid: string, method: string, rest: string[], url: URL, body: unknown, request: http.IncomingMessage): Reply {
  const params = url.searchParams;
  if (rest.length === 0) {
    if (method === "GET") {
      return ok(
        engine.listDocuments(uid, {
          offset: integer(params, "offset", 0, "invalid_document_offset"),
          limit: integer(params, "limit", 20, "invalid_document_limit"),
          fields: commaList(params.get("fields")),
          filter: params.get("filter") ?? undefined,
          ids: commaList(params.get("ids")),
        }),
      );
    }
    if (method === "POST" || method === "PUT") {
      const documents = documentsBody(body, request);
      return accepted(engine.addDocuments(uid, documents, params.get("primaryKey"), method === "POST" ? "replace" : "update"));
    }
    if (method === "DELETE") return accepted(engine.deleteAllDocuments(uid));
  }
  if (rest.length === 1) {
    const [name] = rest as [string];
    if (name === "fetch" && method === "POST") {
      const fetch = objectBody(body ?? {}) as { offset?: unknown; limit?: unknown; fields?: unknown; filter?: unknown; ids?: unknown };
      return ok(
        engine.listDocuments(uid, {
          offset: integerValue(fetch.offset, "offset", 0, "invalid_document_offset"),
          limit: integerValue(fetch.limit, "limit", 20, "invalid_document_limit"),
          fields: stringArray(fetch.fields, "fields", "invalid_document_fields"),
          filter: fetch.filter,
          ids: fetch.ids === undefined || fetch.ids === null ? null : (fetch.ids as unknown[]).map(String),
        }),
      );
    }
    if (name === "delete-batch" && method === "POST") {
      if (!Array.isArray(body) || body.some((id) => typeof id !== "string" && typeof id !== "number")) {
        throw badRequest("Invalid value type: expected an array of document ids.");
      }
      return accepted(engine.deleteDocuments(uid, body.map(String)));
    }
    if (name === "delete" && method === "POST") {
      const { filter } = objectBody(body) as { filter?: unknown };
      if (filter === undefined) throw new ApiError(400, "missing_document_filter", "Missing field `filter`.");
      return accepted(engine.deleteDocumentsByFilter(uid, filter));
    }
    if (method === "GET") return ok(engine.getDocument(uid, name, commaList(url.searchParams.get("fields"))));
    if (method === "DELETE") return accepted(engine.deleteDocuments(uid, [name]));
  }
  throw methodNotAllowed(method, url.pathname);
}

function settingsRoute(engine: SearchEngine, uid: string, method: string, rest: string[], body: unknown, pathname: string): Reply {
  if (rest.length === 0) {
    if (method === "GET") return ok(engine.getSettings(uid));
    if (method === "PATCH") return accepted(engine.updateSettings(uid, objectBody(body)));
    if (method === "DELETE") {
      return accepted(engine.updateSettings(uid, Object.fromEntries(Object.values(settingRoutes).map((key) => [key, null]))));
    }
    throw methodNotAllowed(method, pathname);
  }
  const key = rest.length === 1 ? settingRoutes[rest[0]!] : undefined;
  if (!key) throw new ApiError(404, "not_found", `The search stand-in has no setting route \`${pathname}\`.`);
  if (method === "GET") return ok(engine.getSettings(uid)[key]);
  if (method === "PUT" || method === "PATCH") return accepted(engine.updateSettings(uid, { [key]: body === undefined ? null : body }));
  if (method === "DELETE") return accepted(engine.updateSettings(uid, { [key]: null }));
  throw methodNotAllowed(method, pathname);
}

// ------------------------------------------------------------------------------------------------------
// Request parsing

function authorize(request: http.IncomingMessage, masterKey: string) {
  const header = request.headers.authorization;
  if (!header) {
    throw new ApiError(401, "missing_authorization_header", "The Authorization header is missing. It must use the bearer authorization method.", "auth");
  }
  const match = /^Bearer\s+(.+)$/i.exec(header.trim());
  if (!match || match[1] !== masterKey) throw new ApiError(403, "invalid_api_key", "The provided API key is invalid.", "auth");
}

async function readBody(request: http.IncomingMessage): Promise<unknown> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of request) {
    size += (chunk as Buffer).length;
    if (size > maxBodyBytes) throw new ApiError(413, "payload_too_large", `The provided payload reached the size limit. The maximum accepted payload size is ${maxBodyBytes} bytes.`);
    chunks.push(chunk as Buffer);
  }
  const text = Buffer.concat(chunks).toString("utf8");
  if (text.trim() === "") return undefined;
  const type = request.headers["content-type"] ?? "application/json";
  if (type.startsWith("application/x-ndjson")) {
    try {
      return text.split("\n").filter((line) => line.trim()).map((line) => JSON.parse(line));
    } catch (error) {
      throw new ApiError(400, "malformed_payload", `The ndjson payload provided is malformed. ${(error as Error).message}.`);
    }
  }
  if (!type.startsWith("application/json")) {
    throw new ApiError(415, "invalid_content_type", `The Content-Type \`${type}\` is invalid. Accepted values for the Content-Type header are: \`application/json\`, \`application/x-ndjson\`.`);
  }
  try {
    return JSON.parse(text);
  } catch (error) {
    throw new ApiError(400, "malformed_payload", `The json payload provided is malformed. \`${(error as Error).message}\`.`);
  }
}

function documentsBody(body: unknown, request: http.IncomingMessage): unknown[] {
  if (body === undefined) throw new ApiError(400, "missing_payload", `A ${request.headers["content-type"] ?? "json"} payload is missing.`);
  return Array.isArray(body) ? body : [body];
}

function objectBody(body: unknown): Record<string, unknown> {
  if (body === undefined) return {};
  if (body === null || typeof body !== "object" || Array.isArray(body)) throw badRequest("Invalid value type: expected an object.");
  return body as Record<string, unknown>;
}

function validIndexUid(uid: unknown): string {
  if (typeof uid !== "string" || !/^[a-zA-Z0-9_-]{1,400}$/.test(uid)) {
    throw new ApiError(400, "invalid_index_uid", `\`${String(uid)}\` is not a valid index uid. Index uid can be an integer or a string containing only alphanumeric characters, hyphens (-) and underscores (_), and can not be more than 400 bytes.`);
  }
  return uid;
}

function optionalString(value: unknown, code: string): string | null {
  if (value === undefined || value === null) return null;
  if (typeof value !== "string") throw new ApiError(400, code, "Invalid value type: expected a string.");
  return value;
}

function methodNotAllowed(method: string, pathname: string): ApiError {
  return new ApiError(405, "method_not_allowed", `The search stand-in does not answer \`${method}\` on \`${pathname}\`.`);
}

async function delay(ms: number) {
  if (ms > 0) await new Promise((resolve) => setTimeout(resolve, ms));
}

function commaList(value: string | null): string[] | null {
  return value === null ? null : value.split(",").map((item) => item.trim()).filter(Boolean);
}

function integer(params: URLSearchParams, name: string, fallback: number, code: string): number {
  const raw = params.get(name);
  return raw === null ? fallback : integerValue(Number(raw), name, fallback, code);
}

function integerValue(value: unknown, name: string, fallback: number, code: string): number {
  if (value === undefined || value === null) return fallback;
  if (typeof value !== "number" || !Number.isInteger(value) || value < 0) {
    throw new ApiError(400, code, `Invalid value type at \`.${name}\`: expected a positive integer, but found ${JSON.stringify(value)}.`);
  }
  return value;
}

function stringArray(value: unknown, name: string, code: string): string[] | null {
  if (value === undefined || value === null) return null;
  if (!Array.isArray(value) || value.some((item) => typeof item !== "string")) {
    throw new ApiError(400, code, `Invalid value type at \`.${name}\`: expected an array of strings, but found ${JSON.stringify(value)}.`);
  }
  return value;
}

// Search parameters the SDK may send; those that do not change results here are accepted and left alone.
const knownSearchParameters = new Set([
  "q", "offset", "limit", "page", "hitsPerPage", "filter", "facets", "attributesToRetrieve", "attributesToCrop", "cropLength",
  "cropMarker", "attributesToHighlight", "highlightPreTag", "highlightPostTag", "showMatchesPosition", "sort", "matchingStrategy",
  "showRankingScore", "showRankingScoreDetails", "rankingScoreThreshold", "attributesToSearchOn", "distinct", "hybrid", "vector",
  "retrieveVectors", "locales", "showPerformanceDetails",
]);

function searchRequest(body: Record<string, unknown>): SearchRequest {
  for (const key of Object.keys(body)) {
    if (!knownSearchParameters.has(key)) throw badRequest(`Unknown field \`${key}\`: expected one of ${[...knownSearchParameters].map((name) => `\`${name}\``).join(", ")}`);
  }
  const q = body.q;
  if (q !== undefined && q !== null && typeof q !== "string") throw new ApiError(400, "invalid_search_q", `Invalid value type at \`.q\`: expected a string, but found ${JSON.stringify(q)}.`);
  const positive = (name: string, minimum: number) => {
    const value = body[name];
    if (value === undefined || value === null) return undefined;
    if (typeof value !== "number" || !Number.isInteger(value) || value < minimum) {
      throw new ApiError(400, `invalid_search_${name.replace(/[A-Z]/g, (letter) => `_${letter.toLowerCase()}`)}`, `Invalid value at \`.${name}\`: expected an integer of at least ${minimum}, but found ${JSON.stringify(value)}.`);
    }
    return value;
  };
  const matchingStrategy = body.matchingStrategy ?? "last";
  if (matchingStrategy !== "last" && matchingStrategy !== "all" && matchingStrategy !== "frequency") {
    throw new ApiError(400, "invalid_search_matching_strategy", "Unknown value at `.matchingStrategy`: expected one of `last`, `all`, `frequency`.");
  }
  return {
    q: (q as string | null | undefined) ?? null,
    filter: body.filter,
    facets: stringArray(body.facets, "facets", "invalid_search_facets"),
    sort: stringArray(body.sort, "sort", "invalid_search_sort"),
    offset: positive("offset", 0),
    limit: positive("limit", 0),
    page: positive("page", 0),
    hitsPerPage: positive("hitsPerPage", 0),
    attributesToRetrieve: stringArray(body.attributesToRetrieve, "attributesToRetrieve", "invalid_search_attributes_to_retrieve"),
    matchingStrategy,
  };
}

/** `POST /multi-search`: `{ queries: [{ indexUid, …search parameters }] }`; federated search is not offered. */
function multiSearchQueries(body: Record<string, unknown>): Array<{ indexUid: string; request: SearchRequest }> {
  if (body.federation !== undefined && body.federation !== null) {
    throw new ApiError(400, "invalid_multi_search_federation", "The search stand-in does not offer federated multi-search: leave out `federation`.");
  }
  for (const key of Object.keys(body)) {
    if (key !== "queries" && key !== "federation") throw badRequest(`Unknown field \`${key}\`: expected one of \`queries\`, \`federation\``);
  }
  if (!Array.isArray(body.queries)) throw new ApiError(400, "missing_multi_search_queries", "Missing field `queries`: expected an array of searches.");
  return body.queries.map((query: unknown, position) => {
    if (query === null || typeof query !== "object" || Array.isArray(query)) {
      throw badRequest(`Inside \`.queries[${position}]\`: Invalid value type: expected an object.`);
    }
    const { indexUid, federationOptions: _federationOptions, ...parameters } = query as Record<string, unknown>;
    if (indexUid === undefined) throw new ApiError(400, "missing_index_uid", `Inside \`.queries[${position}]\`: Missing field \`indexUid\`.`);
    try {
      return { indexUid: validIndexUid(indexUid), request: searchRequest(parameters) };
    } catch (error) {
      if (error instanceof ApiError) throw new ApiError(error.status, error.code, `Inside \`.queries[${position}]\`: ${error.message}`, error.type);
      throw error;
    }
  });
}

/** The GET form of search carries lists comma-separated and numbers as text. */
function searchQueryToBody(params: URLSearchParams): Record<string, unknown> {
  const body: Record<string, unknown> = {};
  const lists = new Set(["facets", "sort", "attributesToRetrieve", "attributesToCrop", "attributesToHighlight", "attributesToSearchOn", "locales"]);
  const numbers = new Set(["offset", "limit", "page", "hitsPerPage", "cropLength", "rankingScoreThreshold"]);
  const booleans = new Set(["showMatchesPosition", "showRankingScore", "showRankingScoreDetails", "retrieveVectors", "showPerformanceDetails"]);
  for (const [key, value] of params) {
    if (lists.has(key)) body[key] = commaList(value);
    else if (numbers.has(key)) body[key] = value.trim() === "" || Number.isNaN(Number(value)) ? value : Number(value);
    else if (booleans.has(key)) body[key] = value === "true";
    else body[key] = value;
  }
  return body;
}
