/**
 * Time-varying currents during the arc: generator decrement, motor decay, each device's operation integrated over
 * the current it sees, and the energy added step by step. Sources beside each check.
 */
import type { Device } from '../../shared/schemas/device';
import type { ModelInput } from '../../shared/schemas/model';
import { modelSchema } from '../../shared/schemas/model';
import { computeArcingCurrents, computeCaseEnergy, resolveEnclosure } from '../../server/engine/ieee1584/compute';
import {
  createStudyRunner,
  generatorDecrementProfile,
  motorExponentialProfile,
  operatingTimeS,
  resolveGenerator,
} from '../../server/engine/study';
import { clearingTime } from '../../server/engine/trip';
import { expectClose } from '../helpers/approx';

const parse = (m: ModelInput) => modelSchema.parse(m);

describe('operation under a time-varying current (IEEE C37.112 integral ∫ dt / t(I) = 1)', () => {
  const devices: [string, Device][] = [
    ['relay IEEE-VI', { kind: 'relay', curve: 'IEEE-VI', pickupA: 100, timeDial: 1, breakerCycles: 5 }],
    [
      'electronic LT/ST',
      {
        kind: 'electronic',
        sensorA: 2000,
        longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
        shortTime: { pickup: 4, delayS: 0.3, i2t: true },
        pickupTolerancePct: 10,
        clearingS: 0.05,
      },
    ],
    [
      'fuse',
      {
        kind: 'fuse',
        ratingA: 30,
        minimumMelt: [
          [45, 300],
          [60, 60],
          [90, 10],
          [150, 1],
        ],
        totalClearing: [
          [55, 600],
          [75, 100],
          [110, 15],
          [190, 1.5],
        ],
      },
    ],
  ];
  const currents: Record<string, number[]> = {
    'relay IEEE-VI': [250, 800, 2500],
    'electronic LT/ST': [3000, 6000, 12000],
    fuse: [80, 120, 170],
  };

  it.each(devices)(
    '%s: a constant current gives exactly the constant-current time (the integral of a constant)',
    (name, device) => {
      for (const i of currents[name]) {
        const expected = clearingTime(device, i).clearingTimeS as number;
        const r = operatingTimeS(device, [{ untilS: Infinity, currentA: i }]);
        expect(r).not.toBeNull();
        expectClose(r!.timeS, expected, 1e-12);
      }
    },
  );

  /** Digitized band whose maximum curve passes through (1000 A, 2 s) and (2000 A, 0.5 s). */
  const band: Device = {
    kind: 'band',
    ratingA: 100,
    currentUnit: 'ampere',
    min: [
      [900, 1.5],
      [1800, 0.4],
      [4000, 0.2],
    ],
    max: [
      [900, 3],
      [1000, 2],
      [2000, 0.5],
      [4000, 0.25],
    ],
  };

  it('a current stepping down mid-arc: the integral worked by hand (IEEE C37.112 integral form)', () => {
    // t(I1 = 2000 A) = 0.5 s, t(I2 = 1000 A) = 2 s (points of the band). Step at 0.2 s:
    // consumed 0.2 / 0.5 = 0.4; remaining 1 − 0.4 = 0.6 → 0.6 × 2 s = 1.2 s at I2 → operates at 0.2 + 1.2 = 1.4 s.
    expectClose(clearingTime(band, 2000).clearingTimeS as number, 0.5, 1e-12);
    expectClose(clearingTime(band, 1000).clearingTimeS as number, 2, 1e-12);
    const r = operatingTimeS(band, [
      { untilS: 0.2, currentA: 2000 },
      { untilS: Infinity, currentA: 1000 },
    ]);
    expectClose(r!.timeS, 1.4, 1e-12);
    // The other way round (a rising current): 0.2 / 2 = 0.1 consumed; 0.9 × 0.5 s = 0.45 s → 0.65 s.
    const up = operatingTimeS(band, [
      { untilS: 0.2, currentA: 1000 },
      { untilS: Infinity, currentA: 2000 },
    ]);
    expectClose(up!.timeS, 0.65, 1e-12);
  });

  it('a current that falls below the pickup stops the element and its progress is lost (conservative reset, from memory)', () => {
    // 2000 A for 0.3 s (0.3 / 0.5 = 0.6 consumed), 500 A (below the band's lowest current: no trip) until 0.5 s,
    // then 2000 A again: it starts over, 0.5 s more → 1.0 s.
    const r = operatingTimeS(band, [
      { untilS: 0.3, currentA: 2000 },
      { untilS: 0.5, currentA: 500 },
      { untilS: Infinity, currentA: 2000 },
    ]);
    expectClose(r!.timeS, 1.0, 1e-12);
    // Below the pickup for good: it never operates.
    expect(
      operatingTimeS(band, [
        { untilS: 0.3, currentA: 2000 },
        { untilS: Infinity, currentA: 500 },
      ]),
    ).toBeNull();
  });
});

