import { randomUUID } from 'node:crypto';
import type { CreateUser, UpdateUser, UserAdmin } from '../../shared/schemas/users';
import { hashPassword } from '../auth/passwords';
import { User } from '../db/models';
import type { AppContext, AuthUser } from '../http/context';
import { ApiError } from '../http/errors';
import { recordAudit } from './audit';

export function toUserAdmin(u: User): UserAdmin {
  return { id: u.id, email: u.email, name: u.name, role: u.role, active: u.active, createdAt: u.createdAt.toISOString() };
}

export async function listUsers(actor: AuthUser): Promise<UserAdmin[]> {
  const users = await User.findAll({ where: { organizationId: actor.organizationId }, order: [['name', 'ASC']] });
  return users.map(toUserAdmin);
}

export async function createUser(ctx: AppContext, actor: AuthUser, input: CreateUser): Promise<UserAdmin> {
  if (await User.findOne({ where: { email: input.email } })) {
    throw new ApiError('conflict', 'A user with that e-mail address already exists', { email: 'Already in use' });
  }
  const passwordHash = await hashPassword(input.password);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const user = await User.create(
      { id: randomUUID(), organizationId: actor.organizationId, email: input.email, name: input.name, role: input.role, passwordHash },
      { transaction },
    );
    await recordAudit(
      { organizationId: actor.organizationId, actorId: actor.id, action: 'user.created', entityType: 'user', entityId: user.id, summary: { email: user.email, role: user.role } },
      transaction,
    );
    return toUserAdmin(user);
  });
}

export async function updateUser(ctx: AppContext, actor: AuthUser, userId: string, input: UpdateUser): Promise<UserAdmin> {
  return ctx.db.sequelize.transaction(async (transaction) => {
    const user = await User.findOne({ where: { id: userId, organizationId: actor.organizationId }, transaction });
    if (!user) throw ApiError.notFound('No such user');
    if (user.id === actor.id && (input.active === false || (input.role && input.role !== 'admin'))) {
      throw new ApiError('conflict', 'You cannot deactivate yourself or remove your own admin role');
    }
    const before = { name: user.name, role: user.role, active: user.active };
    if (input.name !== undefined) user.name = input.name;
    if (input.role !== undefined) user.role = input.role;
    if (input.active !== undefined) user.active = input.active;
    // A role change or deactivation ends every session of that user.
    if (before.role !== user.role || before.active !== user.active) user.tokenVersion += 1;
    await user.save({ transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'user.updated',
        entityType: 'user',
        entityId: user.id,
        summary: { before, after: { name: user.name, role: user.role, active: user.active } },
      },
      transaction,
    );
    return toUserAdmin(user);
  });
}
