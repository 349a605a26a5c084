import * as fc from 'fast-check';
import * as math from 'mathjs';
import { expectClose, isClose } from '../helpers/approx';
import { EngineError } from '../../server/engine/errors';
import { modelSchema, type Model, type ModelInput } from '../../shared/schemas/model';
import {
  buildNetwork,
  createShortCircuitSolver,
  InvalidModelError,
  shortCircuit,
  typicalTransformerXr,
  type BusFault,
  type ShortCircuitResult,
} from '../../server/engine/shortcircuit';

/*
 * Network behaviour of the short-circuit engine. Each check names the rule it rests on: IEEE 141 per-unit
 * practice (reference per_unit_example formulas), IEEE 551-2006 Table 9-1 (motors), NEC Chapter 9 Table 9
 * (cables), or circuit theory (Kirchhoff's current law, parallel impedances, ideal transformer).
 */

type Body = Omit<ModelInput, 'format' | 'version'>;
const makeModel = (body: Body): Model => modelSchema.parse({ format: 'emberline-model', version: 1, ...body });
const INFINITE_MVA = 1e9;

const bus = (result: ShortCircuitResult, id: string) => {
  const b = result.buses.find((x) => x.id === id);
  if (!b) throw new Error(`no bus ${id}`);
  return b;
};

/** Thevenin impedance at a bus in ohms (complex), from the summary: |Z| = kV/(√3·kA), angle from X/R. */
function theveninOhm(result: ShortCircuitResult, id: string): { re: number; im: number } {
  const b = bus(result, id);
  const magnitude = b.nominalKv / (Math.sqrt(3) * b.boltedFaultKa);
  const r = magnitude / Math.sqrt(1 + b.xr * b.xr);
  return { re: r, im: r * b.xr };
}

/** Sum of the currents entering a bus (branches, sources, motors), amperes. */
function inflowA(fault: BusFault, busId: string): { re: number; im: number } {
  let re = 0;
  let im = 0;
  for (const br of fault.branches) {
    if (br.toBus === busId) {
      re += br.toPhasorA.re;
      im += br.toPhasorA.im;
    }
    if (br.fromBus === busId) {
      re -= br.fromPhasorA.re;
      im -= br.fromPhasorA.im;
    }
  }
  for (const s of fault.injections) {
    if (s.bus === busId) {
      re += s.phasorA.re;
      im += s.phasorA.im;
    }
  }
  return { re, im };
}

const branch = (fault: BusFault, id: string) => {
  const b = fault.branches.find((x) => x.id === id);
  if (!b) throw new Error(`no branch ${id}`);
  return b;
};
const injection = (fault: BusFault, id: string) => {
  const s = fault.injections.find((x) => x.id === id);
  if (!s) throw new Error(`no injection ${id}`);
  return s;
};

/** 12.47 kV utility, 1500 kVA 5.75 % X/R 6 transformer, 480 V bus "MCC"; extra elements appended. */
function unitSubstation(extra: Partial<Body> = {}): Model {
  return makeModel({
    buses: [{ id: 'PRI', nominalKv: 12.47 }, { id: 'MCC', nominalKv: 0.48 }, ...(extra.buses ?? [])],
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'PRI', shortCircuitMva: 250, xr: 10 }, ...(extra.sources ?? [])],
    transformers: [
      {
        id: 'TX',
        fromBus: 'PRI',
        toBus: 'MCC',
        kva: 1500,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 6,
      },
      ...(extra.transformers ?? []),
    ],
    cables: extra.cables ?? [],
    motors: extra.motors ?? [],
    ties: extra.ties ?? [],
  });
}

