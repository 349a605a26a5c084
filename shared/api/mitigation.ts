import {
  applyMitigationRequestSchema,
  applyMitigationResponseSchema,
  mitigateRequestSchema,
  mitigationResponseSchema,
} from '../schemas/mitigation';
import { endpoint } from './endpoint';

/** Mitigation options for a bus: computed changes that bring its incident energy to or under a target. */
export const mitigationApi = {
  options: endpoint({
    method: 'post',
    path: '/studies/:studyId/mitigate',
    summary:
      'Options that bring a bus’s governing incident energy to or under a target (a setting from the device’s own ' +
      'range, a maintenance switch, an arc-flash relay, a current-limiting fuse, an isolated main), best first, each ' +
      'with its model patch, the energy it gives there and at every other bus it changes, and the selectivity it costs.',
    tag: 'studies',
    access: ['engineer'],
    body: mitigateRequestSchema,
    response: mitigationResponseSchema,
  }),
  apply: endpoint({
    method: 'post',
    path: '/studies/:studyId/mitigate/apply',
    summary:
      'A new draft revision of the site with one option’s change applied (audited), ready to run: running it gives ' +
      'the energy the option promised.',
    tag: 'studies',
    access: ['engineer'],
    body: applyMitigationRequestSchema,
    response: applyMitigationResponseSchema,
    status: 201,
  }),
};
