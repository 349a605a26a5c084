import { randomUUID } from 'node:crypto';
import { Op } from 'sequelize';
import type { Model } from '../../shared/schemas/model';
import type { OrganizationSettings } from '../../shared/schemas/organization';
import type { ResultsResponse, RunDto } from '../../shared/schemas/studies';
import { StudyRun } from '../db/models';
import { DEFAULT_MOTOR_DECAY_CYCLES, parseStoredResults, type StudyOptions } from '../engine/study';
import type { AppContext, AuthUser } from './context';
import { ApiError, modelIssuesError } from './errors';
import { checkModelText } from './modelCheck';
import { recordAudit } from './audit';
import { JobStopped, STOPPED_BY_SHUTDOWN } from './jobs';
import { getSettings, labelSettingsOf } from './organization';
import { findStudy } from './scope';
import { toRunDto } from './studies';
import { runStudyOffThread } from './studyWorker';

interface RunSettings {
  maxArcDurationMs: number;
  motorDecayCycles: number;
  /** The organization's choice; absent in runs queued before the setting existed (the engine's default, higher). */
  motorDecayModel?: OrganizationSettings['motorDecayModel'];
  labelSettings: ReturnType<typeof labelSettingsOf>;
}

/**
 * The engine's options a run starts with, from the organization's settings. Whatever else evaluates a model as a run
 * would (mitigation options, server/services/mitigation.ts) uses exactly these, so a run gives the same numbers.
 */
export function runSettingsOf(settings: OrganizationSettings): StudyOptions & RunSettings {
  return {
    maxArcDurationMs: settings.maxArcDurationMs,
    motorDecayCycles: DEFAULT_MOTOR_DECAY_CYCLES,
    motorDecayModel: settings.motorDecayModel,
    labelSettings: labelSettingsOf(settings),
  };
}

/**
 * Starts a run of a draft's current model as a background job and returns at once (202). The run row holds the
 * model and settings snapshots, the progress, and at the end the results with their whole trace.
 */
export async function startRun(ctx: AppContext, actor: AuthUser, studyId: string): Promise<RunDto> {
  const study = await findStudy(actor, studyId);
  if (study.status !== 'draft')
    throw ApiError.conflict(`Revision ${study.revision} is ${study.status}; only a draft is run`);
  // Checked when it was saved or imported (the answer is kept by its text), not again here on the request thread.
  const checked = checkModelText(study.model);
  const snapshot = checked.snapshot;
  if (snapshot === null) throw modelIssuesError([...checked.issues], 'model.');
  if (!checked.hasEquipment) {
    throw new ApiError('bad_request', 'No bus has equipment to label: give at least one bus its equipment class', {
      'model.buses': 'No equipment',
    });
  }
  const active = await StudyRun.findOne({ where: { studyId: study.id, status: { [Op.in]: ['queued', 'running'] } } });
  if (active) return toRunDto(active);
  const runSettings = runSettingsOf(await getSettings(actor.organizationId));
  const run = await ctx.db.sequelize.transaction(async (transaction) => {
    const r = await StudyRun.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        studyId: study.id,
        modelVersion: study.modelVersion,
        status: 'queued',
        message: 'Waiting to start',
        modelSnapshot: snapshot,
        settingsSnapshot: JSON.stringify(runSettings),
        startedById: actor.id,
        startedAt: ctx.now(),
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'study.run-started',
        entityType: 'study',
        entityId: study.id,
        summary: { runId: r.id, modelVersion: study.modelVersion },
      },
      transaction,
    );
    return r;
  });
  ctx.jobs.start(() => executeRun(ctx, run.id), { kind: 'study-run', id: run.id });
  return toRunDto(run);
}

/**
 * The engine's options of a run, from its settings snapshot (as stored when it started): the run and every later
 * evaluation of its buses (a bus in another operating scenario, server/services/results.ts) use exactly these.
 */
export function studyOptionsOf(settingsSnapshot: string): StudyOptions & RunSettings {
  return JSON.parse(settingsSnapshot) as RunSettings;
}

