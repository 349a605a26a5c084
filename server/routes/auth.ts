import { rateLimit } from 'express-rate-limit';
import { SignInThrottle } from '../auth/accountThrottle';
import { dummyPasswordHash, verifyPassword } from '../auth/passwords';
import { markRevoked } from '../auth/cache';
import { Organization, RevokedToken, User } from '../db/models';
import { ApiError } from '../services/errors';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { recordAudit } from '../services/audit';
import { signInResponseFor } from '../services/users';

/** The same message for an unknown e-mail and a wrong password: sign-in never tells which. */
const BAD_CREDENTIALS = 'E-mail or password is not right';

export function authRoutes(opts: { signInLimitPerMinute: number }): AnyRoute[] {
  const signInLimiter = rateLimit({
    windowMs: 60_000,
    limit: opts.signInLimitPerMinute,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    handler: (_req, res) =>
      res
        .status(429)
        .json({ error: { code: 'rate_limited', message: 'Too many sign-in attempts; wait a minute and try again' } }),
  });

  // Per account, on top of the per-address limit: a growing delay after repeated failures (server/auth/accountThrottle).
  const throttle = new SignInThrottle();

  return [
    bind(contract.auth.signIn, {
      before: [signInLimiter],
      handler: async ({ ctx, body, res }) => {
        const nowMs = ctx.now().getTime();
        const waitMs = throttle.waitMs(body.email, nowMs);
        if (waitMs > 0) {
          const seconds = Math.ceil(waitMs / 1000);
          res.setHeader('Retry-After', String(seconds));
          throw new ApiError(
            'rate_limited',
            `Too many failed sign-ins for this account; try again in ${seconds} s (or reset your password)`,
          );
        }
        const user = await User.findOne({ where: { email: body.email } });
        if (!user) {
          await verifyPassword(await dummyPasswordHash(), body.password);
          throttle.failed(body.email, nowMs);
          throw new ApiError('unauthorized', BAD_CREDENTIALS);
        }
        const ok = await verifyPassword(user.passwordHash, body.password);
        if (!ok || !user.active) {
          throttle.failed(body.email, nowMs);
          throw new ApiError('unauthorized', BAD_CREDENTIALS);
        }
        throttle.succeeded(body.email);
        await recordAudit({
          organizationId: user.organizationId,
          actorId: user.id,
          action: 'auth.signed-in',
          entityType: 'user',
          entityId: user.id,
        });
        return signInResponseFor(ctx, user);
      },
    }),
    bind(contract.auth.me, {
      handler: async ({ user }) => {
        const org = await Organization.findByPk(user.organizationId);
        const row = await User.findByPk(user.id, { attributes: ['id', 'units'] });
        if (!org || !row) throw ApiError.unauthorized();
        return {
          id: user.id,
          email: user.email,
          name: user.name,
          role: user.role,
          organization: { id: org.id, name: org.name },
          units: row.units ?? null,
        };
      },
    }),
    bind(contract.auth.setPreferences, {
      handler: async ({ user, body }) => {
        const row = await User.findByPk(user.id);
        if (!row) throw ApiError.unauthorized();
        row.units = body.units;
        await row.save();
        return { units: row.units ?? null };
      },
    }),
    bind(contract.auth.signOut, {
      handler: async ({ user }) => {
        await RevokedToken.findOrCreate({
          where: { jti: user.jti },
          defaults: { jti: user.jti, expiresAt: user.tokenExpiresAt },
        });
        markRevoked(user.jti);
        return { ok: true as const };
      },
    }),
  ];
}