describe("generator decrement: i(t) = E[(1/X\"d − 1/X'd)e^(−t/T\"d) + (1/X'd − 1/Xd)e^(−t/T'd) + 1/Xd] (classic envelope, from memory)", () => {
  it('at the terminals: the ratio to the first-cycle current worked by hand', () => {
    const p = generatorDecrementProfile({
      subtransientPu: 0.15,
      transientPu: 0.25,
      synchronousPu: 2,
      subtransientTimeConstantS: 0.02,
      transientTimeConstantS: 0.2,
      externalPu: 0,
    });
    expectClose(p.ratioAt(0), 1, 1e-12);
    // t = 0.1 s: (6.6667 − 4) e^(−5) + (4 − 0.5) e^(−0.5) + 0.5 = 0.0179677 + 2.1228572 + 0.5 = 2.6408249;
    // over 1/X"d = 6.6666667 → 0.3961237.
    expectClose(p.ratioAt(0.1), 0.3961237, 1e-6);
    // Sustained: (1/Xd) / (1/X"d) = 0.15 / 2 = 0.075.
    expectClose(p.ratioAt(100), 0.075, 1e-9);
  });

  it('behind an external reactance the reactances and time constants are referred to the fault (from memory)', () => {
    const p = generatorDecrementProfile({
      subtransientPu: 0.15,
      transientPu: 0.25,
      synchronousPu: 2,
      subtransientTimeConstantS: 0.02,
      transientTimeConstantS: 0.2,
      externalPu: 0.1,
    });
    // X" = 0.25, X' = 0.35, X = 2.1; T' = 0.2 × 0.35/0.25 × 2/2.1 = 0.2666667 s; T" = 0.02 × 0.25/0.15 × 0.25/0.35
    // = 0.0238095 s. At t = T' : (4 − 2.8571429) e^(−0.2666667/0.0238095) + (2.8571429 − 0.4761905) e^(−1) + 0.4761905
    // = 1.1428571 × 0.0000137 + 2.3809524 × 0.3678794 + 0.4761905 = 0.0000157 + 0.8759034 + 0.4761905 = 1.3521096;
    // over 1/X" = 4 → 0.3380274.
    expectClose(p.ratioAt(0.2666667), 0.3380274, 1e-6);
    expectClose(p.ratioAt(100), 0.25 / 2.1, 1e-9);
  });

  it('takes typical values when the data are missing, each flagged (typical value, from memory)', () => {
    const g = resolveGenerator({
      id: 'G',
      kind: 'generator',
      bus: 'B',
      kva: 500,
      kv: 0.48,
      subtransientPct: 12,
      xr: 20,
    });
    expect(g.typicalValuesUsed.sort()).toEqual(
      ['G.subtransientTimeConstantS', 'G.synchronousPct', 'G.transientPct', 'G.transientTimeConstantS'].sort(),
    );
    expect(g.warnings.map((w) => w.code)).toEqual(['GENERATOR_TYPICAL_VALUE']);
    expect(g.warnings[0].message).toContain('from memory');
    const given = resolveGenerator({
      id: 'G',
      kind: 'generator',
      bus: 'B',
      kva: 500,
      kv: 0.48,
      subtransientPct: 12,
      xr: 20,
      transientPct: 20,
      sustainedCurrentMultiple: 3,
      subtransientTimeConstantS: 0.02,
      transientTimeConstantS: 0.3,
    });
    expect(given.typicalValuesUsed).toEqual([]);
    // A sustained-current multiple k stands for Xd = 1/k.
    expectClose(given.synchronousPu, 1 / 3, 1e-12);
  });

  it('the model refuses inconsistent generator data, naming the field', () => {
    const base = {
      format: 'emberline-model',
      version: 1,
      buses: [{ id: 'B', nominalKv: 0.48 }],
    } as const;
    const gen = { id: 'G', kind: 'generator', bus: 'B', kva: 500, kv: 0.48, subtransientPct: 12, xr: 20 } as const;
    const bad = modelSchema.safeParse({ ...base, sources: [{ ...gen, transientPct: 10 }] });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0].path).toContain('transientPct');
    const both = modelSchema.safeParse({
      ...base,
      sources: [{ ...gen, synchronousPct: 200, sustainedCurrentMultiple: 3 }],
    });
    expect(both.success).toBe(false);
    expect(both.error!.issues[0].path).toContain('sustainedCurrentMultiple');
  });
});

