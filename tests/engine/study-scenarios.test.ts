/**
 * Operating scenarios: each bus's label is the worst credible state of the system. The numbers of each scenario are
 * checked against the engine run on a model edited by hand into that state (an independent path to the same state:
 * the engine's own parts are checked against their published sources in their own tests); the choice of the
 * governing scenario is checked against the hand-worked reason it must govern (a slower region of the trip band at
 * the lower current); the bolted fault currents against the per-unit method (IEEE 141-1993 / IEEE 551-2006 per-unit
 * short-circuit calculation, from memory).
 */
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import type { BusResult } from '../../shared/schemas/studyResults';
import { applyScenario, createStudyRunner, runAllBuses, runStudy, scenariosOf } from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { expectClose } from '../helpers/approx';

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};
const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;
/** The model as written only (no scenarios): the single-state engine. */
const baseOnly = (input: ModelInput): Model => {
  const m = clone(input) as ModelInput & { scenarios?: unknown };
  delete m.scenarios;
  return parsed(m);
};
const busOf = (buses: BusResult[], id: string) => {
  const b = buses.find((x) => x.busId === id);
  if (!b) throw new Error(`no bus ${id}`);
  return b;
};
const governingCase = (b: BusResult) =>
  b.cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location)!;

/** Utility → 1500 kVA 12.47/0.48 kV transformer → switchboard → cable → panel. */
function radial(): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    frequencyHz: 60,
    buses: [
      { id: 'SWGR', nominalKv: 12.47 },
      { id: 'SWBD', nominalKv: 0.48, equipment: { class: 'switchgear-lv', mainIsolated: true } },
      { id: 'PNL', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-shallow' } },
    ],
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'SWGR', shortCircuitMva: 250, xr: 10 }],
    transformers: [
      {
        id: 'TX',
        fromBus: 'SWGR',
        toBus: 'SWBD',
        kva: 1500,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 6,
      },
    ],
    cables: [
      { id: 'F-PNL', fromBus: 'SWBD', toBus: 'PNL', lengthM: 25, size: '1/0', material: 'Cu', conduit: 'steel' },
    ],
    devices: [
      {
        id: 'R-TX',
        branch: 'TX',
        end: 'from',
        device: {
          kind: 'relay',
          curve: 'IEEE-VI',
          pickupA: 100,
          timeDial: 1,
          instantaneousA: 3000,
          breakerCycles: 5,
        },
      },
      {
        id: 'CB-MAIN',
        branch: 'TX',
        end: 'to',
        device: {
          kind: 'electronic',
          sensorA: 2000,
          longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
          shortTime: { pickup: 4, delayS: 0.3, i2t: false },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      {
        id: 'CB-PNL',
        branch: 'F-PNL',
        end: 'from',
        device: {
          kind: 'thermal-magnetic',
          ratingA: 100,
          thermal: {
            min: [
              [1.35, 300],
              [2, 30],
              [5, 3],
              [10, 0.8],
            ],
            max: [
              [1.35, 1500],
              [2, 100],
              [5, 12],
              [10, 4],
            ],
          },
          instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
          instantaneousClearingCycles: 1.5,
        },
      },
    ],
  } as ModelInput;
}

/** Three-phase bolted fault at the 480 V bus by the per-unit method on a 100 MVA base (complex impedances). */
function perUnitBoltedKaAt480(utilityMva: number, utilityXr: number): number {
  const part = (zPu: number, xr: number) => {
    const r = zPu / Math.sqrt(1 + xr * xr);
    return [r, r * xr];
  };
  const [rs, xs] = part(100 / utilityMva, utilityXr);
  const [rt, xt] = part(0.0575 * (100 / 1.5), 6);
  const baseKa = 100e3 / (Math.sqrt(3) * 480);
  return baseKa / Math.hypot(rs + rt, xs + xt);
}