describe('parallel feeders', () => {
  const feeder = (id: string, sets = 1) => ({
    id,
    fromBus: 'MCC',
    toBus: 'LOAD',
    lengthM: 60,
    sets,
    size: '250',
    material: 'Cu' as const,
    conduit: 'steel' as const,
  });
  const withFeeders = (cables: ReturnType<typeof feeder>[]) =>
    unitSubstation({ buses: [{ id: 'LOAD', nominalKv: 0.48 }], cables });

  it('two identical parallel feeders give half the impedance of one', () => {
    // Parallel impedances: Z/2 (NEC Chapter 9 Table 9 note: for n parallel sets divide R and X by n).
    const one = shortCircuit(withFeeders([feeder('F1')]));
    const two = shortCircuit(withFeeders([feeder('F1'), feeder('F2')]));
    const up = theveninOhm(one, 'MCC');
    const zOne = theveninOhm(one, 'LOAD');
    const zTwo = theveninOhm(two, 'LOAD');
    expectClose(zTwo.re - up.re, (zOne.re - up.re) / 2, 1e-9);
    expectClose(zTwo.im - up.im, (zOne.im - up.im) / 2, 1e-9);
    // Two cables in parallel are the same as one cable with sets: 2.
    const sets = shortCircuit(withFeeders([feeder('F1', 2)]));
    expectClose(bus(sets, 'LOAD').boltedFaultKa, bus(two, 'LOAD').boltedFaultKa, 1e-9);
  });

  it('each identical feeder carries half the fault current, in the same direction', () => {
    // Current divider between equal impedances (circuit theory).
    const fault = createShortCircuitSolver(withFeeders([feeder('F1'), feeder('F2')])).faultAt('LOAD');
    for (const id of ['F1', 'F2']) {
      expectClose(branch(fault, id).toCurrentA, fault.faultCurrentA / 2, 1e-9);
      expect(branch(fault, id).direction).toBe('from-to');
      expect(branch(fault, id).towardBus).toBe('LOAD');
    }
  });

  it('unequal parallel paths share the current inversely to their impedances', () => {
    // Current divider: I1/I2 = |Z2|/|Z1| for paths of the same X/R (same cable type, lengths 60 m and 180 m).
    const long = { ...feeder('F2'), lengthM: 180 };
    const fault = createShortCircuitSolver(withFeeders([feeder('F1'), long])).faultAt('LOAD');
    expectClose(branch(fault, 'F1').toCurrentA / branch(fault, 'F2').toCurrentA, 3, 1e-9);
  });
});

