// The inspector's saved column mapping for instrument tables: one per inspector, replaced on each save.
import { eq } from "drizzle-orm";
import type { SessionUser } from "~/modules/accounts/guards.server";
import type { Executor } from "~/modules/inspections/profiles.server";
import { columnMappingSchema, type ColumnMapping } from "./positioning-import";
import { deviationColumnMappings } from "./schema";

export async function columnMappingOf(db: Executor, inspector: Pick<SessionUser, "id">): Promise<ColumnMapping | null> {
  const [row] = await db.select({ mapping: deviationColumnMappings.mapping }).from(deviationColumnMappings).where(eq(deviationColumnMappings.inspectorId, inspector.id));
  // A stored mapping from an older shape is simply not offered.
  const parsed = columnMappingSchema.safeParse(row?.mapping);
  return parsed.success ? parsed.data : null;
}

export type SaveMappingResult = { ok: true; mapping: ColumnMapping } | { ok: false; errors: Record<string, string[]> };

export async function saveColumnMapping(db: Executor, inspector: Pick<SessionUser, "id">, body: unknown): Promise<SaveMappingResult> {
  const parsed = columnMappingSchema.strict().safeParse(body);
  if (!parsed.success) {
    const errors: Record<string, string[]> = {};
    for (const issue of parsed.error.issues) (errors[issue.path.map(String).join(".") || "mapping"] ??= []).push(issue.message);
    return { ok: false, errors };
  }
  const now = new Date();
  await db
    .insert(deviationColumnMappings)
    .values({ inspectorId: inspector.id, mapping: parsed.data, updatedAt: now })
    .onConflictDoUpdate({ target: deviationColumnMappings.inspectorId, set: { mapping: parsed.data, updatedAt: now } });
  return { ok: true, mapping: parsed.data };
}
