import { z } from 'zod';
import { signInResponseSchema } from '../schemas/auth';
import {
  acceptInvitationSchema,
  changePasswordSchema,
  linkTokenSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  tokenInfoSchema,
} from '../schemas/invitations';
import { endpoint } from './endpoint';

/** One-time links: invitation acceptance, password reset, and changing one's own password. */
export const accountLinksApi = {
  linkInfo: endpoint({
    method: 'post',
    path: '/auth/link-info',
    summary:
      'What a one-time link is for (invitation or password reset) and for whom; 404 saying why when it cannot be used.',
    tag: 'auth',
    access: 'public',
    body: z.object({ token: linkTokenSchema }),
    response: tokenInfoSchema,
  }),
  acceptInvitation: endpoint({
    method: 'post',
    path: '/auth/accept-invitation',
    summary:
      'Accept an invitation with a password of your choice: creates the account and signs in. The link works once.',
    tag: 'auth',
    access: 'public',
    body: acceptInvitationSchema,
    response: signInResponseSchema,
  }),
  requestPasswordReset: endpoint({
    method: 'post',
    path: '/auth/password-reset',
    summary:
      'Ask for a password-reset link by e-mail (1 hour). Always answers ok: it never tells whether the address has an account.',
    tag: 'auth',
    access: 'public',
    body: passwordResetRequestSchema,
    response: z.object({ ok: z.literal(true) }),
  }),
  confirmPasswordReset: endpoint({
    method: 'post',
    path: '/auth/password-reset/confirm',
    summary:
      'Set a new password from a reset link: the link works once; every other session ends; returns a fresh one.',
    tag: 'auth',
    access: 'public',
    body: passwordResetConfirmSchema,
    response: signInResponseSchema,
  }),
  changePassword: endpoint({
    method: 'post',
    path: '/auth/password',
    summary: 'Change your password (needs the current one): every other session ends; returns a fresh one.',
    tag: 'auth',
    access: 'signed-in',
    body: changePasswordSchema,
    response: signInResponseSchema,
  }),
};
