import type { RequestHandler } from 'express';
import { RevokedToken, User } from '../db/models';
import type { AppContext } from '../services/context';
import { ApiError } from '../services/errors';
import { authCacheEpoch, cachedRevoked, cachedUser, rememberRevoked, rememberUser, type CachedUser } from './cache';
import { verifyToken } from './tokens';

/** The user a token names, from the short-lived cache (server/auth/cache.ts) or the database. */
async function userOf(id: string): Promise<CachedUser | null> {
  const hit = cachedUser(id);
  if (hit) return hit;
  const at = authCacheEpoch();
  const u = await User.findByPk(id, {
    attributes: ['id', 'organizationId', 'role', 'email', 'name', 'active', 'tokenVersion'],
  });
  if (!u) return null;
  const user: CachedUser = {
    id: u.id,
    organizationId: u.organizationId,
    role: u.role,
    email: u.email,
    name: u.name,
    active: u.active,
    tokenVersion: u.tokenVersion,
  };
  rememberUser(user, at);
  return user;
}

async function isRevoked(jti: string): Promise<boolean> {
  const hit = cachedRevoked(jti);
  if (hit !== undefined) return hit;
  const at = authCacheEpoch();
  const revoked = !!(await RevokedToken.findByPk(jti, { attributes: ['jti'] }));
  rememberRevoked(jti, revoked, at);
  return revoked;
}

/**
 * Bearer-token authentication. A token is refused when it is missing, malformed, expired, signed with another
 * secret, revoked by sign-out, or older than the user's last password change, role change or deactivation. The user
 * and revocation look-ups are cached for a few seconds and invalidated on change (server/auth/cache.ts).
 */
export function authenticate(ctx: AppContext): RequestHandler {
  return async (req, _res, next) => {
    const header = req.headers.authorization ?? '';
    const match = /^Bearer\s+(\S+)$/i.exec(header);
    if (!match) return next(ApiError.unauthorized('Sign in to continue'));
    const claims = verifyToken(ctx.config.jwtSecret, match[1], ctx.config.jwtTtlHours);
    if (!claims) return next(ApiError.unauthorized('Your session is invalid or has expired; sign in again'));
    const user = await userOf(claims.sub);
    if (!user || !user.active || user.tokenVersion !== claims.ver || user.organizationId !== claims.org) {
      return next(ApiError.unauthorized('Your session is no longer valid; sign in again'));
    }
    if (await isRevoked(claims.jti)) {
      return next(ApiError.unauthorized('You have signed out; sign in again'));
    }
    req.user = {
      id: user.id,
      organizationId: user.organizationId,
      role: user.role,
      email: user.email,
      name: user.name,
      jti: claims.jti,
      tokenExpiresAt: new Date(claims.exp * 1000),
    };
    next();
  };
}
