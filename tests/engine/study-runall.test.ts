/**
 * The run body of a study worker (`runAllBuses`) serializes each bus as soon as it is evaluated and splices the texts
 * into the results: the stored text must be exactly the stored form of the whole results (`runStudy`), and read back,
 * `JSON.stringify` of the whole results, byte for byte, on the demo plant, on generated radial and looped plants and with a bus that fails, and its counts must be
 * those of the results. The reference is the JSON specification's serialization (ECMA-404 / JSON.stringify).
 */
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import {
  parseStoredResults,
  runAllBuses,
  runStudy,
  storedResultsText,
  type StudyOptions,
} from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { loopedMesh, radialPlant } from '../../server/bench/scaling';

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};

function expectSameText(model: Model, options: StudyOptions = {}) {
  const whole = runStudy(model, options);
  const progress: [number, number][] = [];
  const outcome = runAllBuses(model, options, (done, total) => progress.push([done, total]), 0);
  // The stored form, and read back: exactly the whole results.
  expect(outcome.resultsJson).toBe(storedResultsText(whole));
  expect(JSON.stringify(parseStoredResults(outcome.resultsJson))).toBe(JSON.stringify(whole));
  expect(outcome.buses).toBe(whole.buses.length);
  expect(outcome.failed).toBe(whole.buses.filter((b) => b.status === 'error').length);
  expect(progress[0]).toEqual([0, whole.buses.length]);
  expect(progress[progress.length - 1]).toEqual([whole.buses.length, whole.buses.length]);
  return { whole, outcome };
}

describe('runAllBuses (the stored results text)', () => {
  it('equals JSON.stringify of the whole results on the demo plant (generator, motors), both motor settings', () => {
    expectSameText(parsed(larkspurModel()));
    expectSameText(parsed(larkspurModel()), { motorDecayModel: 'exponential', maxArcDurationMs: 1000 });
  });

  it('equals JSON.stringify of the whole results on generated radial and looped plants', () => {
    expectSameText(parsed(radialPlant(300)));
    expectSameText(parsed(loopedMesh(300)));
  });

  it('counts a bus that fails and keeps its error in the text', () => {
    const model = parsed(radialPlant(200));
    // Past the schema (as an old stored model could be): the engine reports it on that bus alone.
    const bad = model.buses.find((b) => b.id === 'MCC-0-5');
    if (!bad?.equipment) throw new Error('generated plant changed');
    (bad.equipment as { class: string }).class = 'no-such-class';
    const { outcome, whole } = expectSameText(model);
    expect(outcome.failed).toBe(1);
    expect(whole.buses.find((b) => b.busId === 'MCC-0-5')?.status).toBe('error');
  });
});
