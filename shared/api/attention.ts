import { attentionListResponseSchema, attentionQuerySchema, attentionSummarySchema } from '../schemas/attention';
import { auditPageSchema, auditQuerySchema } from '../schemas/auditLog';
import {
  fieldReportListSchema,
  fieldReportQuerySchema,
  fieldReportSchema,
  fieldReportTriageSchema,
} from '../schemas/fieldReports';
import { endpoint } from './endpoint';

/** Roles of the routes below that share one access rule. */
const AUDITORS = ['admin', 'engineer', 'safety'] as const;

/** The attention lists, field reports and the audit log. */
export const attentionApi = {
  summary: endpoint({
    method: 'get',
    path: '/attention',
    summary:
      'What needs attention: counts of each list (review due and overdue, stale studies, labels, field reports), per site.',
    tag: 'attention',
    access: AUDITORS,
    query: attentionQuerySchema,
    response: attentionSummarySchema,
  }),
  list: endpoint({
    method: 'get',
    path: '/attention/:list',
    summary: 'One list of things needing attention, with its columns and rows.',
    tag: 'attention',
    access: AUDITORS,
    query: attentionQuerySchema,
    response: attentionListResponseSchema,
  }),
  exportList: endpoint({
    method: 'get',
    path: '/attention/:list/export.csv',
    summary: 'One list as CSV: the site, then the list’s columns.',
    tag: 'attention',
    access: AUDITORS,
    query: attentionQuerySchema,
    produces: 'text/csv',
  }),
  fieldReports: endpoint({
    method: 'get',
    path: '/field-reports',
    summary: 'Field reports, newest first (electricians see only their own).',
    tag: 'field reports',
    access: 'signed-in',
    query: fieldReportQuerySchema,
    response: fieldReportListSchema,
  }),
  fieldReport: endpoint({
    method: 'get',
    path: '/field-reports/:reportId',
    summary: 'One field report, with who acknowledged and resolved it and when.',
    tag: 'field reports',
    access: 'signed-in',
    response: fieldReportSchema,
  }),
  fieldReportPhoto: endpoint({
    method: 'get',
    path: '/field-reports/:reportId/photo',
    summary: 'The photo sent with a field report.',
    tag: 'field reports',
    access: 'signed-in',
    produces: 'image/*',
  }),
  triageFieldReport: endpoint({
    method: 'post',
    path: '/field-reports/:reportId/triage',
    summary: 'Acknowledge a field report, or resolve it with a note of what was done (open → acknowledged → resolved).',
    tag: 'field reports',
    access: ['engineer', 'safety'],
    body: fieldReportTriageSchema,
    response: fieldReportSchema,
  }),
  auditEvents: endpoint({
    method: 'get',
    path: '/audit-events',
    summary:
      'Search the audit log (append-only: no route changes or deletes an event), newest first, a page at a time.',
    tag: 'audit',
    access: AUDITORS,
    query: auditQuerySchema,
    response: auditPageSchema,
  }),
  exportAuditEvents: endpoint({
    method: 'get',
    path: '/audit-events/export.csv',
    summary: 'The matching audit events as CSV (same filters as the search; at most 50 000 events).',
    tag: 'audit',
    access: AUDITORS,
    query: auditQuerySchema.omit({ before: true, limit: true }),
    produces: 'text/csv',
  }),
};