/** A standby generator alone feeding a switchboard through its breaker. */
function generatorOnly(): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    frequencyHz: 60,
    buses: [
      { id: 'GEN-T', nominalKv: 0.48 },
      { id: 'SWBD', nominalKv: 0.48, equipment: { class: 'switchgear-lv', mainIsolated: true } },
    ],
    sources: [
      {
        id: 'GEN',
        kind: 'generator',
        bus: 'GEN-T',
        kva: 500,
        kv: 0.48,
        subtransientPct: 12,
        xr: 20,
        transientPct: 20,
        sustainedCurrentMultiple: 3,
        subtransientTimeConstantS: 0.015,
        transientTimeConstantS: 0.15,
      },
    ],
    cables: [
      {
        id: 'F-GEN',
        fromBus: 'GEN-T',
        toBus: 'SWBD',
        lengthM: 10,
        sets: 2,
        size: '500',
        material: 'Cu',
        conduit: 'steel',
      },
    ],
    devices: [
      {
        id: 'CB-GEN',
        branch: 'F-GEN',
        end: 'from',
        device: {
          kind: 'electronic',
          sensorA: 800,
          longTime: { pickup: 1, delayS: 0.5, delayMultiple: 6 },
          shortTime: { pickup: 3, delayS: 0.3, i2t: false },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
    ],
  } as ModelInput;
}

