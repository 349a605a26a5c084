import { LRUCache } from 'lru-cache';
import type { Role } from '../../shared/schemas/common';

/**
 * What every signed-in request looks up — the user (active, token version, role) and whether the token was revoked
 * by sign-out — kept in this process for a few seconds.
 *
 * Invalidation: in this process, at once. A change of a user row (password change or reset, role change,
 * deactivation, rename) drops the user's entry when it is saved and again when its transaction commits (hooks on the
 * User model, server/db/models.ts); a sign-out marks the token revoked here before it answers. Several server
 * instances: another instance may accept a token for at most `AUTH_CACHE_TTL_MS` after the change (its entry expires
 * and the database is read again).
 *
 * A read that started before an invalidation never stores its (older) answer afterwards: every invalidation bumps an
 * epoch, and a read stores only when the epoch has not moved since it began.
 */
export const AUTH_CACHE_TTL_MS = 5_000;

export interface CachedUser {
  id: string;
  organizationId: string;
  role: Role;
  email: string;
  name: string;
  active: boolean;
  tokenVersion: number;
}

const users = new LRUCache<string, CachedUser>({ max: 20_000, ttl: AUTH_CACHE_TTL_MS });
/** Token id → revoked. A revoked token stays revoked; a token not revoked is asked again after the TTL. */
const revoked = new LRUCache<string, boolean>({ max: 50_000, ttl: AUTH_CACHE_TTL_MS });
let epoch = 0;

/** The epoch to pass to `rememberUser` / `rememberRevoked` (read it before the database read). */
export function authCacheEpoch(): number {
  return epoch;
}

export function cachedUser(id: string): CachedUser | undefined {
  return users.get(id);
}

export function rememberUser(user: CachedUser, readAtEpoch: number): void {
  if (readAtEpoch === epoch) users.set(user.id, user);
}

export function cachedRevoked(jti: string): boolean | undefined {
  return revoked.get(jti);
}

export function rememberRevoked(jti: string, isRevoked: boolean, readAtEpoch: number): void {
  if (isRevoked || readAtEpoch === epoch) revoked.set(jti, isRevoked);
}

/** A user row changed (or may have): the next request reads it again. `undefined`: every user. */
export function forgetUser(id?: string): void {
  epoch++;
  if (id === undefined) users.clear();
  else users.delete(id);
}

/** Sign-out: the token is refused from now on in this process. */
export function markRevoked(jti: string): void {
  epoch++;
  revoked.set(jti, true, { ttl: 0 });
}

/** Empties both caches (tests). */
export function clearAuthCache(): void {
  epoch++;
  users.clear();
  revoked.clear();
}
