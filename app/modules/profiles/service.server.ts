// Tolerance profiles as reviewed data: the versions reports are scored with, and the staff's editing of them.
// A version is drafted by one staff member, published by another (four eyes), and never changed after;
// retiring it stops new reports but leaves the reports scored with it as they are.
import { and, desc, eq, inArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { Database } from "~/db/client.server";
import {
  evaluationRequestSchemaFor,
  fieldErrors,
  findProfile,
  GeometryInputError,
  scoreEvaluation,
  toleranceProfileSchema,
  type EvaluationResponse,
  type ProfileTest,
  type ToleranceProfile,
} from "~/geometry";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { user } from "~/modules/accounts/schema";
import type { Executor } from "~/modules/inspections/profiles.server";
import { toleranceProfiles, type ToleranceProfileRow } from "./schema";

/** An expected refusal: the route answers with `status` and shows `errors` at their fields. */
export class ProfileRuleError extends Error {
  override name = "ProfileRuleError";
  constructor(
    message: string,
    readonly status: 400 | 403 | 404 | 409 | 422 = 422,
    readonly errors: Record<string, string[]> = {},
  ) {
    super(message);
  }
}

export type ProfileStatus = ToleranceProfileRow["status"];

// Published and retired definitions never change (the trigger sees to it), so each is parsed once per process.
const parsedDefinitions = new Map<string, ToleranceProfile>();

function definitionOf(row: Pick<ToleranceProfileRow, "key" | "version" | "status" | "definition">): ToleranceProfile {
  const cacheKey = `${row.key}@${row.version}`;
  if (row.status !== "draft") {
    const cached = parsedDefinitions.get(cacheKey);
    if (cached) return cached;
  }
  const parsed = toleranceProfileSchema.safeParse(row.definition);
  if (!parsed.success) throw new Error(`stored tolerance profile ${cacheKey} does not read: ${parsed.error.message}`);
  if (row.status !== "draft") parsedDefinitions.set(cacheKey, parsed.data);
  return parsed.data;
}

// ————— For scoring —————

/** The versions offered for new reports: published and not retired. */
export async function profilesForNewReports(db: Executor): Promise<ToleranceProfile[]> {
  const rows = await db.select().from(toleranceProfiles).where(eq(toleranceProfiles.status, "published")).orderBy(toleranceProfiles.key, toleranceProfiles.version);
  return rows.map(definitionOf);
}

/** Every version a report may have been scored with (published or retired), for re-scoring and the API. */
export async function scorableProfiles(db: Executor): Promise<ToleranceProfile[]> {
  const rows = await db
    .select()
    .from(toleranceProfiles)
    .where(inArray(toleranceProfiles.status, ["published", "retired"]))
    .orderBy(toleranceProfiles.key, toleranceProfiles.version);
  return rows.map(definitionOf);
}

/** One published or retired version with its status; null for a draft or an unknown version. */
export async function scorableProfile(db: Executor, key: string, version: number): Promise<{ profile: ToleranceProfile; status: "published" | "retired" } | null> {
  const [row] = await db
    .select()
    .from(toleranceProfiles)
    .where(and(eq(toleranceProfiles.key, key), eq(toleranceProfiles.version, version), inArray(toleranceProfiles.status, ["published", "retired"])));
  if (!row) return null;
  return { profile: definitionOf(row), status: row.status as "published" | "retired" };
}

// ————— For the staff editor —————

const author = alias(user, "profile_author");
const approver = alias(user, "profile_approver");
const retirer = alias(user, "profile_retirer");

function versionSummary(row: {
  profile: ToleranceProfileRow;
  authorName: string | null;
  approverName: string | null;
  retiredByName: string | null;
}) {
  const definition = row.profile.definition as Partial<ToleranceProfile>;
  return {
    key: row.profile.key,
    version: row.profile.version,
    status: row.profile.status,
    title: typeof definition.title === "string" ? definition.title : row.profile.key,
    category: definition.category ?? null,
    makersChart: definition.scope?.maker?.chart ?? null,
    basedOn: row.profile.basedOnVersion ? { key: row.profile.basedOnKey ?? row.profile.key, version: row.profile.basedOnVersion } : null,
    builtIn: row.profile.builtIn,
    revision: row.profile.revision,
    authorId: row.profile.authorId,
    author: row.authorName,
    approver: row.approverName,
    retiredBy: row.retiredByName,
    retireReason: row.profile.retireReason,
    createdAt: row.profile.createdAt.toISOString(),
    updatedAt: row.profile.updatedAt.toISOString(),
    publishedAt: row.profile.publishedAt?.toISOString() ?? null,
    retiredAt: row.profile.retiredAt?.toISOString() ?? null,
  };
}

export type ProfileVersionSummary = ReturnType<typeof versionSummary>;

function selectVersions(db: Executor) {
  return db
    .select({ profile: toleranceProfiles, authorName: author.name, approverName: approver.name, retiredByName: retirer.name })
    .from(toleranceProfiles)
    .leftJoin(author, eq(author.id, toleranceProfiles.authorId))
    .leftJoin(approver, eq(approver.id, toleranceProfiles.approverId))
    .leftJoin(retirer, eq(retirer.id, toleranceProfiles.retiredById));
}

/** Every version of every profile, grouped by key, newest first within each. */
export async function listProfileVersions(db: Executor) {
  const rows = await selectVersions(db).orderBy(toleranceProfiles.key, desc(toleranceProfiles.version));
  const groups = new Map<string, ProfileVersionSummary[]>();
  for (const row of rows) {
    const summary = versionSummary(row);
    const group = groups.get(summary.key) ?? [];
    group.push(summary);
    groups.set(summary.key, group);
  }
  return [...groups.entries()].map(([key, versions]) => ({ key, versions }));
}

/** One version with its definition, and the version before it (what it was drafted from) for the diff. */
export async function getProfileVersion(db: Executor, key: string, version: number) {
  const [row] = await selectVersions(db).where(and(eq(toleranceProfiles.key, key), eq(toleranceProfiles.version, version)));
  if (!row) return null;
  const previousKey = row.profile.basedOnKey ?? key;
  const previousVersion = row.profile.basedOnVersion ?? (version > 1 ? version - 1 : null);
  const [previous] = previousVersion
    ? await db.select().from(toleranceProfiles).where(and(eq(toleranceProfiles.key, previousKey), eq(toleranceProfiles.version, previousVersion)))
    : [];
  return {
    summary: versionSummary(row),
    definition: row.profile.status === "draft" ? (row.profile.definition as ToleranceProfile) : definitionOf(row.profile),
    previous: previous ? { key: previous.key, version: previous.version, status: previous.status, definition: previous.definition as ToleranceProfile } : null,
  };
}

async function lockedVersion(tx: Executor, key: string, version: number) {
  const [row] = await tx
    .select()
    .from(toleranceProfiles)
    .where(and(eq(toleranceProfiles.key, key), eq(toleranceProfiles.version, version)))
    .for("update");
  if (!row) throw new ProfileRuleError(`There is no version ${version} of ${key}.`, 404);
  return row;
}

/**
 * Starts a draft from an existing version: the next version of the same profile, or (with `newKey`) version 1
 * of a new profile copied from it, e.g. a maker's chart started from the class it refines. The staff member is
 * its author. One draft per profile at a time.
 */
export async function draftNewVersion(db: Database, staff: Pick<SessionUser, "id">, key: string, fromVersion: number, options: { newKey?: string } = {}) {
  return db.transaction(async (tx) => {
    const source = await lockedVersion(tx, key, fromVersion);
    if (source.status === "draft") throw new ProfileRuleError("Draft from a published version, not from a draft.", 409);
    const targetKey = options.newKey ?? key;
    const [open] = await tx.select({ version: toleranceProfiles.version }).from(toleranceProfiles).where(and(eq(toleranceProfiles.key, targetKey), eq(toleranceProfiles.status, "draft")));
    if (open) throw new ProfileRuleError(`${targetKey} already has a draft, version ${open.version}; finish or discard it first.`, 409);
    const [{ latest }] = (await tx
      .select({ latest: sql<number | null>`max(${toleranceProfiles.version})::int` })
      .from(toleranceProfiles)
      .where(eq(toleranceProfiles.key, targetKey))) as [{ latest: number | null }];
    if (options.newKey && latest !== null) throw new ProfileRuleError(`A profile with the key ${options.newKey} exists already; draft its next version instead.`, 409, { newKey: ["This key is taken."] });
    const version = (latest ?? 0) + 1;
    const definition = { ...(source.definition as ToleranceProfile), key: targetKey, version };
    await tx.insert(toleranceProfiles).values({ key: targetKey, version, status: "draft", definition, basedOnKey: source.key, basedOnVersion: source.version, authorId: staff.id });
    return { key: targetKey, version };
  });
}

/**
 * Saves the author's edit of a draft. The whole definition is validated by the one profile schema; every bad
 * value comes back at its field. `revision` is the one the author edited, so two tabs cannot overwrite each other.
 */
export async function saveDraftVersion(db: Database, staff: Pick<SessionUser, "id">, key: string, version: number, input: { definition: unknown; revision: number }) {
  const parsed = toleranceProfileSchema.safeParse(input.definition);
  if (!parsed.success) throw new ProfileRuleError("Some values need correcting; nothing was saved.", 422, fieldErrors(parsed.error));
  if (parsed.data.key !== key || parsed.data.version !== version) {
    throw new ProfileRuleError("The key and version of a draft are fixed.", 422, { key: ["The key and version of a draft are fixed; draft a new version to change them."] });
  }
  return db.transaction(async (tx) => {
    const row = await lockedVersion(tx, key, version);
    if (row.status !== "draft") throw new ProfileRuleError(`Version ${version} of ${key} is ${row.status} and cannot be changed; draft a new version.`, 409);
    if (row.authorId !== staff.id) throw new ProfileRuleError("Only the draft's author edits it; a second staff member reviews and publishes.", 403);
    if (row.revision !== input.revision) throw new ProfileRuleError("The draft was changed in another window since you opened it; reload to see the latest.", 409);
    const [saved] = await tx
      .update(toleranceProfiles)
      .set({ definition: parsed.data, revision: row.revision + 1, updatedAt: new Date() })
      .where(eq(toleranceProfiles.id, row.id))
      .returning({ revision: toleranceProfiles.revision });
    return { revision: saved!.revision };
  });
}

/**
 * Publishes a draft: a second staff member approves what they read (the revision they saw). The author may
 * not publish their own draft; the database's check says the same.
 */
export async function publishDraftVersion(db: Database, staff: Pick<SessionUser, "id">, key: string, version: number, reviewedRevision: number, now = new Date()) {
  return db.transaction(async (tx) => {
    const row = await lockedVersion(tx, key, version);
    if (row.status !== "draft") throw new ProfileRuleError(`Version ${version} of ${key} is already ${row.status}.`, 409);
    if (row.authorId === staff.id) throw new ProfileRuleError("You drafted this version; a second staff member must review and publish it.", 403);
    if (row.revision !== reviewedRevision) throw new ProfileRuleError("The draft changed while you were reviewing it; read the new difference before publishing.", 409);
    const parsed = toleranceProfileSchema.safeParse(row.definition);
    if (!parsed.success) throw new ProfileRuleError("The draft has values that need correcting before it can be published.", 422, fieldErrors(parsed.error));
    await tx
      .update(toleranceProfiles)
      .set({ status: "published", definition: parsed.data, approverId: staff.id, publishedAt: now, updatedAt: now })
      .where(eq(toleranceProfiles.id, row.id));
    return { key, version };
  });
}

/** Retires a published version: inspectors can no longer choose it; reports scored with it keep it. */
export async function retireVersion(db: Database, staff: Pick<SessionUser, "id">, key: string, version: number, reason: string, now = new Date()) {
  return db.transaction(async (tx) => {
    const row = await lockedVersion(tx, key, version);
    if (row.status !== "published") throw new ProfileRuleError(row.status === "draft" ? "A draft is discarded, not retired." : "This version is retired already.", 409);
    await tx.update(toleranceProfiles).set({ status: "retired", retiredAt: now, retiredById: staff.id, retireReason: reason, updatedAt: now }).where(eq(toleranceProfiles.id, row.id));
    return { key, version };
  });
}

/** Discards a draft (its author only); nothing was ever scored with it. */
export async function discardDraftVersion(db: Database, staff: Pick<SessionUser, "id">, key: string, version: number) {
  return db.transaction(async (tx) => {
    const row = await lockedVersion(tx, key, version);
    if (row.status !== "draft") throw new ProfileRuleError("Only a draft can be discarded; retire a published version instead.", 409);
    if (row.authorId !== staff.id) throw new ProfileRuleError("Only the draft's author discards it.", 403);
    await tx.delete(toleranceProfiles).where(eq(toleranceProfiles.id, row.id));
  });
}

// ————— The public scoring API —————

/**
 * POST /api/v1/evaluations: the request checked against the published and retired versions, then scored.
 * Drafts are never scored; a retired version still scores (reports made with it are re-scored the same).
 */
export async function scoreEvaluationRequest(db: Executor, body: unknown): Promise<{ ok: true; response: EvaluationResponse } | { ok: false; errors: Record<string, string[]> }> {
  const profiles = await scorableProfiles(db);
  const parsed = evaluationRequestSchemaFor(profiles).safeParse(body);
  if (!parsed.success) return { ok: false, errors: fieldErrors(parsed.error) };
  const profile = findProfile(profiles, parsed.data.profile.key, parsed.data.profile.version)!;
  try {
    return { ok: true, response: scoreEvaluation(profile, parsed.data) };
  } catch (error) {
    // The schema catches what it can; the engine's own checks are the last word on the readings.
    if (error instanceof GeometryInputError) {
      const field = error.path.length > 0 ? error.path.join(".") : "measurements";
      return { ok: false, errors: { [field]: [error.message] } };
    }
    throw error;
  }
}

// ————— The editor's forms: settings and one test at a time —————

async function draftForEdit(db: Executor, staff: Pick<SessionUser, "id">, key: string, version: number) {
  const [row] = await db.select().from(toleranceProfiles).where(and(eq(toleranceProfiles.key, key), eq(toleranceProfiles.version, version)));
  if (!row) throw new ProfileRuleError(`There is no version ${version} of ${key}.`, 404);
  if (row.status !== "draft") throw new ProfileRuleError(`Version ${version} of ${key} is ${row.status} and cannot be changed; draft a new version.`, 409);
  if (row.authorId !== staff.id) throw new ProfileRuleError("Only the draft's author edits it; a second staff member reviews and publishes.", 403);
  return { row, definition: row.definition as ToleranceProfile };
}

/** Errors of the whole profile under `prefix` (e.g. "tests.3"), re-keyed for the form that edits that part. */
function errorsUnder(error: ProfileRuleError, prefix: string): Record<string, string[]> {
  const errors: Record<string, string[]> = {};
  for (const [path, messages] of Object.entries(error.errors)) {
    const key = path === prefix ? "" : path.startsWith(`${prefix}.`) ? path.slice(prefix.length + 1) : "";
    (errors[key] ??= []).push(...messages);
  }
  return errors;
}

/** Saves the profile's own settings (title, class, scope, rules) into the author's draft. */
export async function saveDraftSettings(db: Database, staff: Pick<SessionUser, "id">, key: string, version: number, settings: Pick<ToleranceProfile, "title" | "category" | "accuracyClass" | "scope" | "rules">, revision: number) {
  const { definition } = await draftForEdit(db, staff, key, version);
  return saveDraftVersion(db, staff, key, version, { definition: { ...definition, ...settings }, revision });
}

/**
 * Saves one test into the author's draft: replaces the test `originalCode` (or adds it when null). Errors of the
 * whole profile that concern this test (a code used twice) come back at the test form's fields.
 */
export async function saveDraftTest(db: Database, staff: Pick<SessionUser, "id">, key: string, version: number, originalCode: string | null, test: ProfileTest, revision: number) {
  const { definition } = await draftForEdit(db, staff, key, version);
  const index = originalCode === null ? definition.tests.length : definition.tests.findIndex((candidate) => candidate.code === originalCode);
  if (index < 0) throw new ProfileRuleError(`There is no test ${originalCode} in this draft.`, 404);
  const tests = [...definition.tests];
  tests[index] = test;
  // A renamed test keeps its key figure.
  const keyFigures = Object.fromEntries(Object.entries(definition.keyFigures).map(([name, code]) => [name, code === originalCode ? test.code : code]));
  try {
    return await saveDraftVersion(db, staff, key, version, { definition: { ...definition, keyFigures, tests }, revision });
  } catch (error) {
    if (error instanceof ProfileRuleError && error.status === 422) throw new ProfileRuleError(error.message, 422, errorsUnder(error, `tests.${index}`));
    throw error;
  }
}

/** Removes a test from the author's draft (not one that supplies a key figure). */
export async function removeDraftTest(db: Database, staff: Pick<SessionUser, "id">, key: string, version: number, code: string, revision: number) {
  const { definition } = await draftForEdit(db, staff, key, version);
  const figure = Object.entries(definition.keyFigures).find(([, figureCode]) => figureCode === code);
  if (figure) throw new ProfileRuleError(`${code} supplies the key figure ${figure[0]}; it cannot be removed.`, 409);
  return saveDraftVersion(db, staff, key, version, { definition: { ...definition, tests: definition.tests.filter((test) => test.code !== code) }, revision });
}
