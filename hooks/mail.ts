import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateInvitation, InvitationDto } from '../shared/schemas/invitations';
import type { Outbox, ReminderDelivery, ReminderRule, ReminderRuleInput } from '../shared/schemas/reminders';
import { apiFetch } from './api';
import { queryKeys } from './queryKeys';

const enc = encodeURIComponent;

export function useReminderRules() {
  return useQuery({
    queryKey: queryKeys.reminders.rules(),
    queryFn: () => apiFetch<{ rules: ReminderRule[]; reminderHourUtc: number }>('/reminder-rules'),
  });
}

export function useSaveReminderRule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id?: string; input: ReminderRuleInput }) =>
      id
        ? apiFetch<ReminderRule>(`/reminder-rules/${enc(id)}`, { method: 'PUT', body: input })
        : apiFetch<ReminderRule>('/reminder-rules', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.reminders.rules() }),
  });
}

export function useDeleteReminderRule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => apiFetch<{ ok: true }>(`/reminder-rules/${enc(id)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.reminders.rules() }),
  });
}

/** An admin approves a rule's outside addresses (until then they are not mailed). */
export function useApproveReminderEmails() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, emails }: { id: string; emails: string[] }) =>
      apiFetch<ReminderRule>(`/reminder-rules/${enc(id)}/approve-emails`, { method: 'POST', body: { emails } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.reminders.rules() }),
  });
}

/** Sends one rule's reminder now, or every enabled rule's when no id is given. */
export function useSendNow() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (ruleId?: string) =>
      apiFetch<{ deliveries: ReminderDelivery[] }>('/reminders/send-now', {
        method: 'POST',
        body: ruleId ? { ruleId } : {},
      }),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: queryKeys.reminders.all() });
      void qc.invalidateQueries({ queryKey: queryKeys.outbox() });
    },
  });
}

export function useDeliveries() {
  return useQuery({
    queryKey: queryKeys.reminders.deliveries(),
    queryFn: async () => (await apiFetch<{ deliveries: ReminderDelivery[] }>('/reminders/deliveries')).deliveries,
  });
}

export function useOutbox() {
  return useQuery({ queryKey: queryKeys.outbox(), queryFn: () => apiFetch<Outbox>('/outbox') });
}

export function useInvitations() {
  return useQuery({
    queryKey: queryKeys.invitations(),
    queryFn: async () => (await apiFetch<{ invitations: InvitationDto[] }>('/invitations')).invitations,
  });
}

function useInvitationMutation<I>(fn: (input: I) => Promise<InvitationDto>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: queryKeys.invitations() });
      void qc.invalidateQueries({ queryKey: queryKeys.outbox() });
    },
  });
}

export function useCreateInvitation() {
  return useInvitationMutation((input: CreateInvitation) =>
    apiFetch<InvitationDto>('/invitations', { method: 'POST', body: input }),
  );
}

export function useResendInvitation() {
  return useInvitationMutation((id: string) =>
    apiFetch<InvitationDto>(`/invitations/${enc(id)}/resend`, { method: 'POST' }),
  );
}

export function useRevokeInvitation() {
  return useInvitationMutation((id: string) =>
    apiFetch<InvitationDto>(`/invitations/${enc(id)}`, { method: 'DELETE' }),
  );
}
