import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { Op, Transaction } from 'sequelize';
import type { SignInResponse } from '../../shared/schemas/auth';
import type { CreateInvitation, InvitationDto, TokenInfo } from '../../shared/schemas/invitations';
import type { Role } from '../../shared/schemas/common';
import { hashPassword } from '../auth/passwords';
import { LinkToken, Organization, User, type LinkPurpose } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { appLink, invitationMail, passwordResetMail } from '../mail';
import { recordAudit } from './audit';
import { signInResponseFor } from './users';

/**
 * Transactions that read a link and then change it start with the write lock on SQLite (BEGIN IMMEDIATE), so a
 * concurrent one waits instead of failing on a stale snapshot; PostgreSQL ignores the type (row locks do the job).
 */
const WRITE_LOCK = { type: Transaction.TYPES.IMMEDIATE };

/** An invitation link works for 7 days, a password-reset link for 1 hour; each works once. */
export const INVITATION_TTL_MS = 7 * 24 * 3600_000;
export const PASSWORD_RESET_TTL_MS = 3600_000;

const EMAIL_TAKEN = 'A user with this e-mail address already exists';

/** 32 random bytes, base64url: the token travels only in the e-mail. */
export function newLinkToken(): string {
  return randomBytes(32).toString('base64url');
}

/** What the database keeps instead of the token. */
export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

type LinkState = 'usable' | 'unknown' | 'used' | 'revoked' | 'expired';

function stateOf(row: LinkToken | null, purpose: LinkPurpose | null, now: Date): LinkState {
  if (!row || (purpose && row.purpose !== purpose)) return 'unknown';
  if (row.usedAt) return 'used';
  if (row.revokedAt) return 'revoked';
  if (row.expiresAt <= now) return 'expired';
  return 'usable';
}

/** The one answer for a link that cannot be used: 404 with a message that says why and what to do. */
function linkRefused(state: Exclude<LinkState, 'usable'>, purpose: LinkPurpose | undefined): ApiError {
  const invitation = purpose === 'invitation';
  switch (state) {
    case 'used':
      return ApiError.notFound(
        invitation
          ? 'This invitation has already been accepted: sign in instead'
          : 'This link has already been used: ask for a new one if you still need it',
      );
    case 'revoked':
      return ApiError.notFound(
        invitation
          ? 'This invitation was withdrawn or replaced by a newer one: ask your administrator'
          : 'A newer link or a password change has replaced this one: use the latest e-mail or ask for a new link',
      );
    case 'expired':
      return ApiError.notFound(
        invitation
          ? 'This invitation has expired: ask your administrator to send it again'
          : 'This link has expired: ask for a new one',
      );
    default:
      return ApiError.notFound('This link is not valid: check that the whole link was copied, or ask for a new one');
  }
}

async function findLink(token: string, transaction?: Transaction): Promise<LinkToken | null> {
  return LinkToken.findOne({ where: { tokenHash: hashLinkToken(token) }, transaction });
}

/**
 * Marks the link used, atomically: a conditional UPDATE that only one caller can win (checked by the affected rows),
 * so two concurrent uses of the same link never both succeed. Throws the 404 that says why otherwise.
 */
async function claimLink(
  ctx: AppContext,
  token: string,
  purpose: LinkPurpose,
  transaction: Transaction,
): Promise<LinkToken> {
  const now = ctx.now();
  const row = await findLink(token, transaction);
  const state = stateOf(row, purpose, now);
  if (state !== 'usable' || !row) throw linkRefused(state === 'usable' ? 'unknown' : state, purpose);
  const [affected] = await LinkToken.update(
    { usedAt: now },
    { where: { id: row.id, purpose, usedAt: null, revokedAt: null, expiresAt: { [Op.gt]: now } }, transaction },
  );
  if (affected !== 1) throw linkRefused('used', purpose);
  return row;
}

// ---------------------------------------------------------------- invitations

function invitationStatus(row: LinkToken, now: Date): InvitationDto['status'] {
  if (row.usedAt) return 'accepted';
  if (row.revokedAt) return 'revoked';
  if (row.expiresAt <= now) return 'expired';
  return 'pending';
}

