import { z } from 'zod';
import { roleSchema } from './common';

export const signInRequestSchema = z
  .object({
    email: z
      .string()
      .trim()
      .toLowerCase()
      .pipe(z.email({ message: 'Enter a valid e-mail address' })),
    password: z.string().min(1, 'Enter your password').max(256),
  })
  .meta({ id: 'SignInRequest' });
export type SignInRequest = z.infer<typeof signInRequestSchema>;

export const userSchema = z
  .object({
    id: z.string(),
    email: z.string(),
    name: z.string(),
    role: roleSchema,
  })
  .meta({ id: 'User' });
export type User = z.infer<typeof userSchema>;

/** The unit system lengths are shown in: US customary (in, ft) or SI (mm, m). Stored values are SI either way. */
export const unitSystemSchema = z.enum(['us', 'si']).describe('Unit system: us (in, ft) or si (mm, m)');
export type UnitSystem = z.infer<typeof unitSystemSchema>;

export const meSchema = userSchema
  .extend({
    organization: z.object({ id: z.string(), name: z.string() }),
    units: unitSystemSchema.nullable().describe("The user's unit system; null: the organization's label unit order"),
  })
  .meta({ id: 'Me' });
export type Me = z.infer<typeof meSchema>;

export const signInResponseSchema = z
  .object({ token: z.string(), expiresAt: z.string(), user: userSchema })
  .meta({ id: 'SignInResponse' });
export type SignInResponse = z.infer<typeof signInResponseSchema>;

export const preferencesSchema = z
  .object({ units: unitSystemSchema.nullable().describe('null: follow the organization’s label unit order again') })
  .strict()
  .meta({ id: 'Preferences' });
export type Preferences = z.infer<typeof preferencesSchema>;

/** Password policy: long enough to resist guessing; no composition rules (common practice, NIST SP 800-63B). */
export const passwordSchema = z.string().min(10, 'Use at least 10 characters').max(256, 'Use at most 256 characters');