describe('a generator-only bus whose sustained current falls below the short-time pickup', () => {
  // First-cycle current ≈ 1/X"d ≈ 8 × rated (601 A) → above the short-time pickup (3 × 800 A = 2400 A, high edge
  // 2640 A); it decays toward 3 × rated ≈ 1800 A (sustained multiple), below that pickup but above the long-time
  // pickup (800 A, high edge 880 A).
  it('the short-time element stops timing and the arc lasts to the cap, the trace saying why', () => {
    const bus = createStudyRunner(parse(generatorOnly())).runBus('SWBD');
    const full = bus.cases.find((c) => c.arcCase === 'full')!;
    const cb = full.devices.find((d) => d.deviceId === 'CB-GEN')!;
    // At the first-cycle current its band gives the short-time delay (0.3 s + clearing): no longer true over time.
    expect(cb.region).toBe('short-time');
    expect(cb.dropouts.map((d) => d.element)).toContain('short-time');
    const drop = cb.dropouts.find((d) => d.element === 'short-time')!;
    expect(drop.atS).toBeLessThan(cb.clearingTimeS as number);
    expect(full.arcDurationCapped).toBe(true);
    expectClose(full.arcDurationS, 2, 1e-12);
    expect(full.sentence).toMatch(
      /short-time element stopped timing at [0-9.]+ s as the current it sees fell below the pickup/,
    );
    expect(full.sentence).toContain('generator current decays');
    expect(bus.warnings.map((w) => w.code)).toContain('ARC_DURATION_CAPPED');
  });

  it('with a longer cap, the long-time band clears it, later than its short-time band would at the first-cycle current', () => {
    const bus = createStudyRunner(parse(generatorOnly()), { maxArcDurationMs: 30000 }).runBus('SWBD');
    const full = bus.cases.find((c) => c.arcCase === 'full')!;
    const cb = full.devices.find((d) => d.deviceId === 'CB-GEN')!;
    expect(full.arcDurationCapped).toBe(false);
    expect(full.clearingDeviceId).toBe('CB-GEN');
    expect(cb.operatingElement).toBe('long-time');
    expect(full.clearingRegion).toBe('long-time');
    expect(cb.operatedAtS!).toBeGreaterThan(cb.clearingTimeS as number);
    expectClose(full.arcDurationS, cb.operatedAtS!, 1e-12);
    // Upper bound: the current only falls, never below the sustained current, whose bolted value is at least
    // Ibf × X"d/Xd = Ibf × 0.12 × 3 (an external reactance only raises the ratio); the long-time band at the arcing
    // current of that bolted current (IEEE 1584-2018 Eq. 1) is then the latest it can operate.
    const sustained = computeArcingCurrents({
      voltageV: 480,
      boltedFaultKa: bus.boltedFaultKa * 0.12 * 3,
      electrodeConfig: 'VCB',
      gapMm: bus.equipment!.gapMm,
    }).arcingCurrentKa.full;
    const latest = clearingTime(generatorOnly().devices![0].device as Device, sustained * 1000).clearingTimeS as number;
    expect(cb.operatedAtS!).toBeLessThanOrEqual(latest);
    expect(full.sentence).toContain('long-time');
  });

  it('adds the energy step by step, each step at its own arcing current (IEEE 1584-2018: E ∝ T at a given current)', () => {
    const bus = createStudyRunner(parse(generatorOnly())).runBus('SWBD');
    const eq = bus.equipment!;
    const full = bus.cases.find((c) => c.arcCase === 'full')!;
    const enclosure = resolveEnclosure(
      { electrodeConfig: 'VCB', voltageV: 480, gapMm: eq.gapMm },
      eq.enclosureMm ?? undefined,
    );
    let sum = 0;
    let steps = 0;
    for (const i of full.intervals)
      for (const s of i.steps.length ? i.steps : [i]) {
        steps++;
        const a = computeArcingCurrents({
          voltageV: 480,
          boltedFaultKa: s.boltedFaultKa,
          electrodeConfig: 'VCB',
          gapMm: eq.gapMm,
        });
        sum += computeCaseEnergy(
          a,
          'full',
          enclosure.enclosureCorrectionFactor,
          (s.toS - s.fromS) * 1000,
          eq.workingDistanceMm,
        ).incidentEnergyJPerCm2;
      }
    expect(steps).toBeGreaterThan(3);
    expectClose(full.incidentEnergyJPerCm2, sum, 1e-9);
    // The bolted current of the steps falls with the decrement: the first step holds the first-cycle current.
    const first = full.intervals[0].steps[0] ?? full.intervals[0];
    expectClose(first.boltedFaultKa, bus.boltedFaultKa, 1e-12);
    const lastInterval = full.intervals[full.intervals.length - 1];
    const last = lastInterval.steps.at(-1) ?? lastInterval;
    expect(last.boltedFaultKa).toBeLessThan(first.boltedFaultKa / 2);
  });
});

/** A panel fed by the utility through a transformer, with one large motor on it, and the devices given. */
function withMotor(devices: ModelInput['devices'] = []): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    frequencyHz: 60,
    buses: [
      { id: 'SVC', nominalKv: 12.47 },
      { id: 'MCC', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
    ],
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'SVC', shortCircuitMva: 250, xr: 10 }],
    transformers: [
      {
        id: 'TX',
        fromBus: 'SVC',
        toBus: 'MCC',
        kva: 1000,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 6,
      },
    ],
    motors: [{ id: 'M-1', bus: 'MCC', hp: 300, kv: 0.46 }],
    devices,
  } as ModelInput;
}

