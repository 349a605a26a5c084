import type { ModelInput } from '../../shared/schemas/model';

/**
 * The invented Larkspur Valley Water Reclamation Facility (DESIGN.md §9): a 12.47 kV utility service into the main
 * switchgear, two unit substations (1500 kVA and 750 kVA, 480 V), a 480 V switchboard with a standby generator
 * paralleled for testing, two motor control centres with pump and blower motors, a power panel and a 208 V lighting
 * panel. Every device and setting here is invented for the demonstration; none is a maker's data.
 */
export function larkspurModel(): ModelInput {
  const tm = (ratingA: number, instMultiple: number) => ({
    kind: 'thermal-magnetic' as const,
    ratingA,
    thermal: {
      min: [[1.35, 250], [2, 28], [3, 9], [5, 2.8], [8, 0.9]] as [number, number][],
      max: [[1.35, 1400], [2, 95], [3, 38], [5, 11], [8, 4]] as [number, number][],
    },
    instantaneous: { pickupMultiple: instMultiple, tolerancePct: 20 },
    instantaneousClearingCycles: 1.5,
  });
  return {
    format: 'emberline-model',
    version: 1,
    name: 'Larkspur Valley Water Reclamation Facility',
    frequencyHz: 60,
    buses: [
      { id: 'SWGR-A', name: 'Main switchgear 12.47 kV', nominalKv: 12.47, equipment: { class: 'switchgear-15kv' } },
      {
        id: 'USS-1',
        name: 'Unit substation 1 secondary (1500 kVA)',
        nominalKv: 0.48,
        equipment: { class: 'switchgear-lv', mainIsolated: false },
      },
      { id: 'USS-2', name: 'Unit substation 2 secondary (750 kVA)', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } },
      {
        id: 'SWBD-1',
        name: 'Process switchboard',
        nominalKv: 0.48,
        equipment: { class: 'switchgear-lv', enclosureMm: { height: 2286, width: 914, depth: 762 } },
      },
      { id: 'MCC-1', name: 'Aeration MCC', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
      { id: 'MCC-2', name: 'Influent pump MCC', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
      { id: 'PP-1', name: 'Power panel, operations building', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-shallow' } },
      { id: 'LP-1', name: 'Lighting panel, operations building', nominalKv: 0.208, equipment: { class: 'mcc-panelboard-lv-shallow' } },
      { id: 'GEN-T', name: 'Standby generator terminals', nominalKv: 0.48 },
    ],
    sources: [
      { id: 'UTIL', name: 'Utility service', kind: 'utility', bus: 'SWGR-A', shortCircuitMva: 250, xr: 12 },
      { id: 'GEN-1', name: 'Standby generator', kind: 'generator', bus: 'GEN-T', kva: 750, kv: 0.48, subtransientPct: 16, xr: 18 },
    ],
    transformers: [
      { id: 'TX-1', name: 'Unit substation 1 transformer', fromBus: 'SWGR-A', toBus: 'USS-1', kva: 1500, primaryKv: 12.47, secondaryKv: 0.48, impedancePct: 5.75, xr: 6.5 },
      { id: 'TX-2', name: 'Unit substation 2 transformer', fromBus: 'SWGR-A', toBus: 'USS-2', kva: 750, primaryKv: 12.47, secondaryKv: 0.48, impedancePct: 5.75, xr: 5.5 },
      { id: 'TX-LP1', name: 'Lighting transformer', fromBus: 'PP-1', toBus: 'LP-1', kva: 15, primaryKv: 0.48, secondaryKv: 0.208, impedancePct: 3 },
    ],
    cables: [
      { id: 'F-SWBD1', name: 'USS-1 to switchboard', fromBus: 'USS-1', toBus: 'SWBD-1', lengthM: 25, sets: 4, size: '500', material: 'Cu', conduit: 'steel' },
      { id: 'F-MCC1', name: 'Switchboard to aeration MCC', fromBus: 'SWBD-1', toBus: 'MCC-1', lengthM: 60, sets: 2, size: '350', material: 'Cu', conduit: 'steel' },
      { id: 'F-PP1', name: 'Switchboard to power panel', fromBus: 'SWBD-1', toBus: 'PP-1', lengthM: 45, sets: 1, size: '4/0', material: 'Cu', conduit: 'pvc' },
      { id: 'F-MCC2', name: 'USS-2 to influent pump MCC', fromBus: 'USS-2', toBus: 'MCC-2', lengthM: 35, sets: 2, size: '250', material: 'Cu', conduit: 'steel' },
      { id: 'F-GEN', name: 'Generator to switchboard', fromBus: 'GEN-T', toBus: 'SWBD-1', lengthM: 40, sets: 3, size: '500', material: 'Cu', conduit: 'steel' },
    ],
    motors: [
      { id: 'B-101', name: 'Aeration blower 1', bus: 'MCC-1', hp: 200, kv: 0.46 },
      { id: 'B-102', name: 'Aeration blower 2', bus: 'MCC-1', hp: 200, kv: 0.46 },
      { id: 'P-201', name: 'Influent pump 1', bus: 'MCC-2', hp: 100, kv: 0.46 },
      { id: 'P-202', name: 'Influent pump 2', bus: 'MCC-2', hp: 100, kv: 0.46 },
    ],
    devices: [
      {
        id: 'R-SVC',
        name: 'Service relay',
        source: 'UTIL',
        device: { kind: 'relay', curve: 'IEEE-VI', ctRatio: 400 / 5, pickupSecondaryA: 4, timeDial: 3, instantaneousA: 8000, breakerCycles: 5 },
      },
      {
        id: 'R-TX1',
        name: 'TX-1 primary relay',
        branch: 'TX-1',
        end: 'from',
        device: { kind: 'relay', curve: 'IEEE-EI', ctRatio: 200 / 5, pickupSecondaryA: 2.5, timeDial: 2, instantaneousA: 1600, breakerCycles: 5 },
      },
      {
        id: 'R-TX2',
        name: 'TX-2 primary relay',
        branch: 'TX-2',
        end: 'from',
        device: { kind: 'relay', curve: 'IEEE-EI', ctRatio: 100 / 5, pickupSecondaryA: 2.5, timeDial: 2, instantaneousA: 800, breakerCycles: 5 },
      },
      {
        id: 'CB-USS1-M',
        name: 'USS-1 secondary main',
        branch: 'TX-1',
        end: 'to',
        device: {
          kind: 'electronic',
          sensorA: 2000,
          longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
          shortTime: { pickup: 3, delayS: 0.3, i2t: false },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      {
        id: 'CB-USS2-M',
        name: 'USS-2 secondary main',
        branch: 'TX-2',
        end: 'to',
        device: {
          kind: 'electronic',
          sensorA: 1000,
          longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
          shortTime: { pickup: 4, delayS: 0.2, i2t: false },
          instantaneous: { pickup: 12 },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      {
        id: 'CB-SWBD1',
        name: 'Switchboard feeder breaker',
        branch: 'F-SWBD1',
        end: 'from',
        device: {
          kind: 'electronic',
          sensorA: 1600,
          longTime: { pickup: 1, delayS: 7, delayMultiple: 6 },
          shortTime: { pickup: 3, delayS: 0.2, i2t: true },
          instantaneous: { pickup: 10 },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      { id: 'CB-MCC1', name: 'Aeration MCC feeder', branch: 'F-MCC1', end: 'from', device: tm(600, 10) },
      { id: 'CB-PP1', name: 'Power panel feeder', branch: 'F-PP1', end: 'from', device: tm(225, 10) },
      { id: 'CB-MCC2', name: 'Influent pump MCC feeder', branch: 'F-MCC2', end: 'from', device: tm(400, 10) },
      {
        id: 'CB-GEN',
        name: 'Generator breaker',
        branch: 'F-GEN',
        end: 'from',
        device: {
          kind: 'electronic',
          sensorA: 1200,
          longTime: { pickup: 0.8, delayS: 4, delayMultiple: 6 },
          shortTime: { pickup: 2, delayS: 0.1, i2t: false },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      {
        id: 'FU-LP1',
        name: 'Lighting transformer primary fuse',
        branch: 'TX-LP1',
        end: 'from',
        device: {
          kind: 'fuse',
          ratingA: 30,
          minimumMelt: [[45, 300], [60, 60], [90, 10], [150, 1], [300, 0.08], [600, 0.01]],
          totalClearing: [[55, 600], [75, 100], [110, 15], [190, 1.5], [380, 0.12], [800, 0.012]],
        },
      },
    ],
  } as ModelInput;
}
