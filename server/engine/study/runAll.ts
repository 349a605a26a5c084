import type { Model } from '../../../shared/schemas/model';
import { createStudyRunner, type StudyOptions } from './runStudy';

/** A whole run, serialized: the results as JSON text (stored as is) and the counts for the run's message. */
export interface StudyRunOutcome {
  resultsJson: string;
  buses: number;
  failed: number;
}

/**
 * Every labelled bus in one call (the body of a study run in a worker thread): progress is reported after each bus
 * at most every `progressEveryMs`, and the results are serialized here, off the server's main thread.
 */
export function runAllBuses(
  model: Model,
  options: StudyOptions,
  onProgress: (done: number, total: number) => void,
  progressEveryMs = 200,
): StudyRunOutcome {
  const runner = createStudyRunner(model, options);
  const total = runner.busIds.length;
  const buses = [];
  let last = Date.now();
  onProgress(0, total);
  for (let i = 0; i < total; i++) {
    buses.push(runner.runBus(runner.busIds[i]));
    if (Date.now() - last >= progressEveryMs) {
      last = Date.now();
      onProgress(i + 1, total);
    }
  }
  const results = runner.finish(buses);
  return {
    resultsJson: JSON.stringify(results),
    buses: buses.length,
    failed: buses.filter((b) => b.status === 'error').length,
  };
}
