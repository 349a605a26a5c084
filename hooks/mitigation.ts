import { useMutation, useQueryClient } from '@tanstack/react-query';
import { contract } from '../shared/api';
import type { ApplyMitigationRequest, MitigateRequest } from '../shared/schemas/mitigation';
import { callApi } from './api';
import { queryKeys } from './queryKeys';

/**
 * Mitigation options for one bus of a revision (POST /studies/:studyId/mitigate): a mutation, as the answer is
 * computed on request (every candidate run through the study engine) and depends on the target entered.
 */
export function useMitigationOptions(studyId: string) {
  return useMutation({
    mutationFn: (body: MitigateRequest) => callApi(contract.mitigation.options, { params: { studyId }, body }),
  });
}

/** Applies one option: a new draft revision of the site with its change (POST /studies/:studyId/mitigate/apply). */
export function useApplyMitigation(studyId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ApplyMitigationRequest) => callApi(contract.mitigation.apply, { params: { studyId }, body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.studies.all() }),
  });
}
