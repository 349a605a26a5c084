import { LRUCache } from 'lru-cache';

/**
 * Per-account limits, keyed by the e-mail address as typed (lower-cased), whether or not an account has it, so the
 * answer never tells which addresses exist. Kept in the server's memory (one server: several instances each keep
 * their own count, so the limit is per instance).
 */

/** Failures before the delay starts, the quiet time that forgets them, the first delay and its cap. */
export const SIGN_IN_FREE_FAILURES = 10;
export const SIGN_IN_WINDOW_MS = 15 * 60_000;
export const SIGN_IN_FIRST_DELAY_MS = 5_000;
export const SIGN_IN_MAX_DELAY_MS = 5 * 60_000;

/**
 * Sign-in backoff per account: after SIGN_IN_FREE_FAILURES failed attempts (without SIGN_IN_WINDOW_MS of quiet in
 * between), each further attempt must wait a delay after the last failure that doubles with each failure, from 5 s up
 * to 5 minutes. A success forgets the failures. The real owner is never locked out for longer than the cap.
 */
export class SignInThrottle {
  private readonly failures = new LRUCache<string, { count: number; lastMs: number }>({ max: 50_000 });

  /** Milliseconds to wait before this account may try again (0: now). */
  waitMs(email: string, nowMs: number): number {
    const f = this.current(email, nowMs);
    if (!f || f.count < SIGN_IN_FREE_FAILURES) return 0;
    const delay = Math.min(SIGN_IN_FIRST_DELAY_MS * 2 ** (f.count - SIGN_IN_FREE_FAILURES), SIGN_IN_MAX_DELAY_MS);
    return Math.max(0, f.lastMs + delay - nowMs);
  }

  failed(email: string, nowMs: number): void {
    const f = this.current(email, nowMs);
    this.failures.set(key(email), { count: (f?.count ?? 0) + 1, lastMs: nowMs });
  }

  succeeded(email: string): void {
    this.failures.delete(key(email));
  }

  private current(email: string, nowMs: number) {
    const f = this.failures.get(key(email));
    if (f && nowMs - f.lastMs > SIGN_IN_WINDOW_MS) {
      this.failures.delete(key(email));
      return undefined;
    }
    return f;
  }
}

/** At most `limit` events per account in a sliding `windowMs` (password-reset mails: 3 an hour). */
export class AccountQuota {
  private readonly events = new LRUCache<string, number[]>({ max: 50_000 });
  constructor(
    private readonly limit: number,
    private readonly windowMs: number,
  ) {}

  /** Counts the event and says whether it is within the quota. */
  take(email: string, nowMs: number): boolean {
    const recent = (this.events.get(key(email)) ?? []).filter((t) => nowMs - t < this.windowMs);
    if (recent.length >= this.limit) {
      this.events.set(key(email), recent);
      return false;
    }
    recent.push(nowMs);
    this.events.set(key(email), recent);
    return true;
  }
}

function key(email: string): string {
  return email.trim().toLowerCase();
}
