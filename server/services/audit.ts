import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { AuditEvent } from '../db/models';

export interface AuditInput {
  organizationId: string;
  actorId: string | null;
  action: string;
  entityType: string;
  entityId?: string | null;
  summary?: Record<string, unknown>;
}

/** Appends one audit event (append-only: nothing updates or deletes them). */
export async function recordAudit(input: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditEvent.create(
    {
      id: randomUUID(),
      organizationId: input.organizationId,
      actorId: input.actorId,
      action: input.action,
      entityType: input.entityType,
      entityId: input.entityId ?? null,
      summary: JSON.stringify(input.summary ?? {}),
    },
    { transaction },
  );
}
