import { z } from 'zod';
import { endpoint } from './endpoint';

export const oneLineQuerySchema = z.object({
  scenario: z
    .string()
    .min(1)
    .max(120)
    .optional()
    .describe('Operating scenario whose out-of-service elements are drawn dashed (default: the model as written)'),
});

/** The one-line diagram of a study revision, drawn from its model (shared/oneLine). */
export const oneLineApi = {
  svg: endpoint({
    method: 'get',
    path: '/studies/:studyId/one-line.svg',
    summary:
      'The one-line diagram of the revision’s model as a standalone SVG: every element with its id, and at each labelled bus the incident energy, signal word and governing scenario of the study’s results (the approved run, else the latest finished run); buses with model problems marked.',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    query: oneLineQuerySchema,
    produces: 'image/svg+xml',
  }),
};
