import { LRUCache } from 'lru-cache';
import type { ModelHooks } from 'sequelize/types/hooks';

/**
 * Short-lived read caches for the hottest routes (the results pages and buses, the public label check, the settings
 * every calculation reads), invalidated by
 * change counters that model hooks bump whenever a row of the tables they read is written.
 *
 * Invalidation: in this process, at once and whole. Any write of a watched model (instance save or destroy, bulk
 * create, update or destroy) bumps its counter when the statement completes and again when its transaction commits
 * (a read in between may have seen the old rows); an entry is used only while the counter has not moved since its
 * read began. Several server instances: another instance's write is seen after at most `READ_CACHE_TTL_MS` (the
 * entry expires and the database is read again), as for the signed-in user cache (server/auth/cache.ts).
 */
export const READ_CACHE_TTL_MS = 5_000;

/**
 * `studies`: studies and study runs (which run a study's results stand on). `labels`: labels. `organizations`:
 * organizations (their settings, read by every calculation).
 */
export type WatchedTables = 'studies' | 'labels' | 'organizations';

const counters: Record<WatchedTables, number> = { studies: 0, labels: 0, organizations: 0 };

export function changeCounter(tables: WatchedTables): number {
  return counters[tables];
}

export function bumpChangeCounter(tables: WatchedTables): void {
  counters[tables] += 1;
}

/** Hooks for a model's `init` options: every write bumps the counter, at once and when its transaction commits. */
export function bumpOnWrite(tables: WatchedTables): Partial<ModelHooks> {
  const bump = (options: { transaction?: { afterCommit: (fn: () => void) => void } | null }) => {
    bumpChangeCounter(tables);
    options?.transaction?.afterCommit(() => bumpChangeCounter(tables));
  };
  return {
    afterSave: (_row, options) => bump(options),
    afterDestroy: (_row, options) => bump(options),
    afterUpsert: (_row, options) => bump(options),
    afterBulkCreate: (_rows, options) => bump(options),
    afterBulkUpdate: (options) => bump(options),
    afterBulkDestroy: (options) => bump(options),
  };
}

/** An LRU of answers valid while the watched tables have not changed since the read began, for a few seconds. */
export class ReadCache<V extends object> {
  private readonly entries: LRUCache<string, { counter: number; value: V }>;

  constructor(
    private readonly tables: WatchedTables,
    max: number,
  ) {
    this.entries = new LRUCache({ max, ttl: READ_CACHE_TTL_MS });
  }

  /** The counter to pass to `set` (read it before the database read). */
  counter(): number {
    return changeCounter(this.tables);
  }

  get(key: string): V | undefined {
    const e = this.entries.get(key);
    if (!e) return undefined;
    if (e.counter !== changeCounter(this.tables)) {
      this.entries.delete(key);
      return undefined;
    }
    return e.value;
  }

  /** Stores the answer of a read that began at `readAtCounter`, unless the tables changed since. */
  set(key: string, value: V, readAtCounter: number): void {
    if (readAtCounter === changeCounter(this.tables)) this.entries.set(key, { counter: readAtCounter, value });
  }

  clear(): void {
    this.entries.clear();
  }
}