describe('induction motor contribution (IEEE 551-2006 Table 9-1 practice)', () => {
  const ratedA = (kva: number, kv: number) => kva / (Math.sqrt(3) * kv);

  it('a 100 hp, 480 V motor adds I_rated / (1.2 × 0.167) at its bus', () => {
    // IEEE 551-2006 Table 9-1: X" = 16.7 %, LV motors above 50 hp at 1.2 X" in the first-cycle network.
    // kVA = hp (1 kVA per hp: common practice, no source). The reference also prints "4.8 × rated, 20.8 %" beside
    // 1.2 X"; 1.2 × 16.7 % is 20.04 % (4.99 × rated): the engine follows the 1.2 × 16.7 % product.
    const xr = 10;
    const without = createShortCircuitSolver(unitSubstation()).faultAt('MCC');
    const withMotor = createShortCircuitSolver(
      unitSubstation({ motors: [{ id: 'M1', bus: 'MCC', hp: 100, kv: 0.48, xr }] }),
    ).faultAt('MCC');
    const expectedA = ratedA(100, 0.48) / (1.2 * 0.167) / Math.sqrt(1 + 1 / (xr * xr)); // |Z| = X·√(1 + 1/(X/R)²)
    expectClose(injection(withMotor, 'M1').currentA, expectedA, 1e-9);
    // A bolted fault at the motor's bus holds that bus at zero volts, so the other sources are unaffected and
    // the fault current is the phasor sum (superposition, IEEE 141 practice).
    expectClose(withMotor.faultPhasorA.re, without.faultPhasorA.re + injection(withMotor, 'M1').phasorA.re, 1e-9);
    expectClose(withMotor.faultPhasorA.im, without.faultPhasorA.im + injection(withMotor, 'M1').phasorA.im, 1e-9);
    expect(withMotor.faultCurrentA).toBeGreaterThan(without.faultCurrentA);
  });

  it('a 30 hp motor on a 480 V system at 1.67 X"', () => {
    // IEEE 551-2006 Table 9-1: LV motors below 50 hp at 1.67 X" (≈ 3.6 × rated current).
    const fault = createShortCircuitSolver(
      unitSubstation({ motors: [{ id: 'M2', bus: 'MCC', hp: 30, kv: 0.48, xr: 1e6 }] }),
    ).faultAt('MCC');
    expectClose(injection(fault, 'M2').currentA / ratedA(30, 0.48), 1 / (1.67 * 0.167), 1e-6);
    expectClose(injection(fault, 'M2').currentA / ratedA(30, 0.48), 3.6, 0.01); // "~3.6 × rated" as printed
  });

  it('a 4.16 kV motor at X" = 16.7 % gives 6 × rated current', () => {
    // IEEE 551-2006 Table 9-1: induction motor X" = 16.7 % (→ 6 × rated current); no LV multiplier above 1 kV.
    const model = makeModel({
      buses: [{ id: 'MV', nominalKv: 4.16 }],
      sources: [{ id: 'UTIL', kind: 'utility', bus: 'MV', shortCircuitMva: 150, xr: 12 }],
      motors: [{ id: 'M3', bus: 'MV', kva: 1000, kv: 4.16, xr: 1e6 }],
    });
    const fault = createShortCircuitSolver(model).faultAt('MV');
    // 1/0.167 = 5.988, printed as "6 ×": tolerance 0.5 %.
    expectClose(injection(fault, 'M3').currentA / ratedA(1000, 4.16), 6, 0.005);
    expectClose(injection(fault, 'M3').currentA / ratedA(1000, 4.16), 1 / 0.167, 1e-9);
  });

  it('a given locked-rotor multiple sets X" = 1/multiple', () => {
    // Reference per_unit_example: induction motor X" ≈ 1/LRC multiple; IEEE 551 1.2 X" above 50 hp (LV).
    const fault = createShortCircuitSolver(
      unitSubstation({ motors: [{ id: 'M4', bus: 'MCC', hp: 200, kv: 0.48, lockedRotorMultiple: 6.5, xr: 1e6 }] }),
    ).faultAt('MCC');
    expectClose(injection(fault, 'M4').currentA / ratedA(200, 0.48), 6.5 / 1.2, 1e-6);
  });

  it('a 460 V motor on a 480 V bus: its impedance changes base by (0.46/0.48)²', () => {
    // IEEE 141 change of base: Zpu,new = Zpu,old·(MVAnew/MVAold)·(kVold/kVnew)².
    const fault = createShortCircuitSolver(
      unitSubstation({ motors: [{ id: 'M5', bus: 'MCC', hp: 100, kv: 0.46, xr: 1e6 }] }),
    ).faultAt('MCC');
    expectClose(injection(fault, 'M5').currentA, ((ratedA(100, 0.46) / (1.2 * 0.167)) * 0.48) / 0.46, 1e-6);
  });

  it('warns when kVA is taken from hp and when X/R is typical', () => {
    const result = shortCircuit(unitSubstation({ motors: [{ id: 'M6', bus: 'MCC', hp: 75, kv: 0.48 }] }));
    expect(result.warnings.map((w) => w.code)).toEqual(
      expect.arrayContaining(['motor-kva-from-hp', 'typical-motor-xr']),
    );
    expect(result.warnings.find((w) => w.code === 'typical-motor-xr')!.message).toContain('M6');
  });
});

