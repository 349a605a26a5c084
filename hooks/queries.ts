import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Device, ElectronicPositions, ElectronicTripType } from '../shared/schemas/device';
import type { DeviceTypeInput } from '../shared/schemas/deviceLibrary';
import type { IncidentEnergyRequest } from '../shared/schemas/incidentEnergy';
import type { OrganizationSettingsInput } from '../shared/schemas/organization';
import type { SiteInput } from '../shared/schemas/sites';
import type { CreateUser, UpdateUser } from '../shared/schemas/users';
import { contract, type ResponseOf } from '../shared/api';
import { callApi } from './api';
import { queryKeys } from './queryKeys';

export function useMe() {
  return useQuery({ queryKey: queryKeys.me(), queryFn: () => callApi(contract.auth.me) });
}

export function useSites() {
  return useQuery({
    queryKey: queryKeys.sites.list(),
    queryFn: async () => (await callApi(contract.sites.list)).sites,
  });
}

export function useSite(siteId: string) {
  return useQuery({
    queryKey: queryKeys.sites.detail(siteId),
    queryFn: () => callApi(contract.sites.get, { params: { siteId } }),
  });
}

export function useSaveSite(siteId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: SiteInput) =>
      siteId
        ? callApi(contract.sites.update, { params: { siteId }, body: input })
        : callApi(contract.sites.create, { body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.sites.all() }),
  });
}

export function useUsers() {
  return useQuery({
    queryKey: queryKeys.users(),
    queryFn: async () => (await callApi(contract.users.list)).users,
  });
}

export function useCreateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateUser) => callApi(contract.users.create, { body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.users() }),
  });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: UpdateUser & { id: string }) =>
      callApi(contract.users.update, { params: { userId: id }, body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.users() }),
  });
}

export function useOrganization() {
  return useQuery({ queryKey: queryKeys.organization(), queryFn: () => callApi(contract.organization.get) });
}

export function useUpdateSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (settings: OrganizationSettingsInput) =>
      callApi(contract.organization.updateSettings, { body: settings }),
    onSuccess: (org) => {
      qc.setQueryData(queryKeys.organization(), org);
      // The dashboard's "not installed" list and the reminder hour follow the settings.
      void qc.invalidateQueries({ queryKey: queryKeys.attention.all() });
      void qc.invalidateQueries({ queryKey: queryKeys.reminders.all() });
    },
  });
}

/** The incident-energy answer: the calculation and the label values under the organization's settings. */
export type IncidentEnergyResult = ResponseOf<typeof contract.calc.incidentEnergy>;

export function useIncidentEnergy() {
  return useMutation({
    mutationFn: (input: IncidentEnergyRequest) => callApi(contract.calc.incidentEnergy, { body: input }),
  });
}

export function useDeviceTypes() {
  return useQuery({
    queryKey: queryKeys.deviceTypes.list(),
    queryFn: async () => (await callApi(contract.devices.list)).deviceTypes,
  });
}

export function useDeviceType(id: string | undefined) {
  return useQuery({
    queryKey: queryKeys.deviceTypes.detail(id ?? 'new'),
    queryFn: () => callApi(contract.devices.get, { params: { deviceTypeId: id as string } }),
    enabled: !!id,
  });
}

export function useSaveDeviceType(id?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: DeviceTypeInput) =>
      id
        ? callApi(contract.devices.update, { params: { deviceTypeId: id }, body: input })
        : callApi(contract.devices.create, { body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.deviceTypes.all() }),
  });
}

export function useDeleteDeviceType() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => callApi(contract.devices.remove, { params: { deviceTypeId: id } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.deviceTypes.all() }),
  });
}

/** Sampled min/max curves of a device for the plot; keyed by the device's JSON so edits re-fetch. */
export function useBandCurves(device: Device | null) {
  const json = device ? JSON.stringify(device) : '';
  return useQuery({
    queryKey: queryKeys.bandCurves(json),
    queryFn: () => {
      if (!device) throw new Error('No device to plot');
      return callApi(contract.calc.bandCurves, { body: { device } });
    },
    enabled: !!device,
    placeholderData: (prev) => prev,
    retry: false,
  });
}

export function useClearingTime() {
  return useMutation({
    mutationFn: (input: { device: Device; currentA: number }) => callApi(contract.calc.clearingTime, { body: input }),
  });
}

export function useResolveTripUnit() {
  return useMutation({
    mutationFn: (input: { tripType: ElectronicTripType; positions: ElectronicPositions }) =>
      callApi(contract.calc.resolveTripUnit, { body: input }),
  });
}