describe('a hand-worked radial case: the minimum utility governs at one bus, the base at another', () => {
  const input = {
    ...radial(),
    scenarios: [{ id: 'util-min', name: 'Utility minimum', sources: { UTIL: { shortCircuitMva: 10 } } }],
  };
  const results = runStudy(parsed(input));
  // The same state edited by hand: the utility at 10 MVA, no scenarios.
  const minByHand = clone(radial());
  (minByHand.sources![0] as { shortCircuitMva: number }).shortCircuitMva = 10;
  const base = runStudy(baseOnly(radial()));
  const min = runStudy(parsed(minByHand));

  it('evaluates both states and lists them, base first', () => {
    expect(results.scenarios).toEqual([
      { id: 'base', name: 'Model as written' },
      { id: 'util-min', name: 'Utility minimum' },
    ]);
    for (const b of results.buses) expect(b.scenarios?.map((s) => s.scenarioId)).toEqual(['base', 'util-min']);
  });

  it('takes each state’s bolted fault current from the per-unit method', () => {
    // 250 MVA: about 28.6 kA at the switchboard; 10 MVA: about 8.7 kA (hand calculation above, 1 % for the engine's
    // transformer and cable details).
    const swbd = busOf(results.buses, 'SWBD').scenarios!;
    expectClose(swbd[0].boltedFaultKa!, perUnitBoltedKaAt480(250, 10), 0.01);
    expectClose(swbd[1].boltedFaultKa!, perUnitBoltedKaAt480(10, 10), 0.01);
  });

  it('switchboard: at 10 MVA the arc falls below the main’s short-time pickup, so the minimum governs', () => {
    // Short-time pickup 4 × 2000 A with +10 % tolerance = 8.8 kA. At 250 MVA the arcing current (> 15 kA) is above it:
    // short-time delay 0.3 s. At 10 MVA the bolted current is 8.7 kA, so the arcing current is below it: the long-time
    // band (about 10 s × (6 / 2.5)² at 2.5 × pickup) and the primary relay (IEEE C37.112 very inverse at about twice
    // its pickup: several seconds) are slower than the study's 2 s cap.
    const swbd = busOf(results.buses, 'SWBD');
    const [b, m] = swbd.scenarios!;
    expect(b.clearingDeviceId).toBe('CB-MAIN');
    expect(b.clearingRegion).toBe('short-time');
    expect(m.arcingCurrentKa!.full).toBeLessThan(8.8);
    expect(m.arcDurationS).toBe(2);
    expect(swbd.scenarioId).toBe('util-min');
    expect(m.incidentEnergyJPerCm2!).toBeGreaterThan(b.incidentEnergyJPerCm2!);
    // Both energies are what the single-state engine gives for each state.
    expectClose(b.incidentEnergyJPerCm2!, busOf(base.buses, 'SWBD').incidentEnergyJPerCm2!, 1e-12);
    expectClose(m.incidentEnergyJPerCm2!, busOf(min.buses, 'SWBD').incidentEnergyJPerCm2!, 1e-12);
    // The label is the minimum's: its whole result, trace and label values, and it says why.
    expect(swbd.incidentEnergyJPerCm2).toBe(m.incidentEnergyJPerCm2);
    expect(swbd.labelValues).toEqual(busOf(min.buses, 'SWBD').labelValues);
    expect(swbd.cases).toEqual(busOf(min.buses, 'SWBD').cases);
    expect(swbd.warnings.find((w) => w.code === 'SCENARIO_GOVERNS')?.message).toMatch(/Utility minimum/);
  });

  it('panel: the feeder clears instantaneously in both states, so the higher current (base) governs', () => {
    // Instantaneous pickup 10 × 100 A, +20 % = 1.2 kA: far below both arcing currents; 1.5 cycles in both states.
    const pnl = busOf(results.buses, 'PNL');
    const [b, m] = pnl.scenarios!;
    expect(b.clearingRegion).toBe('instantaneous');
    expect(m.clearingRegion).toBe('instantaneous');
    expect(pnl.scenarioId).toBe('base');
    expect(b.incidentEnergyJPerCm2!).toBeGreaterThan(m.incidentEnergyJPerCm2!);
    expectClose(b.incidentEnergyJPerCm2!, busOf(base.buses, 'PNL').incidentEnergyJPerCm2!, 1e-12);
    expectClose(m.incidentEnergyJPerCm2!, busOf(min.buses, 'PNL').incidentEnergyJPerCm2!, 1e-12);
    expect(pnl.warnings.some((w) => w.code === 'SCENARIO_GOVERNS')).toBe(false);
  });

  it('a scenario that fails at a bus makes the bus an error naming it (the worst case is then unknown)', () => {
    // 1 MVA: about 1.2 kA at 480 V, below the main's long-time pickup; with no cap on the bus nothing clears it.
    const capless = clone(input) as ModelInput;
    capless.buses[1].equipment = {
      ...capless.buses[1].equipment!,
      arcDurationCapS: null,
      arcDurationCapReason: 'escape not possible',
    };
    (capless as { scenarios: unknown[] }).scenarios = [
      { id: 'weak', name: 'Weak grid', sources: { UTIL: { shortCircuitMva: 1 } } },
    ];
    const r = runStudy(parsed(capless));
    const swbd = busOf(r.buses, 'SWBD');
    expect(swbd.status).toBe('error');
    expect(swbd.scenarioId).toBe('weak');
    expect(swbd.error?.message).toMatch(/^Scenario "Weak grid": /);
    expect(swbd.labelValues).toBeUndefined();
    expect(swbd.scenarios?.map((s) => s.status)).toEqual(['ok', 'error']);
    expect(busOf(r.buses, 'PNL').status).toBe('ok');
  });
});

