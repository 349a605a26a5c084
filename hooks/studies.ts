import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ApproveInput, RunDto, StudyDto } from '../shared/schemas/studies';
import type { ModelInput } from '../shared/schemas/model';
import { contract } from '../shared/api';
import { callApi } from './api';
import { settleModelDraft } from './modelDrafts';
import { queryKeys } from './queryKeys';

export function useStudies(siteId: string) {
  return useQuery({
    queryKey: queryKeys.studies.bySite(siteId),
    queryFn: async () => (await callApi(contract.studies.list, { params: { siteId } })).studies,
  });
}

export function useEquipment(siteId: string) {
  return useQuery({
    queryKey: queryKeys.equipment(siteId),
    queryFn: async () => (await callApi(contract.studies.equipment, { params: { siteId } })).equipment,
  });
}

export function useStudy(id: string) {
  return useQuery({
    queryKey: queryKeys.studies.detail(id),
    queryFn: () => callApi(contract.studies.get, { params: { studyId: id } }),
  });
}

export function useCreateStudy(siteId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { title: string }) => callApi(contract.studies.create, { params: { siteId }, body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.studies.all() }),
  });
}

export function useStudyModel(id: string, enabled = true) {
  return useQuery({
    queryKey: queryKeys.studies.model(id),
    queryFn: () => callApi(contract.studies.model, { params: { studyId: id } }),
    enabled,
  });
}

export function useSaveModel(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { model: ModelInput; version: number }) =>
      callApi(contract.studies.saveModel, { params: { studyId: id }, body: input }),
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
      return callApi(contract.studies.importModel, { params: { studyId: id }, formData: form });
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
        run = await callApi(contract.studies.run, { params: { studyId: id } });
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
    mutationFn: () => callApi(contract.studies.startRun, { params: { studyId: id } }),
    onSuccess: (run) => {
      qc.setQueryData(queryKeys.studies.run(id), run);
    },
  });
}

function useStudyAction<I = void>(mutationFn: (body: I) => Promise<StudyDto>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.studies.all() }),
  });
}

export const useSubmitStudy = (id: string) =>
  useStudyAction<void>(() => callApi(contract.studies.submit, { params: { studyId: id } }));
export const useReturnToDraft = (id: string) =>
  useStudyAction<void>(() => callApi(contract.studies.returnToDraft, { params: { studyId: id } }));
export const useApproveStudy = (id: string) =>
  useStudyAction<ApproveInput>((body) => callApi(contract.studies.approve, { params: { studyId: id }, body }));
export const useReviseStudy = (id: string) =>
  useStudyAction<void>(() => callApi(contract.studies.revise, { params: { studyId: id } }));
