import type { WhereOptions } from 'sequelize';
import type { FieldReportDto, FieldReportStatus, FieldReportTriage } from '../../shared/schemas/fieldReports';
import { FieldReport, Label, Site, User } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { recordAudit } from './audit';

const DAY_MS = 86_400_000;

async function toDtos(ctx: AppContext, reports: FieldReport[]): Promise<FieldReportDto[]> {
  if (!reports.length) return [];
  const userIds = new Set<string>();
  for (const r of reports) for (const id of [r.reporterId, r.acknowledgedById, r.resolvedById]) if (id) userIds.add(id);
  const users = new Map(
    (await User.findAll({ where: { id: [...userIds] }, attributes: ['id', 'name'] })).map((u) => [u.id, u.name]),
  );
  const labels = new Map(
    (
      await Label.findAll({
        where: { id: [...new Set(reports.map((r) => r.labelId))] },
        attributes: ['id', 'code', 'equipmentTag'],
      })
    ).map((l) => [l.id, l]),
  );
  const sites = new Map(
    (await Site.findAll({ where: { id: [...new Set(reports.map((r) => r.siteId))] }, attributes: ['id', 'name'] })).map(
      (s) => [s.id, s.name],
    ),
  );
  const now = ctx.now();
  return reports.map((r) => ({
    id: r.id,
    siteId: r.siteId,
    siteName: sites.get(r.siteId) ?? '',
    labelId: r.labelId,
    labelCode: labels.get(r.labelId)?.code ?? '',
    equipmentTag: labels.get(r.labelId)?.equipmentTag ?? '',
    kind: r.kind,
    text: r.text,
    hasPhoto: !!r.photoKey,
    status: r.status as FieldReportStatus,
    reporter: { id: r.reporterId, name: users.get(r.reporterId) ?? '' },
    acknowledgedAt: r.acknowledgedAt ? r.acknowledgedAt.toISOString() : null,
    acknowledgedBy: r.acknowledgedById ? (users.get(r.acknowledgedById) ?? '') : null,
    resolvedAt: r.resolvedAt ? r.resolvedAt.toISOString() : null,
    resolvedBy: r.resolvedById ? (users.get(r.resolvedById) ?? '') : null,
    resolutionNote: r.resolutionNote ?? null,
    createdAt: r.createdAt.toISOString(),
    ageDays: Math.max(0, Math.floor((now.getTime() - r.createdAt.getTime()) / DAY_MS)),
  }));
}

/** Electricians see only the reports they made; everyone else sees every report of the organization. */
function visibleWhere(actor: AuthUser): WhereOptions {
  return actor.role === 'electrician'
    ? { organizationId: actor.organizationId, reporterId: actor.id }
    : { organizationId: actor.organizationId };
}

export async function listFieldReports(
  ctx: AppContext,
  actor: AuthUser,
  q: { status?: FieldReportStatus; siteId?: string; mine?: string },
): Promise<FieldReportDto[]> {
  const where: Record<string, unknown> = { ...(visibleWhere(actor) as object) };
  if (q.status) where.status = q.status;
  if (q.siteId) where.siteId = q.siteId;
  if (q.mine) where.reporterId = actor.id;
  const reports = await FieldReport.findAll({ where, order: [['createdAt', 'DESC']], limit: 500 });
  return toDtos(ctx, reports);
}

async function findReport(actor: AuthUser, reportId: string): Promise<FieldReport> {
  const r = await FieldReport.findOne({ where: { ...(visibleWhere(actor) as object), id: reportId } });
  if (!r) throw ApiError.notFound('No such field report');
  return r;
}

export async function getFieldReport(ctx: AppContext, actor: AuthUser, reportId: string): Promise<FieldReportDto> {
  return (await toDtos(ctx, [await findReport(actor, reportId)]))[0];
}

export async function fieldReportPhoto(
  ctx: AppContext,
  actor: AuthUser,
  reportId: string,
): Promise<{ body: Buffer; contentType: string }> {
  const r = await findReport(actor, reportId);
  const file = r.photoKey ? await ctx.storage.get(r.photoKey) : null;
  if (!file) throw ApiError.notFound('This report has no photo');
  return { body: file.body, contentType: file.contentType };
}

/** Which status may follow which (resolving straight from open is allowed: the fix may be quick). */
const NEXT: Record<FieldReportStatus, FieldReportStatus[]> = {
  open: ['acknowledged', 'resolved'],
  acknowledged: ['resolved'],
  resolved: [],
};

export async function triageFieldReport(
  ctx: AppContext,
  actor: AuthUser,
  reportId: string,
  input: FieldReportTriage,
): Promise<FieldReportDto> {
  const report = await ctx.db.sequelize.transaction(async (transaction) => {
    const r = await FieldReport.findOne({ where: { id: reportId, organizationId: actor.organizationId }, transaction });
    if (!r) throw ApiError.notFound('No such field report');
    const before = r.status as FieldReportStatus;
    if (!NEXT[before].includes(input.status)) {
      throw ApiError.conflict(
        before === 'resolved'
          ? 'This report is already resolved'
          : `A report that is ${before} cannot become ${input.status}`,
      );
    }
    const now = ctx.now();
    // Conditional update: two people triaging at once cannot both move it from the same status.
    const patch =
      input.status === 'acknowledged'
        ? { status: 'acknowledged' as const, acknowledgedAt: now, acknowledgedById: actor.id }
        : {
            status: 'resolved' as const,
            resolvedAt: now,
            resolvedById: actor.id,
            resolutionNote: input.note,
            ...(before === 'open' ? { acknowledgedAt: now, acknowledgedById: actor.id } : {}),
          };
    const [count] = await FieldReport.update(patch, { where: { id: r.id, status: before }, transaction });
    if (count !== 1) throw ApiError.conflict('Someone else changed this report meanwhile; reload it');
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: `field-report.${input.status}`,
        entityType: 'field-report',
        entityId: r.id,
        summary: {
          before: { status: before },
          after: { status: input.status },
          ...(input.note ? { note: input.note } : {}),
        },
      },
      transaction,
    );
    return FieldReport.findByPk(r.id, { transaction, rejectOnEmpty: true });
  });
  return (await toDtos(ctx, [report]))[0];
}
