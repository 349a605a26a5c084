import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { ResultsPage, ResultsPageParams } from '../shared/schemas/resultsPage';
import { contract } from '../shared/api';
import { apiFetch, callApi } from './api';
import { queryKeys } from './queryKeys';

const enc = encodeURIComponent;

/** The query string of a results page (parameters left out are the server's defaults). */
export function resultsPageQuery(params: ResultsPageParams): string {
  const parts: string[] = [];
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null) parts.push(`${k}=${enc(String(v))}`);
  return parts.length ? `?${parts.join('&')}` : '';
}

/**
 * One page of a study's results (rows without traces, the paging and the whole study's counts); null when the study
 * has no results yet. The previous page stays on screen while the next one loads.
 */
export function useResultsPage(studyId: string, params: ResultsPageParams, enabled = true) {
  return useQuery({
    queryKey: queryKeys.studies.resultsPage(studyId, params),
    queryFn: async () => {
      try {
        return await apiFetch<ResultsPage>(`/studies/${enc(studyId)}/results${resultsPageQuery(params)}`);
      } catch (e) {
        if ((e as { status?: number }).status === 404) return null;
        throw e;
      }
    },
    enabled,
    staleTime: 60_000,
    placeholderData: keepPreviousData,
  });
}

/** One bus of a study's results with its whole clearing trace and the devices it names. */
export function useBusResult(studyId: string, busId: string) {
  return useQuery({
    queryKey: queryKeys.studies.busResult(studyId, busId),
    queryFn: () => callApi(contract.studies.busResult, { params: { studyId, busId } }),
    staleTime: 60_000,
    retry: (count, e) => (e as { status?: number }).status !== 404 && count < 2,
  });
}