async function inviterNames(rows: LinkToken[]): Promise<Map<string, string>> {
  const ids = [...new Set(rows.map((r) => r.createdById).filter((id): id is string => !!id))];
  if (!ids.length) return new Map();
  return new Map((await User.findAll({ where: { id: ids }, attributes: ['id', 'name'] })).map((u) => [u.id, u.name]));
}

function toInvitation(row: LinkToken, names: Map<string, string>, now: Date): InvitationDto {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role as Role,
    status: invitationStatus(row, now),
    invitedBy: (row.createdById && names.get(row.createdById)) || '',
    createdAt: row.createdAt.toISOString(),
    expiresAt: row.expiresAt.toISOString(),
  };
}

export async function listInvitations(ctx: AppContext, actor: AuthUser): Promise<InvitationDto[]> {
  const rows = await LinkToken.findAll({
    where: { organizationId: actor.organizationId, purpose: 'invitation' },
    order: [['createdAt', 'DESC']],
    limit: 500,
  });
  const names = await inviterNames(rows);
  const now = ctx.now();
  return rows.map((r) => toInvitation(r, names, now));
}

async function findInvitation(actor: AuthUser, invitationId: string, transaction?: Transaction): Promise<LinkToken> {
  const row = await LinkToken.findOne({
    where: { id: invitationId, organizationId: actor.organizationId, purpose: 'invitation' },
    transaction,
  });
  if (!row) throw ApiError.notFound('No such invitation');
  return row;
}

/**
 * Refuses an address that is already a user of the inviting organization. An address that belongs to another
 * organization is treated like a new one: saying so would tell one organization about another's people. Such an
 * invitation simply stays pending; its link tells the person (who owns the address) to sign in instead.
 */
async function assertEmailFree(email: string, organizationId: string, transaction?: Transaction): Promise<void> {
  if (await User.findOne({ where: { email, organizationId }, attributes: ['id'], transaction }))
    throw new ApiError('conflict', `${EMAIL_TAKEN} in your organization`, { email: 'Already in use' });
}

async function organizationName(organizationId: string): Promise<string> {
  return (await Organization.findByPk(organizationId, { attributes: ['name'] }))?.name ?? 'your organization';
}

/** Sends the invitation mail (after the change is committed: no mail for a change that rolled back). */
async function mailInvitation(ctx: AppContext, actor: AuthUser, row: LinkToken, token: string): Promise<void> {
  const content = invitationMail({
    organizationName: await organizationName(row.organizationId),
    inviterName: actor.name,
    name: row.name,
    role: row.role as Role,
    link: appLink(ctx.config.publicBaseUrl, `welcome/${token}`),
    expiresAt: row.expiresAt,
  });
  await ctx.mail.send({
    organizationId: row.organizationId,
    kind: 'invitation',
    to: row.email,
    actorId: actor.id,
    ...content,
  });
}

/** Invites someone by e-mail: a one-time link to /welcome/<token>, valid 7 days. */
export async function createInvitation(
  ctx: AppContext,
  actor: AuthUser,
  input: CreateInvitation,
): Promise<InvitationDto> {
  const token = newLinkToken();
  const now = ctx.now();
  const row = await ctx.db.sequelize.transaction(WRITE_LOCK, async (transaction) => {
    await assertEmailFree(input.email, actor.organizationId, transaction);
    const pending = await LinkToken.findOne({
      where: {
        organizationId: actor.organizationId,
        purpose: 'invitation',
        email: input.email,
        usedAt: null,
        revokedAt: null,
        expiresAt: { [Op.gt]: now },
      },
      transaction,
    });
    if (pending) {
      throw new ApiError('conflict', 'This address already has a pending invitation: resend it instead', {
        email: 'Already invited',
      });
    }
    const created = await LinkToken.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        purpose: 'invitation',
        tokenHash: hashLinkToken(token),
        email: input.email,
        name: input.name,
        role: input.role,
        userId: null,
        createdById: actor.id,
        expiresAt: new Date(now.getTime() + INVITATION_TTL_MS),
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'invitation.created',
        entityType: 'invitation',
        entityId: created.id,
        summary: { email: input.email, name: input.name, role: input.role, expiresAt: created.expiresAt.toISOString() },
      },
      transaction,
    );
    return created;
  });
  await mailInvitation(ctx, actor, row, token);
  return toInvitation(row, new Map([[actor.id, actor.name]]), now);
}

