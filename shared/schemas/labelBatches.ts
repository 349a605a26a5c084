import { z } from 'zod';
import { labelSizeSchema } from './labels';

export const createLabelBatchSchema = z
  .object({
    labelIds: z
      .array(z.string().min(1).max(64))
      .min(1, 'Choose at least one label')
      .max(5000, 'At most 5000 labels at once'),
    size: labelSizeSchema,
  })
  .meta({ id: 'CreateLabelBatch' });
export type CreateLabelBatch = z.infer<typeof createLabelBatchSchema>;

export const labelBatchSchema = z
  .object({
    id: z.string(),
    size: labelSizeSchema,
    total: z.number(),
    status: z.enum(['queued', 'running', 'done', 'failed']),
    progress: z.number(),
    message: z.string(),
    createdAt: z.string(),
  })
  .meta({ id: 'LabelBatch' });
export type LabelBatchDto = z.infer<typeof labelBatchSchema>;