describe('a double-ended substation: tie open and closed', () => {
  const model = parsed(solidsBuildingModel());
  const states = Object.fromEntries(scenariosOf(model).map((a) => [a.id, a]));

  it('the base keeps the tie open; the closed-transition scenario closes it and changes nothing else', () => {
    expect(states.base.model.ties[0].closed).toBe(false);
    const closed = states['tie-closed'].model;
    expect(closed.ties[0].closed).toBe(true);
    expect(closed.sources).toEqual(model.sources);
    expect(closed.motors).toEqual(model.motors);
    expect(closed.devices).toEqual(model.devices);
  });

  it('tie closed: an arc on side A is fed from both sides, cut off in two steps by two devices', () => {
    const shA = busOf(runStudy(states['tie-closed'].model).buses, 'SH-A');
    const c = governingCase(shA);
    const utilities = c.sources.filter((s) => s.kind === 'utility');
    expect(utilities.map((s) => s.sourceId).sort()).toEqual(['SH-UTIL-A', 'SH-UTIL-B']);
    const a = utilities.find((s) => s.sourceId === 'SH-UTIL-A')!;
    const b = utilities.find((s) => s.sourceId === 'SH-UTIL-B')!;
    // Feeder B's current reaches the arc through the tie: the tie breaker (short-time 0.2 s) opens before side A's main
    // (short-time 0.3 s), so the arc is fed by both, then by side A alone (settings in the demo model).
    expect(b.cutByDeviceId).toBe('SH-CB-TIE');
    expect(a.cutByDeviceId).toBe('SH-CB-MA');
    expect(b.stopsAtS).toBeLessThan(a.stopsAtS);
    expect(c.intervals.length).toBeGreaterThanOrEqual(2);
    expect(c.intervals[0].sourceIds).toEqual(expect.arrayContaining(['SH-UTIL-A', 'SH-UTIL-B']));
    expect(c.intervals.some((i) => i.sourceIds.includes('SH-UTIL-A') && !i.sourceIds.includes('SH-UTIL-B'))).toBe(true);
  });

  it('tie open: the same arc is fed by side A’s utility only', () => {
    const shA = busOf(runStudy(states.base.model).buses, 'SH-A');
    const utilities = governingCase(shA).sources.filter((s) => s.kind === 'utility');
    expect(utilities.map((s) => s.sourceId)).toEqual(['SH-UTIL-A']);
  });

  it('closing the tie adds side B’s fault current: the two sides’ currents add (one node, V/Za + V/Zb)', () => {
    // Motors stopped in all three states, so that only the two utility paths feed the fault.
    const noMotors = (m: Model) => ({ ...m, motors: [], devices: m.devices });
    const run = (m: Model) => createStudyRunner(noMotors(m)).runBus('SH-A').boltedFaultKa;
    const sideAOnly = run(
      applyScenario(model, {
        id: 'a',
        sources: { 'SH-UTIL-B': { inService: false } },
        ties: { 'SH-TIE': { closed: true } },
      }).model,
    );
    const sideBOnly = run(
      applyScenario(model, {
        id: 'b',
        sources: { 'SH-UTIL-A': { inService: false } },
        ties: { 'SH-TIE': { closed: true } },
      }).model,
    );
    const both = run(applyScenario(model, { id: 'ab', ties: { 'SH-TIE': { closed: true } } }).model);
    // The generator on side B feeds in every one of these states; it is counted in both single-side runs, so:
    // both ≈ A + B − generator. With similar X/R the phasors add nearly as magnitudes (2 %).
    const genOnly = run(
      applyScenario(model, {
        id: 'g',
        sources: { 'SH-UTIL-A': { inService: false }, 'SH-UTIL-B': { inService: false } },
        ties: { 'SH-TIE': { closed: true } },
      }).model,
    );
    expectClose(both, sideAOnly + sideBOnly - genOnly, 0.02);
  });

  it('the label at each bus is the scenario with the highest energy, with every scenario’s energy beside it', () => {
    const results = runStudy(model);
    for (const bus of results.buses) {
      expect(bus.status).toBe('ok');
      const ok = bus.scenarios!.filter((s) => s.status === 'ok');
      const worst = ok.reduce((w, s) => (s.incidentEnergyJPerCm2! > w.incidentEnergyJPerCm2! ? s : w));
      expect(bus.scenarioId).toBe(worst.scenarioId);
      expect(bus.incidentEnergyJPerCm2).toBe(worst.incidentEnergyJPerCm2);
      for (const s of ok) {
        const alone = busOf(runStudy(states[s.scenarioId].model).buses, bus.busId);
        expectClose(s.incidentEnergyJPerCm2!, alone.incidentEnergyJPerCm2!, 1e-12);
        expect(s.clearingDeviceId).toBe(alone.clearingDeviceId);
      }
    }
  });

  it('a bus no source reaches in a scenario is skipped for it, with a note', () => {
    const m = clone(model);
    m.scenarios = [{ id: 'a-out', name: 'Feeder A out, tie open', sources: { 'SH-UTIL-A': { inService: false } } }];
    const applied = applyScenario(m, m.scenarios[0]);
    expect([...applied.deEnergizedBusIds].sort()).toEqual(['SH-A', 'SH-MCC', 'SH-PRI-A']);
    const results = runStudy(parsed(m as ModelInput));
    const shA = busOf(results.buses, 'SH-A');
    expect(shA.scenarioId).toBe('base');
    expect(shA.scenarios![1]).toMatchObject({ scenarioId: 'a-out', status: 'de-energized' });
    expect(shA.scenarios![1].note).toMatch(/no source/);
    // Side B still has its feeder and the generator: evaluated.
    expect(busOf(results.buses, 'SH-B').scenarios![1].status).toBe('ok');
  });
});

