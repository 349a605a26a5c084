import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { createSite, findSite, listSites, toSiteDto, updateSite } from '../services/sites';

export const siteRoutes: AnyRoute[] = [
  bind(contract.sites.list, {
    handler: async ({ user }) => ({ sites: await listSites(user) }),
  }),
  bind(contract.sites.create, {
    handler: ({ ctx, user, body }) => createSite(ctx, user, body),
  }),
  bind(contract.sites.get, {
    handler: async ({ user, params }) => toSiteDto(await findSite(user, params.siteId)),
  }),
  bind(contract.sites.update, {
    handler: ({ ctx, user, body, params }) => updateSite(ctx, user, params.siteId, body),
  }),
];
