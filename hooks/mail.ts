import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateInvitation, InvitationDto } from '../shared/schemas/invitations';
import type { ReminderRuleInput } from '../shared/schemas/reminders';
import { contract } from '../shared/api';
import { callApi } from './api';
import { queryKeys } from './queryKeys';

export function useReminderRules() {
  return useQuery({
    queryKey: queryKeys.reminders.rules(),
    queryFn: () => callApi(contract.mail.reminderRules),
  });
}

export function useSaveReminderRule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id?: string; input: ReminderRuleInput }) =>
      id
        ? callApi(contract.mail.updateReminderRule, { params: { ruleId: id }, body: input })
        : callApi(contract.mail.createReminderRule, { body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.reminders.rules() }),
  });
}

export function useDeleteReminderRule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => callApi(contract.mail.deleteReminderRule, { params: { ruleId: id } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.reminders.rules() }),
  });
}

/** An admin approves a rule's outside addresses (until then they are not mailed). */
export function useApproveReminderEmails() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, emails }: { id: string; emails: string[] }) =>
      callApi(contract.mail.approveReminderEmails, { params: { ruleId: id }, body: { emails } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.reminders.rules() }),
  });
}

/** Sends one rule's reminder now, or every enabled rule's when no id is given. */
export function useSendNow() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (ruleId?: string) => callApi(contract.mail.sendRemindersNow, { body: ruleId ? { ruleId } : {} }),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: queryKeys.reminders.all() });
      void qc.invalidateQueries({ queryKey: queryKeys.outbox() });
    },
  });
}

export function useDeliveries() {
  return useQuery({
    queryKey: queryKeys.reminders.deliveries(),
    queryFn: async () => (await callApi(contract.mail.deliveries)).deliveries,
  });
}

export function useOutbox() {
  return useQuery({ queryKey: queryKeys.outbox(), queryFn: () => callApi(contract.mail.outbox) });
}

export function useInvitations() {
  return useQuery({
    queryKey: queryKeys.invitations(),
    queryFn: async () => (await callApi(contract.mail.invitations)).invitations,
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
  return useInvitationMutation((input: CreateInvitation) => callApi(contract.mail.invite, { body: input }));
}

export function useResendInvitation() {
  return useInvitationMutation((id: string) =>
    callApi(contract.mail.resendInvitation, { params: { invitationId: id } }),
  );
}

export function useRevokeInvitation() {
  return useInvitationMutation((id: string) =>
    callApi(contract.mail.revokeInvitation, { params: { invitationId: id } }),
  );
}
