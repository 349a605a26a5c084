import { Op } from 'sequelize';
import type { CreateLabelBatch } from '../../shared/schemas/labelBatches';
import { LabelBatch } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';

/**
 * Limits of print batches, so one request cannot hold the server: a label asked for twice is made once, a batch holds
 * at most `maxLabels` different labels (422 above, naming labelIds), and one user has at most `maxActivePerUser`
 * batches queued or running (429 above).
 */
export const LABEL_BATCH_LIMITS = { maxLabels: 1000, maxActivePerUser: 2 } as const;

/** Admission is decided one request at a time per user, so two simultaneous requests cannot both take the last place. */
const admitting = new Map<string, Promise<unknown>>();

async function oneAtATime<T>(key: string, fn: () => Promise<T>): Promise<T> {
  const previous = admitting.get(key) ?? Promise.resolve();
  const mine = previous.catch(() => undefined).then(fn);
  admitting.set(key, mine);
  try {
    return await mine;
  } finally {
    if (admitting.get(key) === mine) admitting.delete(key);
  }
}

/** Applies the limits, then creates the batch with duplicate ids dropped (first occurrence order kept). */
export async function admitLabelBatch<T>(
  ctx: AppContext,
  actor: AuthUser,
  input: CreateLabelBatch,
  create: (ctx: AppContext, actor: AuthUser, input: CreateLabelBatch) => Promise<T>,
): Promise<T> {
  const labelIds = Array.from(new Set(input.labelIds));
  if (labelIds.length > LABEL_BATCH_LIMITS.maxLabels) {
    const message = `A print batch holds at most ${LABEL_BATCH_LIMITS.maxLabels} different labels (this one has ${labelIds.length}); split it into smaller batches`;
    throw new ApiError('unprocessable', message, { labelIds: message });
  }
  return oneAtATime(actor.id, async () => {
    const active = await LabelBatch.count({
      where: {
        organizationId: actor.organizationId,
        requestedById: actor.id,
        status: { [Op.in]: ['queued', 'running'] },
      },
    });
    if (active >= LABEL_BATCH_LIMITS.maxActivePerUser) {
      throw new ApiError(
        'rate_limited',
        `You already have ${active} print batches being made (at most ${LABEL_BATCH_LIMITS.maxActivePerUser} at once); wait for one to finish`,
      );
    }
    return create(ctx, actor, { ...input, labelIds });
  });
}
