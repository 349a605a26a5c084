import {
  organizationSettingsSchema,
  type OrganizationDto,
  type OrganizationSettings,
  type OrganizationSettingsInput,
} from '../../shared/schemas/organization';
import { Organization } from '../db/models';
import { ReadCache } from '../db/readCache';
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

/**
 * Each organization's settings, read by every calculation (the spot check, runs, labels): cached a few seconds and
 * dropped on any write of an organization (server/db/readCache.ts). Callers get their own copy.
 */
const settingsCache = new ReadCache<{ settings: OrganizationSettings }>('organizations', 1_000);

export async function getSettings(organizationId: string): Promise<OrganizationSettings> {
  const hit = settingsCache.get(organizationId);
  if (hit) return structuredClone(hit.settings);
  const at = settingsCache.counter();
  const org = await Organization.findByPk(organizationId, { attributes: ['settings'] });
  const settings = parseSettings(org?.settings ?? '{}');
  settingsCache.set(organizationId, { settings: structuredClone(settings) }, at);
  return settings;
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
