// The search stand-in against the search engine's own filter, sort, pagination, facet and typo test cases
// (engine-conformance/cases.ts names the commit, file and test each comes from), over HTTP as the SDK
// speaks to it: each case gets its own index with the engine test's settings and documents.
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort } from "../../../scripts/lib/ports.ts";
import { startSearchStandIn, type SearchStandIn } from "../../../search/stand-in/index.ts";
import { ENGINE_COMMIT, engineCases, type Expectation } from "./engine-conformance/cases.ts";

let standIn: SearchStandIn;
let dataDir: string;
let host: string;

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(os.tmpdir(), "tenthmark-engine-conformance-"));
  const port = await freePort();
  standIn = await startSearchStandIn({ port, dataDir, appOrigin: "http://localhost" });
  host = standIn.env.MEILISEARCH_HOST!;
});

afterAll(async () => {
  await standIn?.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

async function call(method: string, route: string, body?: unknown): Promise<{ status: number; json: Record<string, unknown> }> {
  const response = await fetch(`${host}${route}`, {
    method,
    headers: { authorization: `Bearer ${standIn.env.MEILISEARCH_API_KEY}`, "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: response.status, json: (await response.json()) as Record<string, unknown> };
}

async function waitFor(task: { json: Record<string, unknown> }) {
  for (;;) {
    const { json } = await call("GET", `/tasks/${String(task.json.taskUid)}`);
    if (json.status === "succeeded") return;
    if (json.status === "failed") throw new Error(`task failed: ${JSON.stringify(json.error)}`);
    await new Promise((resolve) => setTimeout(resolve, 5));
  }
}

function check(answer: { status: number; json: Record<string, unknown> }, expected: Expectation) {
  const body = answer.json;
  expect(answer.status, JSON.stringify(body).slice(0, 400)).toBe(expected.status ?? 200);
  if (expected.code) expect(body.code).toBe(expected.code);
  if (answer.status !== 200) return;
  const ids = (body.hits as Array<{ id: unknown }>).map((hit) => hit.id);
  if (expected.ids) expect(ids).toEqual(expected.ids);
  if (expected.idsInAnyOrder) expect([...ids].sort()).toEqual([...expected.idsInAnyOrder].sort());
  if (expected.count !== undefined) expect(ids).toHaveLength(expected.count);
  if (expected.fields) expect(body).toMatchObject(expected.fields);
  for (const field of expected.absent ?? []) expect(body).not.toHaveProperty(field);
  if (expected.facetDistribution) expect(body.facetDistribution).toMatchObject(expected.facetDistribution);
  for (const [facet, size] of Object.entries(expected.facetSizes ?? {})) {
    expect(Object.keys((body.facetDistribution as Record<string, object>)[facet] ?? {})).toHaveLength(size);
  }
}

describe(`the search stand-in against the engine's test cases (meilisearch@${ENGINE_COMMIT.slice(0, 12)})`, () => {
  it.each(engineCases.map((engineCase, n) => [engineCase.from, engineCase, n] as const))("%s", async (_from, engineCase, n) => {
    const uid = `conformance-${n}`;
    await waitFor(await call("PATCH", `/indexes/${uid}/settings`, engineCase.settings));
    await waitFor(await call("POST", `/indexes/${uid}/documents?primaryKey=id`, engineCase.documents));
    for (const { request, expect: expected } of engineCase.searches) {
      check(await call("POST", `/indexes/${uid}/search`, request), expected);
    }
  });
});
