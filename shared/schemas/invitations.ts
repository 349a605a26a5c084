import { z } from 'zod';
import { printableName } from './text';
import { passwordSchema } from './auth';
import { roleSchema } from './common';

const email = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ message: 'Enter a valid e-mail address' }));

export const createInvitationSchema = z
  .object({ email, name: printableName(z.string().trim().min(1, 'Enter a name').max(120)), role: roleSchema })
  .meta({ id: 'CreateInvitation' });
export type CreateInvitation = z.infer<typeof createInvitationSchema>;

export const invitationSchema = z
  .object({
    id: z.string(),
    email: z.string(),
    name: z.string(),
    role: roleSchema,
    status: z.enum(['pending', 'accepted', 'expired', 'revoked']),
    invitedBy: z.string(),
    createdAt: z.string(),
    expiresAt: z.string(),
  })
  .meta({ id: 'Invitation' });
export type InvitationDto = z.infer<typeof invitationSchema>;
export const invitationListSchema = z.object({ invitations: z.array(invitationSchema) });

/** One-time links: the token travels only in the e-mail; the server keeps its hash. */
export const linkTokenSchema = z.string().trim().min(20, 'This link is not complete').max(200);

export const tokenInfoSchema = z
  .object({
    purpose: z.enum(['invitation', 'password-reset']),
    email: z.string(),
    name: z.string(),
    organizationName: z.string(),
    role: roleSchema.nullable().describe('The role an invitation gives; null for a password reset'),
    expiresAt: z.string(),
  })
  .meta({ id: 'LinkTokenInfo' });
export type TokenInfo = z.infer<typeof tokenInfoSchema>;

export const acceptInvitationSchema = z
  .object({ token: linkTokenSchema, password: passwordSchema })
  .meta({ id: 'AcceptInvitation' });
export const passwordResetRequestSchema = z.object({ email }).meta({ id: 'PasswordResetRequest' });
export const passwordResetConfirmSchema = z
  .object({ token: linkTokenSchema, password: passwordSchema })
  .meta({ id: 'PasswordResetConfirm' });
export const changePasswordSchema = z
  .object({ currentPassword: z.string().min(1, 'Enter your current password').max(256), newPassword: passwordSchema })
  .meta({ id: 'ChangePassword' });
