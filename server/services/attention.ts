import { Op, type WhereOptions } from 'sequelize';
import {
  ATTENTION_LIST_INFO,
  ATTENTION_LISTS,
  type AttentionColumn,
  type AttentionCounts,
  type AttentionList,
  type AttentionListResponse,
  type AttentionRow,
  type AttentionSummary,
} from '../../shared/schemas/attention';
import { FIELD_REPORT_STATUS_LABELS, reportKindLabel, type FieldReportStatus } from '../../shared/schemas/fieldReports';
import { FieldReport, Label, Site, Study, User } from '../db/models';
import type { AppContext } from './context';
import { ApiError } from './errors';
import { addMonths } from './dates';
import { getSettings } from './organization';

const DAY_MS = 86_400_000;
const isoDay = (d: Date | null | undefined): string | null => (d ? d.toISOString().slice(0, 10) : null);
/** Whole days from a to b (negative when b is earlier). */
const daysBetween = (a: Date, b: Date): number => Math.floor((b.getTime() - a.getTime()) / DAY_MS);

const STUDY_COLUMNS: AttentionColumn[] = [
  { key: 'study', label: 'Study', kind: 'text' },
  { key: 'revision', label: 'Rev', kind: 'number' },
  { key: 'approvedOn', label: 'Approved', kind: 'date' },
  { key: 'approvedBy', label: 'Approved by', kind: 'text' },
  { key: 'reviewBy', label: 'Review by', kind: 'date' },
];

const COLUMNS: Record<AttentionList, AttentionColumn[]> = {
  'review-overdue': [...STUDY_COLUMNS, { key: 'daysOverdue', label: 'Days overdue', kind: 'number' }],
  'review-due-30': [...STUDY_COLUMNS, { key: 'daysLeft', label: 'Days left', kind: 'number' }],
  'review-due-90': [...STUDY_COLUMNS, { key: 'daysLeft', label: 'Days left', kind: 'number' }],
  'stale-studies': [
    { key: 'study', label: 'Study', kind: 'text' },
    { key: 'revision', label: 'Rev', kind: 'number' },
    { key: 'approvedOn', label: 'Approved', kind: 'date' },
    { key: 'changedInRevision', label: 'Changed in rev', kind: 'number' },
    { key: 'modelChangedOn', label: 'Model changed', kind: 'date' },
    { key: 'changedStatus', label: 'That revision is', kind: 'text' },
  ],
  'superseded-installed': [
    { key: 'equipment', label: 'Equipment', kind: 'text' },
    { key: 'code', label: 'Label on equipment', kind: 'text' },
    { key: 'revision', label: 'Of rev', kind: 'number' },
    { key: 'installedOn', label: 'Installed', kind: 'date' },
    { key: 'supersededOn', label: 'Superseded', kind: 'date' },
    { key: 'currentCode', label: 'Current label', kind: 'text' },
  ],
  'not-installed': [
    { key: 'equipment', label: 'Equipment', kind: 'text' },
    { key: 'code', label: 'Label', kind: 'text' },
    { key: 'revision', label: 'Rev', kind: 'number' },
    { key: 'issuedOn', label: 'Issued', kind: 'date' },
    { key: 'printedOn', label: 'Printed', kind: 'date' },
    { key: 'daysSinceIssue', label: 'Days since issue', kind: 'number' },
  ],
  'open-reports': [
    { key: 'equipment', label: 'Equipment', kind: 'text' },
    { key: 'kind', label: 'What', kind: 'text' },
    { key: 'status', label: 'Status', kind: 'text' },
    { key: 'reportedBy', label: 'Reported by', kind: 'text' },
    { key: 'reportedOn', label: 'Reported', kind: 'date' },
    { key: 'ageDays', label: 'Age (days)', kind: 'number' },
    { key: 'text', label: 'Report', kind: 'text' },
  ],
};

export function columnsOf(list: AttentionList): AttentionColumn[] {
  return COLUMNS[list];
}

interface Gathered {
  asOf: Date;
  rows: Record<AttentionList, AttentionRow[]>;
  sites: Map<string, string>;
  notInstalledAfterDays: number;
  reviewIntervalMonths: number;
  openReportAges: AttentionSummary['openReportAges'];
}

/**
 * Everything that needs attention in one organization (optionally one site), read in a handful of queries.
 * The lists are computed from the recorded studies, labels and field reports at `ctx.now()`.
 */
