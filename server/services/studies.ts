import { randomUUID } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import {
  MODEL_FORMAT,
  MODEL_VERSION,
  parseModel,
  type Model,
  type ModelInput,
  type ModelIssue,
} from '../../shared/schemas/model';
import type { ApproveInput, EquipmentDto, ModelEnvelope, RunDto, StudyDto } from '../../shared/schemas/studies';
import { Equipment, Site, Study, StudyRun, User } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { parseStoredResults } from '../engine/study/storedResults';
import { recordAudit } from './audit';
import { modelCheckOfText } from './modelCheck';
import { addMonths } from './dates';
import { issueLabels } from './labels';
import { getSettings } from './organization';
import { APPROVED_WORK, findSite, findStudy, findStudyHead } from './scope';
import { can } from '../../shared/permissions';
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import type { ModelWarning } from '../../shared/schemas/modelWarnings';

// Look-ups by id live in ./scope (organization and role visibility in one place); re-exported for the routes.
export { findStudy, findStudyHead };

export function emptyModel(name: string): Record<string, unknown> {
  return {
    format: MODEL_FORMAT,
    version: MODEL_VERSION,
    name,
    frequencyHz: 60,
    buses: [],
    sources: [],
    transformers: [],
    cables: [],
    motors: [],
    ties: [],
    devices: [],
  };
}

export function toRunDto(r: StudyRun): RunDto {
  return {
    id: r.id,
    status: r.status,
    progress: r.progress,
    message: r.message,
    modelVersion: r.modelVersion,
    startedAt: r.startedAt.toISOString(),
    finishedAt: r.finishedAt ? r.finishedAt.toISOString() : null,
  };
}

async function latestRuns(studyIds: string[]): Promise<Map<string, StudyRun>> {
  const out = new Map<string, StudyRun>();
  if (!studyIds.length) return out;
  const runs = await StudyRun.findAll({
    where: { studyId: studyIds },
    attributes: ['id', 'studyId', 'status', 'progress', 'message', 'modelVersion', 'startedAt', 'finishedAt'],
    order: [['startedAt', 'ASC']],
  });
  for (const r of runs) out.set(r.studyId, r);
  return out;
}

/** Study rows → DTOs with computed review status, staleness and the latest run. */
export async function toStudyDtos(ctx: AppContext, organizationId: string, studies: Study[]): Promise<StudyDto[]> {
  if (!studies.length) return [];
  const settings = await getSettings(organizationId);
  const now = ctx.now();
  const siteIds = [...new Set(studies.map((s) => s.siteId))];
  const sites = new Map((await Site.findAll({ where: { id: siteIds } })).map((s) => [s.id, s.name]));
  const userIds = [...new Set(studies.map((s) => s.lastEditedById).filter((x): x is string => !!x))];
  const users = new Map((await User.findAll({ where: { id: userIds } })).map((u) => [u.id, u.name]));
  const runs = await latestRuns(studies.map((s) => s.id));
  // An approved study is stale when a later revision of its site has had its model changed since the approval.
  const later = await Study.findAll({
    where: { siteId: siteIds, status: { [Op.in]: ['draft', 'in-review'] } },
    attributes: ['siteId', 'revision', 'modelUpdatedAt'],
  });
  return studies.map((s) => {
    const run = runs.get(s.id);
    const reviewDueAt = s.approvedAt ? addMonths(s.approvedAt, settings.reviewIntervalMonths) : null;
    const stale =
      s.status === 'approved' &&
      !!s.approvedAt &&
      later.some((l) => l.siteId === s.siteId && l.revision > s.revision && l.modelUpdatedAt > (s.approvedAt as Date));
    return {
      id: s.id,
      siteId: s.siteId,
      siteName: sites.get(s.siteId) ?? '',
      revision: s.revision,
      title: s.title,
      status: s.status,
      modelVersion: s.modelVersion,
      modelUpdatedAt: s.modelUpdatedAt.toISOString(),
      lastEditedBy: s.lastEditedById ? { id: s.lastEditedById, name: users.get(s.lastEditedById) ?? '' } : null,
      parentStudyId: s.parentStudyId ?? null,
      submittedAt: s.submittedAt ? s.submittedAt.toISOString() : null,
      approval:
        s.approvedAt && reviewDueAt
          ? {
              approvedAt: s.approvedAt.toISOString(),
              approvedById: s.approvedById ?? '',
              approverName: s.approverName ?? '',
              licenceNumber: s.licenceNumber ?? '',
              jurisdiction: s.jurisdiction ?? '',
              reviewDueAt: reviewDueAt.toISOString(),
            }
          : null,
      supersededAt: s.supersededAt ? s.supersededAt.toISOString() : null,
      pastReview: s.status === 'approved' && !!reviewDueAt && reviewDueAt < now,
      stale,
      latestRun: run ? toRunDto(run) : null,
      resultsCurrent: !!run && run.status === 'done' && run.modelVersion === s.modelVersion,
      createdAt: s.createdAt.toISOString(),
    };
  });
}

