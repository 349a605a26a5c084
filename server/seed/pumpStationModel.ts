import type { ModelInput } from '../../shared/schemas/model';

/**
 * The invented Larkspur Valley raw-water pump station: a 12.47 kV tap, one 750 kVA unit substation at 480 V, a pump
 * MCC and a small power panel. Its study was approved almost five years ago in the demo, so the dashboard has a
 * review coming due. Every device and setting here is invented; none is a maker's data.
 */
export function pumpStationModel(): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    name: 'Larkspur Valley Raw Water Pump Station',
    frequencyHz: 60,
    buses: [
      { id: 'PS-SWGR', name: 'Pump station incoming switch 12.47 kV', nominalKv: 12.47 },
      {
        id: 'PS-USS',
        name: 'Pump station unit substation secondary',
        nominalKv: 0.48,
        equipment: { class: 'switchgear-lv', mainIsolated: false },
      },
      { id: 'PS-MCC', name: 'Raw water pump MCC', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
      {
        id: 'PS-PP',
        name: 'Pump station power panel',
        nominalKv: 0.48,
        equipment: { class: 'mcc-panelboard-lv-shallow' },
      },
    ],
    sources: [{ id: 'PS-UTIL', name: 'Utility tap', kind: 'utility', bus: 'PS-SWGR', shortCircuitMva: 150, xr: 10 }],
    transformers: [
      {
        id: 'PS-TX',
        name: 'Pump station transformer',
        fromBus: 'PS-SWGR',
        toBus: 'PS-USS',
        kva: 750,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 5.5,
      },
    ],
    cables: [
      {
        id: 'PS-F-MCC',
        name: 'Substation to pump MCC',
        fromBus: 'PS-USS',
        toBus: 'PS-MCC',
        lengthM: 20,
        sets: 2,
        size: '350',
        material: 'Cu',
        conduit: 'steel',
      },
      {
        id: 'PS-F-PP',
        name: 'Substation to power panel',
        fromBus: 'PS-USS',
        toBus: 'PS-PP',
        lengthM: 30,
        sets: 1,
        size: '2/0',
        material: 'Cu',
        conduit: 'pvc',
      },
    ],
    motors: [
      { id: 'RW-1', name: 'Raw water pump 1', bus: 'PS-MCC', hp: 150, kv: 0.46 },
      { id: 'RW-2', name: 'Raw water pump 2', bus: 'PS-MCC', hp: 150, kv: 0.46 },
    ],
    devices: [
      {
        id: 'PS-FUSE',
        name: 'Transformer primary fuse',
        branch: 'PS-TX',
        end: 'from',
        device: {
          kind: 'fuse',
          ratingA: 50,
          totalClearing: [
            [100, 300],
            [150, 40],
            [250, 5],
            [500, 0.6],
            [1000, 0.1],
            [3000, 0.02],
          ],
        },
      },
      {
        id: 'PS-CB-M',
        name: 'Substation secondary main',
        branch: 'PS-TX',
        end: 'to',
        device: {
          kind: 'electronic',
          sensorA: 1000,
          longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
          shortTime: { pickup: 4, delayS: 0.2, i2t: false },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      {
        id: 'PS-CB-MCC',
        name: 'Pump MCC feeder',
        branch: 'PS-F-MCC',
        end: 'from',
        device: {
          kind: 'electronic',
          sensorA: 600,
          longTime: { pickup: 1, delayS: 7, delayMultiple: 6 },
          instantaneous: { pickup: 8 },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      {
        id: 'PS-CB-PP',
        name: 'Power panel feeder',
        branch: 'PS-F-PP',
        end: 'from',
        device: {
          kind: 'electronic',
          sensorA: 225,
          longTime: { pickup: 1, delayS: 5, delayMultiple: 6 },
          instantaneous: { pickup: 10 },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
    ],
  };
}
