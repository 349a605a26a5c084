import { z } from 'zod';
import { printableName } from './text';
import { roleSchema } from './common';
import { passwordSchema } from './auth';

export const userAdminSchema = z
  .object({
    id: z.string(),
    email: z.string(),
    name: z.string(),
    role: roleSchema,
    active: z.boolean(),
    createdAt: z.string(),
  })
  .meta({ id: 'UserAdmin' });
export type UserAdmin = z.infer<typeof userAdminSchema>;

export const userListSchema = z.object({ users: z.array(userAdminSchema) });

export const createUserSchema = z
  .object({
    email: z
      .string()
      .trim()
      .toLowerCase()
      .pipe(z.email({ message: 'Enter a valid e-mail address' })),
    name: printableName(z.string().trim().min(1, 'Enter a name').max(120)),
    role: roleSchema,
    password: passwordSchema,
  })
  .meta({ id: 'CreateUser' });
export type CreateUser = z.infer<typeof createUserSchema>;

export const updateUserSchema = z
  .object({
    name: printableName(z.string().trim().min(1).max(120).optional()),
    role: roleSchema.optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change' })
  .meta({ id: 'UpdateUser' });
export type UpdateUser = z.infer<typeof updateUserSchema>;
