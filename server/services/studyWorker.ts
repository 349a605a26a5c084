import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import {
  createScenarioRunner,
  storedResultsFromPieces,
  storedResultsText,
  type StudyOptions,
  type StudyRunOutcome,
  type StudyRunPiece,
} from '../engine/study';
import { markCheckedModel } from '../engine/shortcircuit';
import { log } from '../log';
import { generatedPlant } from '../seed/generatedPlant';
import { yieldToLoop } from './jobs';
import { mitigationOutcome, mitigationOutcomes, type MitigationOutcome, type TripTypes } from '../engine/mitigation';
import { scenarioBusResult, type ScenarioBusOutcome } from './scenarioBus';

/**
 * Study runs are computed in a worker thread, so a large plant never holds up the server's event loop (requests,
 * health checks, label checks, other jobs). The worker gets the model and settings as plain JSON, runs every labelled
 * bus, reports progress as messages and hands back the results already serialized (the JSON text that is stored).
 * The worker loads the TypeScript source through tsx's require hook, as the label PDF worker does (it works under tsx,
 * `node --import tsx` and ts-jest); where a worker cannot start, the run is computed in the main thread bus by bus,
 * yielding between buses (logged), as before.
 *
 * Workers are kept warm between runs (loading the engine takes about a second, and a warmed-up engine runs a large
 * plant several times faster): a worker takes one run at a time (`{ type: 'run', id, model, options }`, answered by
 * progress, done or error messages carrying the id) and then waits for the next. A job that starts while the warm
 * workers are busy gets a worker of its own; at most `STUDY_WORKER_PARALLELISM` idle workers are kept, unref'd (they
 * never keep the process alive), each terminated after `IDLE_WORKER_MS` or by `closeStudyWorkers()` (server shutdown,
 * test app close).
 *
 * A large run (a model text of `SPLIT_RUN_MIN_CHARS` or more) is computed in `STUDY_WORKER_PARALLELISM` parts at once,
 * each part a contiguous range of the buses in a worker of its own (server/engine/study/runAll.ts `runBusRange`), and
 * the parts' stored texts are joined (`storedResultsFromPieces`): the same results, read back, as one part would give.
 * A stop request (`signal`) terminates the worker running that job; a worker whose run failed, that errors or that
 * exits is dropped, and the next run starts a new one.
 */

/** Heap limit of one study worker, MB (a 50 000-bus plant needs well under this). */
const WORKER_HEAP_MB = 1536;

/** An idle warm worker is terminated after this long without a run. */
export const IDLE_WORKER_MS = 10 * 60_000;

/**
 * Workers a large run is split over, and idle workers kept warm: two where the machine has two cores or more (the
 * server's own thread is mostly idle during a run), one otherwise.
 */
export const STUDY_WORKER_PARALLELISM = Math.max(1, Math.min(2, os.availableParallelism()));

/**
 * A run whose model text is at least this long (about 2 000 buses) is split over `STUDY_WORKER_PARALLELISM` workers:
 * below it, parsing the model and building the network twice costs more than the split saves.
 */
export const SPLIT_RUN_MIN_CHARS = 1_000_000;

// The run's model and results are locals of the message handler: nothing of a finished run stays referenced.
const BOOTSTRAP = `
const { parentPort, workerData } = require('node:worker_threads');
try { require('tsx/cjs/api').register(); } catch (e) { /* already JavaScript */ }
const { runAllBuses, runBusRange, markCheckedModel } = require(workerData.modulePath);
let busModule = null;
let mitigationModule = null;
parentPort.on('message', (msg) => {
  if (msg && msg.type === 'mitigate') {
    let result;
    try {
      mitigationModule = mitigationModule || require(workerData.mitigationModulePath);
      result = msg.busIds
        ? mitigationModule.mitigationOutcomes(msg.model, msg.busIds, msg.targetCalPerCm2, msg.options, msg.tripTypes)
        : mitigationModule.mitigationOutcome(msg.model, msg.busId, msg.targetCalPerCm2, msg.options, msg.tripTypes);
    } catch (e) {
      parentPort.postMessage({ type: 'error', id: msg.id, message: e && e.message ? e.message : String(e) });
      return;
    }
    parentPort.postMessage({ type: 'done', id: msg.id, outcome: result });
    return;
  }
  if (msg && msg.type === 'bus') {
    let result;
    try {
      busModule = busModule || require(workerData.busModulePath);
      const model = typeof msg.model === 'string' ? JSON.parse(msg.model) : msg.model;
      result = busModule.scenarioBusResult(model, msg.options, msg.scenarioId, msg.busId, msg.key);
    } catch (e) {
      parentPort.postMessage({ type: 'error', id: msg.id, message: e && e.message ? e.message : String(e) });
      return;
    }
    parentPort.postMessage({ type: 'done', id: msg.id, outcome: result });
    return;
  }
  if (!msg || msg.type !== 'run') return;
  const id = msg.id;
  let outcome;
  try {
    const progress = (done, total) => parentPort.postMessage({ type: 'progress', id, done, total });
    // A warm-up runs the same model text several times (rounds), each from its own parse, as a run would.
    for (let i = 0; i < (msg.rounds || 1); i++) {
      const model = typeof msg.model === 'string' ? JSON.parse(msg.model) : msg.model;
      if (msg.checked) markCheckedModel(model);
      outcome = msg.part ? runBusRange(model, msg.options, progress, msg.part) : runAllBuses(model, msg.options, progress);
    }
  } catch (e) {
    parentPort.postMessage({ type: 'error', id, message: e && e.message ? e.message : String(e) });
    return;
  }
  parentPort.postMessage({ type: 'done', id, outcome });
});
`;

