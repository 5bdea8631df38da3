// The engine's built-in profile versions, published into the database by the step that runs right after the
// migrations (scripts/lib/migrate.ts). Each version is written once; a version already there is left alone,
// because a published version never changes. Built-in versions are reviewed as code, so they carry no author.
import canonicalize from "canonicalize";
import { and, eq } from "drizzle-orm";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import { BUILT_IN_PROFILES, toleranceProfileSchema } from "../../geometry";
import { toleranceProfiles } from "./schema";

export async function seedBuiltInProfiles(db: NodePgDatabase, log: (message: string) => void = () => {}) {
  for (const builtIn of BUILT_IN_PROFILES) {
    const definition = toleranceProfileSchema.parse(builtIn);
    const inserted = await db
      .insert(toleranceProfiles)
      .values({
        key: definition.key,
        version: definition.version,
        status: "published",
        definition,
        ...(definition.version > 1 ? { basedOnKey: definition.key, basedOnVersion: definition.version - 1 } : {}),
        builtIn: true,
        publishedAt: new Date(),
      })
      .onConflictDoNothing()
      .returning({ id: toleranceProfiles.id });
    if (inserted.length) {
      log(`tolerance profile ${definition.key} v${definition.version} published`);
      continue;
    }
    const [stored] = await db
      .select({ definition: toleranceProfiles.definition, builtIn: toleranceProfiles.builtIn })
      .from(toleranceProfiles)
      .where(and(eq(toleranceProfiles.key, definition.key), eq(toleranceProfiles.version, definition.version)));
    if (!stored?.builtIn || canonicalize(stored.definition) !== canonicalize(definition)) {
      log(`tolerance profile ${definition.key} v${definition.version}: the database holds another version under this number; the built-in one was not added`);
    }
  }
}
