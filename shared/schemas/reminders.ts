import { z } from 'zod';
import { attentionListSchema } from './attention';
import { roleSchema } from './common';

/** A reminder rule: who is told, about which lists. Rules run daily at the organization's reminder hour. */
export const reminderRuleInputSchema = z
  .object({
    name: z.string().trim().min(1, 'Name the rule').max(120),
    enabled: z.boolean().default(true),
    lists: z.array(attentionListSchema).min(1, 'Pick at least one list').max(10),
    roles: z.array(roleSchema).max(4).default([]).describe('Every active user with one of these roles'),
    emails: z
      .array(
        z
          .string()
          .trim()
          .toLowerCase()
          .pipe(z.email({ message: 'Enter a valid e-mail address' })),
      )
      .max(20)
      .default([])
      .describe('Further addresses'),
    onlyWhenSomething: z.boolean().default(true).describe('Skip the day when every chosen list is empty'),
  })
  .refine((r) => r.roles.length + r.emails.length > 0, { message: 'Choose a role or add an address', path: ['roles'] })
  .meta({ id: 'ReminderRuleInput' });
export type ReminderRuleInput = z.input<typeof reminderRuleInputSchema>;

export const reminderRuleSchema = z
  .object({
    id: z.string(),
    name: z.string(),
    enabled: z.boolean(),
    lists: z.array(attentionListSchema),
    roles: z.array(roleSchema),
    emails: z.array(z.string()),
    emailStates: z
      .array(z.object({ email: z.string(), state: z.enum(['member', 'approved', 'pending']) }))
      .describe(
        "Each further address: a user of the organization, an outside address an admin approved, or one awaiting an admin's approval (not mailed)",
      ),
    onlyWhenSomething: z.boolean(),
    lastSentAt: z.string().nullable(),
    updatedAt: z.string(),
  })
  .meta({ id: 'ReminderRule' });
export type ReminderRule = z.infer<typeof reminderRuleSchema>;

export type ReminderEmailState = ReminderRule['emailStates'][number]['state'];

export const approveEmailsSchema = z.object({
  emails: z
    .array(
      z
        .string()
        .trim()
        .toLowerCase()
        .pipe(z.email({ message: 'Enter a valid e-mail address' })),
    )
    .min(1, 'Name at least one address')
    .max(20),
});

export const reminderRuleListSchema = z.object({ rules: z.array(reminderRuleSchema), reminderHourUtc: z.number() });

export const reminderDeliverySchema = z
  .object({
    id: z.string(),
    ruleId: z.string(),
    ruleName: z.string(),
    trigger: z.enum(['daily', 'manual']),
    status: z.enum(['sending', 'sent', 'skipped', 'failed']),
    recipients: z.array(z.string()),
    itemCount: z.number(),
    message: z.string(),
    createdAt: z.string(),
  })
  .meta({ id: 'ReminderDelivery' });
export type ReminderDelivery = z.infer<typeof reminderDeliverySchema>;

export const sendNowSchema = z.object({
  ruleId: z.string().max(64).optional().describe('One rule; all enabled rules when absent'),
});
export const sendNowResponseSchema = z.object({ deliveries: z.array(reminderDeliverySchema) });
export const deliveryListSchema = z.object({ deliveries: z.array(reminderDeliverySchema) });

/** A message captured by the local mail sink (development and tests) or recorded as sent. */
export const outboxMessageSchema = z
  .object({
    id: z.string(),
    receivedAt: z.string(),
    from: z.string(),
    to: z.array(z.string()),
    subject: z.string(),
    text: z.string(),
    kind: z.string().describe('reminder, invitation, password-reset, …'),
  })
  .meta({ id: 'OutboxMessage' });
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;

export const outboxSchema = z
  .object({
    transport: z.enum(['local-sink', 'smtp']).describe('local-sink: mail is captured here and not delivered'),
    messages: z.array(outboxMessageSchema),
  })
  .meta({ id: 'Outbox' });
export type Outbox = z.infer<typeof outboxSchema>;
