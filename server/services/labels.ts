import { randomBytes, randomUUID } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { REPORT_KINDS } from '../../shared/schemas/fieldReports';
import type { LabelCheck, LabelContent, LabelDto, LabelStatus } from '../../shared/schemas/labels';
import { LABEL_CODE_ALPHABET, isLabelCode, normalizeLabelCode, parseLabelCode } from '../../shared/labelCode';
import { ONLY_AT_CAUTIONS } from '../../shared/cautions';
import {
  busArcDurationCapS,
  LABEL_STATUS_NOTICES,
  labelDisplay,
  type LabelDisplay,
  type UnitOrder,
} from '../../shared/labelDisplay';
import type { StudyResults } from '../../shared/schemas/studyResults';
import { FieldReport, Label, Site, type Study, User } from '../db/models';
import { ReadCache } from '../db/readCache';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { recordAudit } from './audit';
import { addMonths } from './dates';
import { findSite, findStudy } from './scope';

/** 80 random bits as 16 base32 characters (an unguessable code, at least 64 bits). */
export function newLabelCode(): string {
  const bytes = randomBytes(10);
  let bits = 0;
  let value = 0;
  let out = '';
  for (const b of bytes) {
    value = (value << 8) | b;
    bits += 8;
    while (bits >= 5) {
      out += LABEL_CODE_ALPHABET[(value >>> (bits - 5)) & 31];
      bits -= 5;
    }
  }
  return out;
}

/** Codes are typed by people: accept lower case, spaces and dashes, and the look-alikes O→0, I/L→1. */
export const normalizeCode = normalizeLabelCode;

const day = (d: Date) => d.toISOString().slice(0, 10);

export const LABEL_CAUTION =
  'Values from an engineering study (IEEE 1584-2018). De-energize where possible; follow the electrical safety program.';

type Trace = StudyResults['buses'][number]['cases'][number];

/** "CB-2 (Main breaker)": a device of a clearing trace by id and name, the same words everywhere. */
function deviceName(trace: Trace, deviceId: string): string {
  const name = trace.devices.find((d) => d.deviceId === deviceId)?.name;
  return name && name !== deviceId ? `${deviceId} (${name})` : deviceId;
}

/** With several sources: the devices that cut off the sources other than the one the clearing device ends. */
function otherSourcesClearedBy(trace: Trace): string[] {
  const ids = new Set<string>();
  for (const s of trace.sources)
    if (s.reason === 'device' && s.cutByDeviceId && s.cutByDeviceId !== trace.clearingDeviceId)
      ids.add(s.cutByDeviceId);
  return [...ids].map((id) => deviceName(trace, id));
}

/** Label content of every labelled bus of an approved run (a snapshot: it never changes afterwards). */
export function labelContents(
  results: StudyResults,
  study: Study,
  site: Site,
  approvedAt: Date,
  reviewBy: Date,
  unitOrder?: UnitOrder,
): { tag: string; content: LabelContent }[] {
  const out: { tag: string; content: LabelContent }[] = [];
  for (const b of results.buses) {
    const lv = b.labelValues;
    if (b.status !== 'ok' || !lv) continue;
    const governing = b.cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location);
    out.push({
      tag: b.busId,
      content: {
        signalWord: lv.signalWord,
        equipmentTag: b.busId,
        equipmentName: b.busName,
        siteName: site.name,
        nominalVoltageV: lv.nominalVoltageV,
        incidentEnergyCalPerCm2: lv.incidentEnergyCalPerCm2,
        incidentEnergyJPerCm2: lv.incidentEnergyJPerCm2,
        workingDistanceMm: lv.workingDistanceMm,
        arcFlashBoundaryMm: lv.arcFlashBoundaryMm,
        minimumArcRatingCalPerCm2: lv.minimumArcRatingCalPerCm2,
        ppeLevel: lv.noAdequatePpe ? null : (lv.ppeLevel?.name ?? null),
        noAdequatePpe: lv.noAdequatePpe || !lv.ppeLevel,
        limitedApproachMovable: lv.shockApproach?.limitedApproachMovable.text ?? null,
        limitedApproachFixed: lv.shockApproach?.limitedApproachFixed.text ?? null,
        restrictedApproach: lv.shockApproach?.restrictedApproach.text ?? null,
        gloveClass: lv.gloveClass ? `Class ${lv.gloveClass.class}` : null,
        clearingDevice: governing?.clearingDeviceId ? deviceName(governing, governing.clearingDeviceId) : null,
        governingCase: `${b.governing?.arcCase === 'reduced' ? 'reduced' : 'full'} arcing current${b.governing?.location === 'line-side' ? ', line side of the main' : ''}${scenarioNote(b)}`,
        studyTitle: study.title,
        studyRevision: study.revision,
        studyDate: day(approvedAt),
        reviewByDate: day(reviewBy),
        approvedBy: `${study.approverName ?? ''}, licence ${study.licenceNumber ?? ''} (${study.jurisdiction ?? ''})`,
        // A condition of the energy (a maintenance switch ON, an arc-flash relay in service) first: never cut.
        caution: [...Object.values(ONLY_AT_CAUTIONS).filter((c) => lv.cautions.includes(c)), LABEL_CAUTION].join(' '),
        otherSourcesClearedBy: governing ? otherSourcesClearedBy(governing) : [],
        arcDurationCapS: busArcDurationCapS(b, results.maxArcDurationMs),
        ppeDescription: lv.noAdequatePpe ? null : (lv.ppeLevel?.description ?? null),
        ...(unitOrder ? { unitOrder } : {}),
      },
    });
  }
  return out;
}

