import { randomUUID } from 'node:crypto';
import type { Site as SiteDto, SiteInput } from '../../shared/schemas/sites';
import { siteInputSchema } from '../../shared/schemas/sites';
import { Site } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { recordAudit } from './audit';
import { findSite } from './scope';

export function toSiteDto(s: Site): SiteDto {
  return {
    id: s.id,
    name: s.name,
    address: s.address,
    description: s.description,
    createdAt: s.createdAt.toISOString(),
    updatedAt: s.updatedAt.toISOString(),
  };
}

export async function listSites(actor: AuthUser): Promise<SiteDto[]> {
  const sites = await Site.findAll({ where: { organizationId: actor.organizationId }, order: [['name', 'ASC']] });
  return sites.map(toSiteDto);
}

// The look-up by id lives in ./scope with the other organization-scoped reads; re-exported for the routes.
export { findSite };

export async function createSite(ctx: AppContext, actor: AuthUser, input: SiteInput): Promise<SiteDto> {
  const data = siteInputSchema.parse(input);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const site = await Site.create(
      { id: randomUUID(), organizationId: actor.organizationId, ...data },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'site.created',
        entityType: 'site',
        entityId: site.id,
        summary: { name: site.name },
      },
      transaction,
    );
    return toSiteDto(site);
  });
}

export async function updateSite(ctx: AppContext, actor: AuthUser, siteId: string, input: SiteInput): Promise<SiteDto> {
  const data = siteInputSchema.parse(input);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const site = await Site.findOne({ where: { id: siteId, organizationId: actor.organizationId }, transaction });
    if (!site) throw ApiError.notFound('No such site');
    const before = { name: site.name, address: site.address, description: site.description };
    await site.update(data, { transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'site.updated',
        entityType: 'site',
        entityId: site.id,
        summary: { before, after: data },
      },
      transaction,
    );
    return toSiteDto(site);
  });
}
