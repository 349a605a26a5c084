import { useQuery } from '@tanstack/react-query';
import { contract } from '../shared/api';
import { callApi } from './api';
import { queryKeys } from './queryKeys';

/** What changed from `otherStudyId` (the baseline) to `studyId`; disabled until a baseline is chosen. */
export function useRevisionComparison(studyId: string, otherStudyId: string | null) {
  return useQuery({
    queryKey: queryKeys.studies.compare(studyId, otherStudyId ?? ''),
    queryFn: () => callApi(contract.compare.revisions, { params: { studyId, otherStudyId: otherStudyId ?? '' } }),
    enabled: !!otherStudyId,
  });
}
