/**
 * Conservative defaults (items of "trustworthy by default"): an unstated main isolation means the line side is
 * evaluated; relays stop following the inverse curve above a declared multiple; the relay instantaneous pickup has a
 * tolerance; a bus can carry its own arc-duration cap; medium-voltage motors take the first-cycle multipliers by size.
 * Each check names its source beside it.
 */
import type { ModelInput } from '../../shared/schemas/model';
import { modelSchema } from '../../shared/schemas/model';
import { runStudy } from '../../server/engine/study';
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