export async function listStudies(ctx: AppContext, actor: AuthUser, siteId: string): Promise<StudyDto[]> {
  await findSite(actor, siteId);
  const where: Record<string, unknown> = { siteId, organizationId: actor.organizationId };
  if (!can(actor.role, 'seeUnapprovedStudies')) where.status = APPROVED_WORK;
  const studies = await Study.findAll({ where, order: [['revision', 'DESC']] });
  return toStudyDtos(ctx, actor.organizationId, studies);
}

export async function getStudyDto(ctx: AppContext, actor: AuthUser, studyId: string): Promise<StudyDto> {
  const study = await findStudy(actor, studyId);
  return (await toStudyDtos(ctx, actor.organizationId, [study]))[0];
}

/**
 * The site's next revision number. The site row is locked first (SELECT … FOR UPDATE on PostgreSQL; SQLite's
 * writes already take turns), so two revisions started at once on one site wait for each other instead of both
 * reading the same maximum and one failing on the unique (site, revision) index.
 */
export async function nextRevision(siteId: string, transaction: Transaction): Promise<number> {
  await Site.findByPk(siteId, { transaction, lock: transaction.LOCK.UPDATE, attributes: ['id'] });
  const max = (await Study.max('revision', { where: { siteId }, transaction })) as number | null;
  return (max ?? 0) + 1;
}

export async function createStudy(
  ctx: AppContext,
  actor: AuthUser,
  siteId: string,
  input: { title: string; model?: Record<string, unknown> },
): Promise<StudyDto> {
  const site = await findSite(actor, siteId);
  const study = await ctx.db.sequelize.transaction(async (transaction) => {
    const now = ctx.now();
    const s = await Study.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        siteId: site.id,
        revision: await nextRevision(site.id, transaction),
        title: input.title,
        status: 'draft',
        model: JSON.stringify(input.model ?? emptyModel(input.title)),
        modelUpdatedAt: now,
        lastEditedById: actor.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'study.created',
        entityType: 'study',
        entityId: s.id,
        summary: { siteId, revision: s.revision, title: s.title },
      },
      transaction,
    );
    return s;
  });
  return (await toStudyDtos(ctx, actor.organizationId, [study]))[0];
}

export function modelIssues(model: unknown): ModelIssue[] {
  return modelCheck(model).issues;
}

/** A model's problems, and for a sound model its plausibility warnings (shared/modelPlausibility.ts). */
export function modelCheck(model: unknown): { issues: ModelIssue[]; warnings: ModelWarning[] } {
  const r = parseModel(model);
  return r.success ? { issues: [], warnings: plausibilityWarnings(r.model) } : { issues: r.issues, warnings: [] };
}

export async function getModelEnvelope(actor: AuthUser, studyId: string): Promise<ModelEnvelope> {
  const study = await findStudy(actor, studyId);
  // Stored through PUT (checked by draftModelSchema), an import or a new study: a draft, possibly with problems.
  const model = JSON.parse(study.model) as ModelInput;
  return { model, version: study.modelVersion, ...modelCheckOfText(study.model) };
}

function requireDraft(study: Study, what: string): void {
  if (study.status !== 'draft') {
    throw ApiError.conflict(
      study.status === 'approved' || study.status === 'superseded'
        ? `Revision ${study.revision} is ${study.status} and cannot change; start a new revision to ${what}`
        : `Revision ${study.revision} is in review; return it to draft to ${what}`,
    );
  }
}

type CapState = { capS: number | null; reason: string | null } | null;

/**
 * Buses whose own arc-duration cap (or its reason) changes, with the value before and after (null: the study's cap),
 * for the audit log: a cap that differs from the organization's is a safety decision and is recorded as such.
 */
export function arcDurationCapChanges(
  beforeJson: string | null | undefined,
  after: unknown,
): { busId: string; before: CapState; after: CapState }[] {
  const caps = (m: unknown): Map<string, CapState> => {
    const out = new Map<string, CapState>();
    const buses = (m as { buses?: unknown })?.buses;
    if (!Array.isArray(buses)) return out;
    for (const b of buses as {
      id?: unknown;
      equipment?: { arcDurationCapS?: unknown; arcDurationCapReason?: unknown };
    }[]) {
      if (typeof b?.id !== 'string') continue;
      const e = b.equipment;
      const capS = e?.arcDurationCapS;
      out.set(
        b.id,
        capS === undefined
          ? null
          : {
              capS: typeof capS === 'number' ? capS : null,
              reason: typeof e?.arcDurationCapReason === 'string' ? e.arcDurationCapReason : null,
            },
      );
    }
    return out;
  };
  let before: Map<string, CapState>;
  try {
    before = caps(beforeJson ? JSON.parse(beforeJson) : null);
  } catch {
    before = new Map();
  }
  const now = caps(after);
  const changes: { busId: string; before: CapState; after: CapState }[] = [];
  for (const id of new Set([...before.keys(), ...now.keys()])) {
    const a = before.get(id) ?? null;
    const b = now.get(id) ?? null;
    if (JSON.stringify(a) !== JSON.stringify(b) && (a !== null || b !== null))
      changes.push({ busId: id, before: a, after: b });
  }
  return changes;
}

