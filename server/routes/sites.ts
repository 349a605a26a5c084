import { siteInputSchema, siteListSchema, siteSchema } from '../../shared/schemas/sites';
import { defineRoute, type AnyRoute } from '../http/route';
import { createSite, findSite, listSites, toSiteDto, updateSite } from '../services/sites';

export const siteRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/sites',
    summary: 'Sites of the organization.',
    tag: 'sites',
    access: 'signed-in',
    response: siteListSchema,
    handler: async ({ user }) => ({ sites: await listSites(user) }),
  }),
  defineRoute({
    method: 'post',
    path: '/sites',
    summary: 'Create a site.',
    tag: 'sites',
    access: ['admin', 'engineer'],
    body: siteInputSchema,
    response: siteSchema,
    status: 201,
    handler: ({ ctx, user, body }) => createSite(ctx, user, body),
  }),
  defineRoute({
    method: 'get',
    path: '/sites/:siteId',
    summary: 'One site.',
    tag: 'sites',
    access: 'signed-in',
    response: siteSchema,
    handler: async ({ user, params }) => toSiteDto(await findSite(user, params.siteId)),
  }),
  defineRoute({
    method: 'put',
    path: '/sites/:siteId',
    summary: 'Edit a site.',
    tag: 'sites',
    access: ['admin', 'engineer'],
    body: siteInputSchema,
    response: siteSchema,
    handler: ({ ctx, user, body, params }) => updateSite(ctx, user, params.siteId, body),
  }),
];
