import { z } from 'zod';
import { createInvitationSchema, invitationListSchema, invitationSchema } from '../schemas/invitations';
import {
  approveEmailsSchema,
  deliveryListSchema,
  outboxSchema,
  reminderRuleInputSchema,
  reminderRuleListSchema,
  reminderRuleSchema,
  sendNowResponseSchema,
  sendNowSchema,
} from '../schemas/reminders';
import { endpoint } from './endpoint';

/** Roles of the routes below that share one access rule. */
const REMINDER_ROLES = ['admin', 'safety'] as const;

/** Reminder rules, reminders, the outbox and invitations. */
export const mailApi = {
  reminderRules: endpoint({
    method: 'get',
    path: '/reminder-rules',
    summary: 'Reminder rules of the organization and the hour (UTC) at which they go out daily.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    response: reminderRuleListSchema,
  }),
  createReminderRule: endpoint({
    method: 'post',
    path: '/reminder-rules',
    summary: 'Create a reminder rule: which lists, to which roles and addresses.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    body: reminderRuleInputSchema,
    response: reminderRuleSchema,
    status: 201,
  }),
  updateReminderRule: endpoint({
    method: 'put',
    path: '/reminder-rules/:ruleId',
    summary: 'Change a reminder rule.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    body: reminderRuleInputSchema,
    response: reminderRuleSchema,
  }),
  approveReminderEmails: endpoint({
    method: 'post',
    path: '/reminder-rules/:ruleId/approve-emails',
    summary:
      "Approve outside addresses of a rule (admin): until then they are listed as pending and not mailed. A safety officer's new addresses wait for this.",
    tag: 'reminders',
    access: ['admin'],
    body: approveEmailsSchema,
    response: reminderRuleSchema,
  }),
  deleteReminderRule: endpoint({
    method: 'delete',
    path: '/reminder-rules/:ruleId',
    summary: 'Delete a reminder rule (its past deliveries stay listed).',
    tag: 'reminders',
    access: REMINDER_ROLES,
    response: z.object({ ok: z.literal(true) }),
  }),
  sendRemindersNow: endpoint({
    method: 'post',
    path: '/reminders/send-now',
    summary: 'Send one rule (or every enabled rule) now, whatever the hour.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    body: sendNowSchema,
    response: sendNowResponseSchema,
  }),
  deliveries: endpoint({
    method: 'get',
    path: '/reminders/deliveries',
    summary: 'The latest 100 reminder deliveries: sent, skipped or failed, and why.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    response: deliveryListSchema,
  }),
  outbox: endpoint({
    method: 'get',
    path: '/outbox',
    summary: 'Mail captured by the local mail sink for this organization, newest first (up to 200); empty with SMTP.',
    tag: 'mail',
    access: ['admin'],
    response: outboxSchema,
  }),
  invitations: endpoint({
    method: 'get',
    path: '/invitations',
    summary: 'Invitations of the organization, newest first.',
    tag: 'team',
    access: ['admin'],
    response: invitationListSchema,
  }),
  invite: endpoint({
    method: 'post',
    path: '/invitations',
    summary: 'Invite someone by e-mail with a role: a one-time link to /welcome/<token>, valid 7 days.',
    tag: 'team',
    access: ['admin'],
    body: createInvitationSchema,
    response: invitationSchema,
    status: 201,
  }),
  resendInvitation: endpoint({
    method: 'post',
    path: '/invitations/:invitationId/resend',
    summary: 'Send a pending or expired invitation again with a new link (7 days); the old link stops working.',
    tag: 'team',
    access: ['admin'],
    response: invitationSchema,
  }),
  revokeInvitation: endpoint({
    method: 'delete',
    path: '/invitations/:invitationId',
    summary: 'Revoke an invitation: its link stops working.',
    tag: 'team',
    access: ['admin'],
    response: invitationSchema,
  }),
};