describe('motor contribution decaying exponentially (common practice, no source)', () => {
  it('step model: a device on the motor still sees the full motor current up to the decay time and opens at its band time (constant current: ∫ dt / t = 1 at t)', () => {
    const m = withMotor();
    m.devices = [
      {
        id: 'MS-1',
        source: 'M-1',
        device: {
          kind: 'band',
          ratingA: 100,
          currentUnit: 'ampere',
          min: [
            [100, 0.01],
            [100000, 0.01],
          ],
          max: [
            [100, 0.02],
            [100000, 0.02],
          ],
        },
      },
    ];
    const bus = createStudyRunner(parse(m), { motorDecayModel: 'step', motorDecayCycles: 5 }).runBus('MCC');
    const full = bus.cases.find((c) => c.arcCase === 'full')!;
    const motor = full.sources.find((s) => s.sourceId === 'M-1')!;
    expect(full.motorDecayModel).toBe('step');
    expect(motor.cutByDeviceId).toBe('MS-1');
    expectClose(motor.stopsAtS, 0.02, 1e-12);
  });

  it('I(t) = I(0)·e^(−t/τ), τ = the set cycles: after n cycles the contribution is e^(−1) of the first cycle', () => {
    const tau = 5 / 60;
    const p = motorExponentialProfile(tau);
    expectClose(p.ratioAt(tau), Math.exp(-1), 1e-12);
    expectClose(p.ratioAt(2 * tau), Math.exp(-2), 1e-12);
    expect(p.ratioAt(5 * tau * (1 + 1e-9))).toBe(0); // dropped after 5 τ
  });

  it('in the study the bolted current of each step is the utility share plus the motor share × e^(−t/τ)', () => {
    const runner = createStudyRunner(parse(withMotor()), { motorDecayModel: 'exponential', motorDecayCycles: 5 });
    const bus = runner.runBus('MCC');
    const full = bus.cases.find((c) => c.arcCase === 'full')!;
    const tau = 5 / 60;
    const motor = full.sources.find((s) => s.sourceId === 'M-1')!;
    const util = full.sources.find((s) => s.sourceId === 'UTIL')!;
    expect(motor.reason).toBe('motor-decay');
    expectClose(motor.stopsAtS, 5 * tau, 1e-12);
    const steps = full.intervals.flatMap((i) => (i.steps.length ? i.steps : [i]));
    const during = steps.filter((s) => s.toS <= 5 * tau + 1e-12);
    expect(during.length).toBeGreaterThan(3);
    for (const s of during) {
      // Each step carries the higher of its two ends: the start, as the contribution falls.
      expectClose(s.boltedFaultKa, bus.boltedFaultKa * (util.share + motor.share * Math.exp(-s.fromS / tau)), 1e-9);
    }
  });
});