/**
 * Replaces the model of a draft. `expectedVersion` guards against lost updates: a PUT based on an older version
 * gets 409 and changes nothing. Imports pass no version (they replace the model whole).
 */
export async function saveModel(
  ctx: AppContext,
  actor: AuthUser,
  studyId: string,
  model: ModelInput,
  expectedVersion: number | null,
  action = 'study.model-updated',
  summary: Record<string, unknown> = {},
): Promise<ModelEnvelope> {
  return ctx.db.sequelize.transaction(async (transaction) => {
    const study = await findStudy(actor, studyId, transaction);
    requireDraft(study, 'change the model');
    if (expectedVersion !== null && study.modelVersion !== expectedVersion) {
      throw ApiError.conflict(
        `The model was changed by someone else (version ${study.modelVersion}, you edited version ${expectedVersion}); reload to see their changes`,
      );
    }
    const version = study.modelVersion + 1;
    const capChanges = arcDurationCapChanges(study.model, model);
    const text = JSON.stringify(model);
    // Conditional update: a concurrent writer that read the same version loses here instead of overwriting.
    const [count] = await Study.update(
      { model: text, modelVersion: version, modelUpdatedAt: ctx.now(), lastEditedById: actor.id },
      { where: { id: study.id, modelVersion: study.modelVersion }, transaction },
    );
    if (count !== 1) throw ApiError.conflict('The model was changed by someone else; reload to see their changes');
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action,
        entityType: 'study',
        entityId: study.id,
        summary: { version, ...summary, ...(capChanges.length ? { arcDurationCaps: capChanges } : {}) },
      },
      transaction,
    );
    // Checked as stored (the text every later read parses); the answer is kept for the run's start and the next read.
    return { model, version, ...modelCheckOfText(text, model) };
  });
}

async function latestRunOf(studyId: string, transaction?: Transaction): Promise<StudyRun | null> {
  return StudyRun.findOne({ where: { studyId }, order: [['startedAt', 'DESC']], transaction });
}

async function requireCurrentResults(study: Study, transaction: Transaction): Promise<StudyRun> {
  const run = await latestRunOf(study.id, transaction);
  if (!run || run.status !== 'done' || run.modelVersion !== study.modelVersion) {
    throw ApiError.conflict(
      'Run the study on the current model first: the results must match the model being reviewed',
    );
  }
  return run;
}

export async function submitForReview(ctx: AppContext, actor: AuthUser, studyId: string): Promise<StudyDto> {
  const study = await ctx.db.sequelize.transaction(async (transaction) => {
    const s = await findStudy(actor, studyId, transaction);
    requireDraft(s, 'submit it');
    await requireCurrentResults(s, transaction);
    await s.update({ status: 'in-review', submittedAt: ctx.now(), submittedById: actor.id }, { transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'study.submitted',
        entityType: 'study',
        entityId: s.id,
        summary: { revision: s.revision },
      },
      transaction,
    );
    return s;
  });
  return (await toStudyDtos(ctx, actor.organizationId, [study]))[0];
}

export async function returnToDraft(ctx: AppContext, actor: AuthUser, studyId: string): Promise<StudyDto> {
  const study = await ctx.db.sequelize.transaction(async (transaction) => {
    const s = await findStudy(actor, studyId, transaction);
    if (s.status !== 'in-review') throw ApiError.conflict(`Revision ${s.revision} is ${s.status}, not in review`);
    await s.update({ status: 'draft', submittedAt: null, submittedById: null }, { transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'study.returned-to-draft',
        entityType: 'study',
        entityId: s.id,
        summary: { revision: s.revision },
      },
      transaction,
    );
    return s;
  });
  return (await toStudyDtos(ctx, actor.organizationId, [study]))[0];
}

/**
 * Approval by a qualified engineer (name, licence number and jurisdiction recorded). The approved revision becomes
 * immutable; the site's previous approved revision is superseded; the site's equipment list follows the model.
 */
