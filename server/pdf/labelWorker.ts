import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { log } from '../log';
import { renderLabels, type LabelPdfSize, type LabelToRender, type RenderLabelsOptions } from './labels';

/**
 * Label PDFs are made in a worker thread, so a large batch never blocks the server's event loop (requests, health
 * checks, other jobs). The worker runs the same `renderLabels` on plain JSON (label contents and check addresses)
 * and hands back the PDF bytes; progress comes back as messages. At most `MAX_WORKERS` run at once (the rest wait
 * their turn), each with a heap limit, so a batch cannot take the server's memory either.
 *
 * The worker loads the TypeScript source through tsx's require hook (the server runs under tsx; tests under ts-jest,
 * whose transform does not reach worker threads). Where a worker cannot start, the PDF is made in the main thread
 * (logged), as before.
 */

/** Concurrent worker threads (the machine's cores, at most 2: PDF making is CPU-bound). */
const MAX_WORKERS = Math.max(1, Math.min(2, os.availableParallelism?.() ?? os.cpus().length));
/** Heap limit of one worker, MB (a 1000-label batch needs far less). */
const WORKER_HEAP_MB = 512;
/** Progress messages at most every this many labels. */
const PROGRESS_EVERY = 10;

const BOOTSTRAP = `
const { parentPort, workerData } = require('node:worker_threads');
try { require('tsx/cjs/api').register(); } catch (e) { /* already JavaScript */ }
const { renderLabels } = require(workerData.modulePath);
renderLabels(workerData.labels, workerData.size, {
  onProgress: (done, total) => {
    if (done === total || done % workerData.progressEvery === 0) parentPort.postMessage({ type: 'progress', done, total });
  },
}).then(
  (pdf) => parentPort.postMessage({ type: 'done', pdf }, [pdf.buffer]),
  (e) => parentPort.postMessage({ type: 'error', message: e && e.message ? e.message : String(e) }),
);
`;

/** How PDFs were made since start: in a worker, or in the main thread because no worker could start. */
export const labelRenderStats = { worker: 0, mainThread: 0 };

let running = 0;
const waiting: (() => void)[] = [];

async function turn<T>(fn: () => Promise<T>): Promise<T> {
  if (running >= MAX_WORKERS) await new Promise<void>((resolve) => waiting.push(resolve));
  running += 1;
  try {
    return await fn();
  } finally {
    running -= 1;
    waiting.shift()?.();
  }
}

/** Thrown when the worker thread could not be started at all (the caller may render in the main thread). */
class WorkerUnavailable extends Error {}

function renderInWorker(
  labels: readonly LabelToRender[],
  size: LabelPdfSize,
  opts: RenderLabelsOptions,
): Promise<Uint8Array> {
  return new Promise((resolve, reject) => {
    let worker: Worker;
    try {
      worker = new Worker(BOOTSTRAP, {
        eval: true,
        workerData: {
          modulePath: path.join(__dirname, 'labels'),
          // Plain JSON across the thread boundary.
          labels: JSON.parse(JSON.stringify(labels)) as unknown,
          size,
          progressEvery: PROGRESS_EVERY,
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
      fn();
      void worker.terminate();
    };
    worker.on('message', (m: { type: string; done?: number; total?: number; pdf?: Uint8Array; message?: string }) => {
      if (m.type === 'progress') opts.onProgress?.(m.done as number, m.total as number);
      else if (m.type === 'done') finish(() => resolve(new Uint8Array(m.pdf as Uint8Array)));
      else if (m.type === 'error') finish(() => reject(new Error(m.message)));
    });
    worker.on('error', (e: Error & { code?: string }) =>
      finish(() =>
        reject(
          e.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? new Error('The labels PDF needed more memory than allowed; make smaller batches')
            : /Cannot find module|ERR_MODULE_NOT_FOUND|ERR_UNKNOWN_FILE_EXTENSION/.test(e.message)
              ? new WorkerUnavailable(e.message)
              : e,
        ),
      ),
    );
    worker.on('exit', (code) => finish(() => reject(new Error(`The labels PDF worker stopped (exit code ${code})`))));
  });
}

/** `renderLabels` off the main thread (same arguments, same PDF). */
export function renderLabelsOffThread(
  labels: readonly LabelToRender[],
  size: LabelPdfSize,
  opts: RenderLabelsOptions = {},
): Promise<Uint8Array> {
  return turn(async () => {
    try {
      const pdf = await renderInWorker(labels, size, opts);
      labelRenderStats.worker += 1;
      return pdf;
    } catch (e) {
      if (!(e instanceof WorkerUnavailable)) throw e;
      log.warn({ err: e }, 'label PDF worker unavailable; rendering in the main thread');
      labelRenderStats.mainThread += 1;
      return renderLabels(labels, size, opts);
    }
  });
}