export interface StudyJobOptions {
  onProgress?: (done: number, total: number) => void;
  /** Aborted: the worker is terminated and the promise rejects with `stopError()`. */
  signal?: AbortSignal;
  stopError?: () => Error;
  /**
   * The model is the JSON text of a model `parseModel` accepted, as it stands (a run's snapshot, checked when the run
   * started): the engine does not validate it again.
   */
  modelChecked?: boolean;
}

/**
 * Where runs were computed since start: in a worker, or in the main thread because no worker could start; and how
 * many workers were started (a warm worker is reused, so this grows slower than `worker`).
 */
export const studyRunStats = { worker: 0, mainThread: 0, workersStarted: 0 };

class WorkerUnavailable extends Error {}

interface Job {
  id: number;
  onProgress?: (done: number, total: number) => void;
  /** A run's StudyRunOutcome, or a bus job's ScenarioBusOutcome. */
  resolve: (outcome: unknown) => void;
  reject: (e: Error) => void;
}

interface Slot {
  worker: Worker;
  /** The run in progress (null: idle). */
  job: Job | null;
  idleTimer: NodeJS.Timeout | null;
}

/** Every live worker, and the idle ones among them (at most `STUDY_WORKER_PARALLELISM`, the latest idle last). */
const slots = new Set<Slot>();
const idleSlots: Slot[] = [];
let nextJobId = 1;

/** Live and idle study workers (for tests and diagnostics). */
export function studyWorkerCounts(): { live: number; idle: number } {
  return { live: slots.size, idle: idleSlots.length };
}

type WorkerMessage = {
  type: string;
  id?: number;
  done?: number;
  total?: number;
  outcome?: unknown;
  message?: string;
};

function workerError(e: Error & { code?: string }): Error {
  if (e.code === 'ERR_WORKER_OUT_OF_MEMORY') return new Error('The study needed more memory than allowed for one run');
  if (/Cannot find module|ERR_MODULE_NOT_FOUND|ERR_UNKNOWN_FILE_EXTENSION/.test(e.message)) {
    return new WorkerUnavailable(e.message);
  }
  return e;
}

/** The worker leaves the pool (its job, if any, is settled by whoever calls this or by its exit event). */
function forget(slot: Slot): void {
  slots.delete(slot);
  const at = idleSlots.indexOf(slot);
  if (at >= 0) idleSlots.splice(at, 1);
  if (slot.idleTimer) clearTimeout(slot.idleTimer);
  slot.idleTimer = null;
}

function drop(slot: Slot): Promise<unknown> {
  forget(slot);
  return slot.worker.terminate().catch(() => undefined);
}

function startSlot(): Slot {
  const worker = new Worker(BOOTSTRAP, {
    eval: true,
    workerData: {
      modulePath: path.join(__dirname, '..', 'engine', 'study', 'runAll'),
      busModulePath: path.join(__dirname, 'scenarioBus'),
      mitigationModulePath: path.join(__dirname, '..', 'engine', 'mitigation'),
    },
    resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB },
  });
  studyRunStats.workersStarted += 1;
  const slot: Slot = { worker, job: null, idleTimer: null };
  slots.add(slot);
  const take = (): Job | null => {
    const job = slot.job;
    slot.job = null;
    return job;
  };
  worker.on('message', (m: WorkerMessage) => {
    const job = slot.job;
    if (!job || m.id !== job.id) return;
    if (m.type === 'progress') job.onProgress?.(m.done as number, m.total as number);
    else if (m.type === 'done') {
      take();
      release(slot);
      job.resolve(m.outcome);
    } else if (m.type === 'error') {
      take();
      void drop(slot);
      job.reject(new Error(m.message));
    }
  });
  worker.on('error', (e: Error & { code?: string }) => {
    const job = take();
    void drop(slot);
    job?.reject(workerError(e));
  });
  worker.on('exit', (code) => {
    const job = take();
    forget(slot);
    job?.reject(new Error(`The study worker stopped (exit code ${code})`));
  });
  return slot;
}