/** A new link for a pending or expired invitation (7 days again); the old link stops working. */
export async function resendInvitation(ctx: AppContext, actor: AuthUser, invitationId: string): Promise<InvitationDto> {
  const token = newLinkToken();
  const now = ctx.now();
  const row = await ctx.db.sequelize.transaction(WRITE_LOCK, async (transaction) => {
    const inv = await findInvitation(actor, invitationId, transaction);
    const status = invitationStatus(inv, now);
    if (status === 'accepted') throw ApiError.conflict('This invitation has already been accepted');
    if (status === 'revoked') throw ApiError.conflict('This invitation was revoked: invite the person again');
    await assertEmailFree(inv.email, actor.organizationId, transaction);
    const expiresAt = new Date(now.getTime() + INVITATION_TTL_MS);
    const [affected] = await LinkToken.update(
      { tokenHash: hashLinkToken(token), expiresAt },
      { where: { id: inv.id, usedAt: null, revokedAt: null }, transaction },
    );
    if (affected !== 1) throw ApiError.conflict('This invitation changed meanwhile: reload and try again');
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'invitation.resent',
        entityType: 'invitation',
        entityId: inv.id,
        summary: { email: inv.email, expiresAt: expiresAt.toISOString() },
      },
      transaction,
    );
    await inv.reload({ transaction });
    return inv;
  });
  await mailInvitation(ctx, actor, row, token);
  return toInvitation(row, await inviterNames([row]), now);
}

/** Withdraws an invitation: its link stops working. Revoking a revoked invitation changes nothing. */
export async function revokeInvitation(ctx: AppContext, actor: AuthUser, invitationId: string): Promise<InvitationDto> {
  const now = ctx.now();
  const row = await ctx.db.sequelize.transaction(WRITE_LOCK, async (transaction) => {
    const inv = await findInvitation(actor, invitationId, transaction);
    const status = invitationStatus(inv, now);
    if (status === 'accepted')
      throw ApiError.conflict('This invitation has already been accepted: deactivate the user instead');
    if (status === 'revoked') return inv;
    const [affected] = await LinkToken.update(
      { revokedAt: now },
      { where: { id: inv.id, usedAt: null, revokedAt: null }, transaction },
    );
    if (affected !== 1) throw ApiError.conflict('This invitation changed meanwhile: reload and try again');
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'invitation.revoked',
        entityType: 'invitation',
        entityId: inv.id,
        summary: { email: inv.email },
      },
      transaction,
    );
    await inv.reload({ transaction });
    return inv;
  });
  return toInvitation(row, await inviterNames([row]), now);
}

/** The invited person chooses a password: the user is created in the inviting organization with the invited role. */
export async function acceptInvitation(
  ctx: AppContext,
  input: { token: string; password: string },
): Promise<SignInResponse> {
  // Refuse a dead link before spending a password hash on it.
  await linkInfo(ctx, input.token, 'invitation');
  const passwordHash = await hashPassword(input.password);
  try {
    const user = await ctx.db.sequelize.transaction(WRITE_LOCK, async (transaction) => {
      const link = await claimLink(ctx, input.token, 'invitation', transaction);
      if (await User.findOne({ where: { email: link.email }, transaction })) {
        throw new ApiError('conflict', `${EMAIL_TAKEN}: sign in or reset your password`, { email: 'Already in use' });
      }
      const created = await User.create(
        {
          id: randomUUID(),
          organizationId: link.organizationId,
          email: link.email,
          name: link.name,
          role: link.role as Role,
          passwordHash,
        },
        { transaction },
      );
      await LinkToken.update({ userId: created.id }, { where: { id: link.id }, transaction });
      await recordAudit(
        {
          organizationId: link.organizationId,
          actorId: created.id,
          action: 'invitation.accepted',
          entityType: 'invitation',
          entityId: link.id,
          summary: { email: created.email, role: created.role, userId: created.id },
        },
        transaction,
      );
      return created;
    });
    return signInResponseFor(ctx, user);
  } catch (e) {
    // Two invitations to the same address accepted at once: the unique index decides.
    if ((e as { name?: string }).name === 'SequelizeUniqueConstraintError') {
      throw new ApiError('conflict', `${EMAIL_TAKEN}: sign in or reset your password`, { email: 'Already in use' });
    }
    throw e;
  }
}

