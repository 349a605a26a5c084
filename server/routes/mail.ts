import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { createInvitation, listInvitations, resendInvitation, revokeInvitation } from '../services/invitations';
import {
  approveRuleEmails,
  createRule,
  deleteRule,
  listDeliveries,
  listOutbox,
  listRules,
  sendNow,
  updateRule,
} from '../services/reminders';

/** Reminder rules, send-now, deliveries, the outbox, and invitations. */
export const mailRoutes: AnyRoute[] = [
  bind(contract.mail.reminderRules, {
    handler: ({ user }) => listRules(user),
  }),
  bind(contract.mail.createReminderRule, {
    handler: ({ ctx, user, body }) => createRule(ctx, user, body),
  }),
  bind(contract.mail.updateReminderRule, {
    handler: ({ ctx, user, body, params }) => updateRule(ctx, user, params.ruleId, body),
  }),
  bind(contract.mail.approveReminderEmails, {
    handler: ({ ctx, user, body, params }) => approveRuleEmails(ctx, user, params.ruleId, body.emails),
  }),
  bind(contract.mail.deleteReminderRule, {
    handler: async ({ ctx, user, params }) => {
      await deleteRule(ctx, user, params.ruleId);
      return { ok: true as const };
    },
  }),
  bind(contract.mail.sendRemindersNow, {
    handler: async ({ ctx, user, body }) => ({ deliveries: await sendNow(ctx, user, body.ruleId) }),
  }),
  bind(contract.mail.deliveries, {
    handler: async ({ user }) => ({ deliveries: await listDeliveries(user) }),
  }),
  bind(contract.mail.outbox, {
    handler: async ({ ctx, user }) => ({ transport: ctx.mail.transport, messages: await listOutbox(user) }),
  }),
  bind(contract.mail.invitations, {
    handler: async ({ ctx, user }) => ({ invitations: await listInvitations(ctx, user) }),
  }),
  bind(contract.mail.invite, {
    handler: ({ ctx, user, body }) => createInvitation(ctx, user, body),
  }),
  bind(contract.mail.resendInvitation, {
    handler: ({ ctx, user, params }) => resendInvitation(ctx, user, params.invitationId),
  }),
  bind(contract.mail.revokeInvitation, {
    handler: ({ ctx, user, params }) => revokeInvitation(ctx, user, params.invitationId),
  }),
];