/** A finished worker waits for the next run (unref'd, with an idle timeout), unless enough others already wait. */
function release(slot: Slot): void {
  if (!slots.has(slot) || idleSlots.includes(slot)) return;
  if (idleSlots.length >= STUDY_WORKER_PARALLELISM) {
    void drop(slot);
    return;
  }
  idleSlots.push(slot);
  slot.worker.unref();
  slot.idleTimer = setTimeout(() => void drop(slot), IDLE_WORKER_MS);
  slot.idleTimer.unref();
}

/** An idle warm worker (ref'd again), or a new one. */
function acquire(): Slot {
  const slot = idleSlots.pop();
  if (slot) {
    if (slot.idleTimer) clearTimeout(slot.idleTimer);
    slot.idleTimer = null;
    slot.worker.ref();
    return slot;
  }
  return startSlot();
}

/** The warm-up in progress (a run that starts meanwhile waits for its worker instead of starting a cold one). */
let warming: Promise<void> | null = null;
let warmedUp = false;

/**
 * Starts `STUDY_WORKER_PARALLELISM` study workers and runs a generated plant `rounds` times in each, so that the first
 * real run after a server start finds the engine loaded and compiled: a worker that has run 2 000 buses three times
 * runs a 10 000-bus plant about as fast as it ever will, one that ran 400 buses once about 1.7× slower (the JIT
 * compiler tiers up, and the heap grows, over the first several thousand buses). Off the request thread (about two
 * seconds of each core at start); the workers are then kept idle like any other. Runs once per process, and not while
 * a run is in progress. Never rejects: a warm-up that fails is logged and the next run starts its own workers.
 */
export function warmStudyWorker(input: ModelInput = generatedPlant(20, 99), rounds = 3): Promise<void> {
  if (warming) return warming;
  // Once per process; and never beside a run in progress (that worker is warming up already).
  if (warmedUp || slots.size > idleSlots.length) return Promise.resolve();
  warmedUp = true;
  const parsed = parseModel(input);
  if (!parsed.success) {
    log.warn({ issues: parsed.issues.slice(0, 3) }, 'study worker warm-up: the warm-up model is invalid');
    return Promise.resolve();
  }
  // One warm-up job in each worker at once (each takes a worker of its own), its rounds run one after the other.
  const text = JSON.stringify(parsed.model);
  const runs = Array.from({ length: STUDY_WORKER_PARALLELISM }, () =>
    inWorker<StudyRunOutcome>((id) => ({ type: 'run', id, model: text, options: {}, rounds }), {}),
  );
  warming = Promise.all(runs)
    .then(() => undefined)
    .catch((err: unknown) => log.warn({ err }, 'study worker warm-up failed'))
    .finally(() => {
      warming = null;
    });
  return warming;
}

/** Terminates every study worker (idle or running: a running job rejects). For server shutdown and test teardown. */
export async function closeStudyWorkers(): Promise<void> {
  await Promise.all([...slots].map((slot) => drop(slot)));
}

/** In how many parts a run of this model text is computed. */
function partsFor(modelJson: string): number {
  return modelJson.length >= SPLIT_RUN_MIN_CHARS ? STUDY_WORKER_PARALLELISM : 1;
}

function runInWorker(model: Model | string, options: StudyOptions, opts: StudyJobOptions): Promise<StudyRunOutcome> {
  const text = typeof model === 'string' ? model : JSON.stringify(model);
  const parts = partsFor(text);
  if (parts > 1) return runInParts(text, opts.modelChecked === true && typeof model === 'string', options, opts, parts);
  // Plain JSON across the thread boundary; the model's JSON text as stored is passed as is (parsed in the worker).
  return inWorker<StudyRunOutcome>(
    (id) => ({
      type: 'run',
      id,
      model: typeof model === 'string' ? model : (JSON.parse(JSON.stringify(model)) as unknown),
      options: JSON.parse(JSON.stringify(options)) as unknown,
      checked: opts.modelChecked === true && typeof model === 'string',
    }),
    opts,
  );
}

