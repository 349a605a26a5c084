import { z } from 'zod';
import { meSchema, preferencesSchema, signInRequestSchema, signInResponseSchema } from '../schemas/auth';
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
  setPreferences: endpoint({
    method: 'put',
    path: '/auth/me/preferences',
    summary: 'Set the signed-in user’s preferences: the unit system lengths are shown in (stored values stay SI).',
    tag: 'auth',
    access: 'signed-in',
    body: preferencesSchema,
    response: preferencesSchema,
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
