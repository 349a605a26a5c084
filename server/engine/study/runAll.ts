import type { Model } from '../../../shared/schemas/model';
import type { StudyOptions } from './runStudy';
import { createScenarioRunner } from './scenarios';
import { StoredResultsWriter } from './storedResults';

// For the study worker: a run's model snapshot, parsed there, is marked as checked (server/services/studyWorker.ts).
export { markCheckedModel } from '../shortcircuit';

/** A whole run, serialized: the results' stored text (stored as is) and the counts for the run's message. */
export interface StudyRunOutcome {
  /** The stored text of the results (`storedResults.ts`; read back with `parseStoredResults`). */
  resultsJson: string;
  buses: number;
  failed: number;
}

/**
 * Every labelled bus (in the base and every operating scenario) in one call (the body of a study run in a worker
 * thread): progress is reported after each bus at most every `progressEveryMs`, and the results are serialized here,
 * off the server's main thread. Each bus is serialized as soon as it is evaluated (its objects are dropped at once,
 * so a large plant holds text, not object graphs), in the stored form of `storedResults.ts`: read back, the results
 * are exactly those of the whole run.
 */
export function runAllBuses(
  model: Model,
  options: StudyOptions,
  onProgress: (done: number, total: number) => void,
  progressEveryMs = 200,
): StudyRunOutcome {
  const runner = createScenarioRunner(model, options);
  const buses = runner.busIds.length;
  // Progress counts evaluations: every bus in the base and in each operating scenario.
  const total = buses * runner.evaluations;
  const writer = new StoredResultsWriter();
  let failed = 0;
  let last = Date.now();
  onProgress(0, total);
  for (let i = 0; i < buses; i++) {
    const bus = runner.runBus(runner.busIds[i]);
    if (bus.status === 'error') failed += 1;
    writer.add(bus);
    if (Date.now() - last >= progressEveryMs) {
      last = Date.now();
      onProgress((i + 1) * runner.evaluations, total);
    }
  }
  return { resultsJson: writer.text(runner.finish([])), buses: writer.buses, failed };
}