/** With operating scenarios, the one the label is taken from (the highest incident energy): ", scenario “…”". */
function scenarioNote(b: StudyResults['buses'][number]): string {
  const name = b.scenarios?.find((s) => s.scenarioId === b.scenarioId)?.name;
  return name ? `, scenario “${name}”` : '';
}

/**
 * Issues the labels of a revision being approved (inside the approval transaction) and supersedes the labels of
 * the site's earlier revisions.
 */
export async function issueLabels(
  study: Study,
  results: StudyResults,
  approvedAt: Date,
  reviewIntervalMonths: number,
  transaction: Transaction,
  unitOrder?: UnitOrder,
): Promise<number> {
  const site = await Site.findByPk(study.siteId, { transaction });
  if (!site) throw ApiError.notFound('No such site');
  await Label.update(
    { supersededAt: approvedAt },
    { where: { siteId: study.siteId, studyId: { [Op.ne]: study.id }, supersededAt: null }, transaction },
  );
  const reviewBy = addMonths(approvedAt, reviewIntervalMonths);
  const contents = labelContents(results, study, site, approvedAt, reviewBy, unitOrder);
  for (const c of contents) {
    await Label.create(
      {
        id: randomUUID(),
        organizationId: study.organizationId,
        siteId: study.siteId,
        studyId: study.id,
        equipmentTag: c.tag,
        code: newLabelCode(),
        content: JSON.stringify(c.content),
        reviewBy,
        issuedAt: approvedAt,
      },
      { transaction },
    );
  }
  return contents.length;
}

export function labelStatus(label: Pick<Label, 'supersededAt' | 'reviewBy'>, now: Date): LabelStatus {
  if (label.supersededAt) return 'superseded';
  if (label.reviewBy < now) return 'past-review';
  return 'current';
}

export async function toLabelDtos(labels: Label[], now: Date): Promise<LabelDto[]> {
  const ids = [...new Set(labels.map((l) => l.installedById).filter((x): x is string => !!x))];
  const users = new Map((await User.findAll({ where: { id: ids } })).map((u) => [u.id, u.name]));
  return labels.map((l) => {
    const content = JSON.parse(l.content) as LabelContent;
    return {
      id: l.id,
      code: l.code,
      siteId: l.siteId,
      studyId: l.studyId,
      equipmentTag: l.equipmentTag,
      status: labelStatus(l, now),
      content,
      display: labelDisplay(content),
      issuedAt: l.issuedAt.toISOString(),
      printedAt: l.printedAt ? l.printedAt.toISOString() : null,
      installedAt: l.installedAt ? l.installedAt.toISOString() : null,
      installedBy: l.installedById ? (users.get(l.installedById) ?? null) : null,
      supersededAt: l.supersededAt ? l.supersededAt.toISOString() : null,
    };
  });
}

export async function listLabels(
  ctx: AppContext,
  actor: AuthUser,
  filter: { siteId?: string; studyId?: string; current?: boolean },
): Promise<LabelDto[]> {
  // The site or study must be the actor's: another organization's id is not found.
  if (filter.siteId) await findSite(actor, filter.siteId);
  if (filter.studyId) await findStudy(actor, filter.studyId);
  const where: Record<string, unknown> = { organizationId: actor.organizationId };
  if (filter.siteId) where.siteId = filter.siteId;
  if (filter.studyId) where.studyId = filter.studyId;
  if (filter.current) where.supersededAt = null;
  const rows = await Label.findAll({
    where,
    order: [
      ['equipmentTag', 'ASC'],
      ['issuedAt', 'DESC'],
    ],
  });
  return toLabelDtos(rows, ctx.now());
}

export async function findLabel(actor: AuthUser, labelId: string, transaction?: Transaction): Promise<Label> {
  const label = await Label.findOne({ where: { id: labelId, organizationId: actor.organizationId }, transaction });
  if (!label) throw ApiError.notFound('No such label');
  return label;
}

