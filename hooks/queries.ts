import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Me } from '../shared/schemas/auth';
import type { ClearingTimeResponse, Device, ElectronicPositions, ElectronicTripType } from '../shared/schemas/device';
import type { BandCurvesResponse, DeviceType, DeviceTypeInput } from '../shared/schemas/deviceLibrary';
import type { IncidentEnergyRequest, IncidentEnergyResponse } from '../shared/schemas/incidentEnergy';
import type { LabelValuesDto } from '../shared/schemas/labelValues';
import type { OrganizationDto, OrganizationSettingsInput } from '../shared/schemas/organization';
import type { Site, SiteInput } from '../shared/schemas/sites';
import type { CreateUser, UpdateUser, UserAdmin } from '../shared/schemas/users';
import { apiFetch } from './api';
import { queryKeys } from './queryKeys';

export function useMe() {
  return useQuery({ queryKey: queryKeys.me(), queryFn: () => apiFetch<Me>('/auth/me') });
}

export function useSites() {
  return useQuery({
    queryKey: queryKeys.sites.list(),
    queryFn: async () => (await apiFetch<{ sites: Site[] }>('/sites')).sites,
  });
}

export function useSite(siteId: string) {
  return useQuery({
    queryKey: queryKeys.sites.detail(siteId),
    queryFn: () => apiFetch<Site>(`/sites/${encodeURIComponent(siteId)}`),
  });
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
  return useQuery({
    queryKey: queryKeys.users(),
    queryFn: async () => (await apiFetch<{ users: UserAdmin[] }>('/users')).users,
  });
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

export function useOrganization() {
  return useQuery({ queryKey: queryKeys.organization(), queryFn: () => apiFetch<OrganizationDto>('/organization') });
}

export function useUpdateSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (settings: OrganizationSettingsInput) =>
      apiFetch<OrganizationDto>('/organization/settings', { method: 'PUT', body: settings }),
    onSuccess: (org) => {
      qc.setQueryData(queryKeys.organization(), org);
      // The dashboard's "not installed" list and the reminder hour follow the settings.
      void qc.invalidateQueries({ queryKey: queryKeys.attention.all() });
      void qc.invalidateQueries({ queryKey: queryKeys.reminders.all() });
    },
  });
}

export type IncidentEnergyResult = IncidentEnergyResponse & { labelValues: LabelValuesDto };

export function useIncidentEnergy() {
  return useMutation({
    mutationFn: (input: IncidentEnergyRequest) =>
      apiFetch<IncidentEnergyResult>('/calc/incident-energy', { method: 'POST', body: input }),
  });
}

export function useDeviceTypes() {
  return useQuery({
    queryKey: queryKeys.deviceTypes.list(),
    queryFn: async () => (await apiFetch<{ deviceTypes: DeviceType[] }>('/device-types')).deviceTypes,
  });
}

export function useDeviceType(id: string | undefined) {
  return useQuery({
    queryKey: queryKeys.deviceTypes.detail(id ?? 'new'),
    queryFn: () => apiFetch<DeviceType>(`/device-types/${encodeURIComponent(id as string)}`),
    enabled: !!id,
  });
}

export function useSaveDeviceType(id?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: DeviceTypeInput) =>
      id
        ? apiFetch<DeviceType>(`/device-types/${encodeURIComponent(id)}`, { method: 'PUT', body: input })
        : apiFetch<DeviceType>('/device-types', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.deviceTypes.all() }),
  });
}

export function useDeleteDeviceType() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => apiFetch<void>(`/device-types/${encodeURIComponent(id)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.deviceTypes.all() }),
  });
}

/** Sampled min/max curves of a device for the plot; keyed by the device's JSON so edits re-fetch. */
export function useBandCurves(device: Device | null) {
  const json = device ? JSON.stringify(device) : '';
  return useQuery({
    queryKey: queryKeys.bandCurves(json),
    queryFn: () => apiFetch<BandCurvesResponse>('/calc/band-curves', { method: 'POST', body: { device } }),
    enabled: !!device,
    placeholderData: (prev) => prev,
    retry: false,
  });
}

export function useClearingTime() {
  return useMutation({
    mutationFn: (input: { device: Device; currentA: number }) =>
      apiFetch<ClearingTimeResponse>('/calc/clearing-time', { method: 'POST', body: input }),
  });
}

export function useResolveTripUnit() {
  return useMutation({
    mutationFn: (input: { tripType: ElectronicTripType; positions: ElectronicPositions }) =>
      apiFetch<{ device: Device }>('/calc/resolve-trip-unit', { method: 'POST', body: input }),
  });
}
