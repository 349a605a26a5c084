import { Label } from '../db/models';
import { ApiError } from '../services/errors';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { batchFile, createBatch, getBatch, renderLabelPdf } from '../services/labelBatches';
import { admitLabelBatch } from '../services/labelBatchLimits';
import { CAUTIONS } from '../../shared/cautions';
import { renderStudyReport } from '../pdf/studyReport';
import { compareRevisions, defaultBaselineId } from '../services/compare';
import { getOrganization } from '../services/organization';
import { mitigationAppendix } from '../services/mitigationReport';
import { getResults } from '../services/runs';
import { findSite } from '../services/sites';
import { findStudy, getStudyDto } from '../services/studies';

export const labelBatchRoutes: AnyRoute[] = [
  bind(contract.labelBatches.create, {
    handler: ({ ctx, user, body }) => admitLabelBatch(ctx, user, body, createBatch),
  }),
  bind(contract.labelBatches.get, {
    handler: ({ user, params }) => getBatch(user, params.batchId),
  }),
  bind(contract.labelBatches.file, {
    handler: async ({ ctx, user, params, res }) => {
      const pdf = await batchFile(ctx, user, params.batchId);
      res.setHeader('Content-Type', 'application/pdf');
      res.setHeader('Content-Disposition', 'attachment; filename="labels.pdf"');
      res.send(pdf);
    },
  }),
  bind(contract.labelBatches.studyLabelsPdf, {
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

export const studyReportRoute = bind(contract.labelBatches.studyReportPdf, {
  handler: async ({ ctx, user, params, query, res }) => {
    const [study, results, org, site] = await Promise.all([
      getStudyDto(ctx, user, params.studyId),
      getResults(user, params.studyId),
      getOrganization(user),
      findStudy(user, params.studyId).then((s) => findSite(user, s.siteId)),
    ]);
    const baseline = await defaultBaselineId(user, params.studyId);
    const comparison = baseline ? await compareRevisions(user, params.studyId, baseline) : undefined;
    const above = query.mitigationAboveCalPerCm2;
    const mitigation =
      above === undefined ? undefined : await mitigationAppendix(user, params.studyId, results.results, above);
    const pdf = await renderStudyReport({
      organizationName: org.name,
      site: { name: site.name, address: site.address },
      study,
      results: results.results,
      model: results.model,
      cautions: CAUTIONS,
      comparison,
      mitigation,
    });
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="study-report-rev${study.revision}.pdf"`);
    res.send(Buffer.from(pdf));
  },
});
