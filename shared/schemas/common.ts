import { z } from 'zod';
import '../zodMessages';

export const ROLES = ['admin', 'engineer', 'electrician', 'safety'] as const;
export const roleSchema = z.enum(ROLES).describe('User role');
export type Role = z.infer<typeof roleSchema>;

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  engineer: 'Engineer',
  electrician: 'Electrician',
  safety: 'Safety officer',
};

export const ERROR_CODES = [
  'bad_request',
  'unauthorized',
  'forbidden',
  'not_found',
  'conflict',
  'payload_too_large',
  'unsupported_media_type',
  'unprocessable',
  'rate_limited',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

/** The one error shape of every API response that is not a success (docs/API.md, Errors). */
export const errorResponseSchema = z
  .object({
    error: z.object({
      code: z.enum(ERROR_CODES),
      message: z.string(),
      fields: z.record(z.string(), z.string()).optional(),
      /** On a server error (5xx): the request id, as in the X-Request-Id header and the server log. */
      requestId: z.string().optional(),
    }),
  })
  .meta({ id: 'Error' });
export type ErrorResponse = z.infer<typeof errorResponseSchema>;

export const idSchema = z.string().min(1).max(64);
