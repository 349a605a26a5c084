import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { passwordSchema } from '../../shared/schemas/auth';
import { createUserSchema } from '../../shared/schemas/users';
import { hashPassword } from '../auth/passwords';
import type { Db } from '../db';
import { Organization, User } from '../db/models';
import { recordAudit } from './audit';
import { seedGenericLibrary } from './deviceTypes';
import { seedDefaultReminderRules } from './reminders';

/** The input of `npm run create-admin`: the app's own rules for e-mail, name and password. */
export const createAdminSchema = z.object({
  organization: z.string().trim().min(1, 'Give the organization a name').max(200, 'At most 200 characters'),
  email: createUserSchema.shape.email,
  name: createUserSchema.shape.name,
  password: passwordSchema,
});
export type CreateAdminInput = z.input<typeof createAdminSchema>;

export class BootstrapError extends Error {
  constructor(
    message: string,
    readonly field: string,
  ) {
    super(message);
  }
}

/**
 * A new organization and its first admin, in one transaction, with what every organization starts with (the generic
 * device library and the default reminder rules) and audit events for both. The e-mail must be unused anywhere.
 */
export async function createOrganizationWithAdmin(
  db: Db,
  raw: CreateAdminInput,
): Promise<{ organizationId: string; userId: string; email: string }> {
  const parsed = createAdminSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = String(issue.path[0] ?? 'input');
    throw new BootstrapError(`${field}: ${issue.message}`, field);
  }
  const input = parsed.data;
  if (await User.findOne({ where: { email: input.email } })) {
    throw new BootstrapError(`email: a user with the e-mail address ${input.email} already exists`, 'email');
  }
  const passwordHash = await hashPassword(input.password);
  return db.sequelize.transaction(async (transaction) => {
    const org = await Organization.create({ id: randomUUID(), name: input.organization }, { transaction });
    const user = await User.create(
      { id: randomUUID(), organizationId: org.id, email: input.email, name: input.name, role: 'admin', passwordHash },
      { transaction },
    );
    await seedGenericLibrary(org.id, transaction);
    await seedDefaultReminderRules(org.id, transaction);
    await recordAudit(
      {
        organizationId: org.id,
        actorId: null,
        action: 'organization.created',
        entityType: 'organization',
        entityId: org.id,
        summary: { name: org.name, by: 'create-admin command' },
      },
      transaction,
    );
    await recordAudit(
      {
        organizationId: org.id,
        actorId: null,
        action: 'user.created',
        entityType: 'user',
        entityId: user.id,
        summary: { email: user.email, role: user.role, by: 'create-admin command' },
      },
      transaction,
    );
    return { organizationId: org.id, userId: user.id, email: user.email };
  });
}
