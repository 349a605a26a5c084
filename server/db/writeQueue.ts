import { AsyncLocalStorage } from 'node:async_hooks';
import type { Sequelize } from 'sequelize';

/**
 * One writer at a time on SQLite. SQLite has a single write lock: writers that overlap do not queue for it, they
 * spin in the busy handler (each on a libuv thread-pool thread, so reads and unrelated work starve) and fail with
 * SQLITE_BUSY when the busy timeout runs out. This queue makes them wait their turn in the process instead, in
 * arrival order: every transaction, and every write outside a transaction, takes the queue.
 *
 * Code running inside a held turn (a transaction's callback) is not queued again, so a nested call cannot deadlock
 * on the queue. A waiter that has waited `maxWaitMs` goes ahead anyway (SQLite's own busy timeout then applies), so a
 * turn that never ends (a bug) slows writes down but never stops them for good.
 */
export class WriteQueue {
  private tail: Promise<void> = Promise.resolve();
  private readonly held = new AsyncLocalStorage<true>();
  private waiting = 0;

  constructor(private readonly maxWaitMs = 30_000) {}

  /** True inside a turn (a transaction callback or a queued write). */
  get inTurn(): boolean {
    return this.held.getStore() === true;
  }

  /** Writers waiting for their turn (for logs and tests). */
  get depth(): number {
    return this.waiting;
  }

  async run<T>(fn: () => Promise<T>): Promise<T> {
    if (this.inTurn) return fn();
    const previous = this.tail;
    let release!: () => void;
    const mine = new Promise<void>((resolve) => (release = resolve));
    this.tail = previous.then(() => mine);
    this.waiting += 1;
    let timer: NodeJS.Timeout | undefined;
    try {
      await Promise.race([previous, new Promise<void>((resolve) => (timer = setTimeout(resolve, this.maxWaitMs)))]);
    } finally {
      clearTimeout(timer);
      this.waiting -= 1;
    }
    try {
      return await this.held.run(true, fn);
    } finally {
      release();
    }
  }
}

const WRITE_TYPES = new Set(['INSERT', 'UPDATE', 'BULKUPDATE', 'BULKDELETE', 'DELETE', 'UPSERT']);
const WRITE_SQL = /^\s*(INSERT|UPDATE|DELETE|REPLACE|CREATE|DROP|ALTER|BEGIN|PRAGMA\s+\w+\s*=)/i;

/** Whether a query outside a transaction writes (by its Sequelize query type, or the statement for raw SQL). */
function isWrite(sql: unknown, options: { type?: string } | undefined): boolean {
  const type = options?.type;
  if (type && type !== 'RAW') return WRITE_TYPES.has(type);
  const text = typeof sql === 'string' ? sql : ((sql as { query?: string } | null)?.query ?? '');
  return WRITE_SQL.test(text);
}

/**
 * Routes every SQLite transaction and every write outside a transaction through one WriteQueue. Managed
 * transactions (`sequelize.transaction(callback)`, the only kind this project uses) hold the turn for their whole
 * callback; queries that carry a transaction run inside that turn already.
 */
export function serializeSqliteWrites(sequelize: Sequelize, queue = new WriteQueue()): WriteQueue {
  const transaction = sequelize.transaction.bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
  (sequelize as unknown as { transaction: (...args: unknown[]) => Promise<unknown> }).transaction = (
    ...args: unknown[]
  ) => {
    if (typeof args[args.length - 1] !== 'function') return transaction(...args);
    return queue.run(() => transaction(...args));
  };
  const query = sequelize.query.bind(sequelize) as (sql: unknown, options?: unknown) => Promise<unknown>;
  (sequelize as unknown as { query: typeof query }).query = (sql: unknown, options?: unknown) => {
    const opts = options as { transaction?: unknown; type?: string } | undefined;
    if (opts?.transaction || queue.inTurn || !isWrite(sql, opts)) return query(sql, options);
    return queue.run(() => query(sql, options));
  };
  return queue;
}