describe('transformers: currents scale through the voltage ratio', () => {
  const model = unitSubstation({ motors: [{ id: 'M1', bus: 'MCC', hp: 500, kv: 0.48, xr: 8 }] });
  const solver = createShortCircuitSolver(model);

  it('secondary fault: primary current = secondary current × 0.48/12.47', () => {
    // Ideal transformer (ampere-turn balance): I_p/I_s = V_s/V_p; IEEE 141 per-unit bases Ibase = MVA/(√3·kV).
    const fault = solver.faultAt('MCC');
    const tx = branch(fault, 'TX');
    expectClose(tx.fromCurrentA, (tx.toCurrentA * 0.48) / 12.47, 1e-9);
    expect(tx.direction).toBe('from-to');
    expect(tx.towardBus).toBe('MCC');
    // The utility current at 12.47 kV is the transformer's primary current (series path).
    expectClose(injection(fault, 'UTIL').currentA, tx.fromCurrentA, 1e-9);
  });

  it('primary fault: the motor feeds back through the transformer, scaled by the ratio', () => {
    // Ideal transformer: I_p = I_s·(V_s/V_p); the motor's current is the transformer's secondary current (series).
    const fault = solver.faultAt('PRI');
    const tx = branch(fault, 'TX');
    expect(tx.direction).toBe('to-from');
    expect(tx.towardBus).toBe('PRI');
    expectClose(tx.toCurrentA, injection(fault, 'M1').currentA, 1e-9);
    expectClose(tx.fromCurrentA, (injection(fault, 'M1').currentA * 0.48) / 12.47, 1e-9);
    // Fault current = utility + motor contribution seen at 12.47 kV (Kirchhoff's current law at the bus).
    const sum = inflowA(fault, 'PRI');
    expectClose(sum.re, fault.faultPhasorA.re, 1e-9);
    expectClose(sum.im, fault.faultPhasorA.im, 1e-9);
  });

  it('with an off-nominal tap the currents scale by the rated ratio', () => {
    // Tap model: ideal t:1 transformer; I_p/I_s = kVs,rated/kVp,rated (ampere-turn balance on the rated turns).
    const tapped = makeModel({
      buses: [
        { id: 'PRI', nominalKv: 12.47 },
        { id: 'SEC', nominalKv: 0.48 },
      ],
      sources: [{ id: 'UTIL', kind: 'utility', bus: 'PRI', shortCircuitMva: 250, xr: 10 }],
      transformers: [
        {
          id: 'TX',
          fromBus: 'PRI',
          toBus: 'SEC',
          kva: 1000,
          primaryKv: 12.16,
          secondaryKv: 0.48,
          impedancePct: 5.75,
          xr: 6,
        },
      ],
    });
    const tx = branch(createShortCircuitSolver(tapped).faultAt('SEC'), 'TX');
    expectClose(tx.fromCurrentA / tx.toCurrentA, 0.48 / 12.16, 1e-9);
  });
});

describe('sources', () => {
  it('a utility given in kA gives that current at its bus', () => {
    // Reference per_unit_example: utility Z = kV²/(√3·kV·I_sc) ohms.
    const model = makeModel({
      buses: [{ id: 'B', nominalKv: 13.8 }],
      sources: [{ id: 'U', kind: 'utility', bus: 'B', shortCircuitKa: 25, xr: 17 }],
    });
    const result = shortCircuit(model);
    expectClose(bus(result, 'B').boltedFaultKa, 25, 1e-9);
    expectClose(bus(result, 'B').xr, 17, 1e-9);
  });

  it('a generator alone gives I_rated / |X"d + R|', () => {
    // IEEE 141 per-unit practice: I = Ibase/|Z|, generator X = X"d on its rating, R = X/(X/R).
    const model = makeModel({
      buses: [{ id: 'G', nominalKv: 0.48 }],
      sources: [{ id: 'GEN', kind: 'generator', bus: 'G', kva: 1000, kv: 0.48, subtransientPct: 12, xr: 25 }],
    });
    const ratedA = 1000 / (Math.sqrt(3) * 0.48);
    expectClose(bus(shortCircuit(model), 'G').boltedFaultKa * 1000, ratedA / (0.12 * Math.sqrt(1 + 1 / 625)), 1e-9);
  });

  it('a pre-fault voltage of 1.05 pu raises every fault current by 5 %', () => {
    // Thevenin: I = V_prefault / Z (IEEE 141 practice).
    const base = shortCircuit(unitSubstation());
    const raised = shortCircuit({ ...unitSubstation(), prefaultPu: 1.05 });
    for (const b of base.buses) expectClose(bus(raised, b.id).boltedFaultKa, b.boltedFaultKa * 1.05, 1e-9);
    expectClose(raised.prefaultPu, 1.05, 1e-12);
  });

  it('a missing transformer X/R takes the typical value by size, with a warning naming the transformer', () => {
    // Typical X/R: from memory, unverified (reference "typical_values"); the warning says so.
    const model = makeModel({
      buses: [
        { id: 'PRI', nominalKv: 12.47 },
        { id: 'SEC', nominalKv: 0.48 },
      ],
      sources: [{ id: 'UTIL', kind: 'utility', bus: 'PRI', shortCircuitMva: INFINITE_MVA, xr: 10 }],
      transformers: [
        {
          id: 'TX-9',
          fromBus: 'PRI',
          toBus: 'SEC',
          kva: 1500,
          primaryKv: 12.47,
          secondaryKv: 0.48,
          impedancePct: 5.75,
        },
      ],
    });
    const result = shortCircuit(model);
    const warning = result.warnings.find((w) => w.code === 'typical-transformer-xr');
    expect(warning?.message).toContain('TX-9');
    expectClose(bus(result, 'SEC').xr, typicalTransformerXr(1500), 1e-6);
  });
});

