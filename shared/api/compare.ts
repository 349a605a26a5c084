import { revisionComparisonSchema } from '../schemas/compare';
import { endpoint } from './endpoint';

/** Comparison of two revisions of a site's study, read before approving. */
export const compareApi = {
  revisions: endpoint({
    method: 'get',
    path: '/studies/:studyId/compare/:otherStudyId',
    summary:
      'What changed from one revision (otherStudyId, usually the approved one) to another (studyId) of the same site: ' +
      'model elements added, removed and changed field by field, and per bus the change of incident energy, ' +
      'arc-flash boundary, PPE level and signal word, the largest rise in hazard first.',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    response: revisionComparisonSchema,
  }),
};