describe('the standby generator alone on the demo plant', () => {
  const input = larkspurModel();
  const withGenOnly = {
    ...input,
    scenarios: [{ id: 'gen-only', name: 'Generator only', sources: { UTIL: { inService: false } } }],
  };
  const results = runStudy(parsed(withGenOnly as ModelInput));
  // By hand: the utility and the relay on it removed.
  const byHand = clone(input);
  byHand.sources = byHand.sources!.filter((s) => s.id !== 'UTIL');
  byHand.devices = byHand.devices!.filter((d) => d.source !== 'UTIL');
  const genOnly = runStudy(parsed(byHand));
  const base = runStudy(baseOnly(input));

  it('feeds every labelled bus (through the transformers), with less fault current than the utility', () => {
    for (const bus of results.buses) {
      const [b, g] = bus.scenarios!;
      expect(g.status).toBe('ok');
      expect(g.boltedFaultKa!).toBeLessThan(b.boltedFaultKa!);
    }
  });

  it('gives each bus the worse of the two, each number as the single-state engine gives it', () => {
    for (const bus of results.buses) {
      const [b, g] = bus.scenarios!;
      expectClose(b.incidentEnergyJPerCm2!, busOf(base.buses, bus.busId).incidentEnergyJPerCm2!, 1e-12);
      expectClose(g.incidentEnergyJPerCm2!, busOf(genOnly.buses, bus.busId).incidentEnergyJPerCm2!, 1e-12);
      expect(bus.scenarioId).toBe(g.incidentEnergyJPerCm2! > b.incidentEnergyJPerCm2! ? 'gen-only' : 'base');
    }
    // The generator's slow decrement governs somewhere on the demo (motor control centres fed by it).
    expect(results.buses.some((b) => b.scenarioId === 'gen-only')).toBe(true);
  });
});

