import { useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AttentionList } from '../shared/schemas/attention';
import type { FieldReportStatus, FieldReportTriage } from '../shared/schemas/fieldReports';
import { contract } from '../shared/api';
import { apiPath, callApi } from './api';
import { queryKeys } from './queryKeys';

export function useAttentionSummary(siteId: string | null) {
  return useQuery({
    queryKey: queryKeys.attention.summary(siteId),
    queryFn: () => callApi(contract.attention.summary, { query: { siteId: siteId ?? undefined } }),
    placeholderData: (prev) => prev,
  });
}

export function useAttentionList(list: AttentionList, siteId: string | null) {
  return useQuery({
    queryKey: queryKeys.attention.list(list, siteId),
    queryFn: () => callApi(contract.attention.list, { params: { list }, query: { siteId: siteId ?? undefined } }),
  });
}

/** The path of a list's CSV export (for `downloadFile`). */
export function attentionCsvPath(list: AttentionList, siteId: string | null): string {
  return apiPath(contract.attention.exportList, { params: { list }, query: { siteId: siteId ?? undefined } });
}

export interface FieldReportFilters {
  status?: FieldReportStatus;
  siteId?: string;
  mine?: boolean;
}

export function useFieldReports(filters: FieldReportFilters) {
  return useQuery({
    queryKey: queryKeys.fieldReports.list(filters),
    queryFn: async () =>
      (
        await callApi(contract.attention.fieldReports, {
          query: { status: filters.status, siteId: filters.siteId || undefined, mine: filters.mine ? '1' : undefined },
        })
      ).reports,
  });
}

export function useFieldReport(id: string) {
  return useQuery({
    queryKey: queryKeys.fieldReports.detail(id),
    queryFn: () => callApi(contract.attention.fieldReport, { params: { reportId: id } }),
    retry: false,
  });
}

export function useTriageReport(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: FieldReportTriage) =>
      callApi(contract.attention.triageFieldReport, { params: { reportId: id }, body: input }),
    onSuccess: (report) => {
      qc.setQueryData(queryKeys.fieldReports.detail(id), report);
      void qc.invalidateQueries({ queryKey: queryKeys.fieldReports.all() });
      void qc.invalidateQueries({ queryKey: queryKeys.attention.all() });
    },
  });
}

/** Filters of the audit log, as the API takes them (the cursor is added per page). */
export interface AuditFilters {
  q?: string;
  action?: string;
  entityType?: string;
  entityId?: string;
  actorId?: string;
  from?: string;
  to?: string;
}

export const AUDIT_PAGE_SIZE = 50;

export function useAuditEvents(filters: AuditFilters, enabled = true) {
  return useInfiniteQuery({
    queryKey: queryKeys.audit.list({ ...filters }),
    queryFn: ({ pageParam }) =>
      callApi(contract.attention.auditEvents, {
        query: { ...filters, before: pageParam ?? undefined, limit: AUDIT_PAGE_SIZE },
      }),
    initialPageParam: null as string | null,
    getNextPageParam: (last) => last.nextBefore,
    enabled,
  });
}

export function auditCsvPath(filters: AuditFilters): string {
  return apiPath(contract.attention.exportAuditEvents, { query: { ...filters } });
}