// ---------------------------------------------------------------- one-time links and password reset

/** What a link is for and whom, when it can still be used; a 404 that says why otherwise. */
export async function linkInfo(ctx: AppContext, token: string, purpose?: LinkPurpose): Promise<TokenInfo> {
  const row = await findLink(token);
  const state = stateOf(row, purpose ?? null, ctx.now());
  if (state !== 'usable' || !row) throw linkRefused(state === 'usable' ? 'unknown' : state, purpose ?? row?.purpose);
  const org = await Organization.findByPk(row.organizationId, { attributes: ['name'] });
  return {
    purpose: row.purpose,
    email: row.email,
    name: row.name,
    organizationName: org?.name ?? '',
    role: row.purpose === 'invitation' ? (row.role as Role | null) : null,
    expiresAt: row.expiresAt.toISOString(),
  };
}

/**
 * A password-reset request. Runs in the background of a response that is always `{ ok: true }`, so neither the answer
 * nor its timing tells whether the address has an account. Only an active user gets a link (1 hour); a newer link
 * replaces any older one still open.
 */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const user = await User.findOne({ where: { email } });
  if (!user || !user.active) return;
  const token = newLinkToken();
  const now = ctx.now();
  const link = await ctx.db.sequelize.transaction(WRITE_LOCK, async (transaction) => {
    await LinkToken.update(
      { revokedAt: now },
      {
        where: {
          userId: user.id,
          purpose: 'password-reset',
          usedAt: null,
          revokedAt: null,
          expiresAt: { [Op.gt]: now },
        },
        transaction,
      },
    );
    const created = await LinkToken.create(
      {
        id: randomUUID(),
        organizationId: user.organizationId,
        purpose: 'password-reset',
        tokenHash: hashLinkToken(token),
        email: user.email,
        name: user.name,
        role: null,
        userId: user.id,
        createdById: null,
        expiresAt: new Date(now.getTime() + PASSWORD_RESET_TTL_MS),
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: user.organizationId,
        actorId: null,
        action: 'password.reset-requested',
        entityType: 'user',
        entityId: user.id,
        summary: { email: user.email, expiresAt: created.expiresAt.toISOString() },
      },
      transaction,
    );
    return created;
  });
  const content = passwordResetMail({
    name: user.name,
    link: appLink(ctx.config.publicBaseUrl, `reset-password/${token}`),
    expiresAt: link.expiresAt,
  });
  await ctx.mail.send({
    organizationId: user.organizationId,
    kind: 'password-reset',
    to: user.email,
    actorId: null,
    ...content,
  });
}

/** Sets the new password from a reset link: single use; every session of the user ends; returns a fresh one. */
export async function confirmPasswordReset(
  ctx: AppContext,
  input: { token: string; password: string },
): Promise<SignInResponse> {
  await linkInfo(ctx, input.token, 'password-reset');
  const passwordHash = await hashPassword(input.password);
  const now = ctx.now();
  const user = await ctx.db.sequelize.transaction(WRITE_LOCK, async (transaction) => {
    const link = await claimLink(ctx, input.token, 'password-reset', transaction);
    const u = link.userId
      ? await User.findOne({ where: { id: link.userId, organizationId: link.organizationId }, transaction })
      : null;
    if (!u || !u.active) throw ApiError.notFound('This account is no longer active: ask your administrator');
    u.passwordHash = passwordHash;
    u.tokenVersion += 1;
    await u.save({ transaction });
    await LinkToken.update(
      { revokedAt: now },
      {
        where: { userId: u.id, purpose: 'password-reset', usedAt: null, revokedAt: null, id: { [Op.ne]: link.id } },
        transaction,
      },
    );
    await recordAudit(
      {
        organizationId: u.organizationId,
        actorId: u.id,
        action: 'password.reset',
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
