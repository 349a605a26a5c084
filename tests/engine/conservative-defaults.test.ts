/**
 * Conservative defaults (items of "trustworthy by default"): an unstated main isolation means the line side is
 * evaluated; relays stop following the inverse curve above a declared multiple; the relay instantaneous pickup has a
 * tolerance; a bus can carry its own arc-duration cap; medium-voltage motors take the first-cycle multipliers by size.
 * Each check names its source beside it.
 */
import type { ModelInput } from '../../shared/schemas/model';
import { modelSchema } from '../../shared/schemas/model';
import { createShortCircuitSolver } from '../../server/engine/shortcircuit';
import { motorFirstCycleMultiplier } from '../../server/engine/shortcircuit/impedance';
import { runStudy } from '../../server/engine/study';
import { bandFeatureCurrentsA, clearingTime } from '../../server/engine/trip';
import { arcDurationCapChanges } from '../../server/services/studies';
import type { RelayDevice } from '../../shared/schemas/device';
import { expectClose } from '../helpers/approx';

const parse = (m: ModelInput) => modelSchema.parse(m);

/** 12.47 kV utility → 1500 kVA transformer (primary relay, fast secondary main) → 480 V switchboard → MCC. */
function plant(equipment: Record<string, unknown> = {}): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    frequencyHz: 60,
    buses: [
      { id: 'SWGR', nominalKv: 12.47 },
      { id: 'SWBD', nominalKv: 0.48, equipment: { class: 'switchgear-lv', ...equipment } },
      { id: 'MCC', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
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
      {
        id: 'F-MCC',
        fromBus: 'SWBD',
        toBus: 'MCC',
        lengthM: 30,
        sets: 2,
        size: '500',
        material: 'Cu',
        conduit: 'steel',
      },
    ],
    devices: [
      {
        id: 'R-TX',
        name: 'Transformer primary relay',
        branch: 'TX',
        end: 'from',
        device: { kind: 'relay', curve: 'IEEE-VI', pickupA: 100, timeDial: 1, breakerCycles: 5 },
      },
      {
        id: 'CB-MAIN',
        name: 'Switchboard main',
        branch: 'TX',
        end: 'to',
        device: {
          kind: 'electronic',
          sensorA: 2000,
          longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
          instantaneous: { pickup: 5 },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
    ],
  } as ModelInput;
}

describe('main device isolation: not stated means not isolated', () => {
  it('a 480 V switchboard with a fast secondary main governs on the line side, cleared by the primary relay, when mainIsolated is omitted', () => {
    const r = runStudy(parse(plant())).buses.find((b) => b.busId === 'SWBD')!;
    expect(r.status).toBe('ok');
    // The line side of the main is evaluated (the main is excluded there); the next device upstream clears it.
    const lineFull = r.cases.find((c) => c.location === 'line-side' && c.arcCase === 'full')!;
    const loadFull = r.cases.find((c) => c.location === 'load-side' && c.arcCase === 'full')!;
    expect(lineFull.devices.map((d) => d.deviceId)).not.toContain('CB-MAIN');
    expect(loadFull.clearingDeviceId).toBe('CB-MAIN');
    expect(lineFull.clearingDeviceId).toBe('R-TX');
    expect(lineFull.sentence).toContain('R-TX');
    expect(r.governing!.location).toBe('line-side');
    expect(r.clearingDeviceId).toBe('R-TX');
    // The primary relay (inverse time, seconds) is slower than the main's instantaneous (0.05 s): more energy.
    expect(lineFull.arcDurationS).toBeGreaterThan(loadFull.arcDurationS);
    expect(r.equipment!.mainIsolated).toBe(false);
    expect(r.equipment!.typicalValuesUsed).toContain('mainIsolated');
    expect(r.warnings.map((w) => w.code)).toContain('MAIN_ISOLATION_NOT_STATED');
  });

  it('an explicit mainIsolated: true keeps its value: no line-side case, nothing defaulted', () => {
    const r = runStudy(parse(plant({ mainIsolated: true }))).buses.find((b) => b.busId === 'SWBD')!;
    expect(r.cases.every((c) => c.location === 'load-side')).toBe(true);
    expect(r.equipment!.typicalValuesUsed).not.toContain('mainIsolated');
    expect(r.clearingDeviceId).toBe('CB-MAIN');
  });

  it('a bus without a main device: nothing to evaluate on a line side and no default reported', () => {
    const r = runStudy(parse(plant())).buses.find((b) => b.busId === 'MCC')!;
    expect(r.cases.every((c) => c.location === 'load-side')).toBe(true);
    expect(r.equipment!.typicalValuesUsed).not.toContain('mainIsolated');
    expect(r.warnings.map((w) => w.code)).not.toContain('NO_MAIN_DEVICE');
  });

  it('omitted gives the same energy as an explicit false', () => {
    const omitted = runStudy(parse(plant())).buses.find((b) => b.busId === 'SWBD')!;
    const explicit = runStudy(parse(plant({ mainIsolated: false }))).buses.find((b) => b.busId === 'SWBD')!;
    expectClose(omitted.incidentEnergyJPerCm2!, explicit.incidentEnergyJPerCm2!, 1e-12);
  });
});

describe('relay curve limit: the inverse-time element stops following its curve above curveLimitMultiple', () => {
  // IEC 60255-151 Table 1, curve C (extremely inverse): k = 80, α = 2. Breaker: 5 cycles at 60 Hz = 0.083333 s.
  const ei: RelayDevice = { kind: 'relay', curve: 'IEC-EI', pickupA: 200, timeDial: 0.4, breakerCycles: 5 };

  it('at 21.4 kA (107 × pickup) with the default limit (20 ×): 0.4 × 80/(20² − 1) + 5/60 = 0.1635 s', () => {
    const r = clearingTime(ei, 21400);
    // IEC 60255-151 Table 1 EI constants; 20 × the setting is common practice, no source.
    expectClose(r.clearingTimeS as number, (0.4 * 80) / (20 ** 2 - 1) + 5 / 60, 1e-12);
    expectClose(r.clearingTimeS as number, 0.1635, 1e-3);
    expect(r.region).toBe('inverse-time');
    expect(r.warnings.map((w) => w.code)).toContain('RELAY_CURVE_LIMIT');
  });

  it('with curveLimitMultiple 200 the curve is followed to 107 ×: 0.4 × 80/(107² − 1) + 5/60 = 0.0861 s', () => {
    const r = clearingTime({ ...ei, curveLimitMultiple: 200 }, 21400);
    // IEC 60255-151 Table 1 EI constants (k = 80, α = 2); breaker 5 cycles.
    expectClose(r.clearingTimeS as number, (0.4 * 80) / (107 ** 2 - 1) + 5 / 60, 1e-12);
    expectClose(r.clearingTimeS as number, 0.0861, 1e-3);
    expect(r.warnings.map((w) => w.code)).not.toContain('RELAY_CURVE_LIMIT');
  });

  it('below the limit nothing changes: at 10 × pickup the IEC EI equation holds (0.4 × 80/99 + 5/60)', () => {
    // IEC 60255-151 Table 1 EI constants.
    expectClose(clearingTime(ei, 2000).clearingTimeS as number, (0.4 * 80) / 99 + 5 / 60, 1e-12);
  });

  it('the band plot has a corner at the limit (20 × 200 A = 4 000 A)', () => {
    expect(bandFeatureCurrentsA(ei)).toContain(4000);
  });
});

describe('relay instantaneous pickup tolerance (default ±10 %)', () => {
  // IEEE C37.112-2018 very inverse: A = 19.61, B = 0.491, p = 2; t = TD (A/(M^p − 1) + B). Breaker 5 cycles at 60 Hz.
  const vi: RelayDevice = {
    kind: 'relay',
    curve: 'IEEE-VI',
    pickupA: 400,
    timeDial: 2,
    instantaneousA: 4000,
    breakerCycles: 5,
  };
  const breakerS = 5 / 60;

  it('at 4 200 A (within 4 000 A ± 10 %) the maximum curve is the inverse element plus the breaker, with a warning', () => {
    const r = clearingTime(vi, 4200);
    const m = 4200 / 400;
    // IEEE C37.112-2018 VI constants.
    expectClose(r.clearingTimeS as number, 2 * (19.61 / (m ** 2 - 1) + 0.491) + breakerS, 1e-12);
    expect(r.region).toBe('inverse-time');
    expect(r.warnings.map((w) => w.code)).toContain('WITHIN_PICKUP_TOLERANCE');
    // The minimum curve already drops to the instantaneous element above the low edge (3 600 A).
    expectClose(r.minimumTimeS as number, 0.016, 1e-12);
  });

  it('at 4 500 A (above the high edge 4 400 A) the instantaneous element plus the breaker', () => {
    const r = clearingTime(vi, 4500);
    // IEEE 1584-2002: 16 ms relay time in the instantaneous region, plus the breaker time.
    expectClose(r.clearingTimeS as number, 0.016 + breakerS, 1e-12);
    expect(r.region).toBe('instantaneous');
  });

  it('instantaneousTolerancePct 0 restores the element at its pickup', () => {
    expect(clearingTime({ ...vi, instantaneousTolerancePct: 0 }, 4200).region).toBe('instantaneous');
  });
});

describe('arc-duration cap per bus', () => {
  /** The switchboard cleared only by a slow primary relay (no main): IEEE VI, TD 10 — several seconds. */
  function slow(equipment: Record<string, unknown>): ModelInput {
    const m = plant({ mainIsolated: true, ...equipment });
    m.devices = [
      {
        id: 'R-TX',
        branch: 'TX',
        end: 'from',
        device: { kind: 'relay', curve: 'IEEE-VI', pickupA: 100, timeDial: 10, breakerCycles: 5 },
      },
    ];
    return m;
  }
  const swbd = (m: ModelInput) => runStudy(parse(m)).buses.find((b) => b.busId === 'SWBD')!;
  const reason = 'Confined vault: escape not possible within 2 s';

  it('the study cap (2 s) applies where the bus has none of its own', () => {
    const r = swbd(slow({}));
    expect(r.arcDurationS).toBe(2);
    expect(r.arcDurationCap).toEqual({ capS: 2, source: 'study', reason: null });
  });

  it('a bus cap of 5 s with a reason: the arc lasts up to 5 s, the reason is in the trace', () => {
    const r = swbd(slow({ arcDurationCapS: 5, arcDurationCapReason: reason }));
    const study = swbd(slow({}));
    expect(r.status).toBe('ok');
    expect(r.arcDurationS).toBe(5);
    expect(r.arcDurationCap).toEqual({ capS: 5, source: 'bus', reason });
    expect(r.warnings.find((w) => w.code === 'BUS_ARC_DURATION_CAP')!.message).toContain(reason);
    // One source at a constant current: IEEE 1584-2018 energy is proportional to the arc duration (Eqs. 3-6).
    expectClose(r.incidentEnergyJPerCm2! / study.incidentEnergyJPerCm2!, 5 / 2, 1e-9);
  });

  it('no cap (null) with a reason: the relay clearing time stands', () => {
    const r = swbd(slow({ arcDurationCapS: null, arcDurationCapReason: 'Bucket truck: no escape' }));
    expect(r.status).toBe('ok');
    const full = r.cases.find((c) => c.arcCase === 'full')!;
    const relay = full.devices.find((d) => d.deviceId === 'R-TX')!;
    // IEEE C37.112-2018 VI: t = TD (19.61/(M² − 1) + 0.491), plus 5 cycles at 60 Hz; M at the current it sees.
    const m = relay.currentA / 100;
    expectClose(full.arcDurationS, 10 * (19.61 / (m * m - 1) + 0.491) + 5 / 60, 1e-6);
    expect(full.arcDurationS).toBeGreaterThan(5);
    expect(full.arcDurationCapped).toBe(false);
    expect(r.arcDurationCap).toEqual({ capS: null, source: 'bus', reason: 'Bucket truck: no escape' });
  });

  it('a bus cap needs its reason (schema), and a bus with no cap and no clearing device is an error naming the field', () => {
    const bad = modelSchema.safeParse(slow({ arcDurationCapS: 5 }));
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0].path).toEqual(['buses', 1, 'equipment', 'arcDurationCapReason']);
    const m = slow({ arcDurationCapS: null, arcDurationCapReason: 'no escape' });
    m.devices = [];
    const r = swbd(m);
    expect(r.status).toBe('error');
    expect(r.error!.code).toBe('NO_CLEARING_WITHOUT_CAP');
  });
});