async function gather(ctx: AppContext, organizationId: string, siteId?: string): Promise<Gathered> {
  const now = ctx.now();
  const settings = await getSettings(organizationId);
  const siteWhere: WhereOptions = siteId ? { organizationId, id: siteId } : { organizationId };
  const siteRows = await Site.findAll({ where: siteWhere, attributes: ['id', 'name'], order: [['name', 'ASC']] });
  if (siteId && !siteRows.length) throw ApiError.notFound('No such site');
  const sites = new Map(siteRows.map((s) => [s.id, s.name]));
  const siteIds = [...sites.keys()];
  const rows = Object.fromEntries(ATTENTION_LISTS.map((l) => [l, [] as AttentionRow[]])) as Record<
    AttentionList,
    AttentionRow[]
  >;
  const openReportAges = { under7Days: 0, from7To30Days: 0, over30Days: 0 };
  const base = (id: string, sId: string, link: AttentionRow['link'], cells: AttentionRow['cells']): AttentionRow => ({
    id,
    siteId: sId,
    siteName: sites.get(sId) ?? '',
    link,
    cells,
  });

  // Studies: review dates and staleness.
  const studies = await Study.findAll({
    where: { organizationId, siteId: siteIds, status: { [Op.in]: ['approved', 'draft', 'in-review'] } },
    attributes: ['id', 'siteId', 'revision', 'title', 'status', 'modelUpdatedAt', 'approvedAt', 'approverName'],
    order: [['revision', 'ASC']],
  });
  const open = studies.filter((s) => s.status !== 'approved');
  for (const s of studies) {
    if (s.status !== 'approved' || !s.approvedAt) continue;
    const reviewBy = addMonths(s.approvedAt, settings.reviewIntervalMonths);
    const cells = {
      study: s.title,
      revision: s.revision,
      approvedOn: isoDay(s.approvedAt),
      approvedBy: s.approverName ?? '',
      reviewBy: isoDay(reviewBy),
    };
    const link = { kind: 'study' as const, id: s.id };
    if (reviewBy < now) {
      rows['review-overdue'].push(base(s.id, s.siteId, link, { ...cells, daysOverdue: daysBetween(reviewBy, now) }));
    } else {
      const daysLeft = Math.ceil((reviewBy.getTime() - now.getTime()) / DAY_MS);
      if (daysLeft <= 30) rows['review-due-30'].push(base(s.id, s.siteId, link, { ...cells, daysLeft }));
      if (daysLeft <= 90) rows['review-due-90'].push(base(s.id, s.siteId, link, { ...cells, daysLeft }));
    }
    // Stale: a later revision of the same site has a model changed after this approval.
    const changed = open.find(
      (l) => l.siteId === s.siteId && l.revision > s.revision && l.modelUpdatedAt > (s.approvedAt as Date),
    );
    if (changed) {
      rows['stale-studies'].push(
        base(s.id, s.siteId, link, {
          study: s.title,
          revision: s.revision,
          approvedOn: isoDay(s.approvedAt),
          changedInRevision: changed.revision,
          modelChangedOn: isoDay(changed.modelUpdatedAt),
          changedStatus: changed.status === 'in-review' ? 'in review' : 'draft',
        }),
      );
    }
  }
  for (const l of ['review-overdue', 'review-due-30', 'review-due-90'] as const) {
    rows[l].sort((a, b) => String(a.cells.reviewBy).localeCompare(String(b.cells.reviewBy)));
  }

  // Labels: superseded but still on the equipment; current but not installed after the set number of days.
  const revisionOf = new Map(studies.map((s) => [s.id, s.revision]));
  const superseded = await Label.findAll({
    where: { organizationId, siteId: siteIds, supersededAt: { [Op.ne]: null }, installedAt: { [Op.ne]: null } },
    attributes: ['id', 'siteId', 'studyId', 'equipmentTag', 'code', 'installedAt', 'supersededAt'],
  });
  const current = await Label.findAll({
    where: { organizationId, siteId: siteIds, supersededAt: null },
    attributes: ['id', 'siteId', 'studyId', 'equipmentTag', 'code', 'issuedAt', 'printedAt', 'installedAt'],
    order: [['equipmentTag', 'ASC']],
  });
  const missingStudyIds = [
    ...new Set([...superseded, ...current].map((l) => l.studyId).filter((id) => !revisionOf.has(id))),
  ];
  if (missingStudyIds.length) {
    for (const s of await Study.findAll({ where: { id: missingStudyIds }, attributes: ['id', 'revision'] }))
      revisionOf.set(s.id, s.revision);
  }
  const currentByTag = new Map(current.map((l) => [`${l.siteId}\u0000${l.equipmentTag}`, l]));
  for (const l of superseded) {
    const now_ = currentByTag.get(`${l.siteId}\u0000${l.equipmentTag}`);
    // Installing the current label of the same equipment replaces the old one on it.
    if (now_?.installedAt && l.installedAt && now_.installedAt >= l.installedAt) continue;
    rows['superseded-installed'].push(
      base(
        l.id,
        l.siteId,
        { kind: 'label', id: l.id },
        {
          equipment: l.equipmentTag,
          code: l.code,
          revision: revisionOf.get(l.studyId) ?? null,
          installedOn: isoDay(l.installedAt),
          supersededOn: isoDay(l.supersededAt),
          currentCode: now_?.code ?? null,
        },
      ),
    );
  }
  rows['superseded-installed'].sort((a, b) => String(a.cells.equipment).localeCompare(String(b.cells.equipment)));
  const notInstalledBefore = new Date(now.getTime() - settings.notInstalledAfterDays * DAY_MS);
  for (const l of current) {
    if (l.installedAt || l.issuedAt > notInstalledBefore) continue;
    rows['not-installed'].push(
      base(
        l.id,
        l.siteId,
        { kind: 'label', id: l.id },
        {
          equipment: l.equipmentTag,
          code: l.code,
          revision: revisionOf.get(l.studyId) ?? null,
          issuedOn: isoDay(l.issuedAt),
          printedOn: isoDay(l.printedAt),
          daysSinceIssue: daysBetween(l.issuedAt, now),
        },
      ),
    );
  }

  // Field reports not resolved yet, oldest first.
  const reports = await FieldReport.findAll({
    where: { organizationId, siteId: siteIds, status: { [Op.ne]: 'resolved' } },
    order: [['createdAt', 'ASC']],
  });
  const reporterNames = new Map(
    (
      await User.findAll({ where: { id: [...new Set(reports.map((r) => r.reporterId))] }, attributes: ['id', 'name'] })
    ).map((u) => [u.id, u.name]),
  );
  const labelTags = new Map(
    (
      await Label.findAll({
        where: { id: [...new Set(reports.map((r) => r.labelId))] },
        attributes: ['id', 'equipmentTag'],
      })
    ).map((l) => [l.id, l.equipmentTag]),
  );
  for (const r of reports) {
    const age = Math.max(0, daysBetween(r.createdAt, now));
    if (age < 7) openReportAges.under7Days++;
    else if (age <= 30) openReportAges.from7To30Days++;
    else openReportAges.over30Days++;
    rows['open-reports'].push(
      base(
        r.id,
        r.siteId,
        { kind: 'field-report', id: r.id },
        {
          equipment: labelTags.get(r.labelId) ?? '',
          kind: reportKindLabel(r.kind),
          status: FIELD_REPORT_STATUS_LABELS[r.status as FieldReportStatus] ?? r.status,
          reportedBy: reporterNames.get(r.reporterId) ?? '',
          reportedOn: isoDay(r.createdAt),
          ageDays: age,
          text: r.text.length > 160 ? `${r.text.slice(0, 157)}…` : r.text,
        },
      ),
    );
  }

  return {
    asOf: now,
    rows,
    sites,
    notInstalledAfterDays: settings.notInstalledAfterDays,
    reviewIntervalMonths: settings.reviewIntervalMonths,
    openReportAges,
  };
}