describe('radial direction', () => {
  it('current flows from the source toward the fault; branches beyond the fault carry none', () => {
    // One source, radial network: the whole fault current flows along the path source → fault (circuit theory).
    const cable = (id: string, fromBus: string, toBus: string) => ({
      id,
      fromBus,
      toBus,
      lengthM: 30,
      sets: 1,
      size: '4/0',
      material: 'Cu' as const,
      conduit: 'pvc' as const,
    });
    const model = unitSubstation({
      buses: [
        { id: 'A', nominalKv: 0.48 },
        { id: 'B', nominalKv: 0.48 },
        { id: 'C', nominalKv: 0.48 },
      ],
      // C1 drawn "backwards" (from A to MCC) to check the direction sign.
      cables: [cable('C1', 'A', 'MCC'), cable('C2', 'A', 'B'), cable('C3', 'B', 'C')],
    });
    const fault = createShortCircuitSolver(model).faultAt('B');
    expect(branch(fault, 'C1').direction).toBe('to-from');
    expect(branch(fault, 'C1').towardBus).toBe('A');
    expect(branch(fault, 'C2').direction).toBe('from-to');
    expect(branch(fault, 'C2').towardBus).toBe('B');
    expectClose(branch(fault, 'C2').toCurrentA, fault.faultCurrentA, 1e-9);
    expect(branch(fault, 'C3').direction).toBe('none');
    expect(branch(fault, 'C3').towardBus).toBeNull();
    expect(branch(fault, 'C3').toCurrentA).toBeLessThan(1e-6 * fault.faultCurrentA);
  });

  it('reports only the requested branches and sources when asked', () => {
    const solver = createShortCircuitSolver(unitSubstation({ motors: [{ id: 'M1', bus: 'MCC', hp: 100, kv: 0.48 }] }));
    const fault = solver.faultAt('MCC', { branchIds: ['TX'], injectionIds: ['M1'] });
    expect(fault.branches.map((b) => b.id)).toEqual(['TX']);
    expect(fault.injections.map((s) => s.id)).toEqual(['M1']);
    expectClose(fault.branches[0].toCurrentA, branch(solver.faultAt('MCC'), 'TX').toCurrentA, 1e-12);
    expect(() => solver.faultAt('MCC', { branchIds: ['NOPE'] })).toThrow(EngineError);
    expect(() => solver.faultAt('NOPE')).toThrow(EngineError);
  });
});

