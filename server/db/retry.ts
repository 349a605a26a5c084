/**
 * Retries for background work (mail sends, reminder sends, password-reset requests): a failure that may pass by
 * itself (the database busy or locked, a dropped or refused connection, an SMTP 4xx "try again later") is tried
 * again a few times with a growing delay; any other failure is final at once.
 */

const TRANSIENT_CODES = new Set([
  'SQLITE_BUSY',
  'SQLITE_LOCKED',
  'ECONNRESET',
  'ECONNREFUSED',
  'ETIMEDOUT',
  'EPIPE',
  'EAI_AGAIN',
  'ECONNECTION',
  'ESOCKET',
  'EDNS',
  // PostgreSQL: serialization failure, deadlock, too many connections, server shutting down.
  '40001',
  '40P01',
  '53300',
  '57P01',
]);
const TRANSIENT_NAMES = new Set([
  'SequelizeConnectionError',
  'SequelizeConnectionRefusedError',
  'SequelizeConnectionTimedOutError',
  'SequelizeConnectionAcquireTimeoutError',
  'SequelizeHostNotReachableError',
  'SequelizeTimeoutError',
]);

/** Whether an error may pass if the same work is tried again shortly. */
export function isTransientError(e: unknown): boolean {
  for (let err = e, depth = 0; err && typeof err === 'object' && depth < 4; depth += 1) {
    const o = err as { code?: unknown; name?: unknown; message?: unknown; responseCode?: unknown; parent?: unknown };
    if (typeof o.code === 'string' && TRANSIENT_CODES.has(o.code)) return true;
    if (typeof o.name === 'string' && TRANSIENT_NAMES.has(o.name)) return true;
    if (typeof o.responseCode === 'number' && o.responseCode >= 400 && o.responseCode < 500) return true;
    if (typeof o.message === 'string' && /SQLITE_BUSY|SQLITE_LOCKED|database is locked/i.test(o.message)) return true;
    err = o.parent;
  }
  return false;
}

export interface RetryOptions {
  /** Tries in all, the first included (default 4). */
  attempts?: number;
  /** Delay before the second try; doubled each time (default 100 ms). */
  baseDelayMs?: number;
  isTransient?: (e: unknown) => boolean;
  /** Told of each failure that will be tried again. */
  onRetry?: (e: unknown, attempt: number) => void;
}

/** Runs `fn`, trying again after a transient failure; the last failure is thrown. */
export async function withRetry<T>(fn: (attempt: number) => Promise<T>, options: RetryOptions = {}): Promise<T> {
  const attempts = options.attempts ?? 4;
  const base = options.baseDelayMs ?? 100;
  const transient = options.isTransient ?? isTransientError;
  for (let attempt = 1; ; attempt += 1) {
    try {
      return await fn(attempt);
    } catch (e) {
      if (attempt >= attempts || !transient(e)) throw e;
      options.onRetry?.(e, attempt);
      const delay = base * 2 ** (attempt - 1) * (0.75 + Math.random() * 0.5);
      await new Promise((resolve) => setTimeout(resolve, delay));
    }
  }
}
