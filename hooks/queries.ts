import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Me } from '../shared/schemas/auth';
import type { Site, SiteInput } from '../shared/schemas/sites';
import type { CreateUser, UpdateUser, UserAdmin } from '../shared/schemas/users';
import { apiFetch } from './api';
import { queryKeys } from './queryKeys';

export function useMe() {
  return useQuery({ queryKey: queryKeys.me(), queryFn: () => apiFetch<Me>('/auth/me') });
}

export function useSites() {
  return useQuery({ queryKey: queryKeys.sites.list(), queryFn: async () => (await apiFetch<{ sites: Site[] }>('/sites')).sites });
}

export function useSite(siteId: string) {
  return useQuery({ queryKey: queryKeys.sites.detail(siteId), queryFn: () => apiFetch<Site>(`/sites/${encodeURIComponent(siteId)}`) });
}

export function useSaveSite(siteId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: SiteInput) =>
      siteId
        ? apiFetch<Site>(`/sites/${encodeURIComponent(siteId)}`, { method: 'PUT', body: input })
        : apiFetch<Site>('/sites', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.sites.all() }),
  });
}

export function useUsers() {
  return useQuery({ queryKey: queryKeys.users(), queryFn: async () => (await apiFetch<{ users: UserAdmin[] }>('/users')).users });
}

export function useCreateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateUser) => apiFetch<UserAdmin>('/users', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.users() }),
  });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: UpdateUser & { id: string }) =>
      apiFetch<UserAdmin>(`/users/${encodeURIComponent(id)}`, { method: 'PATCH', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.users() }),
  });
}
