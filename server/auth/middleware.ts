import type { RequestHandler } from 'express';
import { RevokedToken, User } from '../db/models';
import type { AppContext } from '../http/context';
import { ApiError } from '../http/errors';
import { verifyToken } from './tokens';

/**
 * Bearer-token authentication. A token is refused when it is missing, malformed, expired, signed with another
 * secret, revoked by sign-out, or older than the user's last password change or deactivation.
 */
export function authenticate(ctx: AppContext): RequestHandler {
  return async (req, _res, next) => {
    const header = req.headers.authorization ?? '';
    const match = /^Bearer\s+(\S+)$/i.exec(header);
    if (!match) return next(ApiError.unauthorized('Sign in to continue'));
    const claims = verifyToken(ctx.config.jwtSecret, match[1], ctx.config.jwtTtlHours);
    if (!claims) return next(ApiError.unauthorized('Your session is invalid or has expired; sign in again'));
    const user = await User.findByPk(claims.sub);
    if (!user || !user.active || user.tokenVersion !== claims.ver || user.organizationId !== claims.org) {
      return next(ApiError.unauthorized('Your session is no longer valid; sign in again'));
    }
    if (await RevokedToken.findByPk(claims.jti)) {
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