export async function approveStudy(
  ctx: AppContext,
  actor: AuthUser,
  studyId: string,
  input: ApproveInput,
): Promise<StudyDto> {
  const settings = await getSettings(actor.organizationId);
  const study = await ctx.db.sequelize.transaction(async (transaction) => {
    const s = await findStudy(actor, studyId, transaction);
    if (s.status !== 'in-review')
      throw ApiError.conflict(`Only a revision in review can be approved; revision ${s.revision} is ${s.status}`);
    const run = await requireCurrentResults(s, transaction);
    if (settings.requireIndependentApprover && s.lastEditedById === actor.id) {
      throw ApiError.conflict(
        'Your organization requires the approving engineer to differ from the last editor of the model',
      );
    }
    const now = ctx.now();
    const previous = await Study.findAll({
      where: { siteId: s.siteId, status: 'approved', id: { [Op.ne]: s.id } },
      transaction,
    });
    for (const p of previous) {
      await p.update({ status: 'superseded', supersededAt: now }, { transaction });
      await recordAudit(
        {
          organizationId: actor.organizationId,
          actorId: actor.id,
          action: 'study.superseded',
          entityType: 'study',
          entityId: p.id,
          summary: { revision: p.revision, by: s.id },
        },
        transaction,
      );
    }
    await s.update(
      {
        status: 'approved',
        approvedAt: now,
        approvedById: actor.id,
        approverName: input.approverName,
        licenceNumber: input.licenceNumber,
        jurisdiction: input.jurisdiction,
        approvedRunId: run.id,
      },
      { transaction },
    );
    await upsertEquipment(JSON.parse(run.modelSnapshot) as Model, s, transaction);
    const issued = await issueLabels(
      s,
      parseStoredResults(run.results ?? '{"buses":[]}'),
      now,
      settings.reviewIntervalMonths,
      transaction,
      settings.labelUnitOrder,
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'study.approved',
        entityType: 'study',
        entityId: s.id,
        summary: {
          revision: s.revision,
          approverName: input.approverName,
          licenceNumber: input.licenceNumber,
          jurisdiction: input.jurisdiction,
          runId: run.id,
          labelsIssued: issued,
        },
      },
      transaction,
    );
    return s;
  });
  return (await toStudyDtos(ctx, actor.organizationId, [study]))[0];
}

async function upsertEquipment(model: Model, study: Study, transaction: Transaction): Promise<void> {
  for (const bus of model.buses) {
    if (!bus.equipment) continue;
    const existing = await Equipment.findOne({ where: { siteId: study.siteId, tag: bus.id }, transaction });
    const data = {
      name: bus.name ?? bus.id,
      equipmentClass: bus.equipment.class,
      nominalKv: bus.nominalKv,
      lastStudyId: study.id,
    };
    if (existing) await existing.update(data, { transaction });
    else
      await Equipment.create(
        { id: randomUUID(), organizationId: study.organizationId, siteId: study.siteId, tag: bus.id, ...data },
        { transaction },
      );
  }
}

/** A new draft revision copied from an approved or superseded one (approved revisions never change). */
export async function newRevision(ctx: AppContext, actor: AuthUser, studyId: string): Promise<StudyDto> {
  const study = await ctx.db.sequelize.transaction(async (transaction) => {
    const from = await findStudy(actor, studyId, transaction);
    if (from.status === 'draft' || from.status === 'in-review') {
      throw ApiError.conflict(`Revision ${from.revision} is still ${from.status}; edit it instead of starting another`);
    }
    const open = await Study.findOne({
      where: { siteId: from.siteId, status: { [Op.in]: ['draft', 'in-review'] } },
      transaction,
    });
    if (open)
      throw ApiError.conflict(
        `Revision ${open.revision} of this site is already open (${open.status}); finish it first`,
      );
    const s = await Study.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        siteId: from.siteId,
        revision: await nextRevision(from.siteId, transaction),
        title: from.title,
        status: 'draft',
        model: from.model,
        modelUpdatedAt: from.modelUpdatedAt,
        lastEditedById: actor.id,
        parentStudyId: from.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'study.revision-started',
        entityType: 'study',
        entityId: s.id,
        summary: { from: from.id, revision: s.revision },
      },
      transaction,
    );
    return s;
  });
  return (await toStudyDtos(ctx, actor.organizationId, [study]))[0];
}

export async function listEquipment(actor: AuthUser, siteId: string): Promise<EquipmentDto[]> {
  await findSite(actor, siteId);
  const rows = await Equipment.findAll({
    where: { siteId, organizationId: actor.organizationId },
    order: [['tag', 'ASC']],
  });
  return rows.map((e) => ({
    id: e.id,
    tag: e.tag,
    name: e.name,
    equipmentClass: e.equipmentClass,
    nominalKv: e.nominalKv,
    lastStudyId: e.lastStudyId,
    updatedAt: e.updatedAt.toISOString(),
  }));
}