describe('bus ties', () => {
  // Double-ended substation: two transformers, two 480 V buses joined by a tie.
  const doubleEnded = (closed: boolean) =>
    makeModel({
      buses: [
        { id: 'PRI', nominalKv: 12.47 },
        { id: 'L', nominalKv: 0.48 },
        { id: 'R', nominalKv: 0.48 },
      ],
      sources: [{ id: 'UTIL', kind: 'utility', bus: 'PRI', shortCircuitMva: 250, xr: 10 }],
      transformers: [
        {
          id: 'TX-L',
          fromBus: 'PRI',
          toBus: 'L',
          kva: 1500,
          primaryKv: 12.47,
          secondaryKv: 0.48,
          impedancePct: 5.75,
          xr: 6,
        },
        {
          id: 'TX-R',
          fromBus: 'PRI',
          toBus: 'R',
          kva: 1000,
          primaryKv: 12.47,
          secondaryKv: 0.48,
          impedancePct: 5.75,
          xr: 6,
        },
      ],
      motors: [{ id: 'M-R', bus: 'R', hp: 200, kv: 0.48, xr: 8 }],
      ties: [{ id: 'TIE', fromBus: 'L', toBus: 'R', closed }],
    });

  it("a closed tie: both buses have the same fault current; the tie carries the far side's contribution", () => {
    // Zero-impedance tie: one electrical node; Kirchhoff's current law at bus R gives the tie current.
    const solver = createShortCircuitSolver(doubleEnded(true));
    expectClose(bus(solver.result, 'L').boltedFaultKa, bus(solver.result, 'R').boltedFaultKa, 1e-12);
    const fault = solver.faultAt('L');
    const tie = branch(fault, 'TIE');
    expect(tie.direction).toBe('to-from');
    expect(tie.towardBus).toBe('L');
    const fromR = {
      re: branch(fault, 'TX-R').toPhasorA.re + injection(fault, 'M-R').phasorA.re,
      im: branch(fault, 'TX-R').toPhasorA.im + injection(fault, 'M-R').phasorA.im,
    };
    expectClose(tie.toCurrentA, Math.hypot(fromR.re, fromR.im), 1e-9);
    for (const id of ['PRI', 'L', 'R']) {
      const sum = inflowA(fault, id);
      const expected = id === 'L' ? fault.faultPhasorA : { re: 0, im: 0 };
      expectClose(sum.re, expected.re, 1e-9, 1e-9 * fault.faultCurrentA);
      expectClose(sum.im, expected.im, 1e-9, 1e-9 * fault.faultCurrentA);
    }
  });

  it('an open tie carries nothing: the buses are as if the tie were absent', () => {
    // Open switch: no path (circuit theory).
    const solver = createShortCircuitSolver(doubleEnded(false));
    const withoutTie = shortCircuit({ ...doubleEnded(false), ties: [] });
    for (const id of ['L', 'R'])
      expectClose(bus(solver.result, id).boltedFaultKa, bus(withoutTie, id).boltedFaultKa, 1e-12);
    expect(isClose(bus(solver.result, 'L').boltedFaultKa, bus(solver.result, 'R').boltedFaultKa, 1e-3)).toBe(false);
    const fault = solver.faultAt('L');
    expect(branch(fault, 'TIE').direction).toBe('none');
    expect(branch(fault, 'TIE').toCurrentA).toBe(0);
  });
});

describe('frequency', () => {
  it('a 50 Hz model uses 50/60 of the Table 9 cable reactance', () => {
    // X = 2πfL; NEC Chapter 9 Table 9 reactances are for 60 Hz.
    const body = (frequencyHz: 50 | 60): Body => ({
      frequencyHz,
      buses: [
        { id: 'S', nominalKv: 0.4 },
        { id: 'E', nominalKv: 0.4 },
      ],
      sources: [{ id: 'U', kind: 'utility', bus: 'S', shortCircuitMva: 30, xr: 8 }],
      cables: [
        { id: 'C', fromBus: 'S', toBus: 'E', lengthM: 80, sets: 1, size: '2/0', material: 'Cu', conduit: 'steel' },
      ],
    });
    const r60 = shortCircuit(makeModel(body(60)));
    const r50 = shortCircuit(makeModel(body(50)));
    const c60 = {
      re: theveninOhm(r60, 'E').re - theveninOhm(r60, 'S').re,
      im: theveninOhm(r60, 'E').im - theveninOhm(r60, 'S').im,
    };
    const c50 = {
      re: theveninOhm(r50, 'E').re - theveninOhm(r50, 'S').re,
      im: theveninOhm(r50, 'E').im - theveninOhm(r50, 'S').im,
    };
    expectClose(c50.im, (c60.im * 50) / 60, 1e-8);
    expectClose(c50.re, c60.re, 1e-8);
    expect(r50.warnings.map((w) => w.code)).toContain('cable-reactance-frequency');
  });
});