describe('arc-duration cap changes for the audit log', () => {
  it('records each bus whose own cap or reason changes, before and after (null: the study cap)', () => {
    const before = JSON.stringify({
      buses: [
        { id: 'A', equipment: { class: 'switchgear-lv' } },
        { id: 'B', equipment: { class: 'switchgear-lv', arcDurationCapS: 5, arcDurationCapReason: 'vault' } },
        { id: 'C', equipment: { class: 'switchgear-lv', arcDurationCapS: 3, arcDurationCapReason: 'x' } },
      ],
    });
    const after = {
      buses: [
        { id: 'A', equipment: { class: 'switchgear-lv', arcDurationCapS: null, arcDurationCapReason: 'bucket truck' } },
        { id: 'B', equipment: { class: 'switchgear-lv' } },
        { id: 'C', equipment: { class: 'switchgear-lv', arcDurationCapS: 3, arcDurationCapReason: 'x' } },
      ],
    };
    expect(arcDurationCapChanges(before, after)).toEqual([
      { busId: 'A', before: null, after: { capS: null, reason: 'bucket truck' } },
      { busId: 'B', before: { capS: 5, reason: 'vault' }, after: null },
    ]);
  });
});

describe('medium-voltage motor first-cycle multipliers', () => {
  /** A 4.16 kV bus fed by the utility, one induction motor on it (X" 16.7 %, X/R 15, kVA given). */
  function mvMotor(hp: number, rpm?: number): ModelInput {
    return {
      format: 'emberline-model',
      version: 1,
      frequencyHz: 60,
      buses: [{ id: 'MV', nominalKv: 4.16 }],
      sources: [{ id: 'UTIL', kind: 'utility', bus: 'MV', shortCircuitMva: 100, xr: 10 }],
      motors: [{ id: 'M', bus: 'MV', hp, kv: 4.16, subtransientPct: 16.7, xr: 15, ...(rpm ? { rpm } : {}) }],
    } as ModelInput;
  }
  const motorCurrentA = (m: ModelInput) => {
    const fault = createShortCircuitSolver(parse(m)).faultAt('MV');
    return fault.injections.find((i) => i.id === 'M')!.currentA;
  };
  /**
   * Hand-worked: a motor at the faulted bus feeds V / |Z| with V = 1 pu; on its own base (1 kVA per hp, common
   * practice, no source) I = (kVA / (√3 · kV)) / (m · X" · √(1 + 1/(X/R)²)).
   */
  const hand = (hp: number, multiplier: number) =>
    hp / (Math.sqrt(3) * 4.16) / (multiplier * 0.167 * Math.sqrt(1 + 1 / 15 ** 2));

  it('300 hp, 1800 rpm, 4.16 kV: × 1.2 (IEEE C37.010 practice, 50–1000 hp)', () => {
    expectClose(motorCurrentA(mvMotor(300, 1800)), hand(300, 1.2), 1e-9);
    // 300 / (√3 × 4.16) = 41.64 A rated; / (1.2 × 0.167 × 1.0022) = 207.3 A (worked by hand).
    expectClose(motorCurrentA(mvMotor(300, 1800)), 207.3, 1e-3);
  });
  it('1500 hp: × 1.0 (above 1000 hp)', () => {
    expectClose(motorCurrentA(mvMotor(1500, 1800)), hand(1500, 1.0), 1e-9);
  });
  it('40 hp: × 1.67 (below 50 hp)', () => {
    expectClose(motorCurrentA(mvMotor(40, 1800)), hand(40, 1.67), 1e-9);
  });
  it('300 hp at 3600 rpm: × 1.0; speed not given: 3600 assumed (the larger contribution) with a warning', () => {
    expectClose(motorCurrentA(mvMotor(300, 3600)), hand(300, 1.0), 1e-9);
    expectClose(motorCurrentA(mvMotor(300)), hand(300, 1.0), 1e-9);
    const w = createShortCircuitSolver(parse(mvMotor(300))).result.warnings.map((x) => x.code);
    expect(w).toContain('motor-rpm-assumed');
  });
  it('low voltage unchanged: a 300 hp 480 V motor keeps 1.2 whatever its speed (IEEE 551-2006 Table 9-1)', () => {
    expect(motorFirstCycleMultiplier(300, 0.48, 3600)).toBe(1.2);
    expect(motorFirstCycleMultiplier(40, 0.48)).toBe(1.67);
  });
});
