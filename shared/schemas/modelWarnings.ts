import { z } from 'zod';

/**
 * A plausibility warning on a model (shared/modelPlausibility.ts): a value the schema accepts but that is rarely
 * right. It never blocks a save, an import or a run. Same shape as a model issue, naming the element and the field.
 */
export const modelWarningSchema = z
  .object({
    code: z.literal('implausible'),
    path: z.string().describe('Where, e.g. "transformers[0].impedancePct"'),
    elementId: z.string().optional(),
    field: z.string().optional(),
    message: z.string(),
  })
  .meta({ id: 'ModelWarning' });
export type ModelWarning = z.infer<typeof modelWarningSchema>;
