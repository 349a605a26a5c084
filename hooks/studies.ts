import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ApproveInput, EquipmentDto, ModelEnvelope, RunDto, StudyDto } from '../shared/schemas/studies';
import { apiFetch } from './api';
import { settleModelDraft } from './modelDrafts';
import { queryKeys } from './queryKeys';

const enc = encodeURIComponent;

export function useStudies(siteId: string) {
  return useQuery({
    queryKey: queryKeys.studies.bySite(siteId),
    queryFn: async () => (await apiFetch<{ studies: StudyDto[] }>(`/sites/${enc(siteId)}/studies`)).studies,
  });
}

export function useEquipment(siteId: string) {
  return useQuery({
    queryKey: queryKeys.equipment(siteId),
    queryFn: async () => (await apiFetch<{ equipment: EquipmentDto[] }>(`/sites/${enc(siteId)}/equipment`)).equipment,
  });
}

export function useStudy(id: string) {
  return useQuery({ queryKey: queryKeys.studies.detail(id), queryFn: () => apiFetch<StudyDto>(`/studies/${enc(id)}`) });
}

export function useCreateStudy(siteId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { title: string }) =>
      apiFetch<StudyDto>(`/sites/${enc(siteId)}/studies`, { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.studies.all() }),
  });
}

export function useStudyModel(id: string, enabled = true) {
  return useQuery({
    queryKey: queryKeys.studies.model(id),
    queryFn: () => apiFetch<ModelEnvelope>(`/studies/${enc(id)}/model`),
    enabled,
  });
}

export function useSaveModel(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { model: Record<string, unknown>; version: number }) =>
      apiFetch<ModelEnvelope>(`/studies/${enc(id)}/model`, { method: 'PUT', body: input }),
    onSuccess: (env, input) => {
      qc.setQueryData(queryKeys.studies.model(id), env);
      // Here rather than in the panel, so that it holds even when the panel has gone (another tab) by the answer.
      settleModelDraft(id, input.model, input.version, env.version);
      void qc.invalidateQueries({ queryKey: queryKeys.studies.detail(id) });
    },
  });
}

export function useImportModel(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (files: File[]) => {
      const form = new FormData();
      for (const f of files) form.append('files', f);
      return apiFetch<ModelEnvelope>(`/studies/${enc(id)}/import`, { method: 'POST', formData: form });
    },
    onSuccess: (env) => {
      qc.setQueryData(queryKeys.studies.model(id), env);
      void qc.invalidateQueries({ queryKey: queryKeys.studies.detail(id) });
    },
  });
}

const isActive = (run: RunDto | null | undefined) => !!run && (run.status === 'queued' || run.status === 'running');

/**
 * The latest run; polls every second while it is queued or running. When a run this client watched finishes (done
 * or failed), the study, its results and the labels are fetched again: the run changes all three.
 */
export function useRun(id: string) {
  const qc = useQueryClient();
  return useQuery({
    queryKey: queryKeys.studies.run(id),
    queryFn: async () => {
      const before = qc.getQueryData<RunDto | null>(queryKeys.studies.run(id));
      let run: RunDto | null;
      try {
        run = await apiFetch<RunDto>(`/studies/${enc(id)}/run`);
      } catch (e) {
        if ((e as { status?: number }).status !== 404) throw e;
        run = null;
      }
      if (isActive(before) && run && !isActive(run)) {
        void qc.invalidateQueries({ queryKey: queryKeys.studies.detail(id) });
        void qc.invalidateQueries({ queryKey: queryKeys.studies.results(id) });
        void qc.invalidateQueries({ queryKey: queryKeys.labels.all() });
      }
      return run;
    },
    refetchInterval: (q) => (isActive(q.state.data) ? 1000 : false),
  });
}

export function useStartRun(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => apiFetch<RunDto>(`/studies/${enc(id)}/run`, { method: 'POST' }),
    onSuccess: (run) => {
      qc.setQueryData(queryKeys.studies.run(id), run);
    },
  });
}

function useStudyAction<I = void>(id: string, path: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: I) =>
      apiFetch<StudyDto>(`/studies/${enc(id)}/${path}`, { method: 'POST', body: body ?? undefined }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.studies.all() }),
  });
}

export const useSubmitStudy = (id: string) => useStudyAction(id, 'submit');
export const useReturnToDraft = (id: string) => useStudyAction(id, 'return-to-draft');
export const useApproveStudy = (id: string) => useStudyAction<ApproveInput>(id, 'approve');
export const useReviseStudy = (id: string) => useStudyAction(id, 'revise');
