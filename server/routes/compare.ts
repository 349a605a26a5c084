import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { compareRevisions } from '../services/compare';

export const compareRoutes: AnyRoute[] = [
  bind(contract.compare.revisions, {
    handler: ({ user, params }) => compareRevisions(user, params.studyId, params.otherStudyId),
  }),
];
