import type { ModelInput } from '../../shared/schemas/model';

/**
 * A generated plant for benchmarks, tests and the study worker's warm-up run (invented, no real equipment): utility →
 * 12.47 kV bus → 20 unit substations (480 V) → each feeds 99 MCC buses by cable; every 480 V bus labelled.
 */
export function generatedPlant(substations = 20, perSubstation = 99): ModelInput {
  const buses: NonNullable<ModelInput['buses']> = [{ id: 'HV', name: 'Service', nominalKv: 12.47 }];
  const transformers: NonNullable<ModelInput['transformers']> = [];
  const cables: NonNullable<ModelInput['cables']> = [];
  const devices: NonNullable<ModelInput['devices']> = [];
  const tm = {
    kind: 'thermal-magnetic' as const,
    ratingA: 225,
    thermal: {
      min: [
        [1.35, 250],
        [3, 9],
        [8, 0.9],
      ] as [number, number][],
      max: [
        [1.35, 1400],
        [3, 38],
        [8, 4],
      ] as [number, number][],
    },
    instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
    instantaneousClearingCycles: 1.5,
  };
  for (let s = 0; s < substations; s++) {
    const sub = `SUB-${s}`;
    buses.push({ id: sub, name: `Substation ${s}`, nominalKv: 0.48, equipment: { class: 'switchgear-lv' } });
    transformers.push({
      id: `TX-${s}`,
      fromBus: 'HV',
      toBus: sub,
      kva: 1500,
      primaryKv: 12.47,
      secondaryKv: 0.48,
      impedancePct: 5.75,
      xr: 6,
    });
    devices.push({
      id: `M-${s}`,
      branch: `TX-${s}`,
      end: 'to',
      device: {
        kind: 'electronic',
        sensorA: 2000,
        longTime: { pickup: 1, delayS: 10 },
        shortTime: { pickup: 4, delayS: 0.3, i2t: false },
        pickupTolerancePct: 10,
        clearingS: 0.05,
      },
    });
    for (let i = 0; i < perSubstation; i++) {
      const id = `MCC-${s}-${i}`;
      buses.push({ id, name: `MCC ${s}.${i}`, nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } });
      cables.push({
        id: `F-${s}-${i}`,
        fromBus: sub,
        toBus: id,
        lengthM: 20 + (i % 40) * 3,
        sets: 1,
        size: '4/0',
        material: 'Cu',
        conduit: 'steel',
      });
      devices.push({ id: `CB-${s}-${i}`, branch: `F-${s}-${i}`, end: 'from', device: tm });
    }
  }
  return {
    format: 'emberline-model',
    version: 1,
    name: 'Generated plant',
    frequencyHz: 60,
    buses,
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'HV', shortCircuitMva: 500, xr: 15 }],
    transformers,
    cables,
    devices,
  } as ModelInput;
}
