import { rateLimit } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import { AccountQuota } from '../auth/accountThrottle';
import { withRetry } from '../db/retry';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { acceptInvitation, confirmPasswordReset, linkInfo, requestPasswordReset } from '../services/invitations';
import { changePassword } from '../services/users';

/** A per-address limit like the sign-in limiter's, with a message naming what was limited. */
function limiter(perMinute: number, what: string): RequestHandler {
  return rateLimit({
    windowMs: 60_000,
    limit: perMinute,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    handler: (_req, res) =>
      res
        .status(429)
        .json({ error: { code: 'rate_limited', message: `Too many ${what}; wait a minute and try again` } }),
  });
}

/** Password-reset mails per account and hour. */
export const RESET_MAILS_PER_HOUR = 3;

/** One-time links (invitation, password reset) and password change. */
export function accountLinkRoutes(opts: { signInLimitPerMinute: number }): AnyRoute[] {
  const perMinute = opts.signInLimitPerMinute;
  const resetMails = new AccountQuota(RESET_MAILS_PER_HOUR, 3600_000);
  return [
    bind(contract.accountLinks.linkInfo, {
      before: [limiter(perMinute, 'link checks')],
      handler: ({ ctx, body }) => linkInfo(ctx, body.token),
    }),
    bind(contract.accountLinks.acceptInvitation, {
      before: [limiter(perMinute, 'attempts')],
      handler: ({ ctx, body }) => acceptInvitation(ctx, body),
    }),
    bind(contract.accountLinks.requestPasswordReset, {
      before: [limiter(perMinute, 'password-reset requests')],
      handler: ({ ctx, body }) => {
        // At most 3 reset mails an hour per address, whatever the client address; beyond, the same answer and no mail.
        if (!resetMails.take(body.email, ctx.now().getTime())) return { ok: true as const };
        // In the background: the answer and its timing are the same whether or not the account exists.
        // A transient failure (database busy, connection lost) is tried again; the mail itself retries on its own.
        ctx.jobs.start(() => withRetry(() => requestPasswordReset(ctx, body.email)));
        return { ok: true as const };
      },
    }),
    bind(contract.accountLinks.confirmPasswordReset, {
      before: [limiter(perMinute, 'attempts')],
      handler: ({ ctx, body }) => confirmPasswordReset(ctx, body),
    }),
    bind(contract.accountLinks.changePassword, {
      before: [limiter(perMinute, 'password changes')],
      handler: ({ ctx, user, body }) => changePassword(ctx, user, body),
    }),
  ];
}
