import { organizationSchema, organizationSettingsSchema } from '../schemas/organization';
import { endpoint } from './endpoint';

/** The organization and its settings. */
export const organizationApi = {
  get: endpoint({
    method: 'get',
    path: '/organization',
    summary: 'The organization and its settings (review interval, signal-word rule, PPE levels, arc-duration cap).',
    tag: 'organization',
    access: 'signed-in',
    response: organizationSchema,
  }),
  updateSettings: endpoint({
    method: 'put',
    path: '/organization/settings',
    summary: 'Change the organization settings.',
    tag: 'organization',
    access: ['admin'],
    body: organizationSettingsSchema,
    response: organizationSchema,
  }),
};
