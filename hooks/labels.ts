import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateLabelBatch } from '../shared/schemas/labelBatches';
import { contract } from '../shared/api';
import { callApi } from './api';
import { queryKeys } from './queryKeys';

export function useLabelDetail(code: string) {
  return useQuery({
    queryKey: queryKeys.labels.detail(code),
    queryFn: () => callApi(contract.labels.detail, { params: { code } }),
    retry: false,
  });
}

export function useLabelCheck(code: string) {
  return useQuery({
    queryKey: queryKeys.labels.check(code),
    queryFn: () => callApi(contract.labels.check, { params: { code } }),
    retry: false,
  });
}

export function useSiteLabels(siteId: string | null) {
  return useQuery({
    queryKey: queryKeys.labels.site(siteId ?? ''),
    queryFn: async () => {
      if (!siteId) throw new Error('No site');
      return (await callApi(contract.labels.siteLabels, { params: { siteId }, query: { current: '1' } })).labels;
    },
    enabled: !!siteId,
  });
}

export function useMarkInstalled(code: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (photo: File) => {
      const form = new FormData();
      form.append('photo', photo);
      return callApi(contract.labels.markInstalled, { params: { code }, formData: form });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.labels.all() }),
  });
}

export function useReportMismatch(code: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { kind: string; text: string; photo?: File | null }) => {
      const form = new FormData();
      form.append('kind', input.kind);
      form.append('text', input.text);
      if (input.photo) form.append('photo', input.photo);
      return callApi(contract.labels.report, { params: { code }, formData: form });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.labels.all() }),
  });
}

export function useCreateBatch() {
  return useMutation({
    mutationFn: (input: CreateLabelBatch) => callApi(contract.labelBatches.create, { body: input }),
  });
}

/** A print batch; polls while it is being made. */
export function useBatch(id: string | null) {
  const qc = useQueryClient();
  return useQuery({
    queryKey: queryKeys.labelBatch(id),
    queryFn: async () => {
      if (!id) throw new Error('No batch');
      const b = await callApi(contract.labelBatches.get, { params: { batchId: id } });
      if (b.status === 'done') void qc.invalidateQueries({ queryKey: queryKeys.labels.all() });
      return b;
    },
    enabled: !!id,
    refetchInterval: (q) =>
      q.state.data && (q.state.data.status === 'queued' || q.state.data.status === 'running') ? 700 : false,
  });
}
