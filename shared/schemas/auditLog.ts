import { z } from 'zod';

export const auditEventSchema = z
  .object({
    id: z.string(),
    at: z.string(),
    actor: z.object({ id: z.string(), name: z.string(), email: z.string() }).nullable(),
    action: z.string(),
    entityType: z.string(),
    entityId: z.string().nullable(),
    summary: z.record(z.string(), z.unknown()),
    /** One line for people: what happened, with the before/after where there is one. */
    description: z.string(),
  })
  .meta({ id: 'AuditEvent' });
export type AuditEventDto = z.infer<typeof auditEventSchema>;

const isoDate = z.iso.datetime({ offset: true }).or(z.iso.date());

export const auditQuerySchema = z.object({
  q: z.string().trim().max(200).optional().describe('Text found in the action, entity, actor or summary'),
  action: z
    .string()
    .trim()
    .max(80)
    .optional()
    .describe('Actions or action prefixes, comma-separated, e.g. "study." or "label.,labels." or "label.installed"'),
  entityType: z.string().trim().max(40).optional(),
  entityId: z.string().trim().max(64).optional(),
  actorId: z.string().trim().max(64).optional(),
  from: isoDate.optional().describe('From this time (inclusive)'),
  to: isoDate.optional().describe('Until this time (exclusive; a date means the end of that day)'),
  before: z.string().max(120).optional().describe('Cursor from the previous page'),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditPageSchema = z
  .object({ events: z.array(auditEventSchema), nextBefore: z.string().nullable() })
  .meta({ id: 'AuditPage' });
export type AuditPage = z.infer<typeof auditPageSchema>;
