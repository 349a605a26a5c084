import path from 'node:path';
import { Worker } from 'node:worker_threads';
import type { Model } from '../../shared/schemas/model';
import { createStudyRunner, type StudyOptions, type StudyRunOutcome } from '../engine/study';
import { log } from '../log';
import { yieldToLoop } from './jobs';

/**
 * Study runs are computed in a worker thread, so a large plant never holds up the server's event loop (requests,
 * health checks, label checks, other jobs). The worker gets the model and settings as plain JSON, runs every labelled
 * bus, reports progress as messages and hands back the results already serialized (the JSON text that is stored).
 * A stopping server terminates the worker at once (`signal`). The worker loads the TypeScript source through tsx's
 * require hook, as the label PDF worker does (it works under tsx, `node --import tsx` and ts-jest); where a worker
 * cannot start, the run is computed in the main thread bus by bus, yielding between buses (logged), as before.
 */

/** Heap limit of one study worker, MB (a 50 000-bus plant needs well under this). */
const WORKER_HEAP_MB = 1536;

const BOOTSTRAP = `
const { parentPort, workerData } = require('node:worker_threads');
try { require('tsx/cjs/api').register(); } catch (e) { /* already JavaScript */ }
const { runAllBuses } = require(workerData.modulePath);
try {
  const model = typeof workerData.model === 'string' ? JSON.parse(workerData.model) : workerData.model;
  const outcome = runAllBuses(model, workerData.options, (done, total) =>
    parentPort.postMessage({ type: 'progress', done, total }),
  );
  parentPort.postMessage({ type: 'done', outcome });
} catch (e) {
  parentPort.postMessage({ type: 'error', message: e && e.message ? e.message : String(e) });
}
`;

export interface StudyJobOptions {
  onProgress?: (done: number, total: number) => void;
  /** Aborted: the worker is terminated and the promise rejects with `stopError()`. */
  signal?: AbortSignal;
  stopError?: () => Error;
}

/** Where runs were computed since start: in a worker, or in the main thread because no worker could start. */
export const studyRunStats = { worker: 0, mainThread: 0 };

class WorkerUnavailable extends Error {}

function runInWorker(model: Model | string, options: StudyOptions, opts: StudyJobOptions): Promise<StudyRunOutcome> {
  return new Promise((resolve, reject) => {
    const stopped = () => opts.stopError?.() ?? new Error('The study run was stopped');
    if (opts.signal?.aborted) {
      reject(stopped());
      return;
    }
    let worker: Worker;
    try {
      worker = new Worker(BOOTSTRAP, {
        eval: true,
        // Plain JSON across the thread boundary.
        workerData: {
          modulePath: path.join(__dirname, '..', 'engine', 'study', 'runAll'),
          // The model's JSON text as stored is passed as is (parsed in the worker, not here).
          model: typeof model === 'string' ? model : (JSON.parse(JSON.stringify(model)) as unknown),
          options: JSON.parse(JSON.stringify(options)) as unknown,
        },
        resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB },
      });
    } catch (e) {
      reject(new WorkerUnavailable(e instanceof Error ? e.message : String(e)));
      return;
    }
    let settled = false;
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      opts.signal?.removeEventListener('abort', onAbort);
      fn();
      void worker.terminate();
    };
    const onAbort = () => finish(() => reject(stopped()));
    opts.signal?.addEventListener('abort', onAbort, { once: true });
    worker.on(
      'message',
      (m: { type: string; done?: number; total?: number; outcome?: StudyRunOutcome; message?: string }) => {
        if (m.type === 'progress') opts.onProgress?.(m.done as number, m.total as number);
        else if (m.type === 'done') finish(() => resolve(m.outcome as StudyRunOutcome));
        else if (m.type === 'error') finish(() => reject(new Error(m.message)));
      },
    );
    worker.on('error', (e: Error & { code?: string }) =>
      finish(() =>
        reject(
          e.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? new Error('The study needed more memory than allowed for one run')
            : /Cannot find module|ERR_MODULE_NOT_FOUND|ERR_UNKNOWN_FILE_EXTENSION/.test(e.message)
              ? new WorkerUnavailable(e.message)
              : e,
        ),
      ),
    );
    worker.on('exit', (code) => finish(() => reject(new Error(`The study worker stopped (exit code ${code})`))));
  });
}

/** The same run in the main thread, bus by bus, yielding to the event loop and checking the stop request. */
async function runInMainThread(
  model: Model | string,
  options: StudyOptions,
  opts: StudyJobOptions,
): Promise<StudyRunOutcome> {
  const runner = createStudyRunner(typeof model === 'string' ? (JSON.parse(model) as Model) : model, options);
  const total = runner.busIds.length;
  const buses = [];
  let last = Date.now();
  for (let i = 0; i < total; i++) {
    buses.push(runner.runBus(runner.busIds[i]));
    if (i % 10 === 9) {
      await yieldToLoop();
      if (opts.signal?.aborted) throw opts.stopError?.() ?? new Error('The study run was stopped');
    }
    if (Date.now() - last > 250) {
      last = Date.now();
      opts.onProgress?.(i + 1, total);
    }
  }
  return {
    resultsJson: JSON.stringify(runner.finish(buses)),
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
