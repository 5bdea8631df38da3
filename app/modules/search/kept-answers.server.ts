// PostgreSQL search answers kept in this process and given again for the same searches while nothing they
// read has changed. Every statement that writes a table a search reads (listings, their photos,
// listing_search, reports, the signing keys) moves `search_generation` in its own transaction
// (drizzle/0033_search-generation.sql); a search reads that number first, then either gives the answer kept
// under the same number or runs its statements and keeps their answer under it. Reading the number before
// the statements makes the answer at least as new as the number, so a kept answer is never older than the
// last write the reader could see. Only what this process read and verified is kept (each report's
// credential is checked before its result is kept), so a database owner who writes past the triggers can
// keep an answer alive longer, never make one up. See docs/decisions/kept-search-answers.md.
import type { Database } from "~/db/client.server";
import { deepFreeze } from "~/modules/deep-freeze";

/** Hits kept at most across all answers (a hit is about a kilobyte): the most recently used answers stay. */
const KEPT_HITS = 5_000;

type KeptAnswer<T> = { generation: number; answers: readonly T[]; hits: number };

export type KeptAnswers<T> = {
  /** The answers kept for `key` under `generation`, if any. */
  find(key: string, generation: number): readonly T[] | undefined;
  /** Keeps `answers` (frozen: every reader gets the same objects) for `key` under `generation`. */
  keep(key: string, generation: number, answers: T[]): void;
};

const keptFor = new WeakMap<Database, KeptAnswers<unknown>>();

function createKeptAnswers<T extends { hits: readonly unknown[] }>(): KeptAnswers<T> {
  const entries = new Map<string, KeptAnswer<T>>();
  let keptHits = 0;
  const forget = (key: string) => {
    const entry = entries.get(key);
    if (!entry) return;
    entries.delete(key);
    keptHits -= entry.hits;
  };
  return {
    find(key, generation) {
      const entry = entries.get(key);
      if (!entry) return undefined;
      if (entry.generation !== generation) {
        forget(key);
        return undefined;
      }
      // Most recently used last, so that the oldest is forgotten first.
      entries.delete(key);
      entries.set(key, entry);
      return entry.answers;
    },
    keep(key, generation, answers) {
      // A slower reader that started under an older number must not replace a newer answer.
      const known = entries.get(key);
      if (known && known.generation > generation) return;
      forget(key);
      const hits = answers.reduce((sum, answer) => sum + answer.hits.length, 0) + 1;
      if (hits > KEPT_HITS) return;
      while (keptHits + hits > KEPT_HITS) forget(entries.keys().next().value!);
      entries.set(key, { generation, answers: deepFreeze(answers), hits });
      keptHits += hits;
    },
  };
}

/** From now on, PostgreSQL searches through `db` keep their answers (the app's own client; see getDatabase). */
export function keepSearchAnswers(db: Database): void {
  if (!keptFor.has(db)) keptFor.set(db, createKeptAnswers());
}

/** The answers kept for `db`'s searches, or null when its searches keep nothing (every search read anew). */
export function keptSearchAnswers<T extends { hits: readonly unknown[] }>(db: Database): KeptAnswers<T> | null {
  return (keptFor.get(db) as KeptAnswers<T> | undefined) ?? null;
}

/**
 * The current search generation. A named statement, so that each connection parses it once. A database
 * without the row (never migrated this far) answers NaN, under which nothing is ever found again.
 */
export async function currentSearchGeneration(db: Database): Promise<number> {
  const { rows } = await db.$client.query<{ generation: string }>({ name: "search_generation", text: "select generation from search_generation where id = 1" });
  return rows[0] ? Number(rows[0].generation) : Number.NaN;
}
