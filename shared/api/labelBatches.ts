import { z } from 'zod';
import { createLabelBatchSchema, labelBatchSchema } from '../schemas/labelBatches';
import { labelSizeSchema } from '../schemas/labels';
import { endpoint } from './endpoint';

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
      'The study report: scope, method and assumptions, inputs, results, each bus’s clearing trace, warnings, cautions, approval.',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    produces: 'application/pdf',
  }),
};
