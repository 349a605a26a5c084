import { createHash, randomUUID } from 'node:crypto';
import type { Response } from 'express';
import { Op, QueryTypes } from 'sequelize';
import { parseModel, type Model } from '../../shared/schemas/model';
import type { ResultsResponse, RunDto } from '../../shared/schemas/studies';
import type { StudyResults } from '../../shared/schemas/studyResults';
import { StudyRun } from '../db/models';
import { createStudyRunner, DEFAULT_MOTOR_DECAY_CYCLES } from '../engine/study';
import type { AppContext, AuthUser } from '../http/context';
import { ApiError, modelIssuesError } from '../http/errors';
import { recordAudit } from './audit';
import { yieldToLoop } from './jobs';
import { getSettings, labelSettingsOf } from './organization';
import { findStudy, toRunDto } from './studies';

interface RunSettings {
  maxArcDurationMs: number;
  motorDecayCycles: number;
  labelSettings: ReturnType<typeof labelSettingsOf>;
}

/**
 * Starts a run of a draft's current model as a background job and returns at once (202). The run row holds the
 * model and settings snapshots, the progress, and at the end the results with their whole trace.
 */
export async function startRun(ctx: AppContext, actor: AuthUser, studyId: string): Promise<RunDto> {
  const study = await findStudy(actor, studyId);
  if (study.status !== 'draft')
    throw ApiError.conflict(`Revision ${study.revision} is ${study.status}; only a draft is run`);
  const parsed = parseModel(JSON.parse(study.model));
  if (!parsed.success) throw modelIssuesError(parsed.issues, 'model.');
  if (!parsed.model.buses.some((b) => b.equipment)) {
    throw new ApiError('bad_request', 'No bus has equipment to label: give at least one bus its equipment class', {
      'model.buses': 'No equipment',
    });
  }
  const active = await StudyRun.findOne({ where: { studyId: study.id, status: { [Op.in]: ['queued', 'running'] } } });
  if (active) return toRunDto(active);
  const settings = await getSettings(actor.organizationId);
  const runSettings: RunSettings = {
    maxArcDurationMs: settings.maxArcDurationMs,
    motorDecayCycles: DEFAULT_MOTOR_DECAY_CYCLES,
    labelSettings: labelSettingsOf(settings),
  };
  const run = await ctx.db.sequelize.transaction(async (transaction) => {
    const r = await StudyRun.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        studyId: study.id,
        modelVersion: study.modelVersion,
        status: 'queued',
        message: 'Waiting to start',
        modelSnapshot: JSON.stringify(parsed.model),
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

/** The job: short circuit once, then bus by bus, yielding to the event loop and recording progress as it goes. */
export async function executeRun(ctx: AppContext, runId: string): Promise<void> {
  const run = await StudyRun.findByPk(runId);
  if (!run || run.status !== 'queued') return;
  try {
    ctx.jobs.throwIfStopping('study-run');
    await run.update({ status: 'running', message: 'Computing short-circuit currents', progress: 0.01 });
    const model = JSON.parse(run.modelSnapshot) as Model;
    const settings = JSON.parse(run.settingsSnapshot) as RunSettings;
    const runner = createStudyRunner(model, settings);
    const buses = [];
    let lastWrite = Date.now();
    for (let i = 0; i < runner.busIds.length; i++) {
      buses.push(runner.runBus(runner.busIds[i]));
      if (i % 10 === 9) {
        await yieldToLoop();
        // A stopping server: the run fails now (no partial results), rather than hold up the shutdown.
        ctx.jobs.throwIfStopping('study-run');
      }
      if (Date.now() - lastWrite > 250) {
        lastWrite = Date.now();
        await run.update({
          progress: 0.02 + 0.96 * ((i + 1) / runner.busIds.length),
          message: `Bus ${i + 1} of ${runner.busIds.length}`,
        });
      }
    }
    const results: StudyResults = runner.finish(buses);
    const failed = buses.filter((b) => b.status === 'error').length;
    const message = `${buses.length} buses evaluated${failed ? `, ${failed} with errors` : ''}`;
    await ctx.db.sequelize.transaction(async (transaction) => {
      await run.update(
        { status: 'done', progress: 1, message, results: JSON.stringify(results), finishedAt: ctx.now() },
        { transaction },
      );
      await recordAudit(
        {
          organizationId: run.organizationId,
          actorId: run.startedById,
          action: 'study.run-finished',
          entityType: 'study',
          entityId: run.studyId,
          summary: { runId: run.id, buses: buses.length, busErrors: failed },
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

/** The DTO columns of a run row, read by `resultsRunOf` without Sequelize's per-query overhead. */
interface RunDtoRow {
  id: string;
  organizationId: string;
  status: RunDto['status'];
  progress: number | string;
  message: string;
  modelVersion: number | string;
  startedAt: Date | string;
  finishedAt: Date | string | null;
}

const RUN_DTO_COLUMNS =
  '"id", "organizationId", "status", "progress", "message", "modelVersion", "startedAt", "finishedAt"';

/** A DATE column read raw: a Date from PostgreSQL, `YYYY-MM-DD HH:MM:SS.SSS +00:00` text from SQLite. */
function dateOf(v: Date | string): Date {
  const d = v instanceof Date ? v : new Date(v);
  if (Number.isNaN(d.getTime())) throw new Error(`Unreadable date in study_runs: ${String(v)}`);
  return d;
}

/**
 * The run the study's results stand on: for an approved study the approved run; otherwise the latest finished run.
 * The study is found the usual way (organization and role checked); the run by one plain SELECT of its DTO columns
 * (no large column, no model instance). Null when there is none.
 */
async function resultsRunOf(actor: AuthUser, studyId: string): Promise<{ id: string; dto: RunDto } | null> {
  const study = await findStudy(actor, studyId);
  const sql = study.approvedRunId
    ? `SELECT ${RUN_DTO_COLUMNS} FROM "study_runs" WHERE "id" = :runId AND "studyId" = :studyId AND "organizationId" = :organizationId`
    : `SELECT ${RUN_DTO_COLUMNS} FROM "study_runs" WHERE "studyId" = :studyId AND "organizationId" = :organizationId AND "status" = 'done' ORDER BY "startedAt" DESC LIMIT 1`;
  const rows = await StudyRun.sequelize!.query<RunDtoRow>(sql, {
    type: QueryTypes.SELECT,
    replacements: { runId: study.approvedRunId ?? '', studyId: study.id, organizationId: actor.organizationId },
  });
  const r = rows[0];
  if (!r) return null;
  return {
    id: r.id,
    dto: {
      id: r.id,
      status: r.status,
      progress: Number(r.progress),
      message: r.message,
      modelVersion: Number(r.modelVersion),
      startedAt: dateOf(r.startedAt).toISOString(),
      finishedAt: r.finishedAt === null ? null : dateOf(r.finishedAt).toISOString(),
    },
  };
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
    model: JSON.parse(run.modelSnapshot) as Record<string, unknown>,
    results: JSON.parse(run.results) as StudyResults,
  };
}

/** A serialized results response: the exact bytes `res.json()` would send, and their entity tag. */
interface ResultsPayload {
  /** JSON of the run DTO the body was built with: a cached body is used only while the run still reads the same. */
  runJson: string;
  body: Buffer;
  etag: string;
}

/**
 * Serialized results responses by organization and run, least recently used first out. A run's model snapshot and
 * results are written once, when it finishes; the run row itself is read on every request (organization-scoped, and
 * its DTO compared), so the cache only saves reading, parsing and serializing the large columns again.
 */
class ResultsCache {
  private readonly entries = new Map<string, ResultsPayload>();
  private bytes = 0;
  constructor(
    private readonly maxBytes: number,
    private readonly maxEntries: number,
  ) {}

  get(key: string): ResultsPayload | undefined {
    const hit = this.entries.get(key);
    if (hit) {
      // Most recently used last.
      this.entries.delete(key);
      this.entries.set(key, hit);
    }
    return hit;
  }

  set(key: string, value: ResultsPayload): void {
    this.delete(key);
    if (value.body.length > this.maxBytes / 4) return; // one huge study would push out every other
    this.entries.set(key, value);
    this.bytes += value.body.length;
    for (const [oldest] of this.entries) {
      if (this.bytes <= this.maxBytes && this.entries.size <= this.maxEntries) break;
      this.delete(oldest);
    }
  }

  delete(key: string): void {
    const old = this.entries.get(key);
    if (!old) return;
    this.entries.delete(key);
    this.bytes -= old.body.length;
  }

  clear(): void {
    this.entries.clear();
    this.bytes = 0;
  }
}

const resultsCache = new ResultsCache(64 * 1024 * 1024, 256);

/** Empties the results cache (tests start from a cold cache with it). */
export function clearResultsCache(): void {
  resultsCache.clear();
}

/** The results response of a study, serialized, from the cache when its run was read before. */
export async function resultsPayload(actor: AuthUser, studyId: string): Promise<ResultsPayload> {
  const run = await resultsRunOf(actor, studyId);
  if (!run) throw ApiError.notFound(NO_RESULTS);
  const { dto } = run;
  const runJson = JSON.stringify(dto);
  const key = `${actor.organizationId}/${run.id}`;
  const hit = resultsCache.get(key);
  if (hit && hit.runJson === runJson) return hit;

  const large = await StudyRun.findOne({
    where: { id: run.id, organizationId: actor.organizationId },
    attributes: ['id', 'modelSnapshot', 'results'],
  });
  if (!large?.results) {
    resultsCache.delete(key);
    throw ApiError.notFound(NO_RESULTS);
  }
  const response: ResultsResponse = {
    run: dto,
    model: JSON.parse(large.modelSnapshot) as Record<string, unknown>,
    results: JSON.parse(large.results) as StudyResults,
  };
  const body = Buffer.from(JSON.stringify(response));
  const payload: ResultsPayload = { runJson, body, etag: `"${createHash('sha1').update(body).digest('base64url')}"` };
  resultsCache.set(key, payload);
  return payload;
}

/**
 * GET /studies/:studyId/results: the cached serialized response with its ETag; Express answers 304 to a matching
 * If-None-Match.
 */
export async function sendResults(res: Response, actor: AuthUser, studyId: string): Promise<void> {
  const payload = await resultsPayload(actor, studyId);
  res.setHeader('ETag', payload.etag);
  res.setHeader('Content-Type', 'application/json; charset=utf-8');
  res.status(200).send(payload.body);
}