/**
 * A run in `count` parts at once, each in a worker of its own (`runBusRange`), joined into the stored text of the
 * whole run. Progress is the sum over the parts (reported once every part has reported its total). A part that fails
 * stops the others, and the run fails with that part's error; a stop request stops every part.
 */
async function runInParts(
  modelJson: string,
  /** The text is a checked model's, as stored (`StudyJobOptions.modelChecked`). */
  checked: boolean,
  options: StudyOptions,
  opts: StudyJobOptions,
  count: number,
): Promise<StudyRunOutcome> {
  const controller = new AbortController();
  const stopAll = () => controller.abort();
  if (opts.signal?.aborted) stopAll();
  opts.signal?.addEventListener('abort', stopAll, { once: true });
  const done = new Array<number>(count).fill(0);
  const totals = new Array<number>(count).fill(-1);
  const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
  const plainOptions = JSON.parse(JSON.stringify(options)) as unknown;
  try {
    const pieces = await Promise.all(
      Array.from({ length: count }, (_, index) =>
        inWorker<StudyRunPiece>(
          (id) => ({
            type: 'run',
            id,
            model: modelJson,
            options: plainOptions,
            checked,
            part: { index, count },
          }),
          {
            signal: controller.signal,
            stopError: opts.stopError,
            onProgress: (d, total) => {
              done[index] = d;
              totals[index] = total;
              if (totals.every((t) => t >= 0)) opts.onProgress?.(sum(done), sum(totals));
            },
          },
        ).catch((e: unknown) => {
          stopAll();
          throw e;
        }),
      ),
    );
    return {
      resultsJson: storedResultsFromPieces(
        pieces[0].head,
        pieces.map((p) => p.piece),
      ),
      buses: sum(pieces.map((p) => p.buses)),
      failed: sum(pieces.map((p) => p.failed)),
    };
  } finally {
    opts.signal?.removeEventListener('abort', stopAll);
  }
}

/** One job in a warm worker: `message(id)` is what is posted; the promise settles with the job's outcome. */
async function inWorker<T>(message: (id: number) => Record<string, unknown>, opts: StudyJobOptions): Promise<T> {
  // A job that starts during the warm-up takes a warmed worker when it is done, rather than start a cold one.
  if (warming && idleSlots.length === 0) await warming;
  return new Promise<T>((resolve, reject) => {
    const stopped = () => opts.stopError?.() ?? new Error('The study run was stopped');
    if (opts.signal?.aborted) {
      reject(stopped());
      return;
    }
    let slot: Slot;
    try {
      slot = acquire();
    } catch (e) {
      reject(new WorkerUnavailable(e instanceof Error ? e.message : String(e)));
      return;
    }
    const onAbort = () => {
      if (slot.job !== job) return;
      slot.job = null;
      void drop(slot);
      reject(stopped());
    };
    const job: Job = {
      id: nextJobId++,
      onProgress: opts.onProgress,
      resolve: (outcome) => {
        opts.signal?.removeEventListener('abort', onAbort);
        resolve(outcome as T);
      },
      reject: (e) => {
        opts.signal?.removeEventListener('abort', onAbort);
        reject(e);
      },
    };
    slot.job = job;
    opts.signal?.addEventListener('abort', onAbort, { once: true });
    try {
      slot.worker.postMessage(message(job.id));
    } catch (e) {
      slot.job = null;
      void drop(slot);
      job.reject(e instanceof Error ? e : new Error(String(e)));
    }
  });
}

/** The same run in the main thread, bus by bus, yielding to the event loop and checking the stop request. */
async function runInMainThread(
  model: Model | string,
  options: StudyOptions,
  opts: StudyJobOptions,
): Promise<StudyRunOutcome> {
  const parsed = typeof model === 'string' ? (JSON.parse(model) as Model) : model;
  if (opts.modelChecked && typeof model === 'string') markCheckedModel(parsed);
  const runner = createScenarioRunner(parsed, options);
  const count = runner.busIds.length;
  const total = count * runner.evaluations;
  const buses = [];
  let last = Date.now();
  for (let i = 0; i < count; i++) {
    buses.push(runner.runBus(runner.busIds[i]));
    if (i % 10 === 9) {
      await yieldToLoop();
      if (opts.signal?.aborted) throw opts.stopError?.() ?? new Error('The study run was stopped');
    }
    if (Date.now() - last > 250) {
      last = Date.now();
      opts.onProgress?.((i + 1) * runner.evaluations, total);
    }
  }
  return {
    resultsJson: storedResultsText(runner.finish(buses)),
    buses: buses.length,
    failed: buses.filter((b) => b.status === 'error').length,
  };
}

