import { siteInputSchema, siteListSchema, siteSchema } from '../schemas/sites';
import { endpoint } from './endpoint';

/** Sites of the organization. */
export const sitesApi = {
  list: endpoint({
    method: 'get',
    path: '/sites',
    summary: 'Sites of the organization.',
    tag: 'sites',
    access: 'signed-in',
    response: siteListSchema,
  }),
  create: endpoint({
    method: 'post',
    path: '/sites',
    summary: 'Create a site.',
    tag: 'sites',
    access: ['admin', 'engineer'],
    body: siteInputSchema,
    response: siteSchema,
    status: 201,
  }),
  get: endpoint({
    method: 'get',
    path: '/sites/:siteId',
    summary: 'One site.',
    tag: 'sites',
    access: 'signed-in',
    response: siteSchema,
  }),
  update: endpoint({
    method: 'put',
    path: '/sites/:siteId',
    summary: 'Edit a site.',
    tag: 'sites',
    access: ['admin', 'engineer'],
    body: siteInputSchema,
    response: siteSchema,
  }),
};
