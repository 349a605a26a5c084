import {
  attentionListResponseSchema,
  attentionListSchema,
  attentionQuerySchema,
  attentionSummarySchema,
  type AttentionList,
} from '../../shared/schemas/attention';
import { auditPageSchema, auditQuerySchema } from '../../shared/schemas/auditLog';
import {
  fieldReportListSchema,
  fieldReportQuerySchema,
  fieldReportSchema,
  fieldReportTriageSchema,
} from '../../shared/schemas/fieldReports';
import { toCsv, sendCsv } from '../http/csv';
import { ApiError } from '../http/errors';
import { defineRoute, type AnyRoute } from '../http/route';
import { attentionList, attentionSummary } from '../services/attention';
import { exportAudit, searchAudit } from '../services/auditLog';
import { fieldReportPhoto, getFieldReport, listFieldReports, triageFieldReport } from '../services/fieldReports';

/** Who reads the dashboard and the audit log: everyone but electricians (docs/ARCHITECTURE.md, Roles). */
const AUDITORS = ['admin', 'engineer', 'safety'] as const;

function listParam(raw: string): AttentionList {
  const parsed = attentionListSchema.safeParse(raw);
  if (!parsed.success) throw ApiError.notFound(`No such list: ${raw}`);
  return parsed.data;
}

const day = (iso: string) => iso.slice(0, 10);

/** The safety dashboard, field-report triage and the audit log. */
export const attentionRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/attention',
    summary:
      'What needs attention: counts of each list (review due and overdue, stale studies, labels, field reports), per site.',
    tag: 'attention',
    access: AUDITORS,
    query: attentionQuerySchema,
    response: attentionSummarySchema,
    handler: ({ ctx, user, query }) => attentionSummary(ctx, user.organizationId, query.siteId),
  }),
  defineRoute({
    method: 'get',
    path: '/attention/:list',
    summary: 'One list of things needing attention, with its columns and rows.',
    tag: 'attention',
    access: AUDITORS,
    query: attentionQuerySchema,
    response: attentionListResponseSchema,
    handler: ({ ctx, user, query, params }) =>
      attentionList(ctx, user.organizationId, listParam(params.list), query.siteId),
  }),
  defineRoute({
    method: 'get',
    path: '/attention/:list/export.csv',
    summary: 'One list as CSV: the site, then the list’s columns.',
    tag: 'attention',
    access: AUDITORS,
    query: attentionQuerySchema,
    produces: 'text/csv',
    handler: async ({ ctx, user, query, params, res }) => {
      const list = await attentionList(ctx, user.organizationId, listParam(params.list), query.siteId);
      const csv = toCsv(
        ['Site', ...list.columns.map((c) => c.label)],
        list.rows.map((r) => [r.siteName, ...list.columns.map((c) => r.cells[c.key])]),
      );
      sendCsv(res, `${list.list}-${day(list.asOf)}.csv`, csv);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/field-reports',
    summary: 'Field reports, newest first (electricians see only their own).',
    tag: 'field reports',
    access: 'signed-in',
    query: fieldReportQuerySchema,
    response: fieldReportListSchema,
    handler: async ({ ctx, user, query }) => ({ reports: await listFieldReports(ctx, user, query) }),
  }),
  defineRoute({
    method: 'get',
    path: '/field-reports/:reportId',
    summary: 'One field report, with who acknowledged and resolved it and when.',
    tag: 'field reports',
    access: 'signed-in',
    response: fieldReportSchema,
    handler: ({ ctx, user, params }) => getFieldReport(ctx, user, params.reportId),
  }),
  defineRoute({
    method: 'get',
    path: '/field-reports/:reportId/photo',
    summary: 'The photo sent with a field report.',
    tag: 'field reports',
    access: 'signed-in',
    produces: 'image/*',
    handler: async ({ ctx, user, params, res }) => {
      const photo = await fieldReportPhoto(ctx, user, params.reportId);
      res.setHeader('Content-Type', photo.contentType);
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.send(photo.body);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/field-reports/:reportId/triage',
    summary: 'Acknowledge a field report, or resolve it with a note of what was done (open → acknowledged → resolved).',
    tag: 'field reports',
    access: ['engineer', 'safety'],
    body: fieldReportTriageSchema,
    response: fieldReportSchema,
    handler: ({ ctx, user, params, body }) => triageFieldReport(ctx, user, params.reportId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/audit-events',
    summary:
      'Search the audit log (append-only: no route changes or deletes an event), newest first, a page at a time.',
    tag: 'audit',
    access: AUDITORS,
    query: auditQuerySchema,
    response: auditPageSchema,
    handler: ({ ctx, user, query }) => searchAudit(ctx, user, query),
  }),
  defineRoute({
    method: 'get',
    path: '/audit-events/export.csv',
    summary: 'The matching audit events as CSV (same filters as the search; at most 50 000 events).',
    tag: 'audit',
    access: AUDITORS,
    query: auditQuerySchema.omit({ before: true, limit: true }),
    produces: 'text/csv',
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