function countsOf(rows: Record<AttentionList, AttentionRow[]>, siteId?: string): AttentionCounts {
  return Object.fromEntries(
    ATTENTION_LISTS.map((l) => [l, siteId ? rows[l].filter((r) => r.siteId === siteId).length : rows[l].length]),
  ) as AttentionCounts;
}

/** Counts of every list, in total and per site, and the ages of open field reports. */
export async function attentionSummary(
  ctx: AppContext,
  organizationId: string,
  siteId?: string,
): Promise<AttentionSummary> {
  const g = await gather(ctx, organizationId, siteId);
  return {
    asOf: g.asOf.toISOString(),
    siteId: siteId ?? null,
    notInstalledAfterDays: g.notInstalledAfterDays,
    reviewIntervalMonths: g.reviewIntervalMonths,
    counts: countsOf(g.rows),
    openReportAges: g.openReportAges,
    sites: [...g.sites.entries()].map(([id, name]) => ({ siteId: id, siteName: name, counts: countsOf(g.rows, id) })),
  };
}

/** One list with its columns and rows. */
export async function attentionList(
  ctx: AppContext,
  organizationId: string,
  list: AttentionList,
  siteId?: string,
): Promise<AttentionListResponse> {
  const g = await gather(ctx, organizationId, siteId);
  const info = ATTENTION_LIST_INFO[list];
  return {
    list,
    title: info.title,
    description:
      list === 'not-installed' ? `${info.description} (now ${g.notInstalledAfterDays} days)` : info.description,
    asOf: g.asOf.toISOString(),
    columns: COLUMNS[list],
    rows: g.rows[list],
  };
}
