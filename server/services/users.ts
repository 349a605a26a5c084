import { randomUUID } from 'node:crypto';
import { Op, Transaction } from 'sequelize';
import type { SignInResponse } from '../../shared/schemas/auth';
import type { CreateUser, UpdateUser, UserAdmin } from '../../shared/schemas/users';
import { hashPassword, verifyPassword } from '../auth/passwords';
import { signToken } from '../auth/tokens';
import { LinkToken, User } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { recordAudit } from './audit';

export function toUserAdmin(u: User): UserAdmin {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    createdAt: u.createdAt.toISOString(),
  };
}

export async function listUsers(actor: AuthUser): Promise<UserAdmin[]> {
  const users = await User.findAll({ where: { organizationId: actor.organizationId }, order: [['name', 'ASC']] });
  return users.map(toUserAdmin);
}

export async function createUser(ctx: AppContext, actor: AuthUser, input: CreateUser): Promise<UserAdmin> {
  const existing = await User.findOne({ where: { email: input.email }, attributes: ['organizationId'] });
  if (existing?.organizationId === actor.organizationId) {
    throw new ApiError('conflict', 'A user with that e-mail address already exists in your organization', {
      email: 'Already in use',
    });
  }
  if (existing) {
    // Another organization's address: a message that does not say so (nor which), pointing to the invitation,
    // whose answer is the same as for a new address.
    throw new ApiError('conflict', 'An account cannot be created here for this address: invite the person by e-mail', {
      email: 'Invite this address instead',
    });
  }
  const passwordHash = await hashPassword(input.password);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const user = await User.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        email: input.email,
        name: input.name,
        role: input.role,
        passwordHash,
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'user.created',
        entityType: 'user',
        entityId: user.id,
        summary: { email: user.email, role: user.role },
      },
      transaction,
    );
    return toUserAdmin(user);
  });
}

export async function updateUser(
  ctx: AppContext,
  actor: AuthUser,
  userId: string,
  input: UpdateUser,
): Promise<UserAdmin> {
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

/** A fresh session for the user (sign-in, password change, reset, accepted invitation). */
export function signInResponseFor(ctx: AppContext, user: User): SignInResponse {
  const { token, expiresAt } = signToken(ctx.config.jwtSecret, ctx.config.jwtTtlHours, user);
  return {
    token,
    expiresAt: expiresAt.toISOString(),
    user: { id: user.id, email: user.email, name: user.name, role: user.role },
  };
}

/**
 * The signed-in user changes their password: the current one is checked, every session (this one included) ends
 * (tokenVersion + 1), open reset links stop working, and a fresh session is returned.
 */
export async function changePassword(
  ctx: AppContext,
  actor: AuthUser,
  input: { currentPassword: string; newPassword: string },
): Promise<SignInResponse> {
  const current = await User.findOne({ where: { id: actor.id, organizationId: actor.organizationId } });
  if (!current) throw ApiError.unauthorized();
  if (!(await verifyPassword(current.passwordHash, input.currentPassword))) {
    throw new ApiError('bad_request', 'The current password is not right', {
      currentPassword: 'Not your current password',
    });
  }
  if (input.newPassword === input.currentPassword) {
    throw new ApiError('bad_request', 'Choose a new password that differs from the current one', {
      newPassword: 'Same as the current password',
    });
  }
  const passwordHash = await hashPassword(input.newPassword);
  const now = ctx.now();
  const user = await ctx.db.sequelize.transaction({ type: Transaction.TYPES.IMMEDIATE }, async (transaction) => {
    const u = await User.findOne({ where: { id: actor.id, organizationId: actor.organizationId }, transaction });
    // Changed in between (another session changed the password): the caller's proof no longer holds.
    if (!u || !u.active || u.passwordHash !== current.passwordHash)
      throw ApiError.unauthorized('Your session is no longer valid; sign in again');
    u.passwordHash = passwordHash;
    u.tokenVersion += 1;
    await u.save({ transaction });
    await LinkToken.update(
      { revokedAt: now },
      {
        where: { userId: u.id, purpose: 'password-reset', usedAt: null, revokedAt: null, expiresAt: { [Op.gt]: now } },
        transaction,
      },
    );
    await recordAudit(
      {
        organizationId: u.organizationId,
        actorId: u.id,
        action: 'password.changed',
        entityType: 'user',
        entityId: u.id,
        summary: { email: u.email },
      },
      transaction,
    );
    return u;
  });
  return signInResponseFor(ctx, user);
}
