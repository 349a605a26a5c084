import { organizationSchema, organizationSettingsSchema } from '../../shared/schemas/organization';
import { defineRoute, type AnyRoute } from '../http/route';
import { getOrganization, updateSettings } from '../services/organization';

export const organizationRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/organization',
    summary: 'The organization and its settings (review interval, signal-word rule, PPE levels, arc-duration cap).',
    tag: 'organization',
    access: 'signed-in',
    response: organizationSchema,
    handler: ({ user }) => getOrganization(user),
  }),
  defineRoute({
    method: 'put',
    path: '/organization/settings',
    summary: 'Change the organization settings.',
    tag: 'organization',
    access: ['admin'],
    body: organizationSettingsSchema,
    response: organizationSchema,
    handler: ({ ctx, user, body }) => updateSettings(ctx, user, body),
  }),
];