describe('errors', () => {
  it('an invalid model throws EngineError naming the element path', () => {
    // docs/MODEL-FORMAT.md, Validation: unknown references are rejected with an error naming the element and field.
    const model = unitSubstation({
      cables: [
        {
          id: 'FDR-3',
          fromBus: 'MCC',
          toBus: 'MCC-9',
          lengthM: 10,
          sets: 1,
          size: '2',
          material: 'Cu',
          conduit: 'pvc',
        },
      ],
    });
    try {
      shortCircuit(model);
      throw new Error('expected an EngineError');
    } catch (error) {
      expect(error).toBeInstanceOf(EngineError);
      expect((error as EngineError).kind).toBe('invalid-input');
      expect((error as EngineError).field).toBe('cables[0].toBus');
      expect((error as EngineError).message).toContain('MCC-9');
      expect((error as InvalidModelError).issues).toEqual([
        expect.objectContaining({ path: 'cables[0].toBus', elementId: 'FDR-3', field: 'toBus' }),
      ]);
    }
  });

  it('non-finite results throw EngineError', () => {
    // An absurd source (1e300 MVA) overflows the admittance: the engine refuses rather than return Infinity.
    const model = makeModel({
      buses: [{ id: 'B', nominalKv: 0.48 }],
      sources: [{ id: 'U', kind: 'utility', bus: 'B', shortCircuitMva: 1e300, xr: 10 }],
    });
    expect(() => shortCircuit(model)).toThrow(EngineError);
  });
});

// ---------------------------------------------------------------------------------------------
// Random looped networks: Kirchhoff's current law at every bus, and Zbus against a dense inverse.

const cableArb = fc.record({
  r: fc.double({ min: 0.01, max: 2, noNaN: true }),
  x: fc.double({ min: 0.01, max: 2, noNaN: true }),
  lengthM: fc.double({ min: 1, max: 500, noNaN: true }),
});

const networkArb = fc.integer({ min: 2, max: 9 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    parents: fc.tuple(...Array.from({ length: n - 1 }, (_, i) => fc.integer({ min: 0, max: i }))),
    treeCables: fc.array(cableArb, { minLength: n - 1, maxLength: n - 1 }),
    loops: fc.array(fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 }), cableArb), {
      maxLength: 6,
    }),
    motorBuses: fc.array(fc.integer({ min: 0, max: n - 1 }), { maxLength: 3 }),
    generatorBus: fc.option(fc.integer({ min: 0, max: n - 1 }), { nil: undefined }),
    tie: fc.option(fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 })), {
      nil: undefined,
    }),
  }),
);

/** Buses L0…L(n−1) at 0.48 kV under a 12.47 kV bus HV with the utility; tree + loop cables. */
type NetworkSpec = typeof networkArb extends fc.Arbitrary<infer T> ? T : never;

function randomModel(spec: NetworkSpec): Model {
  const lv = (i: number) => `L${i}`;
  const cables: Body['cables'] = [];
  spec.parents.forEach((p, i) => {
    const c = spec.treeCables[i];
    cables.push({
      id: `T${i}`,
      fromBus: lv(p),
      toBus: lv(i + 1),
      lengthM: c.lengthM,
      sets: 1,
      rOhmPerKm: c.r,
      xOhmPerKm: c.x,
    });
  });
  spec.loops.forEach(([a, b, c], i) => {
    if (a !== b)
      cables.push({
        id: `X${i}`,
        fromBus: lv(a),
        toBus: lv(b),
        lengthM: c.lengthM,
        sets: 1,
        rOhmPerKm: c.r,
        xOhmPerKm: c.x,
      });
  });
  const ties: Body['ties'] = [];
  if (spec.tie && spec.tie[0] !== spec.tie[1])
    ties.push({ id: 'TIE', fromBus: lv(spec.tie[0]), toBus: lv(spec.tie[1]), closed: true });
  return makeModel({
    buses: [
      { id: 'HV', nominalKv: 12.47 },
      ...Array.from({ length: spec.n }, (_, i) => ({ id: lv(i), nominalKv: 0.48 })),
    ],
    sources: [
      { id: 'UTIL', kind: 'utility', bus: 'HV', shortCircuitMva: 300, xr: 12 },
      ...(spec.generatorBus !== undefined
        ? [
            {
              id: 'GEN',
              kind: 'generator' as const,
              bus: lv(spec.generatorBus),
              kva: 500,
              kv: 0.48,
              subtransientPct: 14,
              xr: 20,
            },
          ]
        : []),
    ],
    transformers: [
      {
        id: 'TX',
        fromBus: 'HV',
        toBus: 'L0',
        kva: 2000,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 7,
      },
    ],
    cables,
    motors: spec.motorBuses.map((b, i) => ({ id: `M${i}`, bus: lv(b), hp: 40 + 60 * i, kv: 0.46, xr: 6 })),
    ties,
  });
}

