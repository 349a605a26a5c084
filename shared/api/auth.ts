import { z } from 'zod';
import { meSchema, signInRequestSchema, signInResponseSchema } from '../schemas/auth';
import { endpoint } from './endpoint';

/** Signing in and out, and who is signed in. */
export const authApi = {
  signIn: endpoint({
    method: 'post',
    path: '/auth/sign-in',
    summary: 'Sign in with e-mail and password; returns a bearer token (at most 12 h).',
    tag: 'auth',
    access: 'public',
    body: signInRequestSchema,
    response: signInResponseSchema,
  }),
  me: endpoint({
    method: 'get',
    path: '/auth/me',
    summary: 'The signed-in user and organization.',
    tag: 'auth',
    access: 'signed-in',
    response: meSchema,
  }),
  signOut: endpoint({
    method: 'post',
    path: '/auth/sign-out',
    summary: 'Revoke the token used for this request.',
    tag: 'auth',
    access: 'signed-in',
    response: z.object({ ok: z.literal(true) }),
  }),
};