/** The job: the whole run in a worker thread (short circuit once, then bus by bus), recording progress as it goes. */
export async function executeRun(ctx: AppContext, runId: string): Promise<void> {
  const run = await StudyRun.findByPk(runId);
  if (!run || run.status !== 'queued') return;
  try {
    ctx.jobs.throwIfStopping('study-run');
    await run.update({ status: 'running', message: 'Computing short-circuit currents', progress: 0.01 });
    const settings = studyOptionsOf(run.settingsSnapshot);
    // Computed in a worker thread (the API keeps answering); progress is written at most every 250 ms, one write at a time.
    let lastWrite = 0;
    let writing: Promise<unknown> = Promise.resolve();
    // Evaluations are counted bus by bus in the base and in each operating scenario.
    const scenarioCount = 1 + countScenarios(run.modelSnapshot);
    // The model's JSON text goes to the worker as stored (parsed there).
    const outcome = await runStudyOffThread(run.modelSnapshot, settings, {
      signal: ctx.jobs.signal,
      // The snapshot is the checked model's JSON text (startRun stores only that): not validated again in the worker.
      modelChecked: true,
      // A stopping server: the run fails now (no partial results), rather than hold up the shutdown.
      stopError: () => new JobStopped(STOPPED_BY_SHUTDOWN['study-run']),
      onProgress: (done, total) => {
        if (Date.now() - lastWrite < 250 || done === 0) return;
        lastWrite = Date.now();
        writing = writing.then(() =>
          // A progress write that fails is not the run failing (the final write reports the outcome).
          run
            .update({ progress: 0.02 + 0.96 * (done / total), message: progressMessage(done, total, scenarioCount) })
            .catch(() => null),
        );
      },
    });
    await writing;
    ctx.jobs.throwIfStopping('study-run');
    const failed = outcome.failed;
    const scenarioNote = scenarioCount > 1 ? ` in ${scenarioCount} operating scenarios (base included)` : '';
    const message = `${outcome.buses} buses evaluated${scenarioNote}${failed ? `, ${failed} with errors` : ''}`;
    await ctx.db.sequelize.transaction(async (transaction) => {
      await run.update(
        { status: 'done', progress: 1, message, results: outcome.resultsJson, finishedAt: ctx.now() },
        { transaction },
      );
      await recordAudit(
        {
          organizationId: run.organizationId,
          actorId: run.startedById,
          action: 'study.run-finished',
          entityType: 'study',
          entityId: run.studyId,
          summary: { runId: run.id, buses: outcome.buses, busErrors: failed },
        },
        transaction,
      );
    });
  } catch (e) {
    const message = e instanceof Error ? e.message.slice(0, 390) : 'The run failed';
    await run.update({ status: 'failed', message, finishedAt: ctx.now() });
    await recordAudit({
      organizationId: run.organizationId,
      actorId: run.startedById,
      action: 'study.run-failed',
      entityType: 'study',
      entityId: run.studyId,
      summary: { runId: run.id, message },
    });
  }
}

export async function latestRun(actor: AuthUser, studyId: string): Promise<RunDto> {
  const study = await findStudy(actor, studyId);
  const run = await StudyRun.findOne({
    where: { studyId: study.id },
    order: [['startedAt', 'DESC']],
    attributes: ['id', 'status', 'progress', 'message', 'modelVersion', 'startedAt', 'finishedAt'],
  });
  if (!run) throw ApiError.notFound('This study has not been run yet');
  return toRunDto(run);
}

const NO_RESULTS = 'No results yet: run the study';

/** The results the study stands on: for an approved study the approved run; otherwise the latest finished run. */
export async function getResults(actor: AuthUser, studyId: string): Promise<ResultsResponse> {
  const study = await findStudy(actor, studyId);
  const run = study.approvedRunId
    ? await StudyRun.findByPk(study.approvedRunId)
    : await StudyRun.findOne({ where: { studyId: study.id, status: 'done' }, order: [['startedAt', 'DESC']] });
  if (!run || !run.results) throw ApiError.notFound(NO_RESULTS);
  return {
    run: toRunDto(run),
    model: JSON.parse(run.modelSnapshot) as Model, // stored parsed when the run started
    results: parseStoredResults(run.results),
  };
}

/** Operating scenarios of a stored model snapshot (its JSON text), without parsing the whole model. */
function countScenarios(modelJson: string): number {
  if (!modelJson.includes('"scenarios"')) return 0;
  const model = JSON.parse(modelJson) as { scenarios?: unknown[] };
  return Array.isArray(model.scenarios) ? model.scenarios.length : 0;
}

/** "Bus 40 of 120", or with scenarios "Bus 14 of 40, 3 scenarios each (42 of 120 evaluations)". */
function progressMessage(done: number, total: number, scenarioCount: number): string {
  if (scenarioCount <= 1) return `Bus ${done} of ${total}`;
  const buses = Math.round(total / scenarioCount);
  return `Bus ${Math.ceil(done / scenarioCount)} of ${buses}, ${scenarioCount} scenarios each (${done} of ${total} evaluations)`;
}
