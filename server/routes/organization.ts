import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { getOrganization, updateSettings } from '../services/organization';

export const organizationRoutes: AnyRoute[] = [
  bind(contract.organization.get, {
    handler: ({ user }) => getOrganization(user),
  }),
  bind(contract.organization.updateSettings, {
    handler: ({ ctx, user, body }) => updateSettings(ctx, user, body),
  }),
];
