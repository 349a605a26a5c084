/**
 * Study runs in a worker thread: the same results as the engine in the test's own thread (the reference, in the stored
 * form of server/engine/study/storedResults.ts, byte for byte), progress reported, a stop request ends the worker, and the API answers while a run is in progress.
 */
import request from 'supertest';
import { generatedPlant } from '../../server/bench/study';
import { parseStoredResults, runStudy, storedJsonText, storedResultsText } from '../../server/engine/study';
import { JobStopped } from '../../server/services/jobs';
import {
  closeStudyWorkers,
  runStudyOffThread,
  SPLIT_RUN_MIN_CHARS,
  STUDY_WORKER_PARALLELISM,
  studyRunStats,
  studyWorkerCounts,
  warmStudyWorker,
} from '../../server/services/studyWorker';
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { draftStudy } from '../helpers/flows';

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};

/** A 3 001-bus run asked to stop at its first progress report. */
function runStoppedAtFirstProgress() {
  const controller = new AbortController();
  return runStudyOffThread(
    parsed(generatedPlant(30, 99)),
    {},
    {
      signal: controller.signal,
      stopError: () => new JobStopped('stopped for the test'),
      onProgress: () => controller.abort(),
    },
  );
}

describe('runStudyOffThread', () => {
  it('gives the results of runStudy in this thread, byte for byte, and reports progress', async () => {
    const model = parsed(larkspurModel());
    const options = { maxArcDurationMs: 2000, motorDecayCycles: 5 };
    const before = studyRunStats.worker;
    const progress: number[] = [];
    const outcome = await runStudyOffThread(model, options, { onProgress: (done) => progress.push(done) });
    expect(studyRunStats.worker).toBe(before + 1);
    const reference = runStudy(model, options);
    expect(outcome.resultsJson).toBe(storedResultsText(reference));
    expect(outcome.buses).toBe(reference.buses.length);
    expect(outcome.failed).toBe(reference.buses.filter((b) => b.status === 'error').length);
    expect(progress[0]).toBe(0);
  }, 60_000);

  it('a stop request terminates the worker and rejects with the stop reason', async () => {
    const running = runStoppedAtFirstProgress();
    await expect(running).rejects.toThrow('stopped for the test');
  }, 60_000);

  it('a large model is run in parts, one per worker at once: the same results as runStudy, progress summed', async () => {
    const model = parsed(generatedPlant(24, 99));
    expect(JSON.stringify(model).length).toBeGreaterThanOrEqual(SPLIT_RUN_MIN_CHARS);
    const progress: [number, number][] = [];
    const outcome = await runStudyOffThread(model, {}, { onProgress: (done, total) => progress.push([done, total]) });
    const reference = runStudy(model, {});
    // Read back: the whole results, byte for byte (ECMA-404 / JSON.stringify is the reference).
    expect(JSON.stringify(parseStoredResults(outcome.resultsJson))).toBe(JSON.stringify(reference));
    expect(outcome.buses).toBe(reference.buses.length);
    // In parts where the machine has the cores for it (form 3 names each part's first bus), else in one (form 2).
    const stored = JSON.parse(storedJsonText(outcome.resultsJson)) as { storedFormat: number; parts?: unknown[] };
    expect(stored.storedFormat).toBe(STUDY_WORKER_PARALLELISM > 1 ? 3 : 2);
    expect(stored.parts?.length ?? 1).toBe(STUDY_WORKER_PARALLELISM);
    // Progress is reported over the whole run (the parts' sums, from the moment every part has said its total: one
    // part may be under way by then), never going back, never past it.
    expect(progress.length).toBeGreaterThan(0);
    let before = 0;
    for (const [done, total] of progress) {
      expect(total).toBe(reference.buses.length);
      expect(done).toBeGreaterThanOrEqual(before);
      expect(done).toBeLessThanOrEqual(total);
      before = done;
    }
  }, 120_000);
});

/**
 * The warm worker: kept between runs, never reused after a stop, a second worker for a run that starts while the warm
 * one is busy. The reference for every result is runStudy in the test's own thread (the engine is deterministic).
 */
