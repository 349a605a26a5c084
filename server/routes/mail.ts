import { z } from 'zod';
import { createInvitationSchema, invitationListSchema, invitationSchema } from '../../shared/schemas/invitations';
import {
  approveEmailsSchema,
  deliveryListSchema,
  outboxSchema,
  reminderRuleInputSchema,
  reminderRuleListSchema,
  reminderRuleSchema,
  sendNowResponseSchema,
  sendNowSchema,
} from '../../shared/schemas/reminders';
import { defineRoute, type AnyRoute } from '../http/route';
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

const REMINDER_ROLES = ['admin', 'safety'] as const;

/** Reminder rules, send-now, deliveries, the outbox, and invitations. */
export const mailRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/reminder-rules',
    summary: 'Reminder rules of the organization and the hour (UTC) at which they go out daily.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    response: reminderRuleListSchema,
    handler: ({ user }) => listRules(user),
  }),
  defineRoute({
    method: 'post',
    path: '/reminder-rules',
    summary: 'Create a reminder rule: which lists, to which roles and addresses.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    body: reminderRuleInputSchema,
    response: reminderRuleSchema,
    status: 201,
    handler: ({ ctx, user, body }) => createRule(ctx, user, body),
  }),
  defineRoute({
    method: 'put',
    path: '/reminder-rules/:ruleId',
    summary: 'Change a reminder rule.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    body: reminderRuleInputSchema,
    response: reminderRuleSchema,
    handler: ({ ctx, user, body, params }) => updateRule(ctx, user, params.ruleId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/reminder-rules/:ruleId/approve-emails',
    summary:
      "Approve outside addresses of a rule (admin): until then they are listed as pending and not mailed. A safety officer's new addresses wait for this.",
    tag: 'reminders',
    access: ['admin'],
    body: approveEmailsSchema,
    response: reminderRuleSchema,
    handler: ({ ctx, user, body, params }) => approveRuleEmails(ctx, user, params.ruleId, body.emails),
  }),
  defineRoute({
    method: 'delete',
    path: '/reminder-rules/:ruleId',
    summary: 'Delete a reminder rule (its past deliveries stay listed).',
    tag: 'reminders',
    access: REMINDER_ROLES,
    response: z.object({ ok: z.literal(true) }),
    handler: async ({ ctx, user, params }) => {
      await deleteRule(ctx, user, params.ruleId);
      return { ok: true as const };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/reminders/send-now',
    summary: 'Send one rule (or every enabled rule) now, whatever the hour.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    body: sendNowSchema,
    response: sendNowResponseSchema,
    handler: async ({ ctx, user, body }) => ({ deliveries: await sendNow(ctx, user, body.ruleId) }),
  }),
  defineRoute({
    method: 'get',
    path: '/reminders/deliveries',
    summary: 'The latest 100 reminder deliveries: sent, skipped or failed, and why.',
    tag: 'reminders',
    access: REMINDER_ROLES,
    response: deliveryListSchema,
    handler: async ({ user }) => ({ deliveries: await listDeliveries(user) }),
  }),
  defineRoute({
    method: 'get',
    path: '/outbox',
    summary: 'Mail captured by the local mail sink for this organization, newest first (up to 200); empty with SMTP.',
    tag: 'mail',
    access: ['admin'],
    response: outboxSchema,
    handler: async ({ ctx, user }) => ({ transport: ctx.mail.transport, messages: await listOutbox(user) }),
  }),
  defineRoute({
    method: 'get',
    path: '/invitations',
    summary: 'Invitations of the organization, newest first.',
    tag: 'team',
    access: ['admin'],
    response: invitationListSchema,
    handler: async ({ ctx, user }) => ({ invitations: await listInvitations(ctx, user) }),
  }),
  defineRoute({
    method: 'post',
    path: '/invitations',
    summary: 'Invite someone by e-mail with a role: a one-time link to /welcome/<token>, valid 7 days.',
    tag: 'team',
    access: ['admin'],
    body: createInvitationSchema,
    response: invitationSchema,
    status: 201,
    handler: ({ ctx, user, body }) => createInvitation(ctx, user, body),
  }),
  defineRoute({
    method: 'post',
    path: '/invitations/:invitationId/resend',
    summary: 'Send a pending or expired invitation again with a new link (7 days); the old link stops working.',
    tag: 'team',
    access: ['admin'],
    response: invitationSchema,
    handler: ({ ctx, user, params }) => resendInvitation(ctx, user, params.invitationId),
  }),
  defineRoute({
    method: 'delete',
    path: '/invitations/:invitationId',
    summary: 'Revoke an invitation: its link stops working.',
    tag: 'team',
    access: ['admin'],
    response: invitationSchema,
    handler: ({ ctx, user, params }) => revokeInvitation(ctx, user, params.invitationId),
  }),
];
