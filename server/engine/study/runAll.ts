import type { Model } from '../../../shared/schemas/model';
import type { StudyOptions } from './runStudy';
import { createScenarioRunner } from './scenarios';

/** A whole run, serialized: the results as JSON text (stored as is) and the counts for the run's message. */
export interface StudyRunOutcome {
  resultsJson: string;
  buses: number;
  failed: number;
}

/**
 * Every labelled bus (in the base and every operating scenario) in one call (the body of a study run in a worker thread): progress is reported after each bus
 * at most every `progressEveryMs`, and the results are serialized here, off the server's main thread. Each bus is
 * serialized as soon as it is evaluated (its objects are dropped at once, so a large plant holds text, not object
 * graphs); the text is the same as `JSON.stringify` of the whole results.
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
  const busJson: string[] = [];
  let failed = 0;
  let last = Date.now();
  onProgress(0, total);
  for (let i = 0; i < buses; i++) {
    const bus = runner.runBus(runner.busIds[i]);
    if (bus.status === 'error') failed += 1;
    busJson.push(JSON.stringify(bus));
    if (Date.now() - last >= progressEveryMs) {
      last = Date.now();
      onProgress((i + 1) * runner.evaluations, total);
    }
  }
  return { resultsJson: withBuses(JSON.stringify(runner.finish([])), busJson), buses: busJson.length, failed };
}

/**
 * The results' JSON text with the buses' texts in its (empty) `buses` array. A quote outside a string value is a
 * delimiter in JSON text (inside one it is escaped), so the first `"buses":[]` is the results' own key: the keys before
 * it hold a string and numbers only.
 */
function withBuses(resultsJson: string, busJson: string[]): string {
  const key = '"buses":[]';
  const at = resultsJson.indexOf(key);
  if (at < 0) throw new Error('The study results have no buses array');
  return `${resultsJson.slice(0, at)}"buses":[${busJson.join(',')}]${resultsJson.slice(at + key.length)}`;
}