describe('random looped networks (property tests)', () => {
  it("Kirchhoff's current law holds at every bus for a fault at every bus", () => {
    // Kirchhoff's current law: the currents entering a bus sum to the fault current drawn there, zero elsewhere.
    fc.assert(
      fc.property(networkArb, (spec) => {
        const model = randomModel(spec);
        const solver = createShortCircuitSolver(model);
        for (const faultBus of solver.busIds) {
          const fault = solver.faultAt(faultBus);
          expectClose(fault.faultCurrentA, bus(solver.result, faultBus).boltedFaultKa * 1000, 1e-9);
          for (const b of model.buses) {
            const sum = inflowA(fault, b.id);
            const expected = b.id === faultBus ? fault.faultPhasorA : { re: 0, im: 0 };
            const tol = 1e-9 * fault.faultCurrentA;
            expectClose(sum.re, expected.re, 1e-9, tol);
            expectClose(sum.im, expected.im, 1e-9, tol);
          }
        }
      }),
      { numRuns: 60 },
    );
  });

  it('the Zbus diagonal of the sparse factorization equals a dense matrix inverse', () => {
    // Zbus = Ybus⁻¹ (nodal method, IEEE 141 practice); the dense inverse is mathjs's, independent of the engine's
    // sparse LDLᵀ, ordering and Takahashi recurrences. Ybus is assembled here from the per-unit branch data.
    fc.assert(
      fc.property(networkArb, (spec) => {
        const model = randomModel(spec);
        const network = buildNetwork(model);
        const n = network.nodeCount;
        const y: math.Complex[][] = Array.from({ length: n }, () =>
          Array.from({ length: n }, () => math.complex(0, 0)),
        );
        const add = (i: number, j: number, v: math.Complex) => {
          y[i][j] = math.add(y[i][j], v) as math.Complex;
        };
        for (const br of network.branches) {
          if (br.fromNode === br.toNode) continue;
          const yb = math.complex(br.admittancePu.re, br.admittancePu.im);
          const t = br.ratio;
          add(br.fromNode, br.fromNode, math.divide(yb, t * t) as math.Complex);
          add(br.toNode, br.toNode, yb);
          add(br.fromNode, br.toNode, math.unaryMinus(math.divide(yb, t)) as math.Complex);
          add(br.toNode, br.fromNode, math.unaryMinus(math.divide(yb, t)) as math.Complex);
        }
        for (const s of network.injections) add(s.node, s.node, math.complex(s.admittancePu.re, s.admittancePu.im));
        const z = math.inv(y) as math.Complex[][];
        const result = shortCircuit(model);
        result.buses.forEach((b, i) => {
          const zkk = z[network.busNode[i]][network.busNode[i]];
          expect(Number.isFinite(zkk.re) && Number.isFinite(zkk.im)).toBe(true);
          const expectedKa = (network.prefaultPu / Math.hypot(zkk.re, zkk.im)) * (network.busBaseA[i] / 1000);
          expectClose(b.boltedFaultKa, expectedKa, 1e-8);
          expectClose(b.xr, zkk.im / zkk.re, 1e-7);
        });
      }),
      { numRuns: 60 },
    );
  });
});