/** A whole study run off the main thread (in the main thread only when no worker can start). */
export async function runStudyOffThread(
  /** The model, or its JSON text (as stored on the run: parsed in the worker). */
  model: Model | string,
  options: StudyOptions,
  opts: StudyJobOptions = {},
): Promise<StudyRunOutcome> {
  try {
    const outcome = await runInWorker(model, options, opts);
    studyRunStats.worker += 1;
    return outcome;
  } catch (e) {
    if (!(e instanceof WorkerUnavailable)) throw e;
    log.warn({ err: e }, 'study worker unavailable; running the study in the main thread');
    studyRunStats.mainThread += 1;
    return runInMainThread(model, options, opts);
  }
}

/**
 * One bus of a finished run in one operating scenario (server/services/scenarioBus.ts), in a warm study worker: for a
 * large model, building the scenario's network takes long enough to hold up other requests. `modelJson` is the run's
 * model snapshot as stored; `key` names the run and scenario (the worker keeps the last runners by it). Where no
 * worker can start it is computed in the main thread (logged).
 */
export async function scenarioBusOffThread(
  modelJson: string,
  options: StudyOptions,
  scenarioId: string,
  busId: string,
  key: string,
): Promise<ScenarioBusOutcome> {
  try {
    return await inWorker<ScenarioBusOutcome>(
      (id) => ({
        type: 'bus',
        id,
        model: modelJson,
        options: JSON.parse(JSON.stringify(options)) as unknown,
        scenarioId,
        busId,
        key,
      }),
      {},
    );
  } catch (e) {
    if (!(e instanceof WorkerUnavailable)) throw e;
    log.warn({ err: e }, 'study worker unavailable; computing the scenario bus in the main thread');
    return scenarioBusResult(JSON.parse(modelJson) as Model, options, scenarioId, busId, key);
  }
}

/**
 * Mitigation options for one bus (server/engine/mitigation) in a warm study worker: the search runs the study engine
 * on every candidate patch (and every other bus for each option), which for anything but a small model takes long
 * enough to hold up other requests. `modelJson` is the study's checked model as JSON text. Where no worker can start
 * it is computed in the main thread (logged).
 */
export async function mitigationOffThread(
  modelJson: string,
  options: StudyOptions,
  busId: string,
  targetCalPerCm2: number,
  tripTypes: TripTypes = {},
): Promise<MitigationOutcome> {
  try {
    return await inWorker<MitigationOutcome>(
      (id) => ({
        type: 'mitigate',
        id,
        model: modelJson,
        options: JSON.parse(JSON.stringify(options)) as unknown,
        busId,
        targetCalPerCm2,
        tripTypes: JSON.parse(JSON.stringify(tripTypes)) as unknown,
      }),
      {},
    );
  } catch (e) {
    if (!(e instanceof WorkerUnavailable)) throw e;
    log.warn({ err: e }, 'study worker unavailable; computing the mitigation options in the main thread');
    return mitigationOutcome(modelJson, busId, targetCalPerCm2, options, tripTypes);
  }
}

/**
 * Mitigation options for several buses of one model toward one target (the report's appendix) in one warm worker
 * call: one evaluator for all of them (server/engine/mitigation, `mitigationOutcomes`), so the short-circuit solutions
 * and the results already computed are shared. In the order asked.
 */
export async function mitigationsOffThread(
  modelJson: string,
  options: StudyOptions,
  busIds: readonly string[],
  targetCalPerCm2: number,
  tripTypes: TripTypes = {},
): Promise<MitigationOutcome[]> {
  try {
    return await inWorker<MitigationOutcome[]>(
      (id) => ({
        type: 'mitigate',
        id,
        model: modelJson,
        options: JSON.parse(JSON.stringify(options)) as unknown,
        busIds: [...busIds],
        targetCalPerCm2,
        tripTypes: JSON.parse(JSON.stringify(tripTypes)) as unknown,
      }),
      {},
    );
  } catch (e) {
    if (!(e instanceof WorkerUnavailable)) throw e;
    log.warn({ err: e }, 'study worker unavailable; computing the mitigation options in the main thread');
    return mitigationOutcomes(modelJson, busIds, targetCalPerCm2, options, tripTypes);
  }
}
