import { Op, type WhereOptions } from 'sequelize';
import type { AuditEventDto, AuditPage, AuditQuery } from '../../shared/schemas/auditLog';
import { AuditEvent, User } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';

/** Export cap: one CSV holds at most this many events (narrow the dates for more). */
export const AUDIT_EXPORT_MAX = 50_000;

const PHRASES: Record<string, string> = {
  'auth.signed-in': 'Signed in',
  'demo.seeded': 'Demo data created',
  'device-type.created': 'Device type created',
  'device-type.updated': 'Device type changed',
  'device-type.deleted': 'Device type deleted',
  'field-report.opened': 'Field report made',
  'field-report.acknowledged': 'Field report acknowledged',
  'field-report.resolved': 'Field report resolved',
  'label.installed': 'Label marked installed',
  'labels.printed': 'Labels printed',
  'organization.settings-updated': 'Organization settings changed',
  'site.created': 'Site created',
  'site.updated': 'Site changed',
  'study.approved': 'Study approved',
  'study.created': 'Study created',
  'study.model-updated': 'Study model changed',
  'study.mitigation-applied': 'Mitigation option applied in a new revision',
  'study.model-imported': 'Model imported into study',
  'study.returned-to-draft': 'Study returned to draft',
  'study.revision-started': 'New study revision started',
  'study.run-started': 'Study run started',
  'study.run-finished': 'Study run finished',
  'study.run-failed': 'Study run failed',
  'study.submitted': 'Study submitted for review',
  'study.superseded': 'Study superseded',
  'user.created': 'User created',
  'user.updated': 'User changed',
};

