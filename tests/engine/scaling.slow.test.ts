/**
 * The study run scales with the plant, not with its square: the work per labelled bus (nodes solved, elements and
 * devices visited, counted by the engine) must not grow more than 3× from a 1 000-bus to an 8 000-bus generated
 * radial plant. Counting operations, not time, so machine load does not matter (3× is the issue's bound; common
 * practice, no source). In a radial plant fed from one end a fault's current flows only on its path to the source
 * (circuit theory), so the work per bus should stay about constant.
 */
import { parseModel, type Model } from '../../shared/schemas/model';
import { createStudyRunner } from '../../server/engine/study';
import { radialPlant } from '../../server/bench/scaling';

function workPerBus(buses: number): number {
  const p = parseModel(radialPlant(buses));
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  const runner = createStudyRunner(p.model as Model);
  const results = runner.busIds.map((id) => runner.runBus(id));
  expect(results.every((r) => r.status === 'ok')).toBe(true);
  const w = runner.work;
  expect(w.faults).toBe(runner.busIds.length);
  return (w.nodeVisits + w.elementVisits + w.pictureVisits) / runner.busIds.length;
}

describe('study run scaling', () => {
  it('work per bus grows less than 3× from 1 000 to 8 000 buses (radial plant)', () => {
    const small = workPerBus(1000);
    const large = workPerBus(8000);
    expect(small).toBeGreaterThan(0);
    expect(large / small).toBeLessThan(3);
  }, 300_000);
});
