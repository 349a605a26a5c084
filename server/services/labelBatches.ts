import { randomUUID } from 'node:crypto';
import type { CreateLabelBatch, LabelBatchDto } from '../../shared/schemas/labelBatches';
import type { LabelContent, LabelSize } from '../../shared/schemas/labels';
import { Label, LabelBatch } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { renderLabelsOffThread } from '../pdf/labelWorker';
import { makeFileKey } from '../storage';
import { recordAudit } from './audit';
import { yieldToLoop, type JobRef } from './jobs';

function toDto(b: LabelBatch): LabelBatchDto {
  return {
    id: b.id,
    size: b.size as LabelSize,
    total: (JSON.parse(b.labelIds) as string[]).length,
    status: b.status,
    progress: b.progress,
    message: b.message,
    createdAt: b.createdAt.toISOString(),
  };
}

export function checkUrl(ctx: AppContext, code: string): string {
  return `${ctx.config.publicBaseUrl.replace(/\/$/, '')}/l/${code}`;
}

/** The labels in the order asked, all of the actor's organization (any other id: 404, nothing printed). */
async function labelsOf(actor: AuthUser, ids: string[]): Promise<Label[]> {
  const rows = await Label.findAll({ where: { id: ids, organizationId: actor.organizationId } });
  const byId = new Map(rows.map((r) => [r.id, r]));
  const missing = ids.filter((id) => !byId.has(id));
  if (missing.length)
    throw new ApiError('not_found', `${missing.length} of the chosen labels were not found`, {
      labelIds: missing.slice(0, 5).join(', '),
    });
  return ids.map((id) => byId.get(id) as Label);
}

/**
 * One PDF of the given labels, now (the study's labels.pdf, print batches). Making or opening a PDF does not mark
 * anything printed: a label is printed when a print batch containing it is downloaded (`recordPrinted`).
 */
export async function renderLabelPdf(
  ctx: AppContext,
  labels: Label[],
  size: LabelSize,
  onProgress?: (done: number, total: number) => void,
): Promise<Uint8Array> {
  return renderLabelsOffThread(
    labels.map((l) => ({ content: JSON.parse(l.content) as LabelContent, checkUrl: checkUrl(ctx, l.code) })),
    size,
    { onProgress },
  );
}

/** Roles whose download of a print batch means the labels in it were printed. */
const PRINTING_ROLES = new Set(['electrician', 'engineer']);

/** Marks the labels of a downloaded print batch printed, with an audit event naming the batch. */
async function recordPrinted(ctx: AppContext, actor: AuthUser, batch: LabelBatch): Promise<void> {
  if (!PRINTING_ROLES.has(actor.role)) return;
  const ids = JSON.parse(batch.labelIds) as string[];
  await ctx.db.sequelize.transaction(async (transaction) => {
    const labels = await Label.findAll({
      where: { id: ids, organizationId: actor.organizationId },
      attributes: ['id', 'equipmentTag'],
      transaction,
    });
    await Label.update(
      { printedAt: ctx.now() },
      { where: { id: labels.map((l) => l.id), organizationId: actor.organizationId }, transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'labels.printed',
        entityType: 'label-batch',
        entityId: batch.id,
        summary: {
          batchId: batch.id,
          count: labels.length,
          size: batch.size,
          tags: labels.slice(0, 50).map((l) => l.equipmentTag),
        },
      },
      transaction,
    );
  });
}

/** A print batch: a background job that renders one PDF and stores it; the client polls its progress. */
export async function createBatch(ctx: AppContext, actor: AuthUser, input: CreateLabelBatch): Promise<LabelBatchDto> {
  const labels = await labelsOf(actor, input.labelIds);
  const batch = await LabelBatch.create({
    id: randomUUID(),
    organizationId: actor.organizationId,
    requestedById: actor.id,
    labelIds: JSON.stringify(input.labelIds),
    size: input.size,
    status: 'queued',
    message: `Waiting to make ${labels.length} label${labels.length === 1 ? '' : 's'}`,
  });
  const job: JobRef = { kind: 'label-batch', id: batch.id };
  ctx.jobs.start(async () => {
    try {
      ctx.jobs.throwIfStopping('label-batch');
      await batch.update({ status: 'running', message: 'Making the PDF', progress: 0.02 });
      let last = Date.now();
      const pdf = await renderLabelPdf(ctx, labels, input.size, (done, total) => {
        if (Date.now() - last > 300) {
          last = Date.now();
          void batch.update({ progress: 0.02 + 0.9 * (done / total), message: `Label ${done} of ${total}` });
        }
      });
      await yieldToLoop();
      const key = makeFileKey(actor.organizationId, 'pdf');
      await ctx.storage.put(key, Buffer.from(pdf), 'application/pdf');
      await batch.update({
        status: 'done',
        progress: 1,
        fileKey: key,
        message: `${labels.length} label${labels.length === 1 ? '' : 's'} ready`,
      });
    } catch (e) {
      await batch.update({
        status: 'failed',
        message: e instanceof Error ? e.message.slice(0, 390) : 'The PDF could not be made',
      });
    }
  }, job);
  return toDto(batch);
}

async function findBatch(actor: AuthUser, id: string): Promise<LabelBatch> {
  const b = await LabelBatch.findOne({ where: { id, organizationId: actor.organizationId } });
  if (!b) throw ApiError.notFound('No such print batch');
  return b;
}

export async function getBatch(actor: AuthUser, id: string): Promise<LabelBatchDto> {
  return toDto(await findBatch(actor, id));
}

export async function batchFile(ctx: AppContext, actor: AuthUser, id: string): Promise<Buffer> {
  const b = await findBatch(actor, id);
  if (b.status !== 'done' || !b.fileKey) throw ApiError.conflict('The PDF is not ready yet');
  const file = await ctx.storage.get(b.fileKey);
  if (!file) throw ApiError.notFound('The PDF is no longer stored; make it again');
  await recordPrinted(ctx, actor, b);
  return file.body;
}