function phrase(action: string): string {
  if (PHRASES[action]) return PHRASES[action];
  const [entity, verb] = action.split('.');
  const words = `${(entity ?? '').replace(/-/g, ' ')} ${(verb ?? '').replace(/-/g, ' ')}`.trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

const show = (v: unknown): string =>
  v === null || v === undefined ? '—' : typeof v === 'object' ? JSON.stringify(v) : String(v);

/** Summary keys in words; keys that only hold internal ids are left out of the description (they stay in the summary). */
const KEY_WORDS: Record<string, string> = {
  approverName: 'approved by',
  licenceNumber: 'licence',
  jurisdiction: 'jurisdiction',
  labelsIssued: 'labels issued',
  modelVersion: 'model version',
  version: 'model version',
  busErrors: 'buses with errors',
  buses: 'buses',
  tag: 'equipment',
  tags: 'equipment',
  photo: 'with photo',
  kind: 'kind',
  count: 'count',
  itemCount: 'items',
  recipients: 'recipients',
  ruleName: 'rule',
  reviewIntervalMonths: 'review interval (months)',
  notInstalledAfterDays: 'not installed after (days)',
  reminderHourUtc: 'reminder hour (UTC)',
  maxArcDurationMs: 'arc duration cap (ms)',
  motorDecayModel: 'motor contribution decay',
  requireIndependentApprover: 'independent approver',
  expiresAt: 'expires',
  busId: 'bus',
  optionId: 'option',
  targetCalPerCm2: 'target (cal/cm²)',
  promisedCalPerCm2: 'promised (cal/cm²)',
};
const HIDDEN_KEYS = new Set(['runId', 'labelId', 'siteId', 'userId', 'from', 'by', 'dayKey', 'files']);
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const keyWords = (k: string): string => KEY_WORDS[k] ?? k.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
const hidden = (k: string, v: unknown): boolean => HIDDEN_KEYS.has(k) || (typeof v === 'string' && UUID.test(v));

/** One line for people: the action, then what changed (before → after) or the main facts of the summary. */
export function describeEvent(action: string, summary: Record<string, unknown>): string {
  const head = phrase(action);
  const before = summary.before as Record<string, unknown> | undefined;
  const after = summary.after as Record<string, unknown> | undefined;
  const parts: string[] = [];
  if (before && after && typeof before === 'object' && typeof after === 'object') {
    for (const k of new Set([...Object.keys(before), ...Object.keys(after)])) {
      if (JSON.stringify(before[k]) !== JSON.stringify(after[k]))
        parts.push(`${keyWords(k)}: ${show(before[k])} → ${show(after[k])}`);
    }
  }
  for (const [k, v] of Object.entries(summary)) {
    if (k === 'before' || k === 'after' || v === null || v === undefined || hidden(k, v)) continue;
    if (Array.isArray(v)) {
      if (v.every((x) => typeof x !== 'object'))
        parts.push(`${keyWords(k)}: ${v.slice(0, 6).join(', ')}${v.length > 6 ? ` and ${v.length - 6} more` : ''}`);
      continue;
    }
    if (typeof v === 'object') continue;
    parts.push(`${keyWords(k)}: ${typeof v === 'boolean' ? (v ? 'yes' : 'no') : show(v)}`);
  }
  return parts.length ? `${head} — ${parts.slice(0, 8).join('; ')}` : head;
}

function parseSummary(text: string): Record<string, unknown> {
  try {
    const v = JSON.parse(text) as unknown;
    return v && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : { value: v };
  } catch {
    return { text };
  }
}

/** "2026-05-01" → that day's start; a date-time as given. `endOfDay` moves a bare date to the next midnight. */
function parseBound(v: string, endOfDay: boolean): Date {
  const d = new Date(/^\d{4}-\d{2}-\d{2}$/.test(v) ? `${v}T00:00:00Z` : v);
  if (endOfDay && /^\d{4}-\d{2}-\d{2}$/.test(v)) d.setUTCDate(d.getUTCDate() + 1);
  return d;
}

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

function encodeCursor(e: AuditEvent): string {
  return Buffer.from(`${e.createdAt.toISOString()}|${e.id}`).toString('base64url');
}

function decodeCursor(c: string): { at: Date; id: string } {
  const [at, id] = Buffer.from(c, 'base64url').toString('utf8').split('|');
  const d = new Date(at ?? '');
  if (!id || Number.isNaN(d.getTime()))
    throw new ApiError('bad_request', 'The page cursor is not valid', { before: 'Not a cursor from this list' });
  return { at: d, id };
}

async function whereOf(ctx: AppContext, actor: AuthUser, q: Omit<AuditQuery, 'limit'>): Promise<WhereOptions> {
  const and: WhereOptions[] = [{ organizationId: actor.organizationId }];
  const like = ctx.db.dialect === 'postgres' ? Op.iLike : Op.like;
  if (q.action) {
    // Several actions or prefixes, comma-separated; one ending in a dot is a prefix ("label." matches label.installed).
    const parts = q.action
      .split(',')
      .map((a) => a.trim())
      .filter(Boolean);
    and.push({
      [Op.or]: parts.map((a) => (a.endsWith('.') ? { action: { [Op.like]: `${escapeLike(a)}%` } } : { action: a })),
    });
  }
  if (q.entityType) and.push({ entityType: q.entityType });
  if (q.entityId) and.push({ entityId: q.entityId });
  if (q.actorId) and.push({ actorId: q.actorId });
  if (q.from) and.push({ createdAt: { [Op.gte]: parseBound(q.from, false) } });
  if (q.to) and.push({ createdAt: { [Op.lt]: parseBound(q.to, true) } });
  if (q.q) {
    const pattern = `%${escapeLike(q.q)}%`;
    const actors = await User.findAll({
      where: {
        organizationId: actor.organizationId,
        [Op.or]: [{ name: { [like]: pattern } }, { email: { [like]: pattern } }],
      },
      attributes: ['id'],
    });
    and.push({
      [Op.or]: [
        { action: { [like]: pattern } },
        { entityType: { [like]: pattern } },
        { entityId: { [like]: pattern } },
        { summary: { [like]: pattern } },
        ...(actors.length ? [{ actorId: actors.map((a) => a.id) }] : []),
      ],
    });
  }
  if (q.before) {
    const c = decodeCursor(q.before);
    and.push({ [Op.or]: [{ createdAt: { [Op.lt]: c.at } }, { createdAt: c.at, id: { [Op.lt]: c.id } }] });
  }
  return { [Op.and]: and };
}

async function toDtos(events: AuditEvent[]): Promise<AuditEventDto[]> {
  const ids = [...new Set(events.map((e) => e.actorId).filter((x): x is string => !!x))];
  const users = new Map(
    (await User.findAll({ where: { id: ids }, attributes: ['id', 'name', 'email'] })).map((u) => [u.id, u]),
  );
  return events.map((e) => {
    const summary = parseSummary(e.summary);
    const u = e.actorId ? users.get(e.actorId) : undefined;
    return {
      id: e.id,
      at: e.createdAt.toISOString(),
      actor: e.actorId ? { id: e.actorId, name: u?.name ?? '(removed user)', email: u?.email ?? '' } : null,
      action: e.action,
      entityType: e.entityType,
      entityId: e.entityId,
      summary,
      description: describeEvent(e.action, summary),
    };
  });
}

/** Newest first, one page at a time. */
export async function searchAudit(ctx: AppContext, actor: AuthUser, q: AuditQuery): Promise<AuditPage> {
  const where = await whereOf(ctx, actor, q);
  const rows = await AuditEvent.findAll({
    where,
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: q.limit + 1,
  });
  const page = rows.slice(0, q.limit);
  return { events: await toDtos(page), nextBefore: rows.length > q.limit ? encodeCursor(page[page.length - 1]) : null };
}

/** Every matching event (up to AUDIT_EXPORT_MAX), newest first, for a CSV export. */
export async function exportAudit(
  ctx: AppContext,
  actor: AuthUser,
  q: Omit<AuditQuery, 'limit' | 'before'>,
): Promise<AuditEventDto[]> {
  const where = await whereOf(ctx, actor, q);
  const total = await AuditEvent.count({ where });
  if (total > AUDIT_EXPORT_MAX) {
    throw new ApiError(
      'unprocessable',
      `${total} events match: narrow the dates or the search (at most ${AUDIT_EXPORT_MAX} per export)`,
    );
  }
  const rows = await AuditEvent.findAll({
    where,
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
  });
  return toDtos(rows);
}
