import { z } from 'zod';
import { labelCheckSchema, labelSchema } from '../schemas/labels';
import { REPORT_KINDS } from '../schemas/fieldReports';
import { endpoint } from './endpoint';

const labelList = z.object({ labels: z.array(labelSchema) });

/** A field report on a label (multipart text fields beside the optional photo). */
const reportSchema = z.object({
  kind: z.enum(REPORT_KINDS, { error: 'Choose what does not match' }),
  text: z.string().trim().min(3, 'Say what does not match').max(4000),
});

/** Labels: the public check of a printed label, label lists, and field actions on a label. */
export const labelsApi = {
  check: endpoint({
    method: 'get',
    path: '/labels/:code',
    summary:
      'Public check of a printed label (no sign-in): what it says and whether it is current, superseded (with the current values) or past review.',
    tag: 'labels',
    access: 'public',
    response: labelCheckSchema,
  }),
  qr: endpoint({
    method: 'get',
    path: '/labels/:code/qr.png',
    summary: 'The QR code printed on a label (PNG): it holds the public check address.',
    tag: 'labels',
    access: 'public',
    produces: 'image/png',
  }),
  detail: endpoint({
    method: 'get',
    path: '/labels/:code/detail',
    summary: 'A label of the organization with its print and install status (signed-in).',
    tag: 'labels',
    access: 'signed-in',
    response: labelSchema,
  }),
  siteLabels: endpoint({
    method: 'get',
    path: '/sites/:siteId/labels',
    summary: 'Labels issued for a site (current=1: only those not superseded).',
    tag: 'labels',
    access: 'signed-in',
    query: z.object({ current: z.enum(['0', '1']).optional() }),
    response: labelList,
  }),
  studyLabels: endpoint({
    method: 'get',
    path: '/studies/:studyId/labels',
    summary: 'Labels issued by one approved revision.',
    tag: 'labels',
    access: 'signed-in',
    response: labelList,
  }),
  markInstalled: endpoint({
    method: 'post',
    path: '/labels/:code/installed',
    summary:
      'Mark a label installed, with a photo of it in place (multipart field "photo": JPEG or PNG, at most 10 MB; stored re-encoded, without metadata).',
    tag: 'labels',
    access: ['electrician', 'engineer'],
    response: labelSchema,
  }),
  report: endpoint({
    method: 'post',
    path: '/labels/:code/reports',
    summary: 'Report what does not match a label (multipart: kind, text, optional photo).',
    tag: 'labels',
    access: ['electrician', 'engineer', 'safety'],
    body: reportSchema,
    response: z.object({ id: z.string(), status: z.string() }),
    status: 201,
  }),
};
