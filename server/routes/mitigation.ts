import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { applyMitigation, mitigationOptions } from '../services/mitigation';

export const mitigationRoutes: AnyRoute[] = [
  bind(contract.mitigation.options, {
    handler: ({ user, params, body }) => mitigationOptions(user, params.studyId, body),
  }),
  bind(contract.mitigation.apply, {
    handler: ({ ctx, user, params, body }) => applyMitigation(ctx, user, params.studyId, body),
  }),
];