/**
 * The public check of a printed label: exactly what the label says, its status, and when superseded what the
 * current label of the same equipment says. Nothing else of the organization is revealed.
 */
/** What the public check of one code reads from the database, parsed and laid out for display. */
interface CheckedLabel {
  code: string;
  supersededAt: Date | null;
  reviewBy: Date;
  content: LabelContent;
  display: LabelDisplay;
  /** For a superseded label: the equipment's current label, if any. */
  current: LabelContent | null;
  currentDisplay: LabelDisplay | null;
}

/**
 * The public check's reads by code, for a few seconds, dropped on any write of a label (issue, print, install,
 * supersede: server/db/readCache.ts). The status is worked out from it at every check (the review date passes).
 */
const checkedLabels = new ReadCache<CheckedLabel>('labels', 20_000);

/** Empties the public check's cache (tests). */
export function clearLabelCheckCache(): void {
  checkedLabels.clear();
}

async function checkedLabel(code: string): Promise<CheckedLabel | null> {
  const hit = checkedLabels.get(code);
  if (hit) return hit;
  const readAt = checkedLabels.counter();
  const label = await Label.findOne({ where: { code } });
  if (!label) return null;
  let current: LabelContent | null = null;
  if (label.supersededAt) {
    const newer = await Label.findOne({
      where: { siteId: label.siteId, equipmentTag: label.equipmentTag, supersededAt: null },
      order: [['issuedAt', 'DESC']],
    });
    current = newer ? (JSON.parse(newer.content) as LabelContent) : null;
  }
  const content = JSON.parse(label.content) as LabelContent;
  const checked: CheckedLabel = {
    code: label.code,
    supersededAt: label.supersededAt ?? null,
    reviewBy: label.reviewBy,
    content,
    display: labelDisplay(content),
    current,
    currentDisplay: current ? labelDisplay(current) : null,
  };
  checkedLabels.set(code, checked, readAt);
  return checked;
}

export async function checkLabel(ctx: AppContext, rawCode: string): Promise<LabelCheck> {
  const code = parseLabelCode(rawCode);
  const label = code && isLabelCode(code) ? await checkedLabel(code) : null;
  if (!label) throw ApiError.notFound('No label has this code. Check the code, or report the label as not matching.');
  const now = ctx.now();
  const status = labelStatus(label, now);
  return {
    code: label.code,
    status,
    statusNotice: LABEL_STATUS_NOTICES[status],
    content: label.content,
    display: label.display,
    current: status === 'superseded' ? label.current : null,
    currentDisplay: status === 'superseded' ? label.currentDisplay : null,
    checkedAt: now.toISOString(),
  };
}

export async function markPrinted(
  ctx: AppContext,
  actor: AuthUser,
  labelIds: string[],
  transaction?: Transaction,
): Promise<void> {
  await Label.update(
    { printedAt: ctx.now() },
    { where: { id: labelIds, organizationId: actor.organizationId }, transaction },
  );
}

export async function markInstalled(
  ctx: AppContext,
  actor: AuthUser,
  labelId: string,
  photoKey: string | null,
): Promise<LabelDto> {
  const label = await ctx.db.sequelize.transaction(async (transaction) => {
    const l = await findLabel(actor, labelId, transaction);
    if (l.supersededAt)
      throw ApiError.conflict('This label is superseded: install the current label of this equipment instead');
    await l.update({ installedAt: ctx.now(), installedById: actor.id, installPhotoKey: photoKey }, { transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'label.installed',
        entityType: 'label',
        entityId: l.id,
        summary: { tag: l.equipmentTag, photo: !!photoKey },
      },
      transaction,
    );
    return l;
  });
  return (await toLabelDtos([label], ctx.now()))[0];
}

export { REPORT_KINDS };

export async function reportMismatch(
  ctx: AppContext,
  actor: AuthUser,
  labelId: string,
  input: { kind: (typeof REPORT_KINDS)[number]; text: string },
  photoKey: string | null,
): Promise<{ id: string; status: string }> {
  return ctx.db.sequelize.transaction(async (transaction) => {
    const l = await findLabel(actor, labelId, transaction);
    const r = await FieldReport.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        siteId: l.siteId,
        labelId: l.id,
        reporterId: actor.id,
        kind: input.kind,
        text: input.text,
        photoKey,
        status: 'open',
        createdAt: ctx.now(),
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'field-report.opened',
        entityType: 'field-report',
        entityId: r.id,
        summary: { labelId: l.id, tag: l.equipmentTag, kind: input.kind },
      },
      transaction,
    );
    return { id: r.id, status: r.status };
  });
}
