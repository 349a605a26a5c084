import type { Model } from '../../../shared/schemas/model';
import type { StudyOptions } from './runStudy';
import { createScenarioRunner } from './scenarios';
import type { StudyResults } from '../../../shared/schemas/studyResults';
import { storedResultsFromPieces, StoredResultsWriter, type StoredResultsPiece } from './storedResults';

// For the study worker: a run's model snapshot, parsed there, is marked as checked (server/services/studyWorker.ts).
export { markCheckedModel } from '../shortcircuit';

/** A whole run, serialized: the results' stored text (stored as is) and the counts for the run's message. */
export interface StudyRunOutcome {
  /** The stored text of the results (`storedResults.ts`; read back with `parseStoredResults`). */
  resultsJson: string;
  buses: number;
  failed: number;
}

/** One part of a run (`runBusRange`): its piece of the stored text, the results without buses, and its counts. */
export interface StudyRunPiece {
  piece: StoredResultsPiece;
  /** The results but their buses (the same in every part: the model's warnings, scenarios, …). */
  head: StudyResults;
  buses: number;
  failed: number;
}

/**
 * Part `index` of `count` of a run: the contiguous range of the labelled buses that falls to it (in the base and
 * every operating scenario), for a run computed in parts in several workers at once. Progress counts this part's
 * evaluations only. Each bus is serialized as soon as it is evaluated (its objects are dropped at once, so a large
 * plant holds text, not object graphs), in the stored form of `storedResults.ts`; `storedResultsFromPieces` joins the
 * parts into the text of the whole run: read back, the results are exactly those of the whole run in one part.
 */
export function runBusRange(
  model: Model,
  options: StudyOptions,
  onProgress: (done: number, total: number) => void,
  part: { index: number; count: number } = { index: 0, count: 1 },
  progressEveryMs = 200,
): StudyRunPiece {
  const runner = createScenarioRunner(model, options);
  const all = runner.busIds.length;
  const from = Math.floor((all * part.index) / part.count);
  const to = Math.floor((all * (part.index + 1)) / part.count);
  // Progress counts evaluations: every bus in the base and in each operating scenario.
  const total = (to - from) * runner.evaluations;
  const writer = new StoredResultsWriter();
  let failed = 0;
  let last = Date.now();
  onProgress(0, total);
  for (let i = from; i < to; i++) {
    const bus = runner.runBus(runner.busIds[i]);
    if (bus.status === 'error') failed += 1;
    writer.add(bus);
    if (Date.now() - last >= progressEveryMs) {
      last = Date.now();
      onProgress((i + 1 - from) * runner.evaluations, total);
    }
  }
  return { piece: writer.piece(), head: runner.finish([]), buses: writer.buses, failed };
}

/**
 * Every labelled bus (in the base and every operating scenario) in one call (the body of a study run in one worker
 * thread): progress is reported after each bus at most every `progressEveryMs`, and the results are serialized here,
 * off the server's main thread, in the stored form of `storedResults.ts`.
 */
export function runAllBuses(
  model: Model,
  options: StudyOptions,
  onProgress: (done: number, total: number) => void,
  progressEveryMs = 200,
): StudyRunOutcome {
  const { piece, head, buses, failed } = runBusRange(model, options, onProgress, undefined, progressEveryMs);
  return { resultsJson: storedResultsFromPieces(head, [piece]), buses, failed };
}
