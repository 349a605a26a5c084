import { z } from 'zod';
import { createLabelBatchSchema, labelBatchSchema } from '../schemas/labelBatches';
import { labelSizeSchema } from '../schemas/labels';
import { endpoint } from './endpoint';

/** Query of the study report. */
export const studyReportQuerySchema = z.object({
  mitigationAboveCalPerCm2: z.coerce
    .number()
    .positive('The appendix energy must be above zero')
    .max(200, 'The appendix energy is at most 200 cal/cm²')
    .optional()
    .describe(
      'Adds the mitigation appendix: the buses above this incident energy, cal/cm², each with its best options toward it (engineers only)',
    ),
});

/** Roles of the routes below that share one access rule. */
const PRINTERS = ['electrician', 'engineer', 'admin'] as const;

/** Label print batches and the PDFs of an approved revision (labels, study report). */
export const labelBatchesApi = {
  create: endpoint({
    method: 'post',
    path: '/label-batches',
    summary:
      'Make one PDF of chosen labels (4×6 in, 4×4 in, or letter/A4 sheets) as a background job; poll for progress.',
    tag: 'labels',
    access: PRINTERS,
    body: createLabelBatchSchema,
    response: labelBatchSchema,
    status: 202,
  }),
  get: endpoint({
    method: 'get',
    path: '/label-batches/:batchId',
    summary: 'Progress of a print batch.',
    tag: 'labels',
    access: PRINTERS,
    response: labelBatchSchema,
  }),
  file: endpoint({
    method: 'get',
    path: '/label-batches/:batchId/file',
    summary: 'The PDF of a finished print batch; downloading it (electrician, engineer) marks its labels printed.',
    tag: 'labels',
    access: PRINTERS,
    produces: 'application/pdf',
  }),
  studyLabelsPdf: endpoint({
    method: 'get',
    path: '/studies/:studyId/labels.pdf',
    summary:
      'All labels issued by an approved revision as one PDF (size=4x6|4x4|letter|a4), for review: it does not mark them printed.',
    tag: 'labels',
    access: PRINTERS,
    query: z.object({ size: labelSizeSchema.default('4x6') }),
    produces: 'application/pdf',
  }),
  studyReportPdf: endpoint({
    method: 'get',
    path: '/studies/:studyId/report.pdf',
    summary:
      'The study report: scope, method and assumptions, inputs, results, each bus’s clearing trace, warnings, cautions, ' +
      'approval; with `mitigationAboveCalPerCm2` (engineers), an appendix of mitigation options for every bus above ' +
      'that energy, toward it as the target.',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    query: studyReportQuerySchema,
    produces: 'application/pdf',
  }),
};
