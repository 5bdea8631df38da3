import { sql } from "drizzle-orm";
import { boolean, check, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "../accounts/schema";

/**
 * draft: being edited by its author, not offered to inspectors;
 * published: approved by a second staff member, offered for new reports, never changed again;
 * retired: no new reports; reports already scored with it keep it and re-score the same.
 */
export const profileStatus = pgEnum("tolerance_profile_status", ["draft", "published", "retired"]);

// One version of a tolerance profile. `definition` is the profile as the engine takes it (validated by the
// one profile schema in app/geometry/profile-schema.ts). Once published, the trigger in the custom migration
// refuses any change but published → retired, and any delete.
export const toleranceProfiles = pgTable(
  "tolerance_profiles",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    key: text("key").notNull(),
    version: integer("version").notNull(),
    status: profileStatus("status").notNull().default("draft"),
    definition: jsonb("definition").notNull(),
    /** The version this one was drafted from: an earlier version of this key, or another profile copied to start a new one. */
    basedOnKey: text("based_on_key"),
    basedOnVersion: integer("based_on_version"),
    /** Shipped with the engine and published by the migration seed, not through the editor. */
    builtIn: boolean("built_in").notNull().default(false),
    authorId: text("author_id").references(() => user.id, { onDelete: "restrict" }),
    approverId: text("approver_id").references(() => user.id, { onDelete: "restrict" }),
    retiredById: text("retired_by_id").references(() => user.id, { onDelete: "restrict" }),
    retireReason: text("retire_reason"),
    /** Counts the author's saves, so an approver publishes exactly the draft they read. */
    revision: integer("revision").notNull().default(1),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    publishedAt: timestamp("published_at", { withTimezone: true }),
    retiredAt: timestamp("retired_at", { withTimezone: true }),
  },
  (table) => [
    uniqueIndex("tolerance_profiles_key_version_idx").on(table.key, table.version),
    uniqueIndex("tolerance_profiles_one_draft_per_key_idx").on(table.key).where(sql`${table.status} = 'draft'`),
    check("tolerance_profiles_definition_matches", sql`${table.definition} ->> 'key' = ${table.key} AND (${table.definition} ->> 'version')::int = ${table.version}`),
    // Four eyes: a version is published by someone other than its author (built-in versions are reviewed as code).
    check(
      "tolerance_profiles_four_eyes",
      sql`${table.status} = 'draft' OR ${table.builtIn} OR (${table.authorId} IS NOT NULL AND ${table.approverId} IS NOT NULL AND ${table.approverId} <> ${table.authorId})`,
    ),
    check("tolerance_profiles_published_at", sql`${table.status} = 'draft' OR ${table.publishedAt} IS NOT NULL`),
    check("tolerance_profiles_retired_at", sql`${table.status} <> 'retired' OR ${table.retiredAt} IS NOT NULL`),
  ],
);

export type ToleranceProfileRow = typeof toleranceProfiles.$inferSelect;
