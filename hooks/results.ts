import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { ResultsPageParams } from '../shared/schemas/resultsPage';
import { contract } from '../shared/api';
import { callApi } from './api';
import { queryKeys } from './queryKeys';

/** A yes/no filter as the query string writes it. */
const flag = (v: boolean | undefined) => (v === undefined ? undefined : v ? 'true' : 'false');

/**
 * One page of a study's results (rows without traces, the paging and the whole study's counts); null when the study
 * has no results yet. The previous page stays on screen while the next one loads.
 */
export function useResultsPage(studyId: string, params: ResultsPageParams, enabled = true) {
  return useQuery({
    queryKey: queryKeys.studies.resultsPage(studyId, params),
    queryFn: async () => {
      try {
        return await callApi(contract.studies.results, {
          params: { studyId },
          query: { ...params, warnings: flag(params.warnings), errors: flag(params.errors) },
        });
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

/**
 * One bus of a study's results with its whole clearing trace and the devices it names: in the governing scenario
 * (the label's basis) when `scenario` is undefined, else in that operating scenario.
 */
export function useBusResult(studyId: string, busId: string, scenario?: string, enabled = true) {
  return useQuery({
    queryKey: queryKeys.studies.busResult(studyId, busId, scenario),
    queryFn: () =>
      callApi(contract.studies.busResult, {
        params: { studyId, busId },
        query: scenario === undefined ? {} : { scenario },
      }),
    enabled,
    staleTime: 60_000,
    retry: (count, e) => {
      const status = (e as { status?: number }).status;
      return status !== 404 && status !== 400 && status !== 409 && count < 2;
    },
  });
}
