import { rateLimit } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import { z } from 'zod';
import { signInResponseSchema } from '../../shared/schemas/auth';
import {
  acceptInvitationSchema,
  changePasswordSchema,
  linkTokenSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  tokenInfoSchema,
} from '../../shared/schemas/invitations';
import { AccountQuota } from '../auth/accountThrottle';
import { withRetry } from '../db/retry';
import { defineRoute, type AnyRoute } from '../http/route';
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
    defineRoute({
      method: 'post',
      path: '/auth/link-info',
      summary:
        'What a one-time link is for (invitation or password reset) and for whom; 404 saying why when it cannot be used.',
      tag: 'auth',
      access: 'public',
      before: [limiter(perMinute, 'link checks')],
      body: z.object({ token: linkTokenSchema }),
      response: tokenInfoSchema,
      handler: ({ ctx, body }) => linkInfo(ctx, body.token),
    }),
    defineRoute({
      method: 'post',
      path: '/auth/accept-invitation',
      summary:
        'Accept an invitation with a password of your choice: creates the account and signs in. The link works once.',
      tag: 'auth',
      access: 'public',
      before: [limiter(perMinute, 'attempts')],
      body: acceptInvitationSchema,
      response: signInResponseSchema,
      handler: ({ ctx, body }) => acceptInvitation(ctx, body),
    }),
    defineRoute({
      method: 'post',
      path: '/auth/password-reset',
      summary:
        'Ask for a password-reset link by e-mail (1 hour). Always answers ok: it never tells whether the address has an account.',
      tag: 'auth',
      access: 'public',
      before: [limiter(perMinute, 'password-reset requests')],
      body: passwordResetRequestSchema,
      response: z.object({ ok: z.literal(true) }),
      handler: ({ ctx, body }) => {
        // At most 3 reset mails an hour per address, whatever the client address; beyond, the same answer and no mail.
        if (!resetMails.take(body.email, ctx.now().getTime())) return { ok: true as const };
        // In the background: the answer and its timing are the same whether or not the account exists.
        // A transient failure (database busy, connection lost) is tried again; the mail itself retries on its own.
        ctx.jobs.start(() => withRetry(() => requestPasswordReset(ctx, body.email)));
        return { ok: true as const };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/auth/password-reset/confirm',
      summary:
        'Set a new password from a reset link: the link works once; every other session ends; returns a fresh one.',
      tag: 'auth',
      access: 'public',
      before: [limiter(perMinute, 'attempts')],
      body: passwordResetConfirmSchema,
      response: signInResponseSchema,
      handler: ({ ctx, body }) => confirmPasswordReset(ctx, body),
    }),
    defineRoute({
      method: 'post',
      path: '/auth/password',
      summary: 'Change your password (needs the current one): every other session ends; returns a fresh one.',
      tag: 'auth',
      access: 'signed-in',
      before: [limiter(perMinute, 'password changes')],
      body: changePasswordSchema,
      response: signInResponseSchema,
      handler: ({ ctx, user, body }) => changePassword(ctx, user, body),
    }),
  ];
}
