import { attentionListSchema, type AttentionList } from '../../shared/schemas/attention';
import { toCsv, sendCsv } from '../http/csv';
import { ApiError } from '../services/errors';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { attentionList, attentionSummary } from '../services/attention';
import { exportAudit, searchAudit } from '../services/auditLog';
import { fieldReportPhoto, getFieldReport, listFieldReports, triageFieldReport } from '../services/fieldReports';

/** Who reads the dashboard and the audit log: everyone but electricians (docs/ARCHITECTURE.md, Roles). */

function listParam(raw: string): AttentionList {
  const parsed = attentionListSchema.safeParse(raw);
  if (!parsed.success) throw ApiError.notFound(`No such list: ${raw}`);
  return parsed.data;
}

const day = (iso: string) => iso.slice(0, 10);

/** The safety dashboard, field-report triage and the audit log. */
export const attentionRoutes: AnyRoute[] = [
  bind(contract.attention.summary, {
    handler: ({ ctx, user, query }) => attentionSummary(ctx, user.organizationId, query.siteId),
  }),
  bind(contract.attention.list, {
    handler: ({ ctx, user, query, params }) =>
      attentionList(ctx, user.organizationId, listParam(params.list), query.siteId),
  }),
  bind(contract.attention.exportList, {
    handler: async ({ ctx, user, query, params, res }) => {
      const list = await attentionList(ctx, user.organizationId, listParam(params.list), query.siteId);
      const csv = toCsv(
        ['Site', ...list.columns.map((c) => c.label)],
        list.rows.map((r) => [r.siteName, ...list.columns.map((c) => r.cells[c.key])]),
      );
      sendCsv(res, `${list.list}-${day(list.asOf)}.csv`, csv);
    },
  }),
  bind(contract.attention.fieldReports, {
    handler: async ({ ctx, user, query }) => ({ reports: await listFieldReports(ctx, user, query) }),
  }),
  bind(contract.attention.fieldReport, {
    handler: ({ ctx, user, params }) => getFieldReport(ctx, user, params.reportId),
  }),
  bind(contract.attention.fieldReportPhoto, {
    handler: async ({ ctx, user, params, res }) => {
      const photo = await fieldReportPhoto(ctx, user, params.reportId);
      res.setHeader('Content-Type', photo.contentType);
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.send(photo.body);
    },
  }),
  bind(contract.attention.triageFieldReport, {
    handler: ({ ctx, user, params, body }) => triageFieldReport(ctx, user, params.reportId, body),
  }),
  bind(contract.attention.auditEvents, {
    handler: ({ ctx, user, query }) => searchAudit(ctx, user, query),
  }),
  bind(contract.attention.exportAuditEvents, {
    handler: async ({ ctx, user, query, res }) => {
      const events = await exportAudit(ctx, user, query);
      const csv = toCsv(
        ['Time (UTC)', 'Actor', 'Actor e-mail', 'Action', 'Entity', 'Entity id', 'Description', 'Summary (JSON)'],
        events.map((e) => [
          e.at,
          e.actor?.name ?? 'system',
          e.actor?.email ?? '',
          e.action,
          e.entityType,
          e.entityId,
          e.description,
          JSON.stringify(e.summary),
        ]),
      );
      sendCsv(res, `audit-log-${day(ctx.now().toISOString())}.csv`, csv);
    },
  }),
];
