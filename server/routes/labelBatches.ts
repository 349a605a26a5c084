import { z } from 'zod';
import { createLabelBatchSchema, labelBatchSchema } from '../../shared/schemas/labelBatches';
import { labelSizeSchema } from '../../shared/schemas/labels';
import { Label } from '../db/models';
import { ApiError } from '../http/errors';
import { defineRoute, type AnyRoute } from '../http/route';
import { batchFile, createBatch, getBatch, renderLabelPdf } from '../services/labelBatches';
import { admitLabelBatch } from '../services/labelBatchLimits';
import { CAUTIONS } from '../../shared/cautions';
import type { Model } from '../../shared/schemas/model';
import { renderStudyReport } from '../pdf/studyReport';
import { getOrganization } from '../services/organization';
import { getResults } from '../services/runs';
import { findSite } from '../services/sites';
import { findStudy, getStudyDto } from '../services/studies';

const PRINTERS = ['electrician', 'engineer', 'admin'] as const;

export const labelBatchRoutes: AnyRoute[] = [
  defineRoute({
    method: 'post',
    path: '/label-batches',
    summary:
      'Make one PDF of chosen labels (4×6 in, 4×4 in, or letter/A4 sheets) as a background job; poll for progress.',
    tag: 'labels',
    access: PRINTERS,
    body: createLabelBatchSchema,
    response: labelBatchSchema,
    status: 202,
    handler: ({ ctx, user, body }) => admitLabelBatch(ctx, user, body, createBatch),
  }),
  defineRoute({
    method: 'get',
    path: '/label-batches/:batchId',
    summary: 'Progress of a print batch.',
    tag: 'labels',
    access: PRINTERS,
    response: labelBatchSchema,
    handler: ({ user, params }) => getBatch(user, params.batchId),
  }),
  defineRoute({
    method: 'get',
    path: '/label-batches/:batchId/file',
    summary: 'The PDF of a finished print batch; downloading it (electrician, engineer) marks its labels printed.',
    tag: 'labels',
    access: PRINTERS,
    produces: 'application/pdf',
    handler: async ({ ctx, user, params, res }) => {
      const pdf = await batchFile(ctx, user, params.batchId);
      res.setHeader('Content-Type', 'application/pdf');
      res.setHeader('Content-Disposition', 'attachment; filename="labels.pdf"');
      res.send(pdf);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/studies/:studyId/labels.pdf',
    summary:
      'All labels issued by an approved revision as one PDF (size=4x6|4x4|letter|a4), for review: it does not mark them printed.',
    tag: 'labels',
    access: PRINTERS,
    query: z.object({ size: labelSizeSchema.default('4x6') }),
    produces: 'application/pdf',
    handler: async ({ ctx, user, params, query, res }) => {
      const study = await findStudy(user, params.studyId);
      const labels = await Label.findAll({
        where: { studyId: study.id, organizationId: user.organizationId },
        order: [['equipmentTag', 'ASC']],
      });
      if (!labels.length)
        throw ApiError.conflict('This revision has no labels: only an approved revision issues labels');
      const pdf = await renderLabelPdf(ctx, labels, query.size);
      res.setHeader('Content-Type', 'application/pdf');
      res.setHeader('Content-Disposition', `attachment; filename="labels-rev${study.revision}-${query.size}.pdf"`);
      res.send(Buffer.from(pdf));
    },
  }),
];

export const studyReportRoute = defineRoute({
  method: 'get',
  path: '/studies/:studyId/report.pdf',
  summary:
    'The study report: scope, method and assumptions, inputs, results, each bus’s clearing trace, warnings, cautions, approval.',
  tag: 'studies',
  access: ['engineer', 'safety', 'admin'],
  produces: 'application/pdf',
  handler: async ({ ctx, user, params, res }) => {
    const [study, results, org, site] = await Promise.all([
      getStudyDto(ctx, user, params.studyId),
      getResults(user, params.studyId),
      getOrganization(user),
      findStudy(user, params.studyId).then((s) => findSite(user, s.siteId)),
    ]);
    const pdf = await renderStudyReport({
      organizationName: org.name,
      site: { name: site.name, address: site.address },
      study,
      results: results.results,
      model: results.model as unknown as Model,
      cautions: CAUTIONS,
    });
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="study-report-rev${study.revision}.pdf"`);
    res.send(Buffer.from(pdf));
  },
});