describe('without scenarios nothing changes', () => {
  it('a model without scenarios gives no scenario fields, and an empty list gives the same text', () => {
    const model = baseOnly(larkspurModel());
    const plain = runAllBuses(model, {}, () => undefined, 0).resultsJson;
    expect(plain).not.toMatch(/"scenario/);
    expect(runAllBuses({ ...model, scenarios: [] }, {}, () => undefined, 0).resultsJson).toBe(plain);
  });

  it('progress counts every bus in every scenario', () => {
    const model = parsed(solidsBuildingModel());
    const progress: [number, number][] = [];
    runAllBuses(model, {}, (d, t) => progress.push([d, t]), 0);
    // 3 labelled buses × (base + 3 scenarios).
    expect(progress[0]).toEqual([0, 12]);
    expect(progress[progress.length - 1]).toEqual([12, 12]);
  });
});

describe('scenario checks', () => {
  const issuesOf = (scenarios: unknown[]) => {
    const p = parseModel({ ...solidsBuildingModel(), scenarios });
    return p.success ? [] : p.issues;
  };

  it('rejects unknown source, tie and motor ids with their path', () => {
    const issues = issuesOf([
      {
        id: 's1',
        sources: { 'NO-SUCH': { inService: false } },
        ties: { 'SH-MCC': { closed: true } },
        motors: { X: { inService: false } },
      },
    ]);
    expect(issues.map((i) => [i.code, i.path, i.elementId])).toEqual([
      ['unknown-reference', 'scenarios[0].sources.NO-SUCH', 's1'],
      ['unknown-reference', 'scenarios[0].ties.SH-MCC', 's1'],
      ['unknown-reference', 'scenarios[0].motors.X', 's1'],
    ]);
  });

  it('rejects a utility’s fault level on a generator, and both MVA and kA at once', () => {
    expect(issuesOf([{ id: 's1', sources: { 'SH-GEN': { shortCircuitMva: 5 } } }]).map((i) => i.path)).toEqual([
      'scenarios[0].sources.SH-GEN.shortCircuitMva',
    ]);
    const both = issuesOf([{ id: 's2', sources: { 'SH-UTIL-A': { shortCircuitMva: 5, shortCircuitKa: 2 } } }]);
    expect(both.map((i) => i.path)).toEqual(['scenarios[0].sources.SH-UTIL-A.shortCircuitMva']);
  });

  it('rejects the id "base", duplicate ids and unknown keys (a misspelt override must not pass silently)', () => {
    expect(issuesOf([{ id: 'base' }]).map((i) => i.path)).toEqual(['scenarios[0].id']);
    expect(issuesOf([{ id: 'x' }, { id: 'x' }]).map((i) => [i.code, i.path])).toEqual([
      ['duplicate-id', 'scenarios[1].id'],
    ]);
    expect(issuesOf([{ id: 'x', sources: { 'SH-UTIL-A': { shortCircuitMVA: 5 } } }])[0].code).toBe('invalid-value');
    expect(issuesOf([{ id: 'x', allMotorsOf: true }])[0].code).toBe('invalid-value');
  });

  it('rejects a scenario whose closed ties form a loop, and one with no source in service', () => {
    const input = solidsBuildingModel();
    const withSecondTie = {
      ...input,
      ties: [...input.ties!, { id: 'SH-TIE-2', fromBus: 'SH-A', toBus: 'SH-B', closed: false }],
      scenarios: [{ id: 'both', ties: { 'SH-TIE': { closed: true }, 'SH-TIE-2': { closed: true } } }],
    };
    const p = parseModel(withSecondTie);
    expect(p.success ? [] : p.issues.map((i) => [i.code, i.path])).toEqual([
      ['tie-loop', 'scenarios[0].ties.SH-TIE-2'],
    ]);
    const dark = issuesOf([
      {
        id: 'dark',
        sources: {
          'SH-UTIL-A': { inService: false },
          'SH-UTIL-B': { inService: false },
          'SH-GEN': { inService: false },
        },
      },
    ]);
    expect(dark.map((i) => [i.code, i.path])).toEqual([['island', 'scenarios[0].sources']]);
  });

  it('a motor’s own override wins over "all motors stopped"', () => {
    const m = parsed(solidsBuildingModel());
    const a = applyScenario(m, { id: 'x', allMotorsOff: true, motors: { 'SH-M1': { inService: true } } });
    expect(a.model.motors.map((x) => x.id)).toEqual(['SH-M1']);
  });
});
