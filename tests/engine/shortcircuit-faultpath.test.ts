import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { createShortCircuitSolver, type BusFault } from '../../server/engine/shortcircuit';
import { generatedPlant } from '../../server/bench/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { pumpStationModel } from '../../server/seed/pumpStationModel';
import { smallModel } from '../fixtures/smallModel';

/*
 * `faultPath` (the study's per-fault solve over the elements a fault can reach) against the straightforward
 * reference, `faultAt`: one full solve of the Zbus column and the current of every branch, source and motor.
 * Circuit theory: a branch off the path between the fault and the sources joins two nodes at one voltage and carries
 * no current, so every element `faultPath` leaves out must carry none in the reference, and every element it reports
 * must carry the reference's current (same arithmetic: equal to 1e-12 relative, in practice bit for bit).
 */

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};

/** A generated plant with loops between substations, a second source, a motor and closed ties. */
function loopedPlant(): Model {
  const m = generatedPlant(3, 8);
  const cable = (id: string, fromBus: string, toBus: string) => ({
    id,
    fromBus,
    toBus,
    lengthM: 50,
    sets: 1,
    size: '4/0',
    material: 'Cu' as const,
    conduit: 'steel' as const,
  });
  m.cables!.push(cable('LOOP-1', 'MCC-0-1', 'MCC-1-1'), cable('LOOP-2', 'MCC-1-2', 'MCC-2-3'));
  m.buses!.push({ id: 'TIED', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } });
  m.buses!.push({ id: 'TIED-2', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } });
  m.ties = [
    { id: 'T-1', fromBus: 'MCC-0-4', toBus: 'TIED', closed: true },
    { id: 'T-2', fromBus: 'TIED', toBus: 'TIED-2', closed: true },
    { id: 'T-OPEN', fromBus: 'MCC-2-6', toBus: 'MCC-1-6', closed: false },
  ];
  m.motors = [{ id: 'MOT-1', bus: 'TIED-2', hp: 200, kv: 0.46 }];
  m.sources!.push({ id: 'GEN-1', kind: 'generator', bus: 'SUB-2', kva: 1000, kv: 0.48, subtransientPct: 15, xr: 20 });
  return parsed(m);
}

const close = (a: number, b: number) => a === b || Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b));

function compare(reference: BusFault, path: BusFault): void {
  expect(close(path.faultCurrentA, reference.faultCurrentA)).toBe(true);
  const pathBranches = new Map(path.branches.map((b) => [b.id, b]));
  for (const ref of reference.branches) {
    const got = pathBranches.get(ref.id);
    if (!got) {
      // Left out: it carries no current in the reference.
      expect([ref.id, ref.direction]).toEqual([ref.id, 'none']);
      continue;
    }
    expect([ref.id, got.direction, got.towardBus]).toEqual([ref.id, ref.direction, ref.towardBus]);
    if (ref.direction !== 'none') {
      expect([ref.id, close(got.fromCurrentA, ref.fromCurrentA), close(got.toCurrentA, ref.toCurrentA)]).toEqual([
        ref.id,
        true,
        true,
      ]);
    }
  }
  const pathInjections = new Map(path.injections.map((i) => [i.id, i]));
  for (const ref of reference.injections) {
    const got = pathInjections.get(ref.id);
    if (!got) expect([ref.id, ref.currentA <= 1e-9 * reference.faultCurrentA]).toEqual([ref.id, true]);
    else expect([ref.id, close(got.currentA, ref.currentA)]).toEqual([ref.id, true]);
  }
}

describe('faultPath against the full solve (faultAt)', () => {
  const cases: [string, () => Model][] = [
    ['demo plant', () => parsed(larkspurModel())],
    ['pump station', () => parsed(pumpStationModel())],
    ['small model', () => parsed(smallModel())],
    ['generated radial plant', () => parsed(generatedPlant(4, 12))],
    ['looped plant with ties, a generator and a motor', loopedPlant],
  ];
  it.each(cases)('%s: same currents at every bus; left-out elements carry none', (_name, make) => {
    const model = make();
    const solver = createShortCircuitSolver(model);
    for (const id of solver.busIds) compare(solver.faultAt(id), solver.faultPath(id));
  });

  it('on a radial plant a fault touches only its path to the source (work does not grow with the plant)', () => {
    // Circuit theory: in a radial network fed from one end, a fault's current flows only on the path to the source.
    const visitsPerFault = (subs: number) => {
      const solver = createShortCircuitSolver(parsed(generatedPlant(subs, 20)));
      for (const id of solver.busIds) solver.faultPath(id);
      return (solver.work.nodeVisits + solver.work.elementVisits) / solver.work.faults;
    };
    const small = visitsPerFault(2);
    const large = visitsPerFault(16);
    // A fault at a panel: panel, substation, 12.47 kV bus (nodes) and feeder, transformer, utility (elements), plus
    // at most a few nodes where the elimination order ends (the root of the elimination tree may sit below the
    // 12.47 kV bus). Eight times the plant must not mean more work per fault.
    expect(large).toBeLessThanOrEqual(small * 1.2);
    expect(large).toBeLessThan(10);
  });
});