describe("motor decay 'higher' (the default): both models evaluated, the higher energy kept", () => {
  // The rule is the product's conservative rule (where a choice is open, the higher hazard); the two decay models
  // themselves are common practice, no source. Each expected energy is the step and the exponential run entered
  // explicitly, so the check is against the two models, not against the bracketing code.
  /** A band with a flat maximum curve at `t` s from 100 A up (min curve at half of it). */
  const flat = (t: number): Device => ({
    kind: 'band',
    ratingA: 100,
    currentUnit: 'ampere',
    min: [
      [100, t / 2],
      [100000, t / 2],
    ],
    max: [
      [100, t],
      [100000, t],
    ],
  });
  const run = (m: ModelInput, motorDecayModel?: 'step' | 'exponential' | 'higher') =>
    createStudyRunner(parse(m), { motorDecayCycles: 5, ...(motorDecayModel ? { motorDecayModel } : {}) }).runBus('MCC');
  /** The sentence states the kept energy against the other one (rounded for reading, so to 0.1 %). */
  function expectSentenceEnergies(sentence: string, kept: number, other: number) {
    const m = /the higher of two energies \(([\d.]+) against ([\d.]+) cal\/cm²/.exec(sentence);
    expect(m).not.toBeNull();
    expectClose(Number(m![1]), kept, 1e-3);
    expectClose(Number(m![2]), other, 1e-3);
  }
  /** Every case of 'higher' against the same case with each model chosen explicitly. */
  function compare(m: ModelInput, chosen?: 'higher') {
    const step = run(m, 'step');
    const exp = run(m, 'exponential');
    const higher = run(m, chosen);
    expect(higher.cases.length).toBe(step.cases.length);
    return higher.cases.map((c, k) => {
      const s = step.cases[k];
      const e = exp.cases[k];
      expect([s.arcCase, s.location, e.arcCase, e.location]).toEqual([c.arcCase, c.location, c.arcCase, c.location]);
      return { higher: c, step: s, exp: e };
    });
  }

  it('a motor keeping the arc going with no device to clear it: the exponential model gives the higher energy and is kept', () => {
    // Nothing clears the utility before the 2 s cap; the same ampere-seconds of motor current spread over 5 τ give
    // the higher energy here.
    for (const { higher, step, exp } of compare(withMotor(), 'higher')) {
      expect(exp.incidentEnergyJPerCm2).toBeGreaterThan(step.incidentEnergyJPerCm2);
      expectClose(higher.incidentEnergyJPerCm2, Math.max(step.incidentEnergyJPerCm2, exp.incidentEnergyJPerCm2), 1e-12);
      expect(higher.motorDecayModel).toBe('exponential');
      const motorStop = (c: typeof exp) => c.sources.find((x) => x.sourceId === 'M-1')!.stopsAtS;
      expect(motorStop(higher)).toBe(motorStop(exp));
      expect(higher.sentence).toContain('evaluated with both decay models: the exponential model');
      expectSentenceEnergies(higher.sentence, exp.incidentEnergyCalPerCm2, step.incidentEnergyCalPerCm2);
    }
  });

  it('a motor starter opening at 0.02 s: the step model (full current until then) gives the higher energy and is kept', () => {
    const m = withMotor([{ id: 'MS-1', source: 'M-1', device: flat(0.02) }]);
    for (const { higher, step, exp } of compare(m, 'higher')) {
      expect(step.incidentEnergyJPerCm2).toBeGreaterThan(exp.incidentEnergyJPerCm2);
      expectClose(higher.incidentEnergyJPerCm2, Math.max(step.incidentEnergyJPerCm2, exp.incidentEnergyJPerCm2), 1e-12);
      expect(higher.motorDecayModel).toBe('step');
      expect(higher.sentence).toContain('evaluated with both decay models: the step model');
      expectSentenceEnergies(higher.sentence, step.incidentEnergyCalPerCm2, exp.incidentEnergyCalPerCm2);
    }
  });

  it('each case keeps its own higher model (a fast main: load side cleared at 0.05 s, line side left to the cap)', () => {
    const m = withMotor([{ id: 'MAIN', branch: 'TX', end: 'to', device: flat(0.05) }]);
    const rows = compare(m); // no option: the default
    expect(rows.map((r) => r.higher.location)).toEqual(['load-side', 'load-side', 'line-side', 'line-side']);
    for (const { higher, step, exp } of rows) {
      expectClose(higher.incidentEnergyJPerCm2, Math.max(step.incidentEnergyJPerCm2, exp.incidentEnergyJPerCm2), 1e-12);
      expect(higher.motorDecayModel).toBe(
        exp.incidentEnergyJPerCm2 > step.incidentEnergyJPerCm2 ? 'exponential' : 'step',
      );
    }
    // Here the two sides are governed by different models, so the choice is made case by case, not once per bus.
    expect(new Set(rows.map((r) => r.higher.motorDecayModel))).toEqual(new Set(['step', 'exponential']));
    // The bus governs on the highest case of all, so its energy is the highest of both models' bus energies.
    const bus = run(m);
    expectClose(
      bus.incidentEnergyJPerCm2!,
      Math.max(run(m, 'step').incidentEnergyJPerCm2!, run(m, 'exponential').incidentEnergyJPerCm2!),
      1e-12,
    );
  });

  it("is the default: no option gives 'higher', the same energies as choosing it", () => {
    expect(createStudyRunner(parse(withMotor())).finish([]).motorDecayModel).toBe('higher');
    const m = withMotor([{ id: 'MS-1', source: 'M-1', device: flat(0.02) }]);
    expect(run(m).cases.map((c) => c.incidentEnergyJPerCm2)).toEqual(
      run(m, 'higher').cases.map((c) => c.incidentEnergyJPerCm2),
    );
  });

  it('a bus without motor contribution is evaluated once: no model on its cases, no motor sentence', () => {
    const m = withMotor();
    m.motors = [];
    const bus = run(m);
    for (const c of bus.cases) {
      expect(c.motorDecayModel).toBeUndefined();
      expect(c.sentence).not.toContain('decay models');
    }
    expect(bus.incidentEnergyJPerCm2).toBe(run(m, 'step').incidentEnergyJPerCm2);
  });
});

describe('a generator without Xd or sustained multiple: both typical sustained currents, the higher energy kept', () => {
  it('equals the higher of the two cases entered explicitly (the higher hazard; typical values from memory)', () => {
    const energyWith = (gen: Record<string, unknown>) => {
      const m = generatorOnly();
      const g = m.sources![0] as Record<string, unknown>;
      delete g.sustainedCurrentMultiple;
      Object.assign(g, gen);
      const bus = createStudyRunner(parse(m)).runBus('SWBD');
      return bus.cases.find((c) => c.arcCase === 'full')!;
    };
    const missing = energyWith({});
    const low = energyWith({ synchronousPct: 200 }); // the typical Xd of the data file
    const high = energyWith({ sustainedCurrentMultiple: 3 }); // the typical supported sustained multiple
    expect(low.incidentEnergyJPerCm2).not.toBeCloseTo(high.incidentEnergyJPerCm2, 3);
    expectClose(missing.incidentEnergyJPerCm2, Math.max(low.incidentEnergyJPerCm2, high.incidentEnergyJPerCm2), 1e-12);
    expect(missing.sentence).toContain('the higher of two energies');
  });

  it("with a motor on the bus and motor decay 'higher': the highest of the four cases entered explicitly (both brackets)", () => {
    // A motor starter with a 0.03 s definite time whose band starts at 0.8 × the motor's first-cycle current: in the
    // step model it opens at 0.03 s; in the exponential model the current falls below its pickup at τ·ln(1/0.8)
    // ≈ 0.019 s, the element stops (the conservative reset) and the motor feeds the arc until 5 τ — so here the
    // exponential model gives the higher energy, in the generator's alternate case too.
    const starter = (fromA: number): Device => ({
      kind: 'band',
      ratingA: 100,
      currentUnit: 'ampere',
      min: [
        [fromA, 0.015],
        [1e6, 0.015],
      ],
      max: [
        [fromA, 0.03],
        [1e6, 0.03],
      ],
    });
    const build = (gen: Record<string, unknown>, fromA: number) => {
      const m = generatorOnly();
      m.motors = [{ id: 'M-1', bus: 'SWBD', hp: 100, kv: 0.46 }];
      m.devices!.push({ id: 'MS', source: 'M-1', device: starter(fromA) });
      const g = m.sources![0] as Record<string, unknown>;
      delete g.sustainedCurrentMultiple;
      Object.assign(g, gen);
      return parse(m);
    };
    const full = (gen: Record<string, unknown>, fromA: number, motorDecayModel: 'step' | 'exponential' | 'higher') =>
      createStudyRunner(build(gen, fromA), { motorDecayModel, motorDecayCycles: 5 })
        .runBus('SWBD')
        .cases.find((c) => c.arcCase === 'full')!;
    // The motor's first-cycle current through its starter, from the model itself.
    const i0 = full({}, 10, 'step').devices.find((d) => d.deviceId === 'MS')!.currentA;
    const fromA = 0.8 * i0;
    const explicit = [{ synchronousPct: 200 }, { sustainedCurrentMultiple: 3 }].flatMap((gen) =>
      (['step', 'exponential'] as const).map((model) => full(gen, fromA, model)),
    );
    const missing = full({}, fromA, 'higher');
    expectClose(missing.incidentEnergyJPerCm2, Math.max(...explicit.map((c) => c.incidentEnergyJPerCm2)), 1e-12);
    const motor = (c: (typeof explicit)[number]) => c.sources.find((x) => x.sourceId === 'M-1')!;
    expect(motor(explicit[0]).cutByDeviceId).toBe('MS'); // step: the starter opens
    expect(motor(explicit[1]).reason).toBe('motor-decay'); // exponential: it stops timing, the motor decays out
    expect(missing.motorDecayModel).toBe('exponential');
    expect(missing.sentence).toContain('Sustained current of GEN not entered');
    expect(missing.sentence).toContain('evaluated with both decay models: the exponential model');
  });
});
