// For the profile tests: staff members and a maker's chart of their own (scoped to an invented make, so the
// versions these tests publish are suggested for their own machines only and leave every other test alone).
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { getDatabase } from "~/db/client.server";
import type { ToleranceProfile } from "~/geometry";
import { toleranceProfiles } from "~/modules/profiles/schema";
import { draftNewVersion, publishDraftVersion, saveDraftVersion } from "~/modules/profiles/service.server";
import { createTestUser } from "./accounts";

export const db = getDatabase();

export async function twoStaff() {
  const author = await createTestUser({ roles: ["admin"], name: "Henrike Dallmer (staff)" });
  const reviewer = await createTestUser({ roles: ["admin"], name: "Osei Brandvold (staff)" });
  return { author, reviewer };
}

export async function definitionOf(key: string, version: number): Promise<ToleranceProfile> {
  const [row] = await db.select().from(toleranceProfiles).where(and(eq(toleranceProfiles.key, key), eq(toleranceProfiles.version, version)));
  if (!row) throw new Error(`no ${key} v${version}`);
  return row.definition as ToleranceProfile;
}

/** Version 1 of a maker's chart for an invented make and model, copied from the normal class and published by two staff. */
export async function publishedMakersChart(staff: Awaited<ReturnType<typeof twoStaff>>) {
  const tag = randomUUID().slice(0, 6);
  const make = `Vorrath ${tag}`;
  const model = "VL-330";
  const key = `maker-vorrath-${tag}`;
  await draftNewVersion(db, staff.author, "centre-lathe-normal", 1, { newKey: key });
  const draft = await definitionOf(key, 1);
  const chart = `Vorrath VL-330 acceptance chart ${tag}`;
  const definition: ToleranceProfile = {
    ...draft,
    title: `Vorrath VL-330, maker's chart ${tag}`,
    scope: { ...draft.scope, maker: { make, model, chart }, source: { confidence: "manufacturer", document: chart } },
  };
  const { revision } = await saveDraftVersion(db, staff.author, key, 1, { definition, revision: 1 });
  await publishDraftVersion(db, staff.reviewer, key, 1, revision);
  return { key, make, model, chart };
}
