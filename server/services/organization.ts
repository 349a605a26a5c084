import {
  organizationSettingsSchema,
  type OrganizationDto,
  type OrganizationSettings,
  type OrganizationSettingsInput,
} from '../../shared/schemas/organization';
import { Organization } from '../db/models';
import type { LabelSettings } from '../engine/labelValues';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { recordAudit } from './audit';

/** Stored settings merged over the defaults (a missing or partial settings blob gets every default). */
export function parseSettings(json: string): OrganizationSettings {
  let raw: unknown = {};
  try {
    raw = JSON.parse(json || '{}');
  } catch {
    raw = {};
  }
  const parsed = organizationSettingsSchema.safeParse(raw);
  return parsed.success ? parsed.data : organizationSettingsSchema.parse({});
}

export async function getOrganization(actor: AuthUser): Promise<OrganizationDto> {
  const org = await Organization.findByPk(actor.organizationId);
  if (!org) throw ApiError.notFound('No such organization');
  return { id: org.id, name: org.name, settings: parseSettings(org.settings) };
}

export async function getSettings(organizationId: string): Promise<OrganizationSettings> {
  const org = await Organization.findByPk(organizationId);
  return parseSettings(org?.settings ?? '{}');
}

export function labelSettingsOf(s: OrganizationSettings): LabelSettings {
  return { ppeLevels: s.ppeLevels, signalWordRule: s.signalWord };
}

export async function updateSettings(
  ctx: AppContext,
  actor: AuthUser,
  input: OrganizationSettingsInput,
): Promise<OrganizationDto> {
  const settings = organizationSettingsSchema.parse(input);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const org = await Organization.findByPk(actor.organizationId, { transaction });
    if (!org) throw ApiError.notFound('No such organization');
    const before = parseSettings(org.settings);
    await org.update({ settings: JSON.stringify(settings) }, { transaction });
    await recordAudit(
      {
        organizationId: org.id,
        actorId: actor.id,
        action: 'organization.settings-updated',
        entityType: 'organization',
        entityId: org.id,
        summary: { before, after: settings },
      },
      transaction,
    );
    return { id: org.id, name: org.name, settings };
  });
}