describe('the warm study worker', () => {
  const options = { maxArcDurationMs: 2000, motorDecayCycles: 5 };
  // From no worker at all (the tests above leave warm ones).
  beforeAll(async () => {
    await closeStudyWorkers();
  });
  afterAll(async () => {
    await closeStudyWorkers();
  });

  it('two runs in a row use one worker and give the same results as runStudy', async () => {
    const model = parsed(larkspurModel());
    const reference = storedResultsText(runStudy(model, options));
    const first = await runStudyOffThread(model, options);
    const started = studyRunStats.workersStarted;
    expect(studyWorkerCounts()).toEqual({ live: 1, idle: 1 });
    const second = await runStudyOffThread(JSON.stringify(model), options);
    expect(studyRunStats.workersStarted).toBe(started);
    expect(first.resultsJson).toBe(reference);
    expect(second.resultsJson).toBe(reference);
    // A run's snapshot (checked when the run started, not validated again in the worker): the same results.
    const checked = await runStudyOffThread(JSON.stringify(model), options, { modelChecked: true });
    expect(checked.resultsJson).toBe(reference);
    // A different plant on the same worker: nothing of the previous run leaks into the next one.
    const plant = parsed(generatedPlant(8, 7));
    const third = await runStudyOffThread(plant, {});
    expect(studyRunStats.workersStarted).toBe(started);
    expect(third.resultsJson).toBe(storedResultsText(runStudy(plant, {})));
    expect(studyWorkerCounts()).toEqual({ live: 1, idle: 1 });
  }, 60_000);

  it("a stopped run's workers are terminated and not reused: the next run starts a new one", async () => {
    await closeStudyWorkers();
    await runStudyOffThread(parsed(generatedPlant(4, 3)), {});
    expect(studyWorkerCounts().idle).toBe(1);
    const started = studyRunStats.workersStarted;
    const running = runStoppedAtFirstProgress();
    await expect(running).rejects.toThrow('stopped for the test');
    // The stopped run (3 001 buses: in parts where the cores allow) took the warm worker, started one for each other
    // part, and every one of them is gone.
    expect(studyRunStats.workersStarted).toBe(started + STUDY_WORKER_PARALLELISM - 1);
    expect(studyWorkerCounts()).toEqual({ live: 0, idle: 0 });
    const model = parsed(larkspurModel());
    const next = await runStudyOffThread(model, options);
    expect(studyRunStats.workersStarted).toBe(started + STUDY_WORKER_PARALLELISM);
    expect(next.resultsJson).toBe(storedResultsText(runStudy(model, options)));
  }, 60_000);

  it('two concurrent runs each get a worker, both finish with the right results, and stay idle', async () => {
    const a = parsed(larkspurModel());
    const b = parsed(generatedPlant(10, 5));
    await runStudyOffThread(a, options);
    const started = studyRunStats.workersStarted;
    const [ra, rb] = await Promise.all([runStudyOffThread(a, options), runStudyOffThread(b, {})]);
    expect(studyRunStats.workersStarted).toBe(started + 1);
    expect(ra.resultsJson).toBe(storedResultsText(runStudy(a, options)));
    expect(rb.resultsJson).toBe(storedResultsText(runStudy(b, {})));
    // As many idle workers are kept as a large run is split over.
    expect(studyWorkerCounts()).toEqual({ live: STUDY_WORKER_PARALLELISM, idle: STUDY_WORKER_PARALLELISM });
    await closeStudyWorkers();
    expect(studyWorkerCounts()).toEqual({ live: 0, idle: 0 });
  }, 60_000);

  it('the warm-up at start leaves a warm worker per part of a large run; a run started during it takes one', async () => {
    await closeStudyWorkers();
    const started = studyRunStats.workersStarted;
    const model = parsed(larkspurModel());
    const warming = warmStudyWorker(generatedPlant(2, 9), 2);
    const run = runStudyOffThread(model, options);
    const [, outcome] = await Promise.all([warming, run]);
    expect(studyRunStats.workersStarted).toBe(started + STUDY_WORKER_PARALLELISM);
    expect(outcome.resultsJson).toBe(storedResultsText(runStudy(model, options)));
    expect(studyWorkerCounts()).toEqual({ live: STUDY_WORKER_PARALLELISM, idle: STUDY_WORKER_PARALLELISM });
    // Once per process: a second call starts nothing.
    await warmStudyWorker();
    expect(studyRunStats.workersStarted).toBe(started + STUDY_WORKER_PARALLELISM);
    await closeStudyWorkers();
  }, 60_000);
});

describe('the API while a large study runs', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp();
  }, 60_000);
  afterAll(async () => {
    await t.close();
  });

  it('answers the health check and run status while the run is in progress, then stores the results', async () => {
    const eng = bearer(t.orgA.users.engineer.token);
    const studyId = await draftStudy(t, 'Worker yard', 'Worker run', generatedPlant(20, 99));
    const run = await request(t.app)
      .post(`/api/studies/${studyId}/run`)
      .set(...eng);
    expect(run.status).toBe(202);
    let answeredWhileRunning = 0;
    for (;;) {
      const status = await request(t.app)
        .get(`/api/studies/${studyId}/run`)
        .set(...eng);
      if (status.body.status === 'done' || status.body.status === 'failed') {
        expect(status.body.status).toBe('done');
        break;
      }
      const health = await request(t.app).get('/api/health');
      expect(health.status).toBe(200);
      if (status.body.status === 'running') answeredWhileRunning += 1;
      await new Promise((r) => setTimeout(r, 20));
    }
    expect(answeredWhileRunning).toBeGreaterThan(0);
    await t.ctx.jobs.idle();
    const results = await request(t.app)
      .get(`/api/studies/${studyId}/results`)
      .set(...eng);
    expect(results.status).toBe(200);
  }, 120_000);
});
